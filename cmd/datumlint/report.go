package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"github.com/datumlint/datumlint/cmd/datumlint/internal/report"
	"github.com/datumlint/datumlint/rules/lint"
)

func newReportCmd() *cobra.Command {
	f := &runFlags{}
	var out string
	cmd := &cobra.Command{
		Use:   "report [PATH ...] -o DIR",
		Short: "Write a review report: one HTML page per part and an index",
		Long: `Check files and folders as check does, and write a review report into DIR: index.html,
listing every part with its findings, and one self-contained page per part (its frames
drawn, the degrees of freedom of each, material conditions, the inspection set-up of each
datum reference frame, views of the nominal geometry and the findings beside their
statements). A page is named after its file's stem, in the folders it was found in below
the path named on the command line; files that would share a page (a.callouts and a.qif in
one folder) are each named after the whole file name (a.callouts.html). Nothing is written
outside DIR; each page is written atomically.

The configuration, --fail-on and the exit status are those of check. Exit 0: no finding at
or above the failing severity; 1: findings; 2: a usage error, a path that could not be read
(the report is still written for the others), nothing found to report, or a page that could
not be written.`,
		RunE: func(cmd *cobra.Command, args []string) error {
			return runReport(cmd, f, out, args)
		},
	}
	fl := cmd.Flags()
	fl.StringVarP(&out, "output", "o", "", "the folder to write the report into (required)")
	f.register(fl)
	registerRunCompletions(cmd)
	if err := cmd.MarkFlagDirname("output"); err != nil {
		panic(err)
	}
	return cmd
}

func runReport(cmd *cobra.Command, f *runFlags, out string, args []string) error {
	if out == "" {
		return &exitError{2, "report needs an output folder: -o DIR"}
	}
	if len(args) == 0 {
		args = []string{"."}
	}
	_, opt, failOn, err := f.prepare(cmd, args)
	if err != nil {
		return &exitError{2, err.Error()}
	}
	opt.KeepParts = true
	res := lint.Run(args, opt)
	if len(res.Files) == 0 && len(res.Errors) == 0 {
		// Nothing to report: say so (exit 2) and write nothing.
		return runExit(cmd.ErrOrStderr(), &res, args, failOn, nil)
	}
	unread := map[string]bool{}
	for _, e := range res.Errors {
		unread[e.Path] = true
	}
	var files []report.File
	for _, lf := range res.Files {
		if unread[lf.Path] {
			continue // reported below; there is nothing to show
		}
		rf := report.File{Path: lf.Path, Root: lf.Root, Part: lf.Part, Findings: lf.Diagnostics}
		if lf.Source != nil {
			rf.Source = lf.Source.Src
		}
		files = append(files, rf)
	}
	if err := report.WriteSite(out, files); err != nil {
		return &exitError{2, fmt.Sprintf("cannot write the report: %v", err)}
	}
	return runExit(cmd.ErrOrStderr(), &res, args, failOn, nil)
}
