package grammar_test

import (
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/rules"
)

// The findings of a file do not change under formatting: the same rules
// fire on the same statements (counted by index, since lines move), and the
// same ones are silenced by allow comments.
func TestFormatKeepsFindings(t *testing.T) {
	inputs := map[string]string{
		// allow comments above, at the end of, and inside joined statements;
		// one that applies to nothing because of a blank line; one between a
		// frame and its composite (applies to nothing either).
		"suppressions": `part "Bracket BR-7"
units mm
standard asme-2018

feature base plane normal -z at (0,0,0)
feature rear plane normal -y at (0,0,0)
# datumlint: allow datum-unused -- the fixture drawing references it
datum A on base
datum B on rear  # datumlint: allow datum-unused -- trailing form

# datumlint: allow datum-letter -- a blank line follows, so this applies to nothing

datum O on base
datum Q on \
  rear # datumlint: allow datum-letter -- on the continuation line
frame rear: ⌖ 0.1 datums A, \
   B # a plain note
  # datumlint: allow composite-invalid -- between the segments
composite 0.05 datums B
frame base: ⏥ 0.02 datums A # datumlint: allow datums-forbidden -- first \
`,
		"unknown kind and words": "part \"x\"\nunits mm\nstandard iso\nfeature a ⌀ normal +z at (0,0,0)\nframe a: ⌀ 0.1\n",
	}
	for _, path := range fileList(t) {
		b, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		inputs[path] = string(b)
	}
	for name, src := range inputs {
		t.Run(name, func(t *testing.T) {
			f := grammar.Parse("a.callouts", []byte(src))
			if len(f.Errors) > 0 {
				return // not formatted; the command leaves it alone
			}
			out, err := grammar.Format(f)
			if err != nil {
				t.Fatal(err)
			}
			g := grammar.Parse("a.callouts", out)
			before := findings(f, rules.Check(grammar.Read("a.callouts", []byte(src)), nil))
			after := findings(g, rules.Check(grammar.Read("a.callouts", out), nil))
			if name == "suppressions" && !strings.Contains(strings.Join(before, "\n"), "suppressed=true") {
				t.Errorf("the suppression case silences nothing, so it tests nothing:\n  %s", strings.Join(before, "\n  "))
			}
			if strings.Join(before, "\n") != strings.Join(after, "\n") {
				t.Errorf("findings changed under formatting\nbefore:\n  %s\nafter:\n  %s\nformatted:\n%s",
					strings.Join(before, "\n  "), strings.Join(after, "\n  "), out)
			}
		})
	}
}

// findings lists each finding as rule, statement index (or "comment" for a
// finding on a comment line) and whether it is silenced, sorted.
func findings(f *grammar.File, ds []rules.Diagnostic) []string {
	var out []string
	for _, d := range ds {
		where := "comment"
		for i, e := range f.Extents {
			if e.First <= d.Span.Start.Line && d.Span.Start.Line <= e.Last {
				where = fmt.Sprintf("statement %d (%s)", i, f.Stmts[i].Keyword())
			}
		}
		out = append(out, fmt.Sprintf("%s on %s suppressed=%v", d.Rule, where, d.Suppressed))
	}
	sort.Strings(out)
	return out
}

func fileList(t testing.TB) []string {
	var out []string
	for _, root := range []string{"testdata", "../testdata", "../rules/testdata", "../cmd/datumlint/testdata"} {
		filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
			if err == nil && !d.IsDir() && strings.HasSuffix(p, ".callouts") {
				out = append(out, p)
			}
			return nil
		})
	}
	if len(out) == 0 {
		t.Fatal("no .callouts files found under testdata")
	}
	return out
}

// FuzzFormatFindings: for any input that parses, formatting keeps the
// findings (rule, statement, silenced or not).
func FuzzFormatFindings(f *testing.F) {
	for _, path := range fileList(f) {
		if src, err := os.ReadFile(path); err == nil {
			f.Add(src)
		}
	}
	f.Fuzz(func(t *testing.T, src []byte) {
		g := grammar.Parse("a.callouts", src)
		if len(g.Errors) > 0 {
			return
		}
		out, err := grammar.Format(g)
		if err != nil {
			t.Fatal(err)
		}
		before := findings(g, rules.Check(grammar.Read("a.callouts", src), nil))
		after := findings(grammar.Parse("a.callouts", out), rules.Check(grammar.Read("a.callouts", out), nil))
		if strings.Join(before, "\n") != strings.Join(after, "\n") {
			t.Errorf("findings changed under formatting\nbefore:\n  %s\nafter:\n  %s\ninput:\n%q\nformatted:\n%s",
				strings.Join(before, "\n  "), strings.Join(after, "\n  "), src, out)
		}
	})
}
