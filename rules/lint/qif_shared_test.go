package lint

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/lint/internal/gen"
)

// Where characteristics share one datum reference frame (FTC 06's
// nominals repeated, each copy on the frames of the original), a finding
// about one frame's use of a datum is that frame's: the document checks to
// as many findings as the same frames written in the notation, one
// statement each, instead of merging them on the shared element.
func TestSharedDatumFrameFindingsPerFrame(t *testing.T) {
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "qif", "nist", "nist_ftc_06_asme1_ap242.qif"))
	if err != nil {
		t.Fatal(err)
	}
	doc := []byte(gen.QIFFeatures(string(src), 1<<20))
	part := Read("repeated.qif", doc)
	written, err := grammar.Format(grammar.FromModel(part, grammar.Notes{}))
	if err != nil {
		t.Fatal(err)
	}
	count := func(ds []rules.Diagnostic) map[string]int {
		n := map[string]int{}
		for _, d := range ds {
			n[d.Rule]++
		}
		return n
	}
	q := count(rules.Check(part, nil))
	c := count(rules.Check(Read("repeated.callouts", written), nil))
	if q["datum-unneeded"] < 4 {
		t.Fatalf("only %d datum-unneeded findings on the repeated frames", q["datum-unneeded"])
	}
	for _, r := range []string{"datum-unneeded", "datum-unqualified", "basic-toleranced", "modifier-illegal", "datum-redundant"} {
		if q[r] != c[r] {
			t.Errorf("%s: %d in the QIF document, %d in the notation", r, q[r], c[r])
		}
	}
}
