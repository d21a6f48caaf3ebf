package main

import (
	"os"
	"path/filepath"
	"sync"

	"github.com/spf13/cobra"

	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/config"
)

// This file links the configuration (.datumlint.toml, --config, --enable,
// --disable) into `datumlint check` through checkHooks.

func init() {
	checkHooks = append(checkHooks, addConfigFlags)
}

func addConfigFlags(cmd *cobra.Command, f *checkFlags) {
	var (
		file string
		over config.Overrides
	)
	fl := cmd.Flags()
	fl.StringVar(&file, "config", "", "use this configuration file for every checked file instead of the "+config.FileName+" files found above them")
	fl.StringSliceVar(&over.Enable, "enable", nil, "run these rules (RULE[,RULE]) even where the configuration turns them off")
	fl.StringSliceVar(&over.Disable, "disable", nil, "do not run these rules (RULE[,RULE])")

	prev := cmd.PreRunE
	cmd.PreRunE = func(cmd *cobra.Command, args []string) error {
		if prev != nil {
			if err := prev(cmd, args); err != nil {
				return err
			}
		}
		if err := over.Check(); err != nil {
			return &exitError{2, err.Error()}
		}
		s := &configSetup{over: over}
		if file != "" {
			c, err := config.Load(file)
			if err != nil {
				return &exitError{2, err.Error()}
			}
			s.fixed = c
		}
		// The failing severity and the size limit are settings of the run,
		// not of a file: they come from --config, or else from the
		// configurations that apply to the paths on the command line (the
		// strictest of them, should they differ).
		top, err := s.forArgs(args)
		if err != nil {
			return &exitError{2, err.Error()}
		}
		var maxBytes int64
		for _, c := range top {
			if c.FailOnSet && (!s.failOnSet || c.FailOn < s.failOn) {
				s.failOn, s.failOnSet = c.FailOn, true
			}
			if c.MaxBytes > 0 && (maxBytes == 0 || c.MaxBytes < maxBytes) {
				maxBytes = c.MaxBytes
			}
		}
		if maxBytes > 0 && !cmd.Flags().Changed("max-bytes") {
			f.maxBytes = maxBytes
		}
		f.configure = configure{
			settingsFor: s.settingsFor,
			exclude:     s.exclude,
			failOnSet:   func() (rules.Severity, bool) { return s.failOn, s.failOnSet },
		}
		return nil
	}
}

// configSetup answers, per checked file, which configuration applies.
type configSetup struct {
	over      config.Overrides
	fixed     *config.Config // from --config
	finder    config.Finder
	failOn    rules.Severity
	failOnSet bool

	mu       sync.Mutex
	settings map[*config.Config]*rules.Settings
}

func (s *configSetup) configFor(path string) (*config.Config, error) {
	if s.fixed != nil {
		return s.fixed, nil
	}
	return s.finder.Find(filepath.Dir(path))
}

// forArgs returns the configurations that apply to the command line's
// paths (a folder's own, a file's folder's).
func (s *configSetup) forArgs(args []string) ([]*config.Config, error) {
	if s.fixed != nil {
		return []*config.Config{s.fixed}, nil
	}
	if len(args) == 0 {
		args = []string{"."}
	}
	var out []*config.Config
	for _, a := range args {
		dir := a
		if st, err := os.Stat(a); err != nil || !st.IsDir() {
			dir = filepath.Dir(a)
		}
		c, err := s.finder.Find(dir)
		if err != nil {
			return nil, err
		}
		if c != nil {
			out = append(out, c)
		}
	}
	return out, nil
}

func (s *configSetup) settingsFor(path string) (*rules.Settings, error) {
	c, err := s.configFor(path)
	if err != nil {
		return nil, err
	}
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.settings == nil {
		s.settings = map[*config.Config]*rules.Settings{}
	}
	st, ok := s.settings[c]
	if !ok {
		st = c.Settings(s.over)
		s.settings[c] = st
	}
	return st, nil
}

func (s *configSetup) exclude(path string) bool {
	c, err := s.configFor(path)
	if err != nil {
		return false // settingsFor reports the broken configuration
	}
	return c.Excluded(path)
}
