package basics_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/rules/kinematics"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/basics"
)

const header = "part \"Test block TB-1\"\nunits mm\nstandard asme-2018\n"

// planes are the usual three datum planes, A (base), B (rear), C (left).
const planes = `
feature base plane normal -z at (0, 0, 0)
feature rear plane normal -y at (0, 0, 0)
feature left plane normal -x at (0, 0, 0)
datum A on base
datum B on rear
datum C on left
`

// missing resolves a file and returns what each frame needs, by frame
// target name and segment ("bore/0"), as readable strings.
func missing(t *testing.T, src string) map[string][]string {
	t.Helper()
	p := grammar.Read("t.callouts", []byte(src))
	if len(p.Problems) > 0 {
		t.Fatalf("test file does not resolve: %v", p.Problems[0])
	}
	facts := kinematics.Analyze(p)
	e := basics.Build(p, nil)
	out := map[string][]string{}
	for _, fr := range p.Frames {
		for i, seg := range fr.Segments {
			if ask, _ := basics.Asks(fr, seg); !ask {
				continue
			}
			a := facts.Segment(fr, i)
			if !a.Resolved {
				t.Fatalf("frame %s does not resolve: %s", fr.Target.Name, a.Problem)
			}
			q, ok := basics.FrameQuery(fr, seg, a.DRF)
			if !ok {
				t.Fatalf("no query for %s", fr.Target.Name)
			}
			key := fmt.Sprintf("%s/%d", fr.Target.Name, i)
			for _, m := range e.Missing(q) {
				out[key] = append(out[key], describe(seg, m))
			}
		}
	}
	return out
}

func describe(seg *model.Segment, m basics.Missing) string {
	rel := "?"
	switch {
	case m.Other != nil:
		rel = basics.Name(m.Other)
	case m.Ref >= 0:
		rel = seg.Refs[m.Ref].Name
	}
	kind := map[basics.Kind]string{basics.Location: "location", basics.Angle: "angle", basics.Circle: "circle", basics.Clocking: "clocking"}[m.Kind]
	return fmt.Sprintf("%s %s %s %s [%s]", basics.Name(m.Member), kind, basics.DirName(m.Dir), rel, m.Suggest)
}

func expect(t *testing.T, got map[string][]string, want map[string][]string) {
	t.Helper()
	for k, w := range want {
		if strings.Join(got[k], "\n") != strings.Join(w, "\n") {
			t.Errorf("%s:\n got %q\nwant %q", k, got[k], w)
		}
	}
	for k, g := range got {
		if _, ok := want[k]; !ok {
			t.Errorf("%s: unexpected %q", k, g)
		}
	}
}

// ASME Y14.5-2018, position: a hole located from A|B|C needs its x from the
// tertiary and its y from the secondary.
func TestHoleFromThreePlanes(t *testing.T) {
	base := header + planes + `
feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)
frame bore: position dia 0.1 datums A, B, C
`
	expect(t, missing(t, base), map[string][]string{"bore/0": {
		"bore location x C [basic 60 from left to bore]",
		"bore location y B [basic 40 from rear to bore]",
	}})
	expect(t, missing(t, base+"basic 40 from rear to bore\n"), map[string][]string{"bore/0": {
		"bore location x C [basic 60 from left to bore]",
	}})
	expect(t, missing(t, base+"basic 40 from rear to bore\nbasic 60 from left to bore\n"), nil)
	// A dimension from a plane that is not a datum of the frame does not
	// locate the hole relative to the datums.
	expect(t, missing(t, base+"feature right plane normal +x at (100, 0, 0)\nbasic 40 from rear to bore\nbasic 40 from right to bore\n"),
		map[string][]string{"bore/0": {"bore location x C [basic 60 from left to bore]"}})
}

// ASME Y14.5-2018, implied basic zero: a hole on a datum's mid-plane, and a
// hole on one centre line with another, need nothing in that direction.
func TestImpliedZero(t *testing.T) {
	src := header + planes + `
feature web tab size 20 +-0.05 normal +x at (60, 0, 0)
datum D on web
feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)
feature vent hole size 6 +-0.1 axis +z at (90, 40, 0)
frame web: position 0.1 datums A, C
frame bore: position dia 0.1 datums A, B, D
frame vent: position dia 0.1 datums A, B, D
basic 60 from left to web
basic 40 from rear to bore
basic 30 from bore to vent
`
	expect(t, missing(t, src), nil)
}

// A chain of basic dimensions through features that are not datums fixes a
// place exactly when it closes on the datums: a rank question.
func TestChains(t *testing.T) {
	src := header + planes + `
feature a hole size 5 +-0.1 axis +z at (20, 20, 0)
feature b hole size 5 +-0.1 axis +z at (50, 35, 0)
feature c hole size 5 +-0.1 axis +z at (80, 47, 0)
frame c: position dia 0.1 datums A, B, C
basic 20 from left to a
basic 20 from rear to a
basic 30 from a to b along +x
basic 15 from a to b along +y
basic 30 from b to c along +x
`
	expect(t, missing(t, src), map[string][]string{"c/0": {
		"c location y B [basic 47 from rear to c]",
	}})
	expect(t, missing(t, src+"basic 12 from b to c along +y\n"), nil)
	// A slanted dimension between the centres is one relation along the
	// line between them: with the x chain it fixes y too.
	expect(t, missing(t, src+"basic 32.310989 from b to c\n"), nil)
}

// A rectangular pattern placed by one corner and its spacings; members on
// one centre line are at an implied zero from each other.
func TestRectangularPattern(t *testing.T) {
	src := header + planes + `
feature bolts hole 4x size 8.4 +-0.1 axis +z at (15, 15, 0) (105, 15, 0) (15, 65, 0) (105, 65, 0)
frame bolts: position dia 0.4 datums A, B, C
    composite dia 0.1 datums A
basic 15 from left to bolts.1
basic 15 from rear to bolts.1
basic 90 from bolts.1 to bolts.2
`
	expect(t, missing(t, src+"basic 50 from bolts.1 to bolts.3\n"), nil)
	spacing := []string{"bolts.3 location y bolts.1 [basic 50 from bolts.1 to bolts.3]"}
	expect(t, missing(t, src), map[string][]string{"bolts/0": spacing, "bolts/1": spacing})
	// Without the corner, only the upper segment misses anything: the
	// lower one relates the members to each other.
	noCorner := strings.Replace(src, "basic 15 from left to bolts.1\n", "", 1) + "basic 50 from bolts.1 to bolts.3\n"
	expect(t, missing(t, noCorner), map[string][]string{"bolts/0": {"bolts.1 location x C [basic 15 from left to bolts.1]"}})
}

const flange = header + `
feature face  plane normal +z at (0, 0, 10)
feature hub   hole size 30 +0.05 -0 axis +z at (0, 0, 0)
feature flat  plane normal -y at (0, -60, 0)
datum A on face
datum B on hub
datum C on flat
`

// The bolt circle extension: the diameter fixes the radius, equal spacing
// is implied, clocking needs an angle unless a member lines up.
func TestBoltCircle(t *testing.T) {
	at30 := flange + `
feature studs hole 4x size 6 +-0.1 axis +z at (34.641016, 20, 0) (-20, 34.641016, 0) (-34.641016, -20, 0) (20, -34.641016, 0)
frame studs: position dia 0.2 datums A, B, C
`
	expect(t, missing(t, at30), map[string][]string{"studs/0": {
		"studs.1 circle z ? [basic dia 80 through studs about hub]",
		"studs.1 clocking z C [basic 60deg from studs.1 to flat about hub]"}})
	expect(t, missing(t, at30+"basic dia 80 through studs about hub\n"), map[string][]string{"studs/0": {
		"studs.1 clocking z C [basic 60deg from studs.1 to flat about hub]"}})
	expect(t, missing(t, at30+"basic dia 80 through studs about hub\nbasic 60deg from studs.1 to flat about hub\n"), nil)
	// Supplement and the angle to the plane itself name the same clocking.
	expect(t, missing(t, at30+"basic dia 80 through studs about hub\nbasic 120deg from studs.1 to flat about hub\n"), nil)

	// Unequal spacing is not implied: the angles between members must be
	// written.
	uneven := flange + `
feature pins hole 3x size 4 +-0.05 axis +z at (30, 0, 0) (0, 30, 0) (-21.213203, -21.213203, 0)
frame pins: position dia 0.2 datums A, B
basic dia 60 through pins about hub
`
	expect(t, missing(t, uneven), map[string][]string{"pins/0": {
		"pins.3 clocking z pins.1 [basic 135deg from pins.1 to pins.3 about hub]"}})
	expect(t, missing(t, uneven+"basic 135deg from pins.1 to pins.3 about hub\n"), nil)
}

// Angularity needs the basic angle; 0 and 90 degrees are implied
// (ASME Y14.5-2018, implied 90 degree angles).
func TestAngularity(t *testing.T) {
	src := header + planes + `
feature ramp plane normal (-0.5, 0, 0.866025) at (20, 10, 10)
feature side plane normal +x at (40, 0, 0)
frame ramp: angularity 0.05 datums A, B
frame side: angularity 0.05 datums A
`
	expect(t, missing(t, src), map[string][]string{"ramp/0": {"ramp angle y A [basic 30deg from base to ramp]"}})
	expect(t, missing(t, src+"basic 30deg from base to ramp\n"), nil)
	expect(t, missing(t, src+"basic 150deg from base to ramp\n"), nil)
}

// The same part in inches, shifted far from the origin, gives the same
// answers: every tolerance is relative to the part's size.
func TestUnitsAndPlacement(t *testing.T) {
	const n = 1 / 25.4
	const off = 5000.0
	f := func(x float64) string { return basics.Num(x*n + off) }
	src := fmt.Sprintf(`part "Test block TB-1"
units in
standard asme-2018
feature base plane normal -z at (%[1]s, %[1]s, %[1]s)
feature rear plane normal -y at (%[1]s, %[1]s, %[1]s)
feature left plane normal -x at (%[1]s, %[1]s, %[1]s)
datum A on base
datum B on rear
datum C on left
feature bolts hole 4x size 0.33 +-0.004 axis +z at (%[2]s, %[2]s, %[1]s) (%[3]s, %[2]s, %[1]s) (%[2]s, %[4]s, %[1]s) (%[3]s, %[4]s, %[1]s)
frame bolts: position dia 0.016 datums A, B, C
basic %[5]s from left to bolts.1
basic %[5]s from rear to bolts.1
basic %[6]s from bolts.1 to bolts.2
`, f(0), f(15), f(105), f(65), basics.Num(15*n), basics.Num(90*n))
	expect(t, missing(t, src), map[string][]string{"bolts/0": {"bolts.3 location y bolts.1 [basic 1.968504 from bolts.1 to bolts.3]"}})
}

func TestMismatches(t *testing.T) {
	src := header + planes + `
feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)
feature ramp plane normal (-0.5, 0, 0.866025) at (20, 10, 10)
feature pins hole 2x size 4 +-0.05 axis +z at (10, 10, 0) (40, 50, 0)
basic 62 from left to bore
basic 40 from rear to bore
basic 150deg from base to ramp
basic 35deg from base to ramp
basic 50 from pins.1 to pins.2
basic 30 from pins.1 to pins.2 along +x
basic 41 from pins.1 to pins.2 along +y
`
	p := grammar.Read("t.callouts", []byte(src))
	var got []string
	for _, m := range basics.Build(p, nil).Mismatches() {
		v := basics.Num(m.Nominal)
		if m.Dim.Angle {
			v = basics.NumAngle(m.Nominal)
		}
		got = append(got, fmt.Sprintf("%d:%s", m.Dim.Span.Start.Line, v))
	}
	want := "15:60 18:30 21:40"
	if strings.Join(got, " ") != want {
		t.Errorf("mismatches %q, want %q", got, want)
	}
}

// Bad geometry gives no answer rather than a wrong one or a panic.
func TestDegenerate(t *testing.T) {
	src := header + planes + `
feature blob surface
feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)
frame blob: surface-profile 0.1 datums A, B, C
basic 10 from bore to bore
basic 10 from blob to bore
basic 5deg from bore to base about bore
basic dia 40 through bore about base
`
	p := grammar.Read("t.callouts", []byte(src))
	e := basics.Build(p, nil)
	if got := e.Missing(basics.Query{Target: p.Frames[0].Target}); got != nil {
		t.Errorf("missing for a surface without geometry: %v", got)
	}
	for _, m := range e.Mismatches() {
		if math.IsNaN(m.Nominal) {
			t.Errorf("NaN nominal for line %d", m.Dim.Span.Start.Line)
		}
	}
}

// A datum axis clocked by a second hole (the two-hole scheme): a single
// hole is located in x and y from the axis, not by an angle.
func TestTwoHoleScheme(t *testing.T) {
	src := header + `
feature base plane normal -z at (0, 0, 0)
feature pilot hole size 10 +0.02 -0 axis +z at (20, 20, 0)
feature loc hole size 8 +0.02 -0 axis +z at (100, 20, 0)
feature bore hole size 12 +0.1 -0 axis +z at (60, 50, 0)
datum A on base
datum B on pilot
datum C on loc
frame loc: position dia 0.05 datums A, B
frame bore: position dia 0.1 datums A, B, C
basic 80 from pilot to loc
`
	expect(t, missing(t, src), map[string][]string{"bore/0": {
		"bore location x B [basic 40 from pilot to bore along +x]",
		"bore location y B [basic 30 from pilot to bore along +y]",
	}})
	expect(t, missing(t, src+"basic 40 from pilot to bore along +x\nbasic 30 from pilot to bore along +y\n"), nil)
}

// A face through a hole's axis is not a centre line: it implies no zero.
func TestFaceImpliesNoZeroToAxis(t *testing.T) {
	src := header + planes + `
feature notch hole size 6 +-0.1 axis +z at (0, 30, 0)
frame notch: position dia 0.1 datums A, B, C
basic 30 from rear to notch
`
	expect(t, missing(t, src), map[string][]string{"notch/0": {"notch location x C [basic 0 from left to notch]"}})
}

// Coordinates written with three or more decimals are rounded computed
// values: they agree with a bolt circle's diameter and an angle within
// their last digit, and a wrong value is still wrong.
func TestRoundedGeometry(t *testing.T) {
	src := flange + `
feature bolts hole 3x size 6 +-0.1 axis +z at (40, 0, 0) (-20, 34.641, 0) (-20, -34.641, 0)
feature ramp plane normal (-0.5, 0, 0.866) at (20, 10, 10)
basic dia 80 through bolts about hub
basic 30deg from face to ramp
basic dia 80.01 through bolts about hub
basic 31deg from face to ramp
`
	p := grammar.Read("t.callouts", []byte(src))
	var got []int
	for _, m := range basics.Build(p, nil).Mismatches() {
		got = append(got, m.Dim.Span.Start.Line)
	}
	if fmt.Sprint(got) != "[16 17]" {
		t.Errorf("mismatches on lines %v, want [16 17]", got)
	}
}

// A missing angle is suggested from the datum whose angle to the feature
// turns it about the axis that is missing: left, at an implied 90 degrees
// to the base, is turned about z only by its angle to the ramp B. (The
// angle to A was suggested before; it is implied and fixed nothing.)
func TestAngleSuggestionTurnsAboutItsAxis(t *testing.T) {
	src := header + `
feature base plane normal -z at (0, 0, 0)
feature ramp plane normal (0.173648, -0.984808, 0) at (0, 0, 0)
feature left plane normal -x at (0, 0, 0)
datum A on base
datum B on ramp
frame left: angularity 0.05 datums A, B
`
	expect(t, missing(t, src), map[string][]string{"left/0": {"left angle z B [basic 80deg from ramp to left]"}})
	expect(t, missing(t, src+"basic 80deg from ramp to left\n"), nil)
}

// A datum feature's place that the part may turn about a datum axis is
// named by its variable, and suggested from the axis it is fixed by.
func TestRestIsSuggested(t *testing.T) {
	src := header + `
feature face  plane normal -z at (0, 0, 0)
feature hub   hole size 20 +0.021 -0 axis +z at (0, 0, 0)
feature flat  plane normal +y at (15, 25, 8)
datum A on face
datum B on hub
frame flat: surface-profile 0.05 datums A, B
`
	expect(t, missing(t, src), map[string][]string{"flat/0": {"flat location y B [basic 25 from hub to flat]"}})
	expect(t, missing(t, src+"basic 25 from hub to flat\n"), nil)
}

// A part drawn turned in its coordinates: an inclined hole at a basic 20
// degrees to A and at an implied 90 degrees to a face, among bolt circles
// located from that face. Eliminating the relations left a small pivot,
// and the reduced form's length (a bound on the distance from the span)
// read the angle as missing; the distance itself decides it fixed.
func TestTurnedInclinedHoleIsOriented(t *testing.T) {
	src := header + `
feature base  plane normal (0, 0.529919, -0.848048) at (0, 0, 0)
feature left  plane normal (-0.173648, -0.835164, -0.521869) at (0, 0, 0)
feature hub1 hole size 12 +0.05 -0 axis (0, -0.529919, 0.848048) at (-12.812118, 60.472725, 37.787553)
feature ring1 hole 6x size 3.4 +-0.1 axis (0, -0.529919, 0.848048) at (-10.554691, 71.329862, 44.571844) (-22.770696, 67.559218, 42.215685) (-25.028122, 56.702081, 35.431393) (-15.069544, 49.615589, 31.003261) (-2.85354, 53.386233, 33.359421) (-0.596114, 64.243369, 40.143712)
feature hub2 hole size 12 +0.05 -0 axis (0, -0.529919, 0.848048) at (-8.009454, 93.338659, 58.324467)
feature ring2 hole 6x size 3.4 +-0.1 axis (0, -0.529919, 0.848048) at (-5.752028, 104.195795, 65.108759) (-17.968032, 100.425151, 62.752599) (-20.225458, 89.568015, 55.968307) (-10.266881, 82.481522, 51.540175) (1.949123, 86.252166, 53.896335) (4.20655, 97.109302, 60.680627)
feature drill1 hole size 5.5 +-0.1 axis (-0.336824, -0.447595, 0.828377) at (-65.00212, 38.998452, 24.368937)
feature right plane normal (0.173648, 0.835164, 0.521869) at (38.202599, 183.736155, 114.811092)
datum A on base
frame drill1: angularity dia 0.05 datums A
basic 68 from left to hub1
basic dia 26 through ring1 about hub1
basic 107 from left to hub2
basic dia 26 through ring2 about hub2
basic 20deg from base to drill1
`
	expect(t, missing(t, src), nil)
}
