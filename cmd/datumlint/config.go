package main

import (
	"os"
	"path/filepath"
	"sync"

	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/config"
)

// loadConfig works out the configuration of a check: --config, or the
// .datumlint.toml files found above each file, with --enable and --disable
// applied. The failing severity and the size limit are settings of the
// run, not of a file: they come from --config, or else from the
// configurations that apply to the paths on the command line (the
// strictest of them, should they differ).
func loadConfig(file string, over config.Overrides, args []string) (*configSetup, error) {
	if err := over.Check(); err != nil {
		return nil, err
	}
	s := &configSetup{over: over}
	if file != "" {
		c, err := config.Load(file)
		if err != nil {
			return nil, err
		}
		s.fixed = c
	}
	top, err := s.forArgs(args)
	if err != nil {
		return nil, err
	}
	for _, c := range top {
		if c.FailOnSet && (!s.failOnSet || c.FailOn < s.failOn) {
			s.failOn, s.failOnSet = c.FailOn, true
		}
		if c.MaxBytes > 0 && (s.maxBytes == 0 || c.MaxBytes < s.maxBytes) {
			s.maxBytes = c.MaxBytes
		}
	}
	return s, nil
}

// configSetup answers, per checked file, which configuration applies.
type configSetup struct {
	over      config.Overrides
	fixed     *config.Config // from --config
	finder    config.Finder
	failOn    rules.Severity
	failOnSet bool
	maxBytes  int64

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
