package rules_test

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/rules"
)

// TestNISTCallouts checks the three NIST PMI test models (public test
// data), written by hand in the notation, with every rule, against the
// triage written beside each finding that stays (`# want`): real issues of
// the models, and the false positives another issue corrects. A finding
// that appears or goes away fails the test, so that the triage is kept.
func TestNISTCallouts(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("..", "testdata", "qif", "nist-callouts", "*.callouts"))
	if err != nil {
		t.Fatal(err)
	}
	if len(files) != 3 {
		t.Fatalf("%d NIST models in the notation, want 3", len(files))
	}
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			src, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			part := grammar.Read(f, src)
			if len(part.Problems) > 0 {
				t.Fatalf("%s does not read: %v", f, part.Problems[0])
			}
			checkWants(t, f, src, rules.Check(part, nil))
		})
	}
}
