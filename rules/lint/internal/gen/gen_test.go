package gen

import (
	"bytes"
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
