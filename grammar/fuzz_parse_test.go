package grammar

import (
	"bytes"
	"fmt"
	"os"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/datumlint/datumlint/grammar/source"
)

// fileLines splits a file as positions count its lines.
func fileLines(src []byte) []string {
	return strings.Split(string(bytes.TrimPrefix(src, []byte("\xef\xbb\xbf"))), "\n")
}

// spanIn reports why sp is not a valid span of a file's lines: 1-based
// lines within the file, 1-based columns (characters) within their line or
// just past its end, and an end that does not come before the start.
func spanIn(lines []string, sp source.Span) error {
	valid := func(p source.Pos) bool {
		if p.Line < 1 || p.Line > len(lines) || p.Col < 1 {
			return false
		}
		return p.Col <= utf8.RuneCountInString(strings.TrimSuffix(lines[p.Line-1], "\r"))+1
	}
	// Something missing at the end of a line is shown as a one-character
	// span just past the line's last character (a caret after it), so an
	// end one further than the last column is valid there.
	atEnd := valid(sp.Start) && sp.End == source.Pos{Line: sp.Start.Line, Col: sp.Start.Col + 1} &&
		sp.Start.Col == utf8.RuneCountInString(strings.TrimSuffix(lines[sp.Start.Line-1], "\r"))+1
	switch {
	case !valid(sp.Start):
		return fmt.Errorf("start %v is outside the file (%d lines)", sp.Start, len(lines))
	case atEnd:
	case !valid(sp.End):
		return fmt.Errorf("end %v is outside the file (%d lines)", sp.End, len(lines))
	case sp.End.Before(sp.Start):
		return fmt.Errorf("end %v comes before start %v", sp.End, sp.Start)
	}
	return nil
}

// fuzzSeeds are hostile and odd inputs, besides the repository's test data.
var fuzzSeeds = []string{
	"", "\n", "\xef\xbb\xbf", "\xef\xbb\xbfunits mm\n", "units mm\r\nstandard iso\r\n", "\x00\x01\x02",
	"part \"\xff\xfe\"\n", "feature a plane normal +z at (0, 0, 1e309)\n", "basic 1e309 from a to b\n",
	"feature " + strings.Repeat("(", 200) + "\n", "frame a: position dia 0.1 datums " + strings.Repeat("A, ", 50) + "A\n",
	"composite dia 0.1\n", "frame a: flatness 0.1 \\\n\\\n\\\n", "\\", "#", "# datumlint: allow x --\n",
	"feature bolts hole 4x size 8.4 +-0.1 axis +z at (1,1,0)\n", "datum A on\n", "frame : :\n",
	"feature a plane normal (0, 0, 0) at (0, 0, 0)\n", "dim 1 +0.1 -0 (E) from a to b\n",
}

// FuzzParse: Parse never panics, and every syntax error and every
// statement has a position inside the file.
func FuzzParse(f *testing.F) {
	for _, s := range fuzzSeeds {
		f.Add([]byte(s))
	}
	for _, path := range testdataFiles(f) {
		if src, err := os.ReadFile(path); err == nil {
			f.Add(src)
		}
	}
	f.Fuzz(func(t *testing.T, src []byte) {
		checkParse(t, src)
	})
}

func checkParse(t *testing.T, src []byte) {
	t.Helper()
	file := Parse("fuzz.callouts", src)
	lines := fileLines(src)
	for _, e := range file.Errors {
		if e == nil {
			t.Fatal("a nil syntax error")
		}
		if err := spanIn(lines, e.Span); err != nil {
			t.Fatalf("syntax error %q: %v\ninput %q", e.Msg, err, src)
		}
		if strings.TrimSpace(e.Msg) == "" {
			t.Fatalf("a syntax error at %v without a message", e.Span)
		}
	}
	if len(file.Extents) != len(file.Stmts) {
		t.Fatalf("%d statements but %d extents", len(file.Stmts), len(file.Extents))
	}
	for i, st := range file.Stmts {
		x := file.Extents[i]
		if x.First < 1 || x.Last < x.First {
			t.Fatalf("statement %d spans lines %d-%d", i, x.First, x.Last)
		}
		if _, bad := st.(*BadStmt); !bad {
			if err := spanIn(lines, st.Span()); err != nil {
				t.Fatalf("statement %d (%s): %v\ninput %q", i, st.Keyword(), err, src)
			}
		}
	}
	for _, c := range file.Comments {
		if err := spanIn(lines, c.Span); err != nil {
			t.Fatalf("comment %q: %v", c.Text, err)
		}
	}
}

// TestParseHostileInputs runs the fuzz property over inputs too large to
// keep as seeds: they are built here, not committed.
func TestParseHostileInputs(t *testing.T) {
	for name, src := range map[string]string{
		"a 1 MB line":         "feature a plane normal +z at (0, 0, 0) " + strings.Repeat("x", 1<<20) + "\n",
		"100,000 parentheses": "feature a hole size 1 +-0.1 axis +z at " + strings.Repeat("(", 100000) + strings.Repeat(")", 100000) + "\n",
		"a 1 MB comment":      "units mm # " + strings.Repeat("é", 1<<19) + "\n",
		"a 1 MB string":       "part \"" + strings.Repeat("a", 1<<20) + "\"\n",
		"100,000 lines":       strings.Repeat("units mm\n", 100000),
		"NUL after 8000":      strings.Repeat("units mm\n", 1000) + "\x00\n",
	} {
		t.Run(name, func(t *testing.T) { checkParse(t, []byte(src)) })
	}
}
