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
	format    string
	color     string
	stdinName string
	quiet     bool
	fixes     fixFlags
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

// prepare works out a run from the flags and the paths its configuration
// is found from: the configuration (--config or the files found above the
// paths, with --enable and --disable), the failing severity (--fail-on,
// else the configuration's, else warning) and the options of lint.Run.
// Errors are usage errors (exit 2).
func (f *runFlags) prepare(cmd *cobra.Command, configArgs []string) (*configSetup, lint.Options, rules.Severity, error) {
	cfg, err := loadConfig(f.config, f.over, configArgs)
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
	if f.maxBytes <= 0 {
		return nil, lint.Options{}, 0, fmt.Errorf("--max-bytes takes a number of bytes above 0, not %d", f.maxBytes)
	}
	if f.workers < 0 {
		return nil, lint.Options{}, 0, fmt.Errorf("--workers takes 0 (one per core) or more, not %d", f.workers)
	}
	if cfg.maxBytes > 0 && !cmd.Flags().Changed("max-bytes") {
		f.maxBytes = cfg.maxBytes
	}
	opt := lint.Options{SettingsFor: cfg.settingsFor, Exclude: cfg.exclude, MaxBytes: f.maxBytes, Workers: f.workers}
	return cfg, opt, failOn, nil
}

// runExit prints a run's warnings and unreadable paths on stderr and
// works out its exit: 2 when nothing was found to check or a path could
// not be read, else 1 when an unsuppressed finding is at or above failOn,
// else nil. after, when set, runs once the paths are printed and before
// the exit is decided, unless nothing was found (check's summary line).
func runExit(stderr io.Writer, res *lint.Result, args []string, failOn rules.Severity, after func()) error {
	printWarnings(stderr, res.Warnings)
	for _, e := range res.Errors {
		printError(stderr, e.Path+": ", e.Err)
	}
	if len(res.Files) == 0 && len(res.Errors) == 0 {
		return &exitError{2, nothingFound(args, res.Excluded)}
	}
	if after != nil {
		after()
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

// stdinDefault names standard input in findings when --stdin-name is not
// given.
const stdinDefault = "<standard input>"

func newCheckCmd() *cobra.Command {
	f := &checkFlags{}
	cmd := &cobra.Command{
		Use:   "check [PATH ...]",
		Short: "Check .callouts and .qif files and folders (folders are walked for both)",
		Long: `Check .callouts files, QIF 3 documents (.qif, in any case) and folders of them. Exit 0: no
finding at or above the failing severity; 1: findings; 2: a usage error, a path that could not
be read (the other paths are still checked), or nothing found to check. With no PATH, the
current folder is checked; "-" reads standard input (--stdin-name names it). After a text run
a one-line summary goes to stderr (--quiet leaves it out). Findings on a QIF file point at its
XML elements and carry no fixes; --fix never writes one.`,
		RunE: func(cmd *cobra.Command, args []string) error {
			return runCheck(cmd, f, args)
		},
	}
	fl := cmd.Flags()
	fl.StringVar(&f.format, "format", "text", "output format: "+strings.Join(formatNames(), ", "))
	fl.StringVar(&f.color, "color", "auto", "colour the text output: auto (on a terminal, unless NO_COLOR is set), always or never")
	fl.StringVar(&f.stdinName, "stdin-name", "", `with "-": the path standard input stands for (its configuration, reader and the name in findings)`)
	fl.BoolVarP(&f.quiet, "quiet", "q", false, "no summary line on stderr after a text run")
	f.runFlags.register(fl)
	fl.BoolVar(&f.fixes.fix, "fix", false, "apply the safe suggested fixes in place, then report what remains")
	fl.BoolVar(&f.fixes.all, "fix-all", false, "apply every suggested fix, also those that change what the drawing says and need review")
	fl.BoolVar(&f.fixes.diff, "diff", false, "with --fix or --fix-all: print the fixes as a unified diff and write nothing")
	registerCheckCompletions(cmd)
	return cmd
}

func runCheck(cmd *cobra.Command, f *checkFlags, args []string) error {
	if len(args) == 0 {
		args = []string{"."}
	}
	useStdin := false
	for _, a := range args {
		useStdin = useStdin || a == "-"
	}
	if useStdin && len(args) > 1 {
		return &exitError{2, `"-" (standard input) is checked alone: name no other path with it`}
	}
	if f.stdinName != "" && !useStdin {
		return &exitError{2, `--stdin-name names standard input: use it with "-"`}
	}
	name := f.stdinName
	if name == "" {
		name = stdinDefault
	}
	configArgs := args
	if useStdin {
		// The configuration is found from the folder of the path standard
		// input stands for (the current folder without --stdin-name).
		configArgs = []string{"."}
		if f.stdinName != "" {
			configArgs = []string{f.stdinName}
		}
	}
	cfg, opt, failOn, err := f.prepare(cmd, configArgs)
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
	if f.fixes.on() && useStdin {
		return &exitError{2, `"-" (standard input) cannot be fixed in place: fix the file itself`}
	}
	stdout, stderr := cmd.OutOrStdout(), cmd.ErrOrStderr()
	if f.fixes.on() {
		fixed, err := runFixes(stdout, stderr, f.fixes, args, cfg, f.maxBytes)
		if err != nil {
			return &exitError{2, err.Error()}
		}
		if f.fixes.diff {
			// Nothing was written: the exit code tells what would remain.
			opt.Override = fixed
			out = func(io.Writer, *lint.Result) error { return nil }
		}
	}
	var res lint.Result
	if useStdin {
		res = lint.RunReader(name, cmd.InOrStdin(), opt)
	} else {
		res = lint.Run(args, opt)
	}
	if err := out(stdout, &res); err != nil {
		return &exitError{2, err.Error()}
	}
	return runExit(stderr, &res, args, failOn, func() {
		if f.format == "text" && !f.quiet {
			fmt.Fprintln(stderr, summary(&res))
		}
	})
}

// nothingFound says why a run checked no file.
func nothingFound(args []string, excluded int) string {
	exts := lint.Exts()
	for i, e := range exts {
		exts[i] = "*" + e
	}
	msg := fmt.Sprintf("no file to check: no %s file found in %s", strings.Join(exts, " or "), strings.Join(args, ", "))
	if excluded > 0 {
		files := "files"
		if excluded == 1 {
			files = "file"
		}
		msg = fmt.Sprintf("no file to check: the %d %s found in %s are excluded by the configuration's exclude globs (a file named on the command line is always checked)",
			excluded, files, strings.Join(args, ", "))
		if excluded == 1 {
			msg = strings.Replace(msg, " are excluded", " is excluded", 1)
		}
	}
	return msg
}

// summary is the line that ends a text run: the files checked and the
// findings by severity (suppressed ones counted apart).
func summary(res *lint.Result) string {
	count := map[rules.Severity]int{}
	suppressed := 0
	for _, d := range res.Diagnostics() {
		if d.Suppressed {
			suppressed++
		} else {
			count[d.Severity]++
		}
	}
	var parts []string
	for _, sev := range []rules.Severity{rules.Error, rules.Warning, rules.Info} {
		if n := count[sev]; n > 0 {
			word := sev.String()
			if n > 1 && sev != rules.Info {
				word += "s"
			}
			parts = append(parts, fmt.Sprintf("%d %s", n, word))
		}
	}
	found := "no findings"
	if len(parts) > 0 {
		found = strings.Join(parts, ", ")
	}
	if suppressed > 0 {
		found += fmt.Sprintf(" (%d suppressed)", suppressed)
	}
	files := "files"
	if len(res.Files) == 1 {
		files = "file"
	}
	return fmt.Sprintf("%d %s checked: %s", len(res.Files), files, found)
}

// printWarnings prints what a run found suspicious but did not stop for.
func printWarnings(w io.Writer, ws []*lint.PathError) {
	for _, e := range ws {
		printError(w, "warning: "+e.Path+": ", e.Err)
	}
}

// printError prints an error on stderr as "datumlint: PREFIX message", one
// line per line of the message (a configuration gives all its mistakes at
// once).
func printError(w io.Writer, prefix string, err error) {
	for _, l := range strings.Split(err.Error(), "\n") {
		fmt.Fprintf(w, "datumlint: %s%s\n", prefix, l)
	}
}

// outputFormat writes a run's results in one --format.
type outputFormat struct {
	name  string
	write func(w io.Writer, res *lint.Result) error
	help  string // for shell completion
}

// formats lists the output formats, in the order help and errors name them.
var formats = []outputFormat{
	{"text", writeText, "one block per finding with the source line (the default)"},
	{"json", writeJSON, "a JSON array of findings"},
	{"sarif", writeSARIF, "a SARIF 2.1.0 log, for code scanning"},
	{"github", writeGitHub, "GitHub Actions annotations"},
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
