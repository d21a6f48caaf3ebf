package grammar

import (
	"strings"
	"testing"
)

// The commonest slips each get a message that names the slip and says what
// to write, with the drafter's own values; and writing what it says
// parses: the fixed statement holds the message's suggestion (says) and
// has no syntax error, in either parser.
func TestSlipMessagesAreKeptPromises(t *testing.T) {
	for _, c := range []struct {
		bad, pos, want, says, fixed string
	}{
		{"frame rear: perpendicularity 0.05 datums A B C", "1:44", "separate the datum references with commas", "datums A, B, C",
			"frame rear: perpendicularity 0.05 datums A, B, C"},
		{"frame rear: position dia 0.1 (M) datums A B(M) C", "1:43", "separate the datum references with commas", "datums A, B(M), C",
			"frame rear: position dia 0.1 (M) datums A, B(M), C"},
		{"frame rear: position dia 0.1 datums A, B C", "1:42", "separate the datum references with commas", "datums A, B, C",
			"frame rear: position dia 0.1 datums A, B, C"},
		{"frame left: perpendicularity 0.05 datum A, B", "1:35", "did you mean 'datums'?", "datums A, B",
			"frame left: perpendicularity 0.05 datums A, B"},
		{"frame left: perpendicularity 0.05 datum A", "1:35", "did you mean 'datums'?", "datums A",
			"frame left: perpendicularity 0.05 datums A"},
		{"frame base: flatness 0,1", "1:22", "write decimals with a point", "0.1", "frame base: flatness 0.1"},
		{"frame bore: position dia 0,25 (M) datums A", "1:26", "write decimals with a point", "0.25", "frame bore: position dia 0.25 (M) datums A"},
		{"basic 12,5 from left to bore", "1:7", "write decimals with a point", "12.5", "basic 12.5 from left to bore"},
		{"feature bore hole size 6 +0.012 axis +z at (60, 40, 0)", "1:24", "the lower deviation is missing", "6 +0.012 -0",
			"feature bore hole size 6 +0.012 -0 axis +z at (60, 40, 0)"},
		{"feature pin pin size 6 -0.01 axis +z at (0, 0, 0)", "1:22", "the lower deviation is missing", "6 +0 -0.01",
			"feature pin pin size 6 +0 -0.01 axis +z at (0, 0, 0)"},
		{"feature bore hole size 6 +0.012", "1:24", "the lower deviation is missing", "6 +0.012 -0", "feature bore hole size 6 +0.012 -0"},
		{"dim 5 +0.1 from left to bore", "1:5", "the lower deviation is missing", "5 +0.1 -0", "dim 5 +0.1 -0 from left to bore"},
		{"frame pin: position dia 0.1 (P15) datums A", "1:29", "write the modifier and its value apart", "(P) 15",
			"frame pin: position dia 0.1 (P) 15 datums A"},
		{"frame pin: position dia 0.1 (P 12.5) datums A", "1:29", "write the modifier and its value apart", "(P) 12.5",
			"frame pin: position dia 0.1 (P) 12.5 datums A"},
		{"frame skin: surface-profile 0.2 (U0.1) datums A", "1:33", "write the modifier and its value apart", "(U) 0.1",
			"frame skin: surface-profile 0.2 (U) 0.1 datums A"},
		{"dim 5 +-0.1 (M) from left to bore", "1:13", "(M) does not belong to a dimension", "remove it",
			"dim 5 +-0.1 from left to bore"},
		{"dim 5 +-0.1 (E) from left to bore", "1:13", "(E) belongs to a feature's size", "remove it",
			"dim 5 +-0.1 from left to bore"},
	} {
		f := Parse("t.callouts", []byte(c.bad))
		if len(f.Errors) != 1 {
			t.Errorf("%q: %d errors %v, want 1", c.bad, len(f.Errors), f.Errors)
			continue
		}
		e := f.Errors[0]
		if e.Span.Start.String() != c.pos || !strings.Contains(e.Msg, c.want) || !strings.Contains(e.Msg, c.says) {
			t.Errorf("%q:\n got %s: %s\nwant %s: ...%s...%s...", c.bad, e.Span.Start, e.Msg, c.pos, c.want, c.says)
		}
		if removed := c.says == "remove it"; !removed && !strings.Contains(c.fixed, c.says) ||
			removed && strings.ContainsAny(c.fixed, "()") {
			t.Errorf("%q: the fixed statement %q does not do what the message says (%q)", c.bad, c.fixed, c.says)
		}
		g := Parse("t.callouts", []byte(c.fixed))
		if len(g.Errors) != 0 {
			t.Errorf("%q: doing what the message says (%q) still fails: %v", c.bad, c.fixed, g.Errors)
			continue
		}
		// Both parsers read the fixed statement alike.
		if fast := fastParse("t.callouts", splitStatements(splitLines([]byte(c.fixed)))[0]); fast == nil {
			t.Errorf("%q: the fast parser does not take the fixed statement", c.fixed)
		}
	}
}

// Slips are recognised where they are slips only: a comma between numbers
// inside a point is a separator, and references with commas are fine.
func TestSlipsOnlyWhereSlips(t *testing.T) {
	for _, c := range []struct{ src, want string }{
		{"feature b plane normal +z at (0,5, 1, 2)", "three coordinates"},
		{"feature b plane normal +z at (0,5, 1)", ""},
		{"frame a: flatness 0.1 datums A, B, C", ""},
		{"feature x hole size 10 +0.1 -0 axis +z at (0,0,0)", ""},
		{"frame a: position dia 0.1 (P) 15 datums A", ""},
	} {
		f := Parse("t.callouts", []byte(c.src))
		switch {
		case c.want == "" && len(f.Errors) != 0:
			t.Errorf("%q: unexpected %v", c.src, f.Errors)
		case c.want != "" && (len(f.Errors) != 1 || !strings.Contains(f.Errors[0].Msg, c.want)):
			t.Errorf("%q: errors %v, want one saying %q", c.src, f.Errors, c.want)
		}
	}
}

// A misspelt first word still declares the name it was meant to, as any
// statement that does not parse does: 'featur slot ...' makes slot known
// (Broken), so its frame is not also name-undefined.
func TestMisspeltKeywordStillDeclares(t *testing.T) {
	src := "units mm\nstandard iso\nfeatur slot1 slot size 6 +-0.1 normal +x at (1, 2, 3)\ndatm A on slot1\nframe slot1: position 0.1 datums A\n"
	f := Parse("t.callouts", []byte(src))
	b, ok := f.Stmts[2].(*BadStmt)
	if !ok || b.Word != "featur" || b.Meant != "feature" || b.Name != "slot1" {
		t.Fatalf("statement 3: %#v, want a BadStmt meant as a feature declaring slot1", f.Stmts[2])
	}
	p := Resolve(f)
	if ft := p.Feature("slot1"); ft == nil || !ft.Broken {
		t.Errorf("slot1 is not declared (broken) by the misspelt statement: %v", ft)
	}
	if d := p.Datum("A"); d == nil || !d.Broken {
		t.Errorf("datum A is not declared (broken) by 'datm A on slot1': %v", d)
	}
}
