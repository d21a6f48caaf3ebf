package rules_test

import (
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/rules"
)

// applyEdits applies a fix's edits to src; edits at one place keep their
// order, as the Language Server Protocol has it.
func applyEdits(src []byte, edits []rules.Edit) []byte {
	f := source.NewFile("", src)
	type cut struct{ from, to int }
	cuts := make([]cut, len(edits))
	for i, e := range edits {
		cuts[i] = cut{f.Offset(e.Span.Start), f.Offset(e.Span.End)}
	}
	idx := make([]int, len(edits))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return cuts[idx[a]].from > cuts[idx[b]].from })
	out := append([]byte(nil), src...)
	// Edits at one offset are applied last first, so that the first ends up first.
	for k := 0; k < len(idx); {
		j := k
		for j < len(idx) && cuts[idx[j]].from == cuts[idx[k]].from {
			j++
		}
		for m := j - 1; m >= k; m-- {
			c, e := cuts[idx[m]], edits[idx[m]]
			out = append(out[:c.from], append([]byte(e.NewText), out[c.to:]...)...)
		}
		k = j
	}
	return out
}

var addRE = regexp.MustCompile("add `([^`]*)`")

// TestBasicMissingFix applies basic-missing's fix to every file that has
// the finding and checks the promise: each suggested quantity is then
// fixed (its suggestion is not made again), the file still parses, and no
// inserted value disagrees with the model.
func TestBasicMissingFix(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("testdata", "*.callouts"))
	srcs := map[string][]byte{"bad-example": []byte(exampleFile(rules.BasicMissing.Bad))}
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		srcs[f] = b
		// The same file with CR LF line ends and without its last line end.
		srcs[f+" (crlf, no final eol)"] = []byte(strings.TrimRight(strings.ReplaceAll(string(b), "\n", "\r\n"), "\r\n"))
	}
	fixed := 0
	for name, src := range srcs {
		before := rules.Check(grammar.Read(name, src), nil)
		had := map[string]bool{}
		for _, d := range before {
			had[d.Rule+"\x00"+d.Message] = true
		}
		for _, d := range before {
			if d.Rule != rules.BasicMissing.ID || d.Suppressed {
				continue
			}
			adds := addRE.FindAllStringSubmatch(d.Message, -1)
			if len(adds) == 0 {
				if len(d.Fixes) != 0 {
					t.Errorf("%s:%v: a fix on a finding that suggests nothing: %s", name, d.Span, d.Message)
				}
				continue
			}
			if len(d.Fixes) != 1 || len(d.Fixes[0].Edits) != len(adds) || !d.Fixes[0].Safe {
				t.Errorf("%s:%v: want one safe fix with %d edits, got %+v", name, d.Span, len(adds), d.Fixes)
				continue
			}
			out := applyEdits(src, d.Fixes[0].Edits)
			fixed++
			after := rules.Check(grammar.Read(name, out), nil)
			for _, a := range adds {
				if !regexp.MustCompile(`(^|\n)` + regexp.QuoteMeta(a[1]) + `(\r?\n|$)`).Match(out) {
					t.Errorf("%s: the fix did not insert %q on a line of its own:\n%s", name, a[1], out)
				}
				for _, n := range after {
					if n.Rule == rules.BasicMissing.ID && strings.Contains(n.Message, "`"+a[1]+"`") {
						t.Errorf("%s: after inserting %q it is still suggested: %s", name, a[1], n.Message)
					}
				}
			}
			for _, n := range after {
				if (n.Rule == rules.Syntax.ID || n.Rule == rules.BasicMismatch.ID) && !had[n.Rule+"\x00"+n.Message] {
					t.Errorf("%s: after the fix of %v: %s %s: %s\n%s", name, d.Span, n.Rule, n.Span, n.Message, out)
				}
			}
		}
	}
	if fixed < 4 {
		t.Fatalf("only %d basic-missing findings with a fix were tried", fixed)
	}
}

// TestBasicMissingFixPlace checks where the lines go: below the feature's
// other basic lines, else below its frames (composite lines included).
func TestBasicMissingFixPlace(t *testing.T) {
	head := "units mm\nstandard asme-2018\nfeature base plane normal -z at (0, 0, 0)\nfeature rear plane normal -y at (0, 0, 0)\nfeature left plane normal -x at (0, 0, 0)\n" +
		"feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)\ndatum A on base\ndatum B on rear\ndatum C on left\n"
	cases := []struct{ in, want string }{
		{
			in:   head + "frame bore: position dia 0.1 (M) datums A, B, C\n\nbasic 40 from rear to bore\n# the end\n",
			want: head + "frame bore: position dia 0.1 (M) datums A, B, C\n\nbasic 40 from rear to bore\nbasic 60 from left to bore\n# the end\n",
		},
		{
			in:   head + "frame bore: position dia 0.1 (M) datums A, B, C\n    composite dia 0.05 datums A\nframe base: flatness 0.1",
			want: head + "frame bore: position dia 0.1 (M) datums A, B, C\n    composite dia 0.05 datums A\nbasic 60 from left to bore\nbasic 40 from rear to bore\nframe base: flatness 0.1",
		},
		{
			in:   head + "frame bore: position dia 0.1 (M) datums A, B, C",
			want: head + "frame bore: position dia 0.1 (M) datums A, B, C\nbasic 60 from left to bore\nbasic 40 from rear to bore",
		},
	}
	for i, c := range cases {
		var got string
		for _, d := range rules.Check(grammar.Read("x.callouts", []byte(c.in)), nil) {
			if d.Rule == rules.BasicMissing.ID && len(d.Fixes) == 1 {
				got = string(applyEdits([]byte(c.in), d.Fixes[0].Edits))
			}
		}
		if got != c.want {
			t.Errorf("case %d: got\n%s\nwant\n%s", i, got, c.want)
		}
	}
}
