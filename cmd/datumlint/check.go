package main

import (
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/spf13/cobra"

	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/lint"
)

// checkFlags are the flags of `datumlint check`.
type checkFlags struct {
	format   string
	failOn   string
	color    string
	maxBytes int64
	workers  int
	configure
}

// configure is filled by the configuration support (config.go) where it is
// linked in; by default the rules run with their default severities.
type configure struct {
	settingsFor func(path string) (*rules.Settings, error)
	exclude     func(path string) bool
	failOnSet   func() (rules.Severity, bool)
}

// checkHooks lets other files add flags and configuration to check.
var checkHooks []func(cmd *cobra.Command, f *checkFlags)

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
	fl.StringVar(&f.failOn, "fail-on", "", "the lowest severity that fails the check: error, warning or info (default warning)")
	fl.StringVar(&f.color, "color", "auto", "colour the text output: auto, always or never (NO_COLOR is honoured)")
	fl.Int64Var(&f.maxBytes, "max-bytes", lint.DefaultMaxBytes, "largest file to read, in bytes")
	fl.IntVar(&f.workers, "workers", 0, "files checked at once (0: one per core)")
	for _, h := range checkHooks {
		h(cmd, f)
	}
	return cmd
}

func runCheck(cmd *cobra.Command, f *checkFlags, args []string) error {
	out, ok := formats[f.format]
	if !ok {
		return &exitError{2, fmt.Sprintf("unknown format %q: use %s", f.format, strings.Join(formatNames(), ", "))}
	}
	failOn := rules.Warning
	if f.failOnSet != nil {
		if s, ok := f.failOnSet(); ok {
			failOn = s
		}
	}
	if f.failOn != "" {
		s, err := rules.ParseSeverity(f.failOn)
		if err != nil || s == rules.Off {
			return &exitError{2, fmt.Sprintf("--fail-on takes error, warning or info, not %q", f.failOn)}
		}
		failOn = s
	}
	if err := setColor(f.color); err != nil {
		return &exitError{2, err.Error()}
	}
	if len(args) == 0 {
		args = []string{"."}
	}
	res := lint.Run(args, lint.Options{SettingsFor: f.settingsFor, Exclude: f.exclude, MaxBytes: f.maxBytes, Workers: f.workers})
	stdout := cmd.OutOrStdout()
	if err := out(stdout, res); err != nil {
		return &exitError{2, err.Error()}
	}
	for _, e := range res.Errors {
		fmt.Fprintf(cmd.ErrOrStderr(), "datumlint: %s\n", e)
	}
	if len(res.Errors) > 0 {
		return &exitError{2, ""}
	}
	for _, d := range res.Diagnostics {
		if !d.Suppressed && d.Severity >= failOn {
			return &exitError{1, ""}
		}
	}
	return nil
}

// formats maps a --format name to its writer.
var formats = map[string]func(w io.Writer, res lint.Result) error{
	"text": writeText,
	"json": writeJSON,
}

func formatNames() []string {
	var out []string
	for _, n := range []string{"text", "json", "sarif", "github"} {
		if _, ok := formats[n]; ok {
			out = append(out, n)
		}
	}
	for n := range formats {
		known := false
		for _, o := range out {
			known = known || o == n
		}
		if !known {
			out = append(out, n)
		}
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

func readLines(path string) []string {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil
	}
	s := strings.TrimPrefix(string(b), "\ufeff")
	return strings.Split(strings.ReplaceAll(s, "\r\n", "\n"), "\n")
}
