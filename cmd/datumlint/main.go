// Command datumlint checks the geometric tolerancing of parts written in
// the callout notation. The commands are thin: each file here parses flags
// and hands the work to grammar/, rules/ and rules/lint.
package main

import (
	"errors"
	"io"
	"os"

	"github.com/spf13/cobra"
)

// version is set at build time with -ldflags "-X main.version=...".
var version = "0.1.0-dev"

// exitError carries an exit code out of a command.
type exitError struct {
	code int
	msg  string
}

func (e *exitError) Error() string { return e.msg }

func newRoot(stdout, stderr io.Writer) *cobra.Command {
	root := &cobra.Command{
		Use:   "datumlint",
		Short: "Check the geometric tolerancing of a part before the drawing is released",
		Long: `datumlint reads .callouts files (feature control frames, datum feature symbols and basic
dimensions in a plain-text notation) and QIF 3 documents (.qif, model-based definitions), builds
a model of the part's nominal geometry and checks it against ASME Y14.5 or ISO GPS practice.

datumlint advises; it does not certify. The governing standard edition, the drawing's own
notes, local codes and qualified engineering judgement decide.`,
		Version:       version,
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	root.SetOut(stdout)
	root.SetErr(stderr)
	root.AddCommand(newCheckCmd(), newReportCmd(), newDofCmd(), newFmtCmd(), newImportCmd(), newRulesCmd(), newExplainCmd(), newLSPCmd())
	return root
}

func run(args []string, stdout, stderr io.Writer) int {
	root := newRoot(stdout, stderr)
	root.SetArgs(args)
	err := root.Execute()
	if err == nil {
		return 0
	}
	var ee *exitError
	if errors.As(err, &ee) {
		if ee.msg != "" {
			printError(stderr, "", ee)
		}
		return ee.code
	}
	printError(stderr, "", err)
	return 2
}

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}
