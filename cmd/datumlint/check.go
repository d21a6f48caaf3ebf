package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/config"
	"github.com/datumlint/datumlint/rules/lint"
)

// checkFlags are the flags of `datumlint check`.
type checkFlags struct {
	runFlags
	format string
	color  string
	fixes  fixFlags
}

// runFlags are the flags of a run that `check` and `report` share: the
// configuration, the failing severity, the size limit and the workers.
type runFlags struct {
	failOn   string
	maxBytes int64
	workers  int
	config   string
	over     config.Overrides
}

func (f *runFlags) register(fl *pflag.FlagSet) {
	fl.StringVar(&f.failOn, "fail-on", "", "the lowest severity that fails the check: error, warning or info (default warning)")
	fl.Int64Var(&f.maxBytes, "max-bytes", lint.DefaultMaxBytes, "largest file to read, in bytes")
	fl.IntVar(&f.workers, "workers", 0, "files checked at once (0: one per core)")
	fl.StringVar(&f.config, "config", "", "use this configuration file for every checked file instead of the "+config.FileName+" files found above them")
	fl.StringSliceVar(&f.over.Enable, "enable", nil, "run these rules (RULE[,RULE]) even where the configuration turns them off")
	fl.StringSliceVar(&f.over.Disable, "disable", nil, "do not run these rules (RULE[,RULE])")
}

// prepare works out a run from the flags and the paths: the configuration
// (--config or the files found above the paths, with --enable and
// --disable), the failing severity (--fail-on, else the configuration's,
// else warning) and the options of lint.Run. Errors are usage errors
// (exit 2).
func (f *runFlags) prepare(cmd *cobra.Command, args []string) (*configSetup, lint.Options, rules.Severity, error) {
	cfg, err := loadConfig(f.config, f.over, args)
	if err != nil {
		return nil, lint.Options{}, 0, err
	}
	failOn := rules.Warning
	if cfg.failOnSet {
		failOn = cfg.failOn
	}
	if f.failOn != "" {
		s, err := rules.ParseSeverity(f.failOn)
		if err != nil || s == rules.Off {
			return nil, lint.Options{}, 0, fmt.Errorf("--fail-on takes error, warning or info, not %q", f.failOn)
		}
		failOn = s
	}
	if cfg.maxBytes > 0 && !cmd.Flags().Changed("max-bytes") {
		f.maxBytes = cfg.maxBytes
	}
	opt := lint.Options{SettingsFor: cfg.settingsFor, Exclude: cfg.exclude, MaxBytes: f.maxBytes, Workers: f.workers}
	return cfg, opt, failOn, nil
}

// runExit is the exit of a run: 2 when a path could not be read (each is
// printed on stderr), else 1 when an unsuppressed finding is at or above
// failOn, else nil.
func runExit(stderr io.Writer, res *lint.Result, failOn rules.Severity) error {
	for _, e := range res.Errors {
		fmt.Fprintf(stderr, "datumlint: %s\n", e)
	}
	if len(res.Errors) > 0 {
		return &exitError{2, ""}
	}
	for _, d := range res.Diagnostics() {
		if !d.Suppressed && d.Severity >= failOn {
			return &exitError{1, ""}
		}
	}
	return nil
}

func newCheckCmd() *cobra.Command {
	f := &checkFlags{}
	cmd := &cobra.Command{
		Use:   "check [PATH ...]",
		Short: "Check .callouts files and folders (folders are walked for *.callouts)",
		Long: `Check .callouts files and folders. Exit 0: no finding at or above the failing severity;
1: findings; 2: a usage error or a path that could not be read (the other paths are still
checked). With no PATH, the current folder is checked.`,
		RunE: func(cmd *cobra.Command, args []string) error {
			return runCheck(cmd, f, args)
		},
	}
	fl := cmd.Flags()
	fl.StringVar(&f.format, "format", "text", "output format: "+strings.Join(formatNames(), ", "))
	fl.StringVar(&f.color, "color", "auto", "colour the text output: auto, always or never (NO_COLOR is honoured)")
	f.runFlags.register(fl)
	fl.BoolVar(&f.fixes.fix, "fix", false, "apply the safe suggested fixes in place, then report what remains")
	fl.BoolVar(&f.fixes.all, "fix-all", false, "apply every suggested fix, also those that change what the drawing says and need review")
	fl.BoolVar(&f.fixes.diff, "diff", false, "with --fix or --fix-all: print the fixes as a unified diff and write nothing")
	return cmd
}

func runCheck(cmd *cobra.Command, f *checkFlags, args []string) error {
	if len(args) == 0 {
		args = []string{"."}
	}
	cfg, opt, failOn, err := f.prepare(cmd, args)
	if err != nil {
		return &exitError{2, err.Error()}
	}
	out := formatNamed(f.format)
	if out == nil {
		return &exitError{2, fmt.Sprintf("unknown format %q: use %s", f.format, strings.Join(formatNames(), ", "))}
	}
	if err := setColor(f.color); err != nil {
		return &exitError{2, err.Error()}
	}
	if f.fixes.diff && !f.fixes.on() {
		return &exitError{2, "--diff shows what --fix or --fix-all would change: add one of them"}
	}
	stdout := cmd.OutOrStdout()
	if f.fixes.on() {
		fixed, err := runFixes(stdout, cmd.ErrOrStderr(), f.fixes, args, cfg, f.maxBytes)
		if err != nil {
			return &exitError{2, err.Error()}
		}
		if f.fixes.diff {
			// Nothing was written: the exit code tells what would remain.
			opt.Override = fixed
			out = func(io.Writer, *lint.Result) error { return nil }
		}
	}
	res := lint.Run(args, opt)
	if err := out(stdout, &res); err != nil {
		return &exitError{2, err.Error()}
	}
	return runExit(cmd.ErrOrStderr(), &res, failOn)
}

// outputFormat writes a run's results in one --format.
type outputFormat struct {
	name  string
	write func(w io.Writer, res *lint.Result) error
}

// formats lists the output formats, in the order help and errors name them.
var formats = []outputFormat{
	{"text", writeText},
	{"json", writeJSON},
	{"sarif", writeSARIF},
	{"github", writeGitHub},
}

func formatNamed(name string) func(io.Writer, *lint.Result) error {
	for _, f := range formats {
		if f.name == name {
			return f.write
		}
	}
	return nil
}

func formatNames() []string {
	out := make([]string, len(formats))
	for i, f := range formats {
		out[i] = f.name
	}
	return out
}

// visible returns the findings that text outputs show (not suppressed).
func visible(ds []rules.Diagnostic) []rules.Diagnostic {
	var out []rules.Diagnostic
	for _, d := range ds {
		if !d.Suppressed {
			out = append(out, d)
		}
	}
	return out
}
