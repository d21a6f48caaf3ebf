package rules

import (
	"testing"

	"github.com/datumlint/datumlint/grammar"
)

// An allow comment naming only rules that the settings turn off cannot
// silence anything, and is not reported as unused: the configuration, not
// the file, is why nothing was found.
func TestAllowOfDisabledRuleNotUnused(t *testing.T) {
	src := []byte(`part "Test plate TP-1"
units mm
standard asme-2018
feature base plane normal -z at (0, 0, 0)
frame base: flatness 0.02  # datumlint: allow tolerance-value -- agreed with the supplier
`)
	count := func(s *Settings) int {
		n := 0
		for _, d := range Check(grammar.Read("t.callouts", src), s) {
			if d.Rule == AllowUnused.ID {
				n++
			}
		}
		return n
	}
	if n := count(nil); n != 1 {
		t.Fatalf("with default settings the allow silences nothing: want 1 allow-unused finding, got %d", n)
	}
	if n := count(&Settings{Severity: map[string]Severity{ToleranceValue.ID: Off}}); n != 0 {
		t.Errorf("with tolerance-value off: want no allow-unused finding, got %d", n)
	}
}
