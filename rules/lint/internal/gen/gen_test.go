package gen

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/longtest"
)

// TestPlatesAreClean is the generator's contract: a generated plate is a
// correct drawing, so every rule stays silent. A finding here means either
// the generator wrote a mistake or a rule fires on a clean part.
func TestPlatesAreClean(t *testing.T) {
	n := longtest.N(40, 200)
	for i := 0; i < n; i++ {
		src := Plate(i)
		for _, d := range rules.Check(grammar.Read("plate.callouts", src), nil) {
			t.Errorf("plate %d:%s: %s: %s\n%s", i, d.Span.Start, d.Rule, d.Message, lineOf(src, d.Span.Start.Line))
		}
	}
}

func TestRowIsClean(t *testing.T) {
	for _, n := range []int{2, 7, 40} {
		for _, d := range rules.Check(grammar.Read("row.callouts", Row(n)), nil) {
			t.Errorf("row of %d:%s: %s: %s", n, d.Span.Start, d.Rule, d.Message)
		}
	}
}

func lineOf(src []byte, n int) string {
	lines := strings.Split(string(src), "\n")
	if n < 1 || n > len(lines) {
		return ""
	}
	return lines[n-1]
}

func TestPlatesAreDeterministicAndVaried(t *testing.T) {
	if !bytes.Equal(Plate(7), Plate(7)) {
		t.Fatal("the same index gave two different plates")
	}
	if bytes.Equal(Plate(7), Plate(8)) {
		t.Fatal("two indexes gave the same plate")
	}
	total := 0
	for i := 0; i < 100; i++ {
		total += bytes.Count(Plate(i), []byte("\n"))
	}
	if avg := total / 100; avg < 120 || avg > 180 {
		t.Errorf("plates average %d lines; the benchmarks assume about 150", avg)
	}
}

func TestWrite(t *testing.T) {
	dir := t.TempDir()
	st, err := Write(dir, PerFolder+3)
	if err != nil {
		t.Fatal(err)
	}
	files, _ := filepath.Glob(filepath.Join(dir, "*", "*.callouts"))
	if st.Files != PerFolder+3 || len(files) != st.Files {
		t.Fatalf("wrote %d files, found %d on disk, want %d", st.Files, len(files), PerFolder+3)
	}
	got, err := os.ReadFile(filepath.Join(dir, "line-001", "plate-00051.callouts"))
	if err != nil || !bytes.Equal(got, Plate(51)) {
		t.Fatalf("plate 51 on disk differs from Plate(51) (err %v)", err)
	}
}

// TestShapesAreClean holds every shape to the generator's contract at a
// repository's size: no rule reports anything, at any severity.
func TestShapesAreClean(t *testing.T) {
	n := 60
	if testing.Short() {
		n = 15
	}
	for _, s := range Shapes {
		for i := range n {
			checkClean(t, fmt.Sprintf("%s part %d", s, i), Part(s, i, 0))
		}
	}
}

// TestLargePartsAreClean holds every shape to the same contract at the
// sizes the benchmarks measure (10,000 features is left to the benchmarks:
// a test that long would be run less).
func TestLargePartsAreClean(t *testing.T) {
	sizes := []int{250, 1000, 4000}
	if testing.Short() {
		sizes = []int{250}
	}
	for _, s := range Shapes {
		for _, n := range sizes {
			checkClean(t, fmt.Sprintf("%s part of %d", s, n), Part(s, 1, n))
		}
	}
}

func checkClean(t *testing.T, name string, src []byte) {
	t.Helper()
	for _, d := range rules.Check(grammar.Read("part.callouts", src), nil) {
		t.Errorf("%s:%s: %s: %s\n%s", name, d.Span.Start, d.Rule, d.Message, lineOf(src, d.Span.Start.Line))
	}
}

// TestShapesHaveTheirSize checks that a part asked for n located features
// has them: one position or located-profile frame per feature, counting a
// pattern's members.
func TestShapesHaveTheirSize(t *testing.T) {
	for _, s := range Shapes {
		for _, n := range []int{0, 37, 250} {
			src := Part(s, 3, n)
			got := locatedFeatures(t, src)
			switch {
			case n == 0 && s != ShapePlate && (got < 12 || got > 28):
				t.Errorf("%s at its own size: %d located features, want 12 to 28", s, got)
			case n > 0 && got != n:
				t.Errorf("%s asked for %d located features: %d", s, n, got)
			}
		}
		if !bytes.Equal(Part(s, 5, 40), Part(s, 5, 40)) || bytes.Equal(Part(s, 5, 40), Part(s, 6, 40)) {
			t.Errorf("%s: parts are not deterministic and varied", s)
		}
	}
}

// locatedFeatures counts the members of the features under position or
// located profile.
func locatedFeatures(t *testing.T, src []byte) int {
	t.Helper()
	p := grammar.Read("part.callouts", src)
	if len(p.Problems) > 0 {
		t.Fatalf("generated part does not resolve: %v", p.Problems[0])
	}
	n := 0
	for _, f := range p.Features {
		for _, fr := range p.FramesOn(f) {
			if fr.Located() {
				n += len(f.Members)
				break
			}
		}
	}
	return n
}

func TestParseShape(t *testing.T) {
	for _, s := range Shapes {
		if got, err := ParseShape(string(s)); err != nil || got != s {
			t.Errorf("ParseShape(%q) = %q, %v", s, got, err)
		}
	}
	if _, err := ParseShape("disc"); err == nil || !strings.Contains(err.Error(), "flange") {
		t.Errorf("ParseShape(disc): %v, want an error listing the shapes", err)
	}
}
