package main

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/rogpeppe/go-internal/diff"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/fix"
	"github.com/datumlint/datumlint/rules/lint"
)

// fixFlags are check's flags for suggested fixes.
type fixFlags struct {
	fix, all, diff bool
}

func (f fixFlags) on() bool { return f.fix || f.all }

// runFixes applies the suggested fixes to every file under args (safe ones,
// or all with --fix-all) before the check reports what remains. With
// --diff it prints what it would change and writes nothing. A file with a
// syntax finding is never written. It returns the fixed text of each file
// it changed, which with --diff stands in for the file in the check.
func runFixes(stdout, stderr io.Writer, f fixFlags, args []string, cfg *configSetup, maxBytes int64) (map[string][]byte, error) {
	files := lint.Collect(args, cfg.exclude).Files // unreadable paths are reported by the check
	fixed := map[string][]byte{}
	for _, path := range files {
		settings, err := cfg.settingsFor(path)
		if err != nil {
			continue // the check reports it
		}
		st, err := os.Stat(path)
		if err != nil || st.Size() > maxBytes {
			continue
		}
		src, err := os.ReadFile(path)
		if err != nil {
			continue
		}
		check := func(name string, src []byte) ([]rules.Diagnostic, *source.File) {
			part := lint.Read(name, src)
			return rules.Check(part, settings), part.Source
		}
		if !lint.Editable(path) {
			// Fixes are lines of the notation: a QIF file is never written.
			if ds, _ := check(path, src); hasFixes(ds) {
				fmt.Fprintf(stderr, "datumlint: %s: not fixed: datumlint never rewrites a QIF file (its fixes are written in the notation; `datumlint import` writes the part as a .callouts file to work on)\n", path)
			}
			continue
		}
		var canon func([]byte) ([]byte, bool)
		if lint.ReaderFor(path) == nil || strings.EqualFold(filepath.Ext(path), lint.Ext) {
			canon = canonical
		}
		res := fix.Run(path, src, check, f.all, canon)
		if res.Refused != "" && res.Applied == 0 {
			fmt.Fprintf(stderr, "datumlint: %s: not fixed: %s\n", path, res.Refused)
			continue
		}
		if res.Applied == 0 {
			continue
		}
		fixed[path] = res.Src
		if f.diff {
			name := filepath.ToSlash(path)
			stdout.Write(diff.Diff("a/"+name, src, "b/"+name, res.Src))
			continue
		}
		if err := writeAtomic(path, res.Src); err != nil {
			return nil, fmt.Errorf("%s: not rewritten: %v", path, err)
		}
		fmt.Fprintf(stderr, "datumlint: %s: %d %s applied\n", path, res.Applied, plural(res.Applied, "fix", "fixes"))
		if res.Refused != "" {
			fmt.Fprintf(stderr, "datumlint: %s: %s\n", path, res.Refused)
		}
	}
	return fixed, nil
}

// canonical gives a callouts file's canonical layout (what fmt writes), or
// false where it does not parse.
func canonical(src []byte) ([]byte, bool) {
	f := grammar.Parse("", src)
	if len(f.Errors) > 0 {
		return nil, false
	}
	out, err := grammar.Format(f)
	return out, err == nil
}

func hasFixes(ds []rules.Diagnostic) bool {
	for _, d := range ds {
		if len(d.Fixes) > 0 {
			return true
		}
	}
	return false
}

func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}
