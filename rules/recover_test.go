package rules

import (
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
)

// withRule registers r for the duration of a test. The registry is filled
// at init and only read afterwards, so tests that change it must not run in
// parallel with others (none in this package does).
func withRule(t *testing.T, r *Rule) {
	t.Helper()
	Register(r)
	t.Cleanup(func() { delete(registry, r.ID) })
}

// A rule that panics must not take the check down: the panic becomes an
// internal-error finding naming the rule and the file, and every other
// rule's findings are still reported.
func TestPanickingRuleIsReportedAndTheOthersStillRun(t *testing.T) {
	src := []byte("units mm\nstandard asme-2018\nfeature base plane normal -z at (0, 0, 0)\ndatum A on base\nframe base: flatness 0.02 datums A\n")
	t.Run("registered", func(t *testing.T) {
		withRule(t, &Rule{
			ID: "zz-test-panics", Summary: "panics", Rationale: "test only", Source: "test only",
			Bad: "x", Good: "x", Severity: Error,
			Run: func(p *Pass) {
				var m map[string]int
				m["boom"]++ // a nil-map write: a runtime panic, as a real bug would give
			},
		})
		ds := Check(grammar.Read("parts/plate.callouts", src), nil)
		var internal, others int
		for _, d := range ds {
			switch d.Rule {
			case InternalRule:
				internal++
				if !strings.Contains(d.Message, "zz-test-panics") || d.File != "parts/plate.callouts" {
					t.Errorf("the internal error does not name the rule and the file: %s: %s", d.File, d.Message)
				}
				if !strings.Contains(d.Message, "nil map") {
					t.Errorf("the internal error does not say what went wrong: %s", d.Message)
				}
				if d.Span.Start.Line != 1 || d.Span.Start.Col != 1 || d.Severity != Error {
					t.Errorf("internal error at %v, severity %v; want 1:1, error", d.Span.Start, d.Severity)
				}
			case DatumsForbidden.ID:
				others++
			}
		}
		if internal != 1 {
			t.Errorf("%d internal-error findings, want 1: %v", internal, ds)
		}
		if others != 1 {
			t.Errorf("the other rules did not all run: no datums-forbidden finding in %v", ds)
		}
	})
	// The test hook leaves nothing registered behind.
	if Lookup("zz-test-panics") != nil {
		t.Fatal("the panicking rule is still registered after its test")
	}
	for _, d := range Check(grammar.Read("parts/plate.callouts", src), nil) {
		if d.Rule == InternalRule {
			t.Errorf("an internal error after the rule was removed: %s", d.Message)
		}
	}
}

// An internal error cannot be silenced by an allow comment: it is about
// datumlint, not about the drawing.
func TestInternalErrorIsNotSuppressed(t *testing.T) {
	withRule(t, &Rule{
		ID: "zz-test-panics", Summary: "panics", Rationale: "test only", Source: "test only",
		Bad: "x", Good: "x", Severity: Error,
		Run: func(p *Pass) { panic("boom") },
	})
	src := []byte("# datumlint: allow internal-error zz-test-panics -- trying to hide it\nunits mm\nstandard iso\n")
	for _, d := range Check(grammar.Read("a.callouts", src), nil) {
		if d.Rule == InternalRule && d.Suppressed {
			t.Errorf("an internal error was suppressed: %s", d.Message)
		}
	}
}
