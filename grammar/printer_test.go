package grammar

import (
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// contractExample is the notation contract's complete example, as shipped
// in testdata/examples; it is canonical as written.
var contractExample = func() string {
	b, err := os.ReadFile(filepath.Join("..", "testdata", "examples", "mounting-plate.callouts"))
	if err != nil {
		panic(err)
	}
	return string(b)
}()

func format(t testing.TB, src string) string {
	t.Helper()
	f := Parse("t.callouts", []byte(src))
	out, err := Format(f)
	if err != nil {
		t.Fatalf("Format: %v\ninput:\n%s", err, src)
	}
	return string(out)
}

// Canonical input prints back unchanged: print(parse(x)) == x.
func TestFormatCanonicalIsFixed(t *testing.T) {
	canonical := []string{
		contractExample,
		"# only a comment\n",
		"",
		`# A header comment, then a blank line.

part "Ramp R-2" # the title
units in
standard iso

feature floor plane normal -z at (0, 0, 0)
feature ramp  plane normal (0, -0.5, 0.866) at (0, 0, 0)
feature slot  slot size 10 +0.05 -0 (E) normal +x at (40, 30, 20)
feature web   tab size 4 -0 -0.02 between floor ramp
feature balls ball 2x size 11.95..12.05 at (1, 2, 3) (4, 5, 6)
feature skin  surface at (0, 0, 0)

datum A  on floor
datum AB on slot  placed on-dimension-line
datum C  on balls placed on-frame

# datumlint: allow datum-unused -- kept for the fixture drawing
datum D on ramp

frame ramp: angularity 0.1 datums A
frame slot: position 0.2 (M) datums A, AB(L) # trailing
    # between the segments
    composite 0.1 (M) datums A
frame skin: surface-profile 0.4 (U) 0.1 datums A-AB, C(M)
frame balls.1: position sdia 0.3 (P) 12 datums A

basic 30deg from floor to ramp
basic 1.5   from floor to balls.1 along (1, 0, 0)
basic dia 80 through balls about AB
dim 40 +-0.1     from floor to slot along +x
dim 12.5 +0.1 -0 from floor to web
`,
		`# The extensions of the notation, canonical as written.
units mm
standard asme-2018
basis model

feature base plane normal -z at (0, 0, 0)
feature rear plane normal -y at (0, 0, 0)
feature e1   line along +z at (0, 0, 0)
feature tip  point at (1, 2, 3)
feature rim  circle size 25 axis +z at (60, 40, 0)
feature cb   hole size 6.6 +-0.1 cbore 11 +0.2 -0 depth 6.5 csink 13 angle 90deg axis -z at (20, 20, 10)
feature tap  hole 2x thread "M8x1.25-6H" axis -z at (10, 10, 0) (20, 10, 0)

target A1  point on base at (10, 10, 0) # a trailing comment
target A2  area dia 6 on base at (90, 10, 0)
# a comment inside a block
target A3  area 10x20 on base at (50, 70, 0) normal +z
target B12 line on rear from (0, 0, 5) to (80, 0, 5)

datum A on base
datum B on rear

frame base: flatness 0.005/25x25
frame e1: straightness 0.01/25
frame cb: position 0.1 along +x datums A, B
frame tap: position dia 0.2 (M) datums A, B(M)-A(M) major-dia separate
frame base: surface-profile 0.5 datums A, B all-around
    composite 0.1 datums A separate
frame rim: line-profile 0.5 datums A between tip e1

ref 60    from base to cb
ref 90deg from base to rear
ref size 25 of rim
`,
	}
	for i, src := range canonical {
		if got := format(t, src); got != src {
			t.Errorf("case %d: canonical input changed:\n%s", i, lineDiff(src, got))
		}
		// Saved with CR LF line ends, and with a byte-order mark, it is
		// canonical too: formatting keeps how the file is saved.
		crlf := strings.ReplaceAll(src, "\n", "\r\n")
		if got := format(t, crlf); got != crlf {
			t.Errorf("case %d with CR LF: canonical input changed:\n%q", i, got)
		}
		if got := format(t, "\ufeff"+crlf); src != "" && got != "\ufeff"+crlf {
			t.Errorf("case %d with a byte-order mark and CR LF: canonical input changed:\n%q", i, got)
		}
	}
}

// Each respelling and layout rule, one at a time.
func TestFormatRewrites(t *testing.T) {
	hdr := "units mm\nstandard asme-2018\n"
	cases := []struct{ name, in, want string }{
		{"symbols to words",
			"frame a: ⌖ ⌀ 0.1 Ⓜ datums A, B Ⓜ\nframe b: ⟂ 0.1 datums A\nframe c: ⌖ S⌀ 0.2 ( l ) datums A\n",
			"frame a: position dia 0.1 (M) datums A, B(M)\nframe b: perpendicularity 0.1 datums A\nframe c: position sdia 0.2 (L) datums A\n"},
		{"plus-minus and deviations",
			"feature h hole size 8 ± 0.1 axis +z at (0,0,0)\nfeature p pin size 8 +0.1/-0 axis +z at (0,0,0)\nfeature q pin size 8 +/- .1 (e) axis +z at (0,0,0)\n",
			"feature h hole size 8 +-0.1 axis +z at (0, 0, 0)\nfeature p pin size 8 +0.1 -0 axis +z at (0, 0, 0)\nfeature q pin size 8 +-.1 (E) axis +z at (0, 0, 0)\n"},
		{"limits and counts",
			"feature b ball 3 X size 11.95 .. 12.05 at (1,2,3) (4,5,6) (7,8,9)\n",
			"feature b ball 3x size 11.95..12.05 at (1, 2, 3) (4, 5, 6) (7, 8, 9)\n"},
		{"continuations joined",
			"feature a plane \\\n   normal -z \\\n   at (0, 0, 0)\nfeature bb plane normal +z at (0, 0, 1)\n",
			"feature a  plane normal -z at (0, 0, 0)\nfeature bb plane normal +z at (0, 0, 1)\n"},
		{"composite indented",
			"frame p: position dia 0.4 (M) datums A, B\ncomposite dia 0.1 (M) datums A\n",
			"frame p: position dia 0.4 (M) datums A, B\n    composite dia 0.1 (M) datums A\n"},
		{"composite on the frame's line",
			"frame p: position dia 0.4 (M) datums A, B composite dia 0.1 (M) datums A\n",
			"frame p: position dia 0.4 (M) datums A, B\n    composite dia 0.1 (M) datums A\n"},
		{"blank lines collapsed, leading and trailing dropped",
			"\n\n# c\n\n\n\nunits mm\n\n\n",
			"# c\n\nunits mm\n"},
		{"spaces and tabs",
			"basic\t 2.50   deg  from  a\tto b\n",
			"basic 2.50deg from a to b\n"},
		{"blocks end at a blank line or another kind",
			"datum A on a\ndatum BB on b\n\ndatum C on c\nbasic 1 from a to b\nbasic 100 from a to b\nframe x: flatness 1\nbasic 2 from a to b\n",
			"datum A  on a\ndatum BB on b\n\ndatum C on c\nbasic 1   from a to b\nbasic 100 from a to b\nframe x: flatness 1\nbasic 2 from a to b\n"},
		{"own-line comments do not end a block",
			"feature a plane normal +z at (0,0,0)\n# note\nfeature long plane normal +z at (0,0,1)\n",
			"feature a    plane normal +z at (0, 0, 0)\n# note\nfeature long plane normal +z at (0, 0, 1)\n"},
		{"trailing comments one space after the code",
			"basic 1 from a to b      # x   \nbasic 22 from a to b#y\n",
			"basic 1  from a to b # x\nbasic 22 from a to b #y\n"},
		{"second trailing comment of a joined statement goes above it",
			"# first\nfeature a plane normal -z \\ # on line one\n  at (0, 0, 0) # on line two\n",
			"# first\n# on line two\nfeature a plane normal -z at (0, 0, 0) # on line one\n"},
		{"comment closing a continuation stays after the statement",
			"basic 1 from a to b \\\n# closes\nbasic 2 from a to b\n",
			"basic 1 from a to b\n# closes\nbasic 2 from a to b\n"},
		{"bolt circle and along",
			"basic ⌀ 80 through bolts about A\nbasic 90 from bolts.1 to bolts.4 along (1,0,0)\n",
			"basic dia 80 through bolts about A\nbasic 90 from bolts.1 to bolts.4 along (1, 0, 0)\n"},
		{"a bolt circle does not pad the lengths around it, and ends their run",
			"basic 60 from left to bore\nbasic 5 from rear to bore\nbasic dia 110 through bolts about bore\nbasic 7.5 from left to bolts.1\nbasic 15 from rear to bolts.1\nbasic 90deg from bolts.1 to bolts.2 about bore\n",
			"basic 60 from left to bore\nbasic 5  from rear to bore\nbasic dia 110 through bolts about bore\nbasic 7.5   from left to bolts.1\nbasic 15    from rear to bolts.1\nbasic 90deg from bolts.1 to bolts.2 about bore\n"},
		{"bolt circles align among themselves",
			"basic dia 80 through inner about A\nbasic dia 110.5 through outer about A\n",
			"basic dia 80    through inner about A\nbasic dia 110.5 through outer about A\n"},
		{"extensions respelled",
			"frame a: flatness 0.005 / 25X25\nframe b: position 1 datums A, H (M) -X (L)\ntarget A1 area ⌀ 6 on b at (0,0,0)\n",
			"frame a: flatness 0.005/25x25\nframe b: position 1 datums A, H(M)-X(L)\ntarget A1 area dia 6 on b at (0, 0, 0)\n"},
		{"countersink angle and thread",
			"feature h hole size 6 thread  \"M8\" csink 12 angle 90 deg axis +z at (0,0,0)\n",
			"feature h hole size 6 thread \"M8\" csink 12 angle 90deg axis +z at (0, 0, 0)\n"},
		{"CRLF and a byte-order mark are kept",
			"\ufeffunits  mm\r\nstandard iso\r\n",
			"\ufeffunits mm\r\nstandard iso\r\n"},
		{"CRLF throughout when the first line ends so",
			"units mm\r\nstandard iso\n\n\n# c\r\nbasic 1 from a to b \\\r\n  along +x\r\n",
			"units mm\r\nstandard iso\r\n\r\n# c\r\nbasic 1 from a to b along +x\r\n"},
		{"LF when the first line ends so",
			"units mm\nstandard iso\r\n",
			"units mm\nstandard iso\n"},
		{"no final newline",
			"units mm",
			"units mm\n"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			in := c.in
			if !strings.Contains(in, "units") {
				in, c.want = hdr+in, hdr+c.want
			}
			got := format(t, in)
			if got != c.want {
				t.Errorf("input:\n%s\n%s", in, lineDiff(c.want, got))
			}
			if again := format(t, got); again != got {
				t.Errorf("not idempotent:\n%s", lineDiff(got, again))
			}
		})
	}
}

// A file that does not parse is refused, with the first error's position.
func TestFormatRefusesSyntaxErrors(t *testing.T) {
	for _, src := range []string{
		"units mm\nfeture a plane normal +z at (0, 0, 0)\n",
		"frame a: position dia 0.1 (Q) datums A\n",
		"composite dia 0.1\n",
		"units mm\x00\n",
	} {
		f := Parse("bad.callouts", []byte(src))
		out, err := Format(f)
		if err == nil {
			t.Errorf("Format accepted a file with syntax errors:\n%s\nprinted:\n%s", src, out)
			continue
		}
		if out != nil {
			t.Errorf("Format returned output with its error for %q", src)
		}
		if !strings.Contains(err.Error(), f.Errors[0].Span.Start.String()) {
			t.Errorf("error %q does not give the position %s", err, f.Errors[0].Span.Start)
		}
	}
	if _, err := Format(nil); err == nil {
		t.Error("Format(nil) gave no error")
	}
}

// Every .callouts file of the repository's test data: if it parses, its
// layout is idempotent and reparses cleanly to the same statements.
func TestFormatTestdata(t *testing.T) {
	files := testdataFiles(t)
	if len(files) == 0 {
		t.Fatal("no .callouts files found under testdata")
	}
	for _, path := range files {
		src, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		t.Run(filepath.ToSlash(path), func(t *testing.T) { checkFormat(t, src) })
	}
}

// checkFormat asserts the printer's properties on one input.
func checkFormat(t *testing.T, src []byte) {
	t.Helper()
	f := Parse("in.callouts", src)
	out, err := Format(f)
	if len(f.Errors) > 0 {
		if err == nil {
			t.Fatalf("a file with syntax errors was formatted")
		}
		return
	}
	if err != nil {
		t.Fatalf("Format: %v", err)
	}
	g := Parse("out.callouts", out)
	if len(g.Errors) > 0 {
		t.Fatalf("the formatted file does not parse: %v\ninput:\n%q\noutput:\n%s", g.Errors[0], src, out)
	}
	if len(g.Stmts) != len(f.Stmts) {
		t.Fatalf("%d statements became %d\ninput:\n%q\noutput:\n%s", len(f.Stmts), len(g.Stmts), src, out)
	}
	for i := range f.Stmts {
		if f.Stmts[i].Keyword() != g.Stmts[i].Keyword() {
			t.Fatalf("statement %d: %s became %s", i, f.Stmts[i].Keyword(), g.Stmts[i].Keyword())
		}
	}
	if n, m := countComments(f), countComments(g); n != m {
		t.Fatalf("%d comments became %d\ninput:\n%q\noutput:\n%s", n, m, src, out)
	}
	again, err := Format(g)
	if err != nil {
		t.Fatal(err)
	}
	if string(again) != string(out) {
		t.Fatalf("not idempotent\ninput:\n%q\n%s", src, lineDiff(string(out), string(again)))
	}
}

func countComments(f *File) int { return len(f.Comments) }

func FuzzFormat(f *testing.F) {
	f.Add([]byte(contractExample))
	for _, path := range testdataFiles(f) {
		if src, err := os.ReadFile(path); err == nil {
			f.Add(src)
		}
	}
	f.Add([]byte("frame p: ⌖ ⌀ 0.4 Ⓜ datums A, B ( m ) \\ # one\n  # two\n\ncomposite ⌀ 0.1 Ⓜ datums A # three\n"))
	f.Add([]byte("feature x pin 2 x size 1e-3 +- .5 (E) axis (0, 0, 1) at (1, 2, 3) (4, 5, 6) # a # b\n"))
	f.Fuzz(func(t *testing.T, src []byte) {
		checkFormat(t, src)
	})
}

// testdataFiles lists the .callouts files under the repository's test data.
func testdataFiles(t testing.TB) []string {
	var out []string
	for _, root := range []string{"testdata", "../testdata", "../rules/testdata", "../cmd/datumlint/testdata"} {
		filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
			if err == nil && !d.IsDir() && strings.HasSuffix(p, ".callouts") {
				out = append(out, p)
			}
			return nil
		})
	}
	return out
}

// lineDiff shows two texts line by line where they differ.
func lineDiff(want, got string) string {
	w, g := strings.Split(want, "\n"), strings.Split(got, "\n")
	var b strings.Builder
	for i := 0; i < len(w) || i < len(g); i++ {
		var a, c string
		if i < len(w) {
			a = w[i]
		}
		if i < len(g) {
			c = g[i]
		}
		mark := "  "
		if a != c || i >= len(w) || i >= len(g) {
			mark = "! "
		}
		b.WriteString(mark + "want: " + a + "\n" + mark + "got:  " + c + "\n")
	}
	return b.String()
}
