package rules

import (
	"bytes"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/source"
)

// checkSeeds are hostile and odd inputs, besides the repository's test data.
var checkSeeds = []string{
	"", "\n", "\xef\xbb\xbf", "\xef\xbb\xbfunits mm\nstandard iso\n", "units mm\r\nstandard iso\r\nfeature a plane normal +z at (0,0,0)\r\n",
	"\x00\x01\x02", "part \"\xff\xfe\"\nunits mm\n", "units mm\nstandard iso\nfeature a plane normal +z at (0, 0, 1e309)\n",
	"units mm\nstandard asme-2018\nbasic 1e309 from a to b\n", "feature a hole size 1 +-0.1 axis +z at " + strings.Repeat("(", 300) + "\n",
	"units mm\nstandard iso\nfeature a plane normal +z at (0,0,0)\ndatum A on a\nframe a: flatness 0.1 datums " + strings.Repeat("A, ", 40) + "A\n",
	"units in\nstandard asme-2009\nfeature a plane normal (0, 0, 0) at (0, 0, 0)\ndatum A on a\nframe a: flatness 0\n",
	"units mm\nstandard iso\nfeature p pin 3x size 4 +-0.1 axis +z at (0,0,0) (0,0,0) (0,0,0)\ndatum A on p\nframe p: position dia 0.1 datums A\n",
	"# datumlint: allow nothing -- because\n# datumlint: allow syntax\nunits\n",
	"units mm\nstandard asme-2018\nfeature s slot size 10 +-0.1 between a b\nfeature a plane normal +y at (0,0,0)\nfeature b plane normal -y at (0,10,0)\n",
}

// testdataCallouts lists the .callouts files of the repository's test data.
func testdataCallouts(t testing.TB) []string {
	var out []string
	for _, root := range []string{"testdata", "../testdata", "../cmd/datumlint/testdata"} {
		filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
			if err == nil && !d.IsDir() && strings.HasSuffix(p, ".callouts") {
				out = append(out, p)
			}
			return nil
		})
	}
	return out
}

// FuzzCheck: a whole check never panics, reports no internal error, and
// every finding names a registered rule and a position inside the file.
func FuzzCheck(f *testing.F) {
	for _, s := range checkSeeds {
		f.Add([]byte(s))
	}
	for _, path := range testdataCallouts(f) {
		if src, err := os.ReadFile(path); err == nil {
			f.Add(src)
		}
	}
	f.Fuzz(func(t *testing.T, src []byte) {
		checkFindings(t, src)
	})
}

func checkFindings(t *testing.T, src []byte) {
	t.Helper()
	const name = "fuzz.callouts"
	ds := Check(grammar.Read(name, src), nil)
	lines := strings.Split(string(bytes.TrimPrefix(src, []byte("\xef\xbb\xbf"))), "\n")
	for _, d := range ds {
		where := fmt.Sprintf("%s %s %q\ninput %.400q", d.Span, d.Rule, d.Message, src)
		switch {
		case d.Rule == InternalRule:
			t.Fatalf("internal error: %s", where)
		case Lookup(d.Rule) == nil:
			t.Fatalf("finding of an unregistered rule: %s", where)
		case d.File != name:
			t.Fatalf("finding in file %q: %s", d.File, where)
		case d.Severity == Off:
			t.Fatalf("finding with no severity: %s", where)
		case strings.TrimSpace(d.Message) == "":
			t.Fatalf("finding without a message: %s", where)
		}
		if err := spanWithin(lines, d.Span); err != nil {
			t.Fatalf("%v: %s", err, where)
		}
	}
}

// spanWithin reports why sp is not a span of the file's lines: positions
// 1-based, within the file, columns (characters) within their line or just
// past its end, the end not before the start. Something missing at the end
// of a line is shown as a one-character span just past its last character.
func spanWithin(lines []string, sp source.Span) error {
	width := func(l int) int { return utf8.RuneCountInString(strings.TrimSuffix(lines[l-1], "\r")) }
	valid := func(p source.Pos) bool {
		return p.Line >= 1 && p.Line <= len(lines) && p.Col >= 1 && p.Col <= width(p.Line)+1
	}
	switch {
	case !valid(sp.Start):
		return fmt.Errorf("start %v outside the file (%d lines)", sp.Start, len(lines))
	case sp.Start.Col == width(sp.Start.Line)+1 && sp.End == source.Pos{Line: sp.Start.Line, Col: sp.Start.Col + 1}:
		return nil
	case !valid(sp.End):
		return fmt.Errorf("end %v outside the file", sp.End)
	case sp.End.Before(sp.Start):
		return fmt.Errorf("end %v before start %v", sp.End, sp.Start)
	}
	return nil
}
