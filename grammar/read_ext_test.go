package grammar_test

import (
	"math"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
)

// The reader of the notation's extensions: what each written form puts in
// the model.

func TestReadsBasis(t *testing.T) {
	if p := resolve(t, ""); p.Basis != model.DrawingBasis {
		t.Errorf("default basis %v, want drawing", p.Basis)
	}
	p := resolve(t, "basis model\n")
	if p.Basis != model.ModelBasis || len(p.Headers) != 3 || p.Headers[2].Keyword != "basis" {
		t.Errorf("basis %v, headers %+v", p.Basis, p.Headers)
	}
	p = resolve(t, "basis modle\n")
	if len(p.Problems) != 1 || !strings.Contains(p.Problems[0].Message, "did you mean 'model'") {
		t.Errorf("problems %v", p.Problems)
	}
}

func TestReadsDatumTargets(t *testing.T) {
	p := resolve(t, `feature base plane normal -z at (0, 0, 0)
feature rear plane normal -y at (0, 0, 0)
target A1 point on base at (10, 10, 0)
target A2 area dia 6 on base at (90, 10, 0)
target A3 area 10x20 on base at (50, 70, 0) normal +z
target B1 line on rear from (0, 0, 5) to (80, 0, 5)
datum A on base
datum B on rear
basic 10 from rear to A1
`)
	if len(p.Problems) > 0 {
		t.Fatalf("problems: %v", p.Problems)
	}
	a, b := p.Datum("A"), p.Datum("B")
	if len(a.Targets) != 3 || len(b.Targets) != 1 {
		t.Fatalf("A has %d targets, B %d", len(a.Targets), len(b.Targets))
	}
	a2, a3, b1 := a.Targets[1], a.Targets[2], b.Targets[0]
	if a2.Shape != model.TargetArea || a2.Dia != 6 || a3.Width != 10 || a3.Height != 20 || a3.Normal != (model.Vec{0, 0, 1}) {
		t.Errorf("areas %+v %+v", a2, a3)
	}
	if b1.Shape != model.TargetLine || b1.Point != (model.Vec{0, 0, 5}) || b1.End != (model.Vec{80, 0, 5}) || b1.On.Feature != p.Feature("rear") {
		t.Errorf("line %+v", b1)
	}
	// Each target is a point or line feature that dimensions reach.
	f := p.Feature("A1")
	if f == nil || f.Kind != model.Point || f.DatumTarget != a.Targets[0] || f.Point() != (model.Vec{10, 10, 0}) {
		t.Errorf("A1's feature %+v", f)
	}
	if g := p.Feature("B1"); g == nil || g.Kind != model.Line || g.Dir != (model.Vec{1, 0, 0}) {
		t.Errorf("B1's feature %+v", g)
	}
	if d := p.Dims[0]; !d.To.Resolved() || d.To.Feature != f {
		t.Errorf("a dimension to A1 does not reach it: %+v", d.To)
	}
}

func TestDatumTargetProblems(t *testing.T) {
	for _, c := range []struct{ src, want string }{
		{"target a1 point on b at (0, 0, 0)", "not a datum target's name"},
		{"target A1 pont on b at (0, 0, 0)", "did you mean 'point'"},
		{"target A1 area on b at (0, 0, 0)", "gives its size"},
		{"target A1 point dia 3 on b at (0, 0, 0)", "only an area target has a size"},
		{"target A1 line on b at (0, 0, 0)", "runs between two points"},
		{"target A1 point on b from (0, 0, 0) to (1, 0, 0)", "at one point"},
		{"target A1 line on b from (1, 0, 0) to (1, 0, 0)", "two different points"},
		{"target A1 area sdia 3 on b at (0, 0, 0)", "the area's size after 'area'"},
	} {
		f := grammar.Parse("t.callouts", []byte("feature b plane normal +z at (0, 0, 0)\n"+c.src+"\n"))
		p := grammar.Resolve(f)
		if len(p.Problems) != 1 || !strings.Contains(p.Problems[0].Message, c.want) {
			t.Errorf("%q: problems %v, want one with %q", c.src, p.Problems, c.want)
		}
	}
}

func TestReadsFrameExtensions(t *testing.T) {
	p := resolve(t, `feature base plane normal -z at (0, 0, 0)
feature bore hole size 10 +-0.1 axis +z at (20, 20, 0)
feature tip point at (0, 0, 0)
feature e1 line along +x at (0, 0, 0)
frame base: flatness 0.005/25x25
frame e1: straightness 0.01/25
frame bore: position 0.1 (M) along +x datums A, H(M)-J(L), K-L(M) separate major-dia
frame base: line-profile 0.2 datums A between tip e1
    composite 0.1 datums A separate
`)
	if len(p.Problems) > 0 {
		t.Fatalf("problems: %v", p.Problems)
	}
	fl, st, pos, lp := p.Frames[0], p.Frames[1], p.Frames[2], p.Frames[3]
	if u := fl.Upper().PerUnit; u == nil || !u.Area || u.Length != 25 || u.Width != 25 || u.Text != "25x25" {
		t.Errorf("flatness per unit %+v", fl.Upper().PerUnit)
	}
	if u := st.Upper().PerUnit; u == nil || u.Area || u.Length != 25 || u.Text != "25" {
		t.Errorf("straightness per unit %+v", st.Upper().PerUnit)
	}
	seg := pos.Upper()
	if seg.ZoneDir == nil || *seg.ZoneDir != (model.Vec{1, 0, 0}) || !seg.Separate || pos.ThreadDiameter != model.MajorDiameter {
		t.Errorf("position: dir %v separate %v thread %q", seg.ZoneDir, seg.Separate, pos.ThreadDiameter)
	}
	hj, kl := seg.Refs[1], seg.Refs[2]
	if hj.Name != "H-J" || strings.Join(hj.Letters, ",") != "H,J" || strings.Join(hj.Materials, ",") != "M,L" || hj.Material != "" {
		t.Errorf("H(M)-J(L): %+v", hj)
	}
	if m, sp := hj.Boundary(1); m != "L" || sp.Start.Col == 0 {
		t.Errorf("J's boundary %q at %v", m, sp)
	}
	if kl.Material != "M" || strings.Join(kl.Materials, ",") != "M,M" {
		t.Errorf("K-L(M): %+v", kl)
	}
	if lp.Extent != model.Between || lp.Between[0].Feature != p.Feature("tip") || lp.Between[1].Feature != p.Feature("e1") {
		t.Errorf("between: %q %v", lp.Extent, lp.Between)
	}
	if !lp.Segments[1].Separate || lp.Segments[0].Separate {
		t.Errorf("separate on the composite segment only: %v %v", lp.Segments[0].Separate, lp.Segments[1].Separate)
	}
	// The frame's own notes belong on its first line.
	p = grammar.Read("t.callouts", []byte("frame a: surface-profile 1 datums A\n    composite 0.5 datums A all-around\n"))
	if len(p.Problems) != 1 || !strings.Contains(p.Problems[0].Message, "frame's first line") {
		t.Errorf("all-around on a composite line: %v", p.Problems)
	}
}

func TestReadsHoleForms(t *testing.T) {
	p := resolve(t, `feature cb hole size 6.6 +-0.1 cbore 11 +0.2 -0 depth 6.5 csink 13 angle 90deg axis -z at (0, 0, 0)
feature tap hole thread "M8x1.25-6H" axis -z at (10, 0, 0)
feature rim circle size 25 axis +z at (0, 0, 0)
`)
	if len(p.Problems) > 0 {
		t.Fatalf("problems: %v", p.Problems)
	}
	cb := p.Feature("cb")
	if cb.Counterbore == nil || cb.Counterbore.Diameter.Max() != 11.2 || cb.Counterbore.Depth.Nominal != 6.5 {
		t.Errorf("counterbore %+v", cb.Counterbore)
	}
	if cb.Countersink == nil || cb.Countersink.Angle.Nominal != 90 {
		t.Errorf("countersink %+v", cb.Countersink)
	}
	if tap := p.Feature("tap"); tap.Thread != "M8x1.25-6H" || tap.Size != nil {
		t.Errorf("thread %q size %v", tap.Thread, tap.Size)
	}
	if rim := p.Feature("rim"); rim.Size == nil || rim.Size.Nominal != 25 || rim.Kind.IsFOS() {
		t.Errorf("circle %+v", rim)
	}
	for _, c := range []struct{ src, want string }{
		{`feature p plane thread "M8" normal +z at (0, 0, 0)`, "takes no 'thread'"},
		{`feature p pin cbore 8 depth 2 axis +z at (0, 0, 0)`, "takes no 'cbore'"},
		{`feature h hole size 6 csink 12 angle 90 axis +z at (0, 0, 0)`, "write it with deg"},
		{`feature h hole size 6 cbore 12deg depth 2 axis +z at (0, 0, 0)`, "a length, not an angle"},
		{`feature t point size 3 at (0, 0, 0)`, "takes no size"},
	} {
		p := grammar.Read("t.callouts", []byte(c.src+"\n"))
		if len(p.Problems) != 1 || !strings.Contains(p.Problems[0].Message, c.want) {
			t.Errorf("%q: problems %v, want one with %q", c.src, p.Problems, c.want)
		}
	}
}

func TestReadsReferenceDimensions(t *testing.T) {
	p := resolve(t, `feature left plane normal -x at (0, 0, 0)
feature bore hole size 10 +-0.1 axis +z at (60, 40, 0)
ref 60 from left to bore along +x
ref size 10 of bore
ref 90deg from left to bore
`)
	if len(p.Problems) > 0 {
		t.Fatalf("problems: %v", p.Problems)
	}
	d, sz, ang := p.Dims[0], p.Dims[1], p.Dims[2]
	if !d.Reference || d.Basic || d.Tol != nil || d.Value != 60 || d.Along == nil || d.To.Feature != p.Feature("bore") {
		t.Errorf("reference distance %+v", d)
	}
	if !sz.Reference || sz.SizeOf == nil || sz.SizeOf.Feature != p.Feature("bore") || sz.Value != 10 {
		t.Errorf("reference size %+v", sz)
	}
	if !ang.Reference || !ang.Angle || math.Abs(ang.Value-90) > 0 {
		t.Errorf("reference angle %+v", ang)
	}
}
