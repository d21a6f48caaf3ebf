package kinematics

import (
	"math"
	"slices"
	"testing"

	"github.com/datumlint/datumlint/rules/dof"
)

// A datum established by datum targets takes its degrees of freedom from
// them (ASME Y14.5-2018, datum targets; ISO 5459:2011): three points on a
// plane remove three, two on a line two, one one; a target on a cone or an
// inclined face touches it along the surface's normal where it lies.
const targetPart = `units mm
standard asme-2018
feature base  plane normal -z at (0, 0, 0)
feature rear  plane normal -y at (0, 0, 0)
feature left  plane normal -x at (0, 0, 0)
feature ramp  plane normal (0.5, 0, 0.866025) at (100, 0, 0)
feature taper cone axis +z at (50, 50, 40)
feature shaft pin size 20 -0 -0.02 axis +x at (0, 100, 10)
feature skin  surface
target A1 point on base at (10, 10, 0)
target A2 point on base at (110, 10, 0)
target A3 area dia 6 on base at (60, 70, 0)
target B1 line on rear from (10, 0, 10) to (110, 0, 10)
target C1 point on left at (0, 40, 10)
target D1 point on ramp at (100, 20, 0)
target E1 point on taper at (60, 50, 0)
target F1 line on shaft from (0, 110, 10) to (50, 110, 10)
target F2 line on shaft from (0, 100, 0) to (50, 100, 0)
target G1 point on skin at (1, 2, 3) normal +x
target H1 point on skin at (1, 2, 3)
datum A on base
datum B on rear
datum C on left
datum D on ramp
datum E on taper
datum F on shaft
datum G on skin
datum H on skin
`

func TestTargetDatumsRemoveWhatTheyTouch(t *testing.T) {
	p := resolveSrc(t, targetPart)
	r := Analyze(p)
	steps := func(letters ...string) []int {
		ds := make([]dof.Datum, len(letters))
		for i, l := range letters {
			ds[i] = DatumSurfaces(p.Datum(l))
		}
		var out []int
		for _, st := range r.frame.Analyze(ds).Steps() {
			out = append(out, st.Constrains)
		}
		return out
	}
	for _, c := range []struct {
		letters []string
		want    []int
	}{
		{[]string{"A"}, []int{3}},
		{[]string{"A", "B", "C"}, []int{3, 2, 1}},
		{[]string{"B"}, []int{2}},
		{[]string{"C"}, []int{1}},
		// One point on the inclined ramp after A: its normal has an x and a
		// z part; A has taken z, so it stops x.
		{[]string{"A", "D"}, []int{3, 1}},
		{[]string{"A", "B", "D"}, []int{3, 2, 1}},
		// One point on the cone, touched along the cone's normal there.
		{[]string{"E"}, []int{1}},
		// Two line targets along a shaft, as in a vee: its axis but the
		// slide along it and the turn about it.
		{[]string{"F"}, []int{4}},
		{[]string{"G"}, []int{1}},
	} {
		if got := steps(c.letters...); !slices.Equal(got, c.want) {
			t.Errorf("%v: constrains %v, want %v", c.letters, got, c.want)
		}
	}
	// The cone target's normal is at right angles to the cone's line
	// through it, in the plane of that line and the axis.
	e := ContactSurfaces(p.Datum("E").Targets[0])[0]
	apex, pt := dof.Vec{50, 50, 40}, dof.Vec{60, 50, 0}
	line := dof.Vec{pt[0] - apex[0], pt[1] - apex[1], pt[2] - apex[2]}
	if dot := e.Dir[0]*line[0] + e.Dir[1]*line[1] + e.Dir[2]*line[2]; math.Abs(dot) > 1e-9 || math.Abs(e.Dir[1]) > 1e-12 {
		t.Errorf("cone target normal %v is not at right angles to the cone's line %v in its axial plane", e.Dir, line)
	}
	// A target on a free-form surface with no normal written cannot be
	// analysed, and a frame on it says why.
	if got := ContactSurfaces(p.Datum("H").Targets[0]); len(got) != 0 {
		t.Errorf("a target with no normal gave %v", got)
	}
	if why := targetsProblem(p.Datum("H")); why == "" {
		t.Error("no problem reported for a target without a normal")
	}
}

// A position with a zone direction is a zone between two planes normal to
// it, through each member: only motions along it move the zone.
func TestDirectedPositionZone(t *testing.T) {
	p := resolveSrc(t, `units mm
standard asme-2018
feature base plane normal -z at (0, 0, 0)
feature rear plane normal -y at (0, 0, 0)
feature bore hole size 10 +-0.1 axis +z at (60, 40, 0)
datum A on base
datum B on rear
frame bore: position 0.2 along +y datums A, B
frame bore: position 0.2 along +x datums A, B
frame bore: position dia 0.2 datums A, B
`)
	r := Analyze(p)
	for i, wantMoves := range []bool{false, true, true} {
		a := r.Segment(p.Frames[i], 0)
		if !a.Resolved || a.Zone.TranslationMoves != wantMoves {
			t.Errorf("frame %d: resolved %v, translation moves %v, want %v (free %v)", i, a.Resolved, a.Zone.TranslationMoves, wantMoves, a.ZoneFree())
		}
	}
	if z := ZoneOf(p.Frames[0]); z.Surfaces[0].Class != dof.Plane || z.Surfaces[0].Dir != (dof.Vec{0, 1, 0}) {
		t.Errorf("directed zone %+v", z.Surfaces[0])
	}
}
