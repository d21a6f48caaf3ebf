package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"github.com/rogpeppe/go-internal/diff"
	"github.com/spf13/cobra"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/lint"
)

type fmtFlags struct {
	write, check, diff bool
}

func newFmtCmd() *cobra.Command {
	f := &fmtFlags{}
	cmd := &cobra.Command{
		Use:   "fmt [PATH ...]",
		Short: "Print .callouts files in the canonical layout, or rewrite them with -w",
		Long: `Print .callouts files in the canonical layout: one statement per line (composite segments
on their own lines, indented), ASCII spellings, single spaces, the name and value columns of a
block aligned, comments where they were. Formatting never changes a file's findings.

Folders are walked for *.callouts (QIF files are left alone); with no PATH the current folder is used, and "-" reads
standard input. For one file, stdout is exactly its canonical text; for several, each is
preceded by a line "==> PATH <==" and followed by a blank line.

  -w       rewrite the files that change, atomically (temporary file and rename; mode and
           line ends kept)
  --check  list the files that would change, and exit 1 if there are any
  --diff   print a unified diff (a/PATH, b/PATH) of what would change

A file that does not parse is never rewritten: its syntax errors go to stderr with their
positions and the exit status is 1. Exit 2: a usage error or a path that could not be read.`,
		RunE: func(cmd *cobra.Command, args []string) error {
			return runFmt(cmd.OutOrStdout(), cmd.ErrOrStderr(), cmd.InOrStdin(), f, args)
		},
	}
	fl := cmd.Flags()
	fl.BoolVarP(&f.write, "write", "w", false, "rewrite files in place")
	fl.BoolVar(&f.check, "check", false, "list the files that are not in canonical layout and exit 1 if any")
	fl.BoolVar(&f.diff, "diff", false, "print a unified diff instead of the formatted text")
	return cmd
}

// fmtResult is the outcome for one input.
type fmtResult struct {
	path    string
	old     []byte
	new     []byte // nil when the file did not parse
	changed bool
}

func runFmt(stdout, stderr io.Writer, stdin io.Reader, f *fmtFlags, args []string) error {
	if f.write && f.check {
		return &exitError{2, "-w and --check do not go together: --check only reports, -w rewrites"}
	}
	if len(args) == 0 {
		args = []string{"."}
	}
	var paths []string
	useStdin := false
	for _, a := range args {
		if a == "-" {
			useStdin = true
			continue
		}
		paths = append(paths, a)
	}
	if useStdin && (f.write || len(paths) > 0) {
		return &exitError{2, `"-" (standard input) is formatted alone and cannot be rewritten with -w`}
	}

	code := 0
	fail := func(c int) { code = max(code, c) }
	var results []fmtResult
	if useStdin {
		src, err := io.ReadAll(io.LimitReader(stdin, lint.DefaultMaxBytes+1))
		if err != nil {
			return &exitError{2, "reading standard input: " + err.Error()}
		}
		if len(src) > lint.DefaultMaxBytes {
			return &exitError{2, fmt.Sprintf("standard input is over %d bytes; not formatted", lint.DefaultMaxBytes)}
		}
		r, ok := formatSource("<standard input>", src, stderr)
		if !ok {
			fail(1)
		}
		results = append(results, r)
	} else {
		found := lint.Collect(paths, nil)
		printWarnings(stderr, found.Warnings)
		for _, e := range found.Errors {
			fmt.Fprintf(stderr, "datumlint: %s\n", e)
			fail(2)
		}
		named := map[string]bool{}
		for _, p := range paths {
			named[filepath.Clean(p)] = true
		}
		for _, p := range found.Files {
			if !lint.Editable(p) {
				// fmt lays out the notation; a QIF file is never rewritten.
				if named[filepath.Clean(p)] {
					fmt.Fprintf(stderr, "datumlint: %s: a QIF document, not a callouts file: fmt lays out the notation (datumlint import writes a QIF document's part in it)\n", p)
					fail(2)
				}
				continue
			}
			src, err := readCallouts(p)
			if err != nil {
				fmt.Fprintf(stderr, "datumlint: %s: %v\n", p, err)
				fail(2)
				continue
			}
			r, ok := formatSource(p, src, stderr)
			if !ok {
				fail(1)
			}
			results = append(results, r)
		}
	}

	printing := !f.write && !f.check && !f.diff
	several := len(results) > 1
	for _, r := range results {
		if r.new == nil {
			continue
		}
		switch {
		case printing:
			if several {
				fmt.Fprintf(stdout, "==> %s <==\n", r.path)
			}
			stdout.Write(r.new)
			if several {
				fmt.Fprintln(stdout)
			}
			continue
		case !r.changed:
			continue
		}
		if f.check {
			fmt.Fprintln(stdout, r.path)
			fail(1)
		}
		if f.diff {
			name := filepath.ToSlash(r.path)
			stdout.Write(diff.Diff("a/"+name, r.old, "b/"+name, r.new))
		}
		if f.write {
			if err := writeAtomic(r.path, r.new); err != nil {
				fmt.Fprintf(stderr, "datumlint: %s: not rewritten: %v\n", r.path, err)
				fail(2)
			}
		}
	}
	if code != 0 {
		return &exitError{code, ""}
	}
	return nil
}

// formatSource parses and formats one input; on syntax errors it reports
// them (with positions) and returns ok == false and no new text.
func formatSource(path string, src []byte, stderr io.Writer) (fmtResult, bool) {
	r := fmtResult{path: path, old: src}
	file := grammar.Parse(path, src)
	// What check reports under the rule syntax: the parser's errors and the
	// values the model cannot read (a number out of range, unknown units).
	// The parser's errors come first; the model's are read only from a
	// file that parses.
	var errs []*model.Problem
	for _, e := range grammar.Resolve(file).Problems {
		if e.Kind == model.Syntax {
			errs = append(errs, e)
		}
	}
	if n := len(file.Errors); n > 0 {
		errs = errs[:n]
	}
	if len(errs) > 0 {
		for _, e := range errs {
			fmt.Fprintf(stderr, "%s:%d:%d: syntax: %s\n", path, e.Span.Start.Line, e.Span.Start.Col, e.Message)
		}
		fmt.Fprintf(stderr, "datumlint: %s does not parse; it was not formatted\n", path)
		return r, false
	}
	out, err := grammar.Format(file)
	if err != nil {
		fmt.Fprintf(stderr, "datumlint: %s: %v\n", path, err)
		return r, false
	}
	r.new, r.changed = out, !bytes.Equal(out, src)
	return r, true
}

func readCallouts(path string) ([]byte, error) {
	st, err := os.Stat(path)
	if err != nil {
		return nil, err
	}
	if st.Size() > lint.DefaultMaxBytes {
		return nil, fmt.Errorf("the file is %d bytes, over the size limit of %d bytes; not formatted", st.Size(), lint.DefaultMaxBytes)
	}
	return os.ReadFile(path)
}

// writeAtomic replaces path with data: a temporary file in the same folder
// (so the rename does not cross file systems) takes the data and the old
// file's mode, is synced, and is renamed over the old file. A reader sees
// the old file or the new one, never a part of either. A symbolic link is
// followed, so the link stays a link.
func writeAtomic(path string, data []byte) error {
	target, err := filepath.EvalSymlinks(path)
	if err != nil {
		return err
	}
	st, err := os.Stat(target)
	if err != nil {
		return err
	}
	if !st.Mode().IsRegular() {
		return errors.New("not a regular file")
	}
	return replaceFile(target, data, st.Mode().Perm())
}

// replaceFile writes data to a temporary file beside target with the mode
// perm, syncs it and renames it over target.
func replaceFile(target string, data []byte, perm os.FileMode) (err error) {
	tmp, err := os.CreateTemp(filepath.Dir(target), "."+filepath.Base(target)+".*.tmp")
	if err != nil {
		return err
	}
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmp.Name())
		}
	}()
	if err = tmp.Chmod(perm); err != nil {
		return err
	}
	if _, err = tmp.Write(data); err != nil {
		return err
	}
	if err = tmp.Sync(); err != nil {
		return err
	}
	if err = tmp.Close(); err != nil {
		return err
	}
	return os.Rename(tmp.Name(), target)
}
