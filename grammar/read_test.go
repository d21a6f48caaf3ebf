package grammar_test

import (
	"math"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
)

func resolve(t *testing.T, src string) *model.Part {
	t.Helper()
	f := grammar.Parse("t.callouts", []byte("units mm\nstandard asme-2018\n"+src))
	if len(f.Errors) > 0 {
		t.Fatalf("syntax: %v", f.Errors)
	}
	return grammar.Resolve(f)
}

// TestMaterialConditions: MMC is the smallest size of an internal feature
// and the largest of an external one (ASME Y14.5-2018, definitions: MMC,
// LMC).
func TestMaterialConditions(t *testing.T) {
	p := resolve(t, `feature h hole size 10 +0.1 -0 axis +z at (0,0,0)
feature s pin size 10 -0 -0.02 axis +z at (0,0,0)
feature w slot size 11.95..12.05 normal +x at (0,0,0)
feature b ball size 20 +-0.5 at (0,0,0)
`)
	for _, c := range []struct {
		name     string
		mmc, lmc float64
	}{
		{"h", 10, 10.1}, {"s", 10, 9.98}, {"w", 11.95, 12.05}, {"b", 20.5, 19.5},
	} {
		f := p.Feature(c.name)
		if math.Abs(f.MMC()-c.mmc) > 1e-12 || math.Abs(f.LMC()-c.lmc) > 1e-12 {
			t.Errorf("%s: MMC %g LMC %g, want %g %g", c.name, f.MMC(), f.LMC(), c.mmc, c.lmc)
		}
	}
}

func TestBetweenDerivesMidPlane(t *testing.T) {
	p := resolve(t, `feature l plane normal -x at (10, 0, 0)
feature r plane normal +x at (22, 5, 5)
feature w slot size 12 +-0.05 between l r
`)
	w := p.Feature("w")
	if !w.HasGeometry || w.Point()[0] != 16 || math.Abs(math.Abs(w.Dir[0])-1) > 1e-12 {
		t.Errorf("mid-plane %v through %v", w.Dir, w.Point())
	}
	if len(problems(p, model.Geometry)) != 0 {
		t.Errorf("unexpected geometry errors %v", problems(p, model.Geometry))
	}
	p = resolve(t, `feature l plane normal -x at (10, 0, 0)
feature r plane normal +y at (22, 5, 5)
feature w slot size 12 +-0.05 between l r
`)
	if len(problems(p, model.Geometry)) != 1 || !strings.Contains(p.Problems[0].Message, "not parallel") {
		t.Errorf("want a not-parallel error, got %v", problems(p, model.Geometry))
	}
}

func TestMembersAndNames(t *testing.T) {
	p := resolve(t, `feature bolts hole 4x size 8 +-0.1 axis +z at (1,0,0) (2,0,0) (3,0,0) (4,0,0)
feature bore hole size 8 +-0.1 axis +z at (0,0,0)
basic 1 from bolts.1 to bolts.2
basic 1 from bolts.5 to bore.1
basic 1 from bolt to bores
`)
	want := map[string]string{
		"bolts.1": "", "bolts.2": "",
		"bolts.5": "bolts has 4 members",
		"bore.1":  "bore is a single hole, not a pattern",
		"bolt":    "did you mean 'bolts'",
		"bores":   "did you mean 'bore'",
	}
	for _, r := range p.Refs {
		w, ok := want[r.Name]
		if !ok {
			t.Errorf("unexpected ref %s", r.Name)
			continue
		}
		if w == "" && !r.Resolved() {
			t.Errorf("%s did not resolve: %s", r.Name, r.Problem)
		}
		if w != "" && (r.Resolved() || !strings.Contains(r.Problem, w)) {
			t.Errorf("%s: problem %q, want %q", r.Name, r.Problem, w)
		}
	}
	if m := p.Refs[1]; m.Member == nil || m.Member.Point[0] != 2 {
		t.Errorf("bolts.2 resolved to %+v", m.Member)
	}
}

func TestValueErrors(t *testing.T) {
	for src, want := range map[string]string{
		"feature a hol size 1 +-0.1 axis +z at (0,0,0)":                                         "did you mean 'hole'",
		"feature a plane size 1 +-0.1 normal +z at (0,0,0)":                                     "not a feature of size",
		"feature a hole 3x size 1 +-0.1 axis +z at (0,0,0) (1,0,0)":                             "says 3 but 2 points",
		"feature a hole 99999999999999999999x size 1 +-0.1 axis +z at (0,0,0)":                  "says 99999999999999999999 but 1 points",
		"feature a hole 18446744073709551617x size 1 +-0.1 axis +z at (0,0,0)":                  "says 18446744073709551617 but 1 points",
		"feature a hole size 1 +-0.1 axis +z at (0,0,0) (1,0,0)":                                "declare it with 2x",
		"feature a hole size 1 +-0.1 normal +z at (0,0,0)":                                      "not given with 'normal'",
		"feature a plane normal (0,0,0) at (0,0,0)":                                             "must not be zero",
		"feature a plane normal +z at (1e309,0,0)":                                              "out of range",
		"feature a plane normal +z at (0,0,0)\nframe a: flatnes 0.1":                            "did you mean 'flatness'",
		"feature a plane normal +z at (0,0,0)\ndatum A on a placed up":                          "unknown placement",
		"feature a hole size 2 +0.1 +0.2 axis +z at (0,0,0)":                                    "below the lower deviation",
		"feature a plane normal +z at (0,0,0)\nframe a: perpendicularity 0.1 datums A, B, C, D": "at most three datums",
	} {
		p := grammar.Read("t", []byte(src))
		if len(p.Problems) != 1 || !strings.Contains(p.Problems[0].Message, want) {
			t.Errorf("%q: errors %v, want one containing %q", src, p.Problems, want)
		}
	}
}

func TestScaleAndCentre(t *testing.T) {
	p := resolve(t, `feature a plane normal +z at (0,0,0)
feature b plane normal +z at (30,40,0)
`)
	if p.Scale != 50 || p.Center != (model.Vec{15, 20, 0}) {
		t.Errorf("scale %g centre %v", p.Scale, p.Center)
	}
}

func TestZoneWords(t *testing.T) {
	for src, want := range map[string]string{
		"feature a plane normal +z at (0,0,0)\nframe a: flatness banana 0.02": "unknown zone 'banana'",
	} {
		p := grammar.Read("t", []byte(src))
		if len(p.Problems) != 1 || !strings.Contains(p.Problems[0].Message, want) {
			t.Errorf("%q: errors %v, want one containing %q", src, p.Problems, want)
		}
	}
	p := grammar.Read("t", []byte("feature a hole size 1 +-0.1 axis +z at (0,0,0)\nframe a: position ⌀0.2\nframe a: position sdia 0.2"))
	if len(p.Problems) != 0 {
		t.Errorf("dia and sdia rejected: %v", p.Problems)
	}
}

func problems(p *model.Part, kind model.ProblemKind) []*model.Problem {
	var out []*model.Problem
	for _, e := range p.Problems {
		if e.Kind == kind {
			out = append(out, e)
		}
	}
	return out
}

// The reader records in the model what rules and outputs need of the file
// as written, so that none of them reads the syntax tree: the statements
// (with the names of one that did not parse), the suppressions with the
// rule identifiers' spans and the statement each covers, and the written
// text and precision of values.
func TestReaderRecordsTheFileAsWritten(t *testing.T) {
	src := "units mm\nstandard asme-2018\n" +
		"feature bolts hole 2x size 8.4 +-0.1 axis (0, 0.70711, 0.70711) at (15.125, 15, 0) (1e2, 15, 0)\n" +
		"# datumlint: allow datum-unused, name-undefined -- kept for the fixture\n" +
		"datum A on bolts\n" +
		"frame bolts: position ⌀ 0.40 (M) datums A  # datumlint: allow zone-shape -- x\n" +
		"feature lug tab size 10 +-0.1 between  \\\n  a b\n" +
		"frame lug: flatnes 0.1 datums B\n"
	p := grammar.Read("t.callouts", []byte(src))
	if p.Source == nil || p.Source.Name != "t.callouts" || string(p.Source.Src) != src {
		t.Fatal("the part does not keep its source")
	}
	var kw []string
	for _, st := range p.Statements {
		kw = append(kw, st.Keyword)
	}
	if got := strings.Join(kw, " "); got != "units standard feature datum frame feature frame" {
		t.Errorf("statements %q", got)
	}
	if st := p.Statements[5]; st.First != 7 || st.Last != 8 || model.StatementText(p.Source, st) != `feature lug tab size 10 +-0.1 between \ a b` {
		t.Errorf("continued statement: lines %d-%d text %q", st.First, st.Last, model.StatementText(p.Source, st))
	}
	if st := p.Statements[4]; model.StatementText(p.Source, st) != "frame bolts: position ⌀ 0.40 (M) datums A" {
		t.Errorf("a trailing comment is not part of the statement's text: %q", model.StatementText(p.Source, st))
	}
	bad := p.Statements[6]
	if !bad.Parsed {
		// "flatnes" is a value the model does not know, not a syntax
		// error: the statement parses.
		if bad.Keyword != "frame" {
			t.Errorf("bad statement %+v", bad)
		}
	}
	if len(p.Suppressions) != 2 {
		t.Fatalf("suppressions %+v", p.Suppressions)
	}
	own, trailing := p.Suppressions[0], p.Suppressions[1]
	if own.Stmt != 3 || own.Trailing || own.Reason != "kept for the fixture" || strings.Join(own.Rules, ",") != "datum-unused,name-undefined" {
		t.Errorf("own-line suppression %+v", own)
	}
	if sp := own.RuleSpans[1]; sp.Start.Line != 4 || sp.Start.Col != 34 || sp.End.Col != 48 {
		t.Errorf("span of name-undefined in the directive: %v", sp)
	}
	if trailing.Stmt != 4 || !trailing.Trailing {
		t.Errorf("trailing suppression %+v", trailing)
	}
	f := p.Feature("bolts")
	if f.Size.Text != "8.4 +-0.1" {
		t.Errorf("size text %q", f.Size.Text)
	}
	if f.Members[0].Decimals != [3]int{3, 0, 0} || f.Members[1].Decimals != [3]int{-1, 0, 0} || f.DirDecimals != [3]int{0, 5, 5} {
		t.Errorf("decimals %v %v dir %v", f.Members[0].Decimals, f.Members[1].Decimals, f.DirDecimals)
	}
	seg := p.Frames[0].Upper()
	if seg.ValueText != "0.40" || seg.ZoneText != "⌀" || seg.Zone != "dia" {
		t.Errorf("segment value %q zone %q/%q", seg.ValueText, seg.ZoneText, seg.Zone)
	}
	if !p.Frames[0].Located() || p.Frames[1].Located() {
		t.Error("position is located; an unknown characteristic is not")
	}
	if lug := p.Feature("lug"); lug.Members[0].Decimals != [3]int{-1, -1, -1} {
		t.Errorf("a width between two faces has no written point: %v", lug.Members[0].Decimals)
	}
	if len(p.FramesOn(f)) != 1 || len(p.DatumsOn(f)) != 1 {
		t.Error("frames and datums are indexed by feature")
	}
}

func TestDatumsSpans(t *testing.T) {
	p := grammar.Read("t", []byte("units mm\nstandard iso\nfeature a plane normal +z at (0,0,0)\nframe a: flatness 0.1 datums A, B (M)\n"))
	seg := p.Frames[0].Upper()
	if sp := seg.DatumsSpan; sp.Start.Col != 23 || sp.End.Col != 38 {
		t.Errorf("datums span %v, want 4:23-4:38", sp)
	}
	if sp := seg.Refs[1].FullSpan; sp.Start.Col != 33 || sp.End.Col != 38 {
		t.Errorf("B (M) span %v", sp)
	}
}
