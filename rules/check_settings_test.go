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

// A finding a rule reports below its default (Inform) stays at info: the
// configuration sets the level of the rule's other findings, lowers both,
// and turns the rule off, but never raises the advisory one.
func TestInformStaysBelowConfiguredSeverity(t *testing.T) {
	src := []byte(`units mm
standard asme-2018
feature base plane normal -z at (0, 0, 0)
feature top plane normal +z at (0, 0, 10)
feature rear plane normal -y at (0, 0, 0)
datum A on base
frame top: perpendicularity 0.05 datums A
frame rear: angularity 0.05 datums A
`)
	levels := func(s *Settings) map[int]Severity {
		out := map[int]Severity{}
		for _, d := range Check(grammar.Read("t.callouts", src), s) {
			if d.Rule == CharacteristicMismatch.ID {
				out[d.Span.Start.Line] = d.Severity
			}
		}
		return out
	}
	for _, c := range []struct {
		set         Severity // Off: the default
		wrong, info Severity // the lines 7 and 8 findings' levels; Off: none
	}{
		{Off, Error, Info},
		{Warning, Warning, Info},
		{Info, Info, Info},
	} {
		var s *Settings
		if c.set != Off {
			s = &Settings{Severity: map[string]Severity{CharacteristicMismatch.ID: c.set}}
		}
		got := levels(s)
		if got[7] != c.wrong || got[8] != c.info {
			t.Errorf("configured %v: want %v and %v, got %v and %v", c.set, c.wrong, c.info, got[7], got[8])
		}
	}
	if got := levels(&Settings{Severity: map[string]Severity{CharacteristicMismatch.ID: Off}}); len(got) != 0 {
		t.Errorf("rule off: want no findings, got %v", got)
	}
}
