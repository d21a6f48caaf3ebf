package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"github.com/spf13/cobra"

	"github.com/datumlint/datumlint/cmd/datumlint/internal/qifimport"
	"github.com/datumlint/datumlint/grammar/qif"
	"github.com/datumlint/datumlint/rules/lint"
)

func newImportCmd() *cobra.Command {
	var out string
	var maxBytes int64
	cmd := &cobra.Command{
		Use:   "import FILE.qif [-o OUT.callouts]",
		Short: "Write a QIF 3 document's part in the callout notation",
		Long: `Write the part of a QIF 3 document (a model-based definition exported by a CAD system) in
the callout notation: its features (like features under one characteristic as a pattern),
datums, feature control frames and dimensions, named from the QIF names where they are valid
and unique, otherwise from the feature's kind and QIF id, each with a comment giving the QIF
ids it comes from, under 'basis model' (in a model every nominal location and angle is basic).
What the document says that the notation cannot carry is listed as comments at the end
(check on the QIF file reports each).

The file written, checked, gives the findings that checking the QIF file gives, except the
findings about the QIF document as such (qif-unsupported, qif-inconsistent).

  -o OUT   write OUT (atomically: a temporary file renamed into place); without -o the file
           goes to standard output and nothing is written to disk

Exit 0: written; 1: the document was refused (not XML, not QIF 3.x, truncated, over a limit:
the error gives its position); 2: a usage error or a file that could not be read or written.`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			return runImport(cmd.OutOrStdout(), cmd.ErrOrStderr(), args[0], out, maxBytes)
		},
	}
	cmd.Flags().StringVarP(&out, "output", "o", "", "write the notation to this file instead of standard output")
	cmd.Flags().Int64Var(&maxBytes, "max-bytes", lint.DefaultMaxBytes, "largest file read, in bytes")
	return cmd
}

func runImport(stdout, stderr io.Writer, path, out string, maxBytes int64) error {
	if maxBytes <= 0 {
		return &exitError{2, fmt.Sprintf("--max-bytes takes a number of bytes above 0, not %d", maxBytes)}
	}
	if !lint.IsQIF(path) {
		return &exitError{2, fmt.Sprintf("%s: import reads QIF documents (.qif)", path)}
	}
	st, err := os.Stat(path)
	switch {
	case err != nil:
		return &exitError{2, fmt.Sprintf("%s: %v", path, friendly(err))}
	case !st.Mode().IsRegular():
		return &exitError{2, fmt.Sprintf("%s: not a regular file", path)}
	case st.Size() > maxBytes:
		return &exitError{2, fmt.Sprintf("%s: the file is %d bytes, over the size limit of %d bytes (raise it with --max-bytes)", path, st.Size(), maxBytes)}
	}
	if out != "" && sameFile(path, out) {
		return &exitError{2, fmt.Sprintf("-o %s would overwrite the QIF document it reads: name another file", out)}
	}
	src, err := os.ReadFile(path)
	if err != nil {
		return &exitError{2, fmt.Sprintf("%s: %v", path, friendly(err))}
	}
	text, err := qifimport.Import(path, src)
	if err != nil {
		var e *qif.Error
		if errors.As(err, &e) {
			fmt.Fprintf(stderr, "%s:%d:%d: error syntax: %s\n", path, e.Span.Start.Line, e.Span.Start.Col, e.Msg)
			return &exitError{1, fmt.Sprintf("%s: not imported", path)}
		}
		return &exitError{2, fmt.Sprintf("%s: %v", path, err)}
	}
	if out == "" {
		_, err := stdout.Write(text)
		return err
	}
	if err := writeFileAtomic(out, text); err != nil {
		return &exitError{2, fmt.Sprintf("%s: not written: %v", out, err)}
	}
	return nil
}

func friendly(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		err = pe.Err
	}
	switch {
	case errors.Is(err, os.ErrNotExist):
		return errors.New("no such file")
	case errors.Is(err, os.ErrPermission):
		return errors.New("permission denied")
	}
	return err
}

// sameFile reports whether two paths name one file (out need not exist).
func sameFile(a, b string) bool {
	sa, err1 := os.Stat(a)
	sb, err2 := os.Stat(b)
	if err1 == nil && err2 == nil {
		return os.SameFile(sa, sb)
	}
	ca, _ := filepath.Abs(a)
	cb, _ := filepath.Abs(b)
	return ca == cb
}

// writeFileAtomic writes a file through a temporary file in its folder
// and a rename, so that a reader never sees it half written: an existing
// file keeps its mode (writeAtomic), a new one is made 0644.
func writeFileAtomic(path string, data []byte) error {
	if _, err := os.Lstat(path); err == nil {
		return writeAtomic(path, data)
	}
	return replaceFile(path, data, 0o644)
}
