package kinematics

import (
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/dof"
)

func resolveSrc(t testing.TB, src string) *model.Part {
	t.Helper()
	p := grammar.Read("test.callouts", []byte(src))
	if len(p.Problems) > 0 {
		t.Fatalf("test source does not read: %v", p.Problems[0])
	}
	return p
}

const kinPart = `units mm
standard asme-2018
feature base  plane normal -z at (0, 0, 0)
feature key   slot size 6 +-0.05 normal +y at (0, 0, 0)
feature hub   hole size 20 +0.05 -0 axis +z at (0, 0, 0)
feature bolts hole 3x size 6 +-0.1 axis +z at (20, 0, 0) (-10, 17, 0) (-10, -17, 0)
feature cup   socket size 8 +0.05 -0 at (0, 0, 10)
feature tip   cone axis +z at (0, 0, 50)
feature rail  extrusion along +x at (0, 0, 0)
feature skin  surface
datum A on base
datum B on key
datum C on hub
datum D on bolts
datum E on bolts.2
datum F on cup
datum G on tip
datum H on rail
datum J on skin
frame hub: position dia 0.1 datums A, C
frame hub: position dia 0.1 (M) datums A, C(M)
frame bolts: position dia 0.2 datums A, C
    composite dia 0.1 datums A
frame hub: perpendicularity dia 0.05 datums A
frame hub: position dia 0.1 datums A, X
`

// The datum feature types give the classes of ISO 5459:2011 and remove the
// degrees of freedom of ASME Y14.5-2018 section 7 when used as primary:
// plane 3, width 3, cylinder 4, sphere 3, cone 5, extrusion 5, complex 6;
// a pattern of three parallel holes acts as one datum and removes 5 (all
// but the slide along the common direction of the axes).
func TestDatumSurfacesByKind(t *testing.T) {
	p := resolveSrc(t, kinPart)
	cases := []struct {
		letter  string
		class   dof.Class
		members int
		removes int
	}{
		{"A", dof.Plane, 1, 3},
		{"B", dof.Plane, 1, 3},
		{"C", dof.Cylinder, 1, 4},
		{"D", dof.Cylinder, 3, 5},
		{"E", dof.Cylinder, 1, 4},
		{"F", dof.Sphere, 1, 3},
		{"G", dof.Cone, 1, 5},
		{"H", dof.Prismatic, 1, 5},
		{"J", dof.Complex, 1, 6},
	}
	fr := dof.Frame{Center: dof.Vec(p.Center), Scale: p.Scale}
	for _, c := range cases {
		d := DatumSurfaces(p.Datum(c.letter))
		if len(d) != c.members {
			t.Errorf("%s: %d surfaces, want %d", c.letter, len(d), c.members)
			continue
		}
		for _, s := range d {
			if s.Class != c.class || !s.Valid() {
				t.Errorf("%s: surface %+v, want a valid %s", c.letter, s, c.class)
			}
		}
		if got := fr.Analyze([]dof.Datum{d}).Steps()[0].Constrains; got != c.removes {
			t.Errorf("%s as primary removes %d, want %d", c.letter, got, c.removes)
		}
	}
	if e := DatumSurfaces(p.Datum("E")); e[0].Point != (dof.Vec{-10, 17, 0}) {
		t.Errorf("E on bolts.2 is at %v, want the second member's axis", e[0].Point)
	}
	if DatumSurfaces(nil) != nil {
		t.Error("a nil datum gives surfaces")
	}
}

func TestRefSurfacesStacksCommonDatum(t *testing.T) {
	p := resolveSrc(t, `units mm
standard asme-2018
feature front pin size 25 -0 -0.01 axis +z at (0, 0, 0)
feature back  pin size 25 -0 -0.01 axis +z at (0, 0, 100)
datum A on front
datum B on back
frame back: circular-runout 0.02 datums A-B
`)
	r := p.Frames[0].Upper().Refs[0]
	if got := RefSurfaces(r); len(got) != 2 || got[0].Point[2] != 0 || got[1].Point[2] != 100 {
		t.Fatalf("A-B gives %+v, want both journals' axes", got)
	}
}

func TestZoneOf(t *testing.T) {
	p := resolveSrc(t, `units mm
standard asme-2018
feature base  plane normal -z at (0, 0, 0)
feature hub   pin size 20 -0 -0.02 axis +z at (0, 0, 0)
feature face  plane normal +z at (0, 0, 30)
feature bolts hole 2x size 6 +-0.1 axis +z at (20, 0, 0) (-20, 0, 0)
datum A on base
frame hub: perpendicularity dia 0.05 datums A
frame face: total-runout 0.05 datums A
frame bolts: position dia 0.1 datums A
frame face: flatness 0.01
`)
	orient := ZoneOf(p.Frames[0])
	if !orient.OrientationOnly || len(orient.Surfaces) != 1 || orient.Surfaces[0].Class != dof.Cylinder {
		t.Errorf("perpendicularity zone %+v, want an orientation-only cylinder", orient)
	}
	run := ZoneOf(p.Frames[1])
	if len(run.Extra) != 1 || run.Extra[0].V != (dof.Vec{0, 0, 1}) || run.OrientationOnly {
		t.Errorf("runout zone %+v, want a slide along the face's normal", run)
	}
	pat := ZoneOf(p.Frames[2])
	if len(pat.Surfaces) != 2 {
		t.Errorf("pattern zone has %d surfaces, want one per member", len(pat.Surfaces))
	}
	form := ZoneOf(p.Frames[3])
	if form.OrientationOnly || len(form.Extra) != 0 || form.Surfaces[0].Class != dof.Plane {
		t.Errorf("flatness zone %+v, want the plane itself", form)
	}
}

func TestDOFSharesOneAnalysisPerReferenceList(t *testing.T) {
	p := resolveSrc(t, kinPart)
	f := Analyze(p)
	plain, mmb := f.Segment(p.Frames[0], 0), f.Segment(p.Frames[1], 0)
	if !plain.Resolved || !mmb.Resolved {
		t.Fatalf("frames did not resolve: %q, %q", plain.Problem, mmb.Problem)
	}
	if plain.DRF != mmb.DRF {
		t.Error("A, C and A, C(M) were analysed twice; MMB constrains the same freedoms")
	}
	if f.Segment(p.Frames[0], 0) != plain {
		t.Error("DOF is not memoised per segment")
	}
	upper := f.Segment(p.Frames[2], 0)
	if upper.DRF != plain.DRF {
		t.Error("the bolts' A, C was analysed again")
	}
	// The pattern off C's axis turns with the part: rotation about C moves
	// the framework of zones; the hub on C's axis does not care.
	if n := len(upper.Zone.Free); n != 1 || upper.Zone.TranslationMoves {
		t.Errorf("pattern to A, C: %d zone-moving motions (%v), want 1 rotation", n, upper.Zone.Free)
	}
	if n := len(plain.Zone.Free); n != 0 {
		t.Errorf("hub to A, C: zone moves with %v", plain.Zone.Free)
	}
	lower := f.Segment(p.Frames[2], 1)
	if !lower.Resolved || lower.Index != 1 || len(lower.DRF.Free()) != 3 {
		t.Errorf("composite lower segment to A: %+v", lower)
	}
	orient := f.Segment(p.Frames[3], 0)
	if len(orient.Zone.Free) != 0 || orient.Zone.PerStep[0] != 2 {
		t.Errorf("perpendicularity to A: zone %+v, want 2 turning rotations fixed by A", orient.Zone)
	}
	bad := f.Segment(p.Frames[4], 0)
	if bad.Resolved || bad.Problem != "datum X is not declared" {
		t.Errorf("undefined datum: resolved %v, problem %q", bad.Resolved, bad.Problem)
	}
	if out := f.Segment(p.Frames[0], 5); out.Resolved {
		t.Error("an out-of-range segment resolved")
	}
}

func BenchmarkDOFFile(b *testing.B) {
	p := resolveSrc(b, kinPart)
	for b.Loop() {
		f := Analyze(p)
		for _, fr := range p.Frames {
			for i := range fr.Segments {
				f.Segment(fr, i)
			}
		}
	}
}
