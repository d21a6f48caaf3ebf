package setup

import (
	"math"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/material"
)

func read(t *testing.T, src string) *model.Part {
	t.Helper()
	p := grammar.Read("test.callouts", []byte("units mm\nstandard asme-2018\n"+src))
	for _, pr := range p.Problems {
		t.Fatalf("test source does not read: %v", pr)
	}
	return p
}

// setupOf works out the set-up of the references of the frame on line
// (counting the two header lines read adds).
func setupOf(t *testing.T, p *model.Part, line int) *Setup {
	t.Helper()
	for _, fr := range p.Frames {
		if fr.Span.Start.Line == line {
			return Analyze(p, nil).Of(fr.Upper().Refs)
		}
	}
	t.Fatalf("no frame on line %d", line)
	return nil
}

func near(a, b float64) bool { return math.Abs(a-b) < 1e-9 }

// The mounting plate (the notation's complete example): three planes
// square to one another need 3, 2 and 1 points of contact — the 3-2-1 rule
// of a datum reference frame (ASME Y14.5-2018, section 4, from memory) —
// and each simulator is square to those before it.
func TestThreePlanesAreThreeTwoOne(t *testing.T) {
	p := read(t, `feature base  plane normal -z at (0, 0, 0)
feature rear  plane normal -y at (0, 0, 0)
feature left  plane normal -x at (0, 0, 0)
feature bore  hole size 25 +0.05 -0 axis +z at (60, 40, 0)
datum A on base
datum B on rear
datum C on left
frame bore: position dia 0.1 (M) datums A, B, C
basic 60 from left to bore
basic 40 from rear to bore
`)
	s := setupOf(t, p, 10)
	if s.Problem != "" || len(s.References) != 3 {
		t.Fatalf("set-up %+v", s)
	}
	wantRel := [][]string{nil, {"perpendicular to A"}, {"perpendicular to A", "perpendicular to B"}}
	for i, r := range s.References {
		if r.Kind() != "plane" || r.Constrains != 3-i || r.Contact.Points != 3-i {
			t.Errorf("%s: %s, removes %d, %d points; want plane, %d, %d", r.Ref, r.Kind(), r.Constrains, r.Contact.Points, 3-i, 3-i)
		}
		if r.Precedence != i+1 || r.PrecedenceWord() != []string{"primary", "secondary", "tertiary"}[i] {
			t.Errorf("%s: precedence %d %q", r.Ref, r.Precedence, r.PrecedenceWord())
		}
		var got []string
		for _, rel := range r.Relations {
			got = append(got, rel.Text())
		}
		if strings.Join(got, "; ") != strings.Join(wantRel[i], "; ") {
			t.Errorf("%s: relations %q, want %q", r.Ref, got, wantRel[i])
		}
	}
	if !strings.Contains(s.References[0].Contact.Text, "not on one line") {
		t.Errorf("primary plane contact %q", s.References[0].Contact.Text)
	}
}

// A hole referenced secondary to a face it is square to: at RMB an
// expanding pin touching it at 3 points (a circle: the least a measuring
// machine takes on one, common practice); at MMB a fixed pin whose size is
// the hole's MMC less the perpendicularity at MMC that relates it to A —
// 25 − 0.05 = 24.95, the hole's virtual condition (ASME Y14.5-2018,
// determining MMB, from memory) — needing no contact at all.
func TestSecondaryHoleAtRMBAndMMB(t *testing.T) {
	p := read(t, `feature face plane normal -z at (0, 0, 0)
feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)
feature slot2 slot size 8 +0.1 -0 normal +x at (20, 40, 0)
datum A on face
datum B on bore
frame bore: perpendicularity dia 0.05 (M) datums A
frame slot2: position 0.2 datums A, B
frame slot2: position 0.2 datums A, B(M)
`)
	rmb := setupOf(t, p, 9).References[1]
	if rmb.Kind() != "adjustable cylinder" || rmb.Boundary != material.RFS || rmb.BoundaryWord() != "RMB" {
		t.Errorf("at RMB: %s %s", rmb.Kind(), rmb.BoundaryWord())
	}
	if rmb.Constrains != 2 || rmb.Contact.Points != 3 || !strings.Contains(rmb.Contact.Text, "circle") {
		t.Errorf("at RMB: removes %d, contact %+v", rmb.Constrains, rmb.Contact)
	}
	if !strings.Contains(rmb.Describe(), "expanding pin") {
		t.Errorf("at RMB: %q", rmb.Describe())
	}
	if len(rmb.Relations) != 1 || rmb.Relations[0].Text() != "perpendicular to A" {
		t.Errorf("at RMB: relations %+v", rmb.Relations)
	}

	mmb := setupOf(t, p, 10).References[1]
	e := mmb.Elements[0]
	if mmb.Kind() != "fixed-size cylinder" || mmb.Ref != "B(M)" || mmb.Name != "B" || mmb.BoundaryWord() != "MMB" {
		t.Errorf("at MMB: %s %s %s", mmb.Kind(), mmb.Ref, mmb.BoundaryWord())
	}
	if !e.Fixed || !e.SizeKnown || !near(e.Size, 24.95) || !strings.Contains(e.From, "perpendicularity dia 0.05 (M) to A, line 8") {
		t.Errorf("at MMB: %+v", e)
	}
	if mmb.Contact.Points != 0 || !strings.Contains(mmb.Contact.Text, "datum feature shift") {
		t.Errorf("at MMB: contact %+v", mmb.Contact)
	}
	if !strings.Contains(mmb.Describe(), "fixed pin ⌀24.95") {
		t.Errorf("at MMB: %q", mmb.Describe())
	}
	// B and B(M) need two simulators: two set-ups.
	if s1, s2 := setupOf(t, p, 9), setupOf(t, p, 10); s1 == s2 || s1.Key != "A,B" || s2.Key != "A,B(M)" || s2.Label() != "A, B(M)" {
		t.Errorf("keys %q and %q", s1.Key, s2.Key)
	}
}

// Without a tolerance relating it to A, a pin at MMB is simulated at its
// MMC (a ring ⌀20); with a position tolerance at MMC to A, at its virtual
// condition (MMC + t: the stud 10 + 0.1 = 10.1).
func TestPinBoundary(t *testing.T) {
	p := read(t, `feature face plane normal -z at (0, 0, 0)
feature boss pin size 20 -0 -0.05 axis +z at (0, 0, 0)
feature stud pin size 10 -0 -0.02 axis +z at (40, 0, 0)
feature hole1 hole size 5 +0.1 -0 axis +z at (20, 20, 0)
datum A on face
datum B on boss
datum C on stud
frame stud: position dia 0.1 (M) datums A
frame hole1: position dia 0.2 datums A, B(M)
frame hole1: position dia 0.2 datums A, C(M)
basic 40 from boss to stud
`)
	b := setupOf(t, p, 11).References[1].Elements[0]
	if !near(b.Size, 20) || b.From != "" {
		t.Errorf("B(M) with nothing relating it: %+v, want the MMC 20", b)
	}
	c := setupOf(t, p, 12).References[1]
	if !near(c.Elements[0].Size, 10.1) || !strings.Contains(c.Describe(), "fixed ring ⌀10.1") {
		t.Errorf("C(M) under position ⌀0.1 (M) to A: %+v, %q", c.Elements[0], c.Describe())
	}
}

// A cylinder as primary datum feature removes 4 degrees of freedom; found by
// an adjustable cylinder it needs 5 points (the least a measuring machine
// takes on a cylinder, common practice); a shoulder face square to it then
// stops the slide along the axis with 1 point.
func TestPrimaryAxisAndShoulder(t *testing.T) {
	p := read(t, `feature shaft pin size 20 -0 -0.02 axis +x at (0, 0, 0)
feature shoulder plane normal -x at (0, 0, 0)
feature flat plane normal +z at (30, 0, 10)
datum A on shaft
datum B on shoulder
frame flat: position 0.1 datums A, B
basic 10 from shaft to flat
basic 30 from shoulder to flat
`)
	s := setupOf(t, p, 8)
	a, b := s.References[0], s.References[1]
	if a.Kind() != "adjustable cylinder" || a.Constrains != 4 || a.Contact.Points != 5 || !strings.Contains(a.Contact.Text, "two cross-sections") {
		t.Errorf("A: %s, removes %d, contact %+v", a.Kind(), a.Constrains, a.Contact)
	}
	if !strings.Contains(a.Describe(), "closing collet") {
		t.Errorf("A: %q", a.Describe())
	}
	if b.Constrains != 1 || b.Contact.Points != 1 || b.Relations[0].Text() != "perpendicular to A" {
		t.Errorf("B: removes %d, contact %+v, relations %+v", b.Constrains, b.Contact, b.Relations)
	}
}

// A hole square to a primary face, then a second hole parallel to it 50
// away: the tertiary simulator is located 50 from B and stops only the
// rotation about B, at 2 points on opposite sides.
func TestTertiaryHoleClocks(t *testing.T) {
	p := read(t, `feature face plane normal -z at (0, 0, 0)
feature pivot hole size 10 +0.02 -0 axis +z at (0, 0, 0)
feature clock hole size 6 +0.02 -0 axis +z at (50, 0, 0)
feature tab1 plane normal +y at (25, 30, 5)
datum A on face
datum B on pivot
datum C on clock
frame tab1: surface-profile 0.1 datums A, B, C
basic 50 from pivot to clock
basic 30 from pivot to tab1
basic 25 from pivot to tab1 along +x
`)
	c := setupOf(t, p, 10).References[2]
	if c.Constrains != 1 || c.Contact.Points != 2 || !strings.Contains(c.Contact.Text, "opposite sides") {
		t.Errorf("C: removes %d, contact %+v", c.Constrains, c.Contact)
	}
	var got []string
	for _, r := range c.Relations {
		got = append(got, r.Text())
	}
	if strings.Join(got, "; ") != "perpendicular to A; parallel to B, 50 from it" {
		t.Errorf("C: relations %q", got)
	}
	if r := c.Relations[1]; !r.HasDistance || !near(r.Distance, 50) || r.Orientation != "parallel" || !r.HasAngle || r.Angle != 0 {
		t.Errorf("C to B: %+v", r)
	}
}

// A hole after three planes is located at its basic distances from B and
// C, and square to A.
func TestHoleLocatedFromPlanes(t *testing.T) {
	p := read(t, `feature base  plane normal -z at (0, 0, 0)
feature rear  plane normal -y at (0, 0, 0)
feature left  plane normal -x at (0, 0, 0)
feature bore  hole size 25 +0.05 -0 axis +z at (60, 40, 0)
feature pin1  hole size 6 +0.05 -0 axis +z at (20, 20, 0)
datum A on base
datum B on rear
datum D on bore
frame bore: position dia 0.1 datums A, B
frame pin1: position dia 0.1 datums A, B, D
basic 40 from rear to bore
basic 20 from rear to pin1
basic 40 from bore to pin1 along +x
`)
	d := setupOf(t, p, 12).References[2]
	var got []string
	for _, r := range d.Relations {
		got = append(got, r.Text())
	}
	if strings.Join(got, "; ") != "perpendicular to A; parallel to B, 40 from it" {
		t.Errorf("D: relations %q", got)
	}
	// After A and B, the bore stops the slide along x only: 1 motion, and
	// its expanding pin needs 2 points.
	if d.Constrains != 1 || d.Contact.Points != 2 {
		t.Errorf("D: removes %d, %d points", d.Constrains, d.Contact.Points)
	}
}

// A sphere's centre as primary datum removes the three translations; an
// adjustable sphere needs 4 points (the least a measuring machine takes on
// a sphere, common practice). A width secondary to a face it is square to:
// 2 motions and the width's size, 3 points over both faces.
func TestSphereAndWidth(t *testing.T) {
	p := read(t, `feature cup socket size 12 +0.02 -0 at (0, 0, 0)
feature face plane normal -z at (0, 0, -10)
feature key slot size 6 +0.03 -0 normal +x at (0, 0, -10)
feature lug plane normal +y at (0, 20, 0)
datum A on cup
datum B on face
datum C on key
frame lug: surface-profile 0.1 datums A
frame lug: surface-profile 0.1 datums B, C
basic 20 from cup to lug
basic 10 from face to cup
`)
	a := setupOf(t, p, 10).References[0]
	if a.Kind() != "adjustable sphere" || a.Constrains != 3 || a.Contact.Points != 4 {
		t.Errorf("A: %s removes %d, %d points", a.Kind(), a.Constrains, a.Contact.Points)
	}
	c := setupOf(t, p, 11).References[1]
	if c.Kind() != "adjustable width" || c.Constrains != 2 || c.Contact.Points != 3 || !strings.Contains(c.Contact.Text, "at least one on each") {
		t.Errorf("C: %s removes %d, contact %+v", c.Kind(), c.Constrains, c.Contact)
	}
	if !strings.Contains(c.Describe(), "spread") {
		t.Errorf("C: %q", c.Describe())
	}
	if got := c.Relations[0].Text(); got != "perpendicular to B" {
		t.Errorf("C to B: %q", got)
	}
}

// A pattern of four holes as one datum at MMB: four fixed pins at their
// basic places, each the holes' virtual condition from the position
// tolerance that relates them to A: MMC 8.3 − 0.4 = 7.9 (the floating
// fastener's size, ASME Y14.5-2018, appendix B, from memory).
func TestPatternAtMMB(t *testing.T) {
	p := read(t, `feature base plane normal -z at (0, 0, 0)
feature bolts hole 4x size 8.4 +-0.1 axis +z at (15, 15, 0) (105, 15, 0) (15, 65, 0) (105, 65, 0)
feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)
datum A on base
datum B on bolts
frame bolts: position dia 0.4 (M) datums A
frame bore: position dia 0.1 datums A, B(M)
basic 90 from bolts.1 to bolts.2
basic 50 from bolts.1 to bolts.3
basic 90 from bolts.3 to bolts.4
basic 45 from bolts.1 to bore
basic 25 from bolts.1 to bore along +y
`)
	b := setupOf(t, p, 9).References[1]
	if b.Kind() != "4 fixed-size cylinders" || b.Constrains != 3 || b.Contact.Points != 0 {
		t.Errorf("B: %s removes %d, %d points", b.Kind(), b.Constrains, b.Contact.Points)
	}
	if e := b.Elements[0]; e.Members != 4 || !near(e.Size, 7.9) {
		t.Errorf("B: %+v", e)
	}
	// A pattern has no one place: the relation is its orientation only.
	if r := b.Relations[0]; r.Text() != "perpendicular to A" || r.HasDistance {
		t.Errorf("B to A: %+v", r)
	}
	if !strings.Contains(b.Describe(), "4 of them") {
		t.Errorf("B: %q", b.Describe())
	}
}

// Two coaxial journals as a common datum A-B: one simulator of two
// cylinders held coaxial, each adjusting to its journal: 4 motions and two
// sizes, 6 points over both.
func TestCommonDatum(t *testing.T) {
	p := read(t, `feature j1 pin size 20 -0 -0.02 axis +x at (0, 0, 0)
feature j2 pin size 20 -0 -0.02 axis +x at (100, 0, 0)
feature rotor pin size 60 -0 -0.1 axis +x at (50, 0, 0)
datum A on j1
datum B on j2
frame rotor: total-runout 0.05 datums A-B
`)
	r := setupOf(t, p, 8).References[0]
	if r.Name != "A-B" || r.Shape != Cylinder || len(r.Elements) != 2 || r.Constrains != 4 || r.Contact.Points != 6 {
		t.Errorf("A-B: %s, %d elements, removes %d, %d points", r.Name, len(r.Elements), r.Constrains, r.Contact.Points)
	}
	if !strings.Contains(r.Contact.Text, "over the 2 features") || !strings.Contains(r.Describe(), "common datum A-B, its parts held coaxial: for A on j1, a closing collet") {
		t.Errorf("A-B: %q; %q", r.Contact.Text, r.Describe())
	}
}

// A cone seated at its basic angle removes 5 motions with 5 points; a
// reference that removes nothing needs no contact; an inclined face is at
// its basic angle to the one before.
func TestConeRedundantAndInclined(t *testing.T) {
	p := read(t, `feature base plane normal -z at (0, 0, 0)
feature top  plane normal +z at (0, 0, 12)
feature ramp plane normal (0.5, 0, 0.866025404) at (40, 0, 12)
feature taper cone axis +z at (0, 0, 30)
feature lip plane normal +x at (50, 0, 5)
datum A on base
datum D on top
datum E on ramp
datum G on taper
frame top: parallelism 0.05 datums A, D
frame lip: surface-profile 0.1 datums A, E
frame lip: surface-profile 0.1 datums G
basic 50 from taper to lip
basic 5 from base to lip
`)
	d := setupOf(t, p, 12).References[1]
	if d.Constrains != 0 || d.Contact.Points != 0 || !strings.HasPrefix(d.Contact.Text, "none: ") {
		t.Errorf("D: removes %d, contact %+v", d.Constrains, d.Contact)
	}
	if got := d.Relations[0].Text(); got != "parallel to A, 12 from it" {
		t.Errorf("D to A: %q", got)
	}
	e := setupOf(t, p, 13).References[1]
	if got := e.Relations[0]; got.Orientation != "inclined" || !near(got.Angle, 30) || got.Text() != "at 30° to A" {
		t.Errorf("E to A: %+v %q", got, got.Text())
	}
	g := setupOf(t, p, 14).References[0]
	if g.Kind() != "cone" || g.Constrains != 5 || g.Contact.Points != 5 {
		t.Errorf("G: %s removes %d, %d points", g.Kind(), g.Constrains, g.Contact.Points)
	}
}

// A frame whose datum is not declared has no set-up, and says why; a frame
// without datums needs none.
func TestUnresolvedAndNone(t *testing.T) {
	p := grammar.Read("t.callouts", []byte("units mm\nstandard asme-2018\nfeature face plane normal -z at (0, 0, 0)\n"+
		"feature bore hole size 5 +0.1 -0 axis +z at (5, 5, 0)\ndatum A on face\n"+
		"frame bore: position dia 0.1 datums A, E\nframe face: flatness 0.01\n"))
	res := Analyze(p, nil)
	s := res.Of(p.Frames[0].Upper().Refs)
	if s.Problem != "datum E is not declared" || len(s.References) != 0 {
		t.Errorf("%+v", s)
	}
	if res.Of(p.Frames[1].Upper().Refs) != nil {
		t.Error("a frame without datums has a set-up")
	}
	all, uses := res.Frames()
	if len(all) != 1 || len(uses[all[0]]) != 1 {
		t.Errorf("frames %+v", all)
	}
}

// Frames lists each distinct frame once, in first use, with every segment
// that uses it (a composite lower segment is a frame of its own).
func TestFramesDistinct(t *testing.T) {
	p := read(t, `feature base  plane normal -z at (0, 0, 0)
feature rear  plane normal -y at (0, 0, 0)
feature left  plane normal -x at (0, 0, 0)
feature bore  hole size 25 +0.05 -0 axis +z at (60, 40, 0)
feature bolts hole 4x size 8.4 +-0.1 axis +z at (15, 15, 0) (105, 15, 0) (15, 65, 0) (105, 65, 0)
datum A on base
datum B on rear
datum C on left
frame base: flatness 0.02
frame rear: perpendicularity 0.05 datums A
frame left: perpendicularity 0.05 datums A, B
frame bore: position dia 0.1 (M) datums A, B, C
frame bolts: position dia 0.4 (M) datums A, B, C
    composite dia 0.1 (M) datums A
`)
	all, uses := Analyze(p, nil).Frames()
	var keys []string
	for _, s := range all {
		keys = append(keys, s.Key)
	}
	if strings.Join(keys, " ") != "A A,B A,B,C" {
		t.Errorf("frames %q", keys)
	}
	if n := len(uses[all[0]]); n != 2 {
		t.Errorf("A serves %d segments, want 2 (rear, and the composite lower segment)", n)
	}
	if n := len(uses[all[2]]); n != 2 {
		t.Errorf("A, B, C serves %d segments, want 2", n)
	}
}

// A datum established by targets is simulated at its targets, and each
// letter of a common datum keeps its own boundary (H(M)-J at MMB and RMB).
func TestTargetsAndBoundaryPerLetter(t *testing.T) {
	p := read(t, `feature base plane normal -z at (0, 0, 0)
feature h1 hole size 10 +0.1 -0 axis +z at (20, 20, 0)
feature h2 hole size 10 +0.1 -0 axis +z at (80, 20, 0)
target A1 point on base at (10, 10, 0)
target A2 point on base at (90, 10, 0)
target A3 point on base at (50, 40, 0)
datum A on base
datum H on h1
datum J on h2
frame h1: position dia 0.1 (M) datums A, H(M)-J
`)
	s := setupOf(t, p, 12)
	if s.Problem != "" || len(s.References) != 2 {
		t.Fatalf("set-up %+v", s)
	}
	a, hj := s.References[0], s.References[1]
	if got := a.Describe(); !strings.Contains(got, "each datum target (A1, A2, A3)") || a.Constrains != 3 {
		t.Errorf("A by targets: %q, constrains %d", got, a.Constrains)
	}
	if hj.Ref != "H(M)-J" || hj.Elements[0].Boundary != material.MMC || hj.Elements[1].Boundary != material.RFS {
		t.Errorf("H(M)-J: %q, boundaries %v %v", hj.Ref, hj.Elements[0].Boundary, hj.Elements[1].Boundary)
	}
	if !hj.Elements[0].Fixed || !hj.Elements[1].Adjustable || !hj.Elements[0].SizeKnown {
		t.Errorf("H fixed %v (size known %v), J adjustable %v", hj.Elements[0].Fixed, hj.Elements[0].SizeKnown, hj.Elements[1].Adjustable)
	}
}
