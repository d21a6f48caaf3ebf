// Package setup works out the inspection set-up of each datum reference
// frame of a part: for every datum reference, in precedence order, the
// datum feature simulator an inspector builds or a measuring program
// fits — its kind, its size where the boundary is fixed (MMB or LMB), its
// orientation and location to the simulators before it, and the least
// contact it needs to fix what the reference removes.
//
// The rules it follows, each from memory where the clause was not read:
//
//   - ASME Y14.5-2018, section 7 (datum feature simulators): a datum
//     feature referenced regardless of material boundary (RMB) gets a
//     simulator that adjusts to it — a plane the feature rests on, an
//     expanding pin in a hole, a closing collet on a pin, parallel plates
//     that spread in a slot or close on a tab; one referenced at MMB or LMB
//     gets a simulator of fixed size, the boundary rules/material works out
//     from the feature's size and the tolerances that relate it to the
//     datums before it. Simulators of secondary and tertiary references
//     keep their basic orientation and location to those of higher
//     precedence.
//   - ISO 5459:2011, datum systems: the same in its terms — the associated
//     (situation) features of the datum system are fitted in order, each
//     with orientation and location constraints to those before it where
//     the drawing's theoretically exact dimensions give them; [M] and [L]
//     after a datum letter fix the simulator at the maximum or least
//     material virtual size.
//   - Contact: a simulator that touches the feature only where it must
//     fixes one degree of freedom per point of contact (exact constraint:
//     Slocum, Precision Machine Design, 1992, kinematic couplings), and a
//     simulator that adjusts its size needs one point more to fix its
//     size. So three planes need 3, 2 and 1 points (the 3-2-1 rule of a
//     datum reference frame, ASME Y14.5-2018, section 4, from memory); an
//     axis found by an adjustable cylinder 5 points, a hole square to a
//     primary plane 3, a sphere's centre 4 — the least numbers of points a
//     measuring machine takes on a cylinder, a circle and a sphere (common
//     practice). A fixed-size simulator needs no contact at all: the
//     feature may move inside it, which is the datum feature shift. The
//     simulators of a whole pattern referenced at RMB are taken to grow
//     together, one size for the pattern (from memory), so the pattern
//     adds one point, not one per feature.
//
// The package reads the part model, the kinematic result the frame rules
// and `datumlint dof` read (rules/kinematics), and rules/material. It
// advises; the drawing, the standard's edition and the inspection plan
// decide.
package setup

import (
	"fmt"
	"math"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/kinematics"
	"github.com/datumlint/datumlint/rules/material"
)

// Shape is the shape of a datum feature simulator.
type Shape int

const (
	NoShape Shape = iota
	Plane
	Width     // two parallel planes
	Cylinder  // a pin or a ring
	Sphere    // a ball or a spherical cup
	Cone      // a cone at the basic angle
	Extrusion // the basic profile, extruded along a direction
	Surface   // the basic surface
	Mixed     // a common datum of features of different shapes
)

var shapeNames = [...]string{"unknown", "plane", "width", "cylinder", "sphere", "cone", "extruded shape", "surface", "mixed"}

func (s Shape) String() string {
	if s < 0 || int(s) >= len(shapeNames) {
		return shapeNames[0]
	}
	return shapeNames[s]
}

// ShapeOf is the simulator shape of a datum feature of a kind.
func ShapeOf(k model.Kind) Shape {
	switch k {
	case model.Plane:
		return Plane
	case model.Slot, model.Tab:
		return Width
	case model.Hole, model.Pin:
		return Cylinder
	case model.Socket, model.Ball:
		return Sphere
	case model.Cone:
		return Cone
	case model.Extrusion:
		return Extrusion
	case model.Surface:
		return Surface
	}
	return NoShape
}

// sized reports whether a shape has a size a simulator adjusts or fixes.
func (s Shape) sized() bool { return s == Width || s == Cylinder || s == Sphere }

// Element is the simulator of one datum feature of a reference (a common
// datum A-B has two).
type Element struct {
	Letter  string // the datum letter
	Feature string // the datum feature as the datum names it ("bolts", "bolts.2")
	Kind    model.Kind
	Shape   Shape
	// Members is the number of features the simulator stands for: more
	// than one for a whole pattern used as one datum (ASME Y14.5-2018,
	// patterns of features as datum features, from memory), each at its
	// basic place.
	Members int
	// Internal is true where the feature is internal (a hole, a slot, a
	// socket): the simulator is inside it.
	Internal bool
	// Adjustable is true where the simulator grows or shrinks until it
	// touches the feature: a feature of size referenced at RMB.
	Adjustable bool
	// Fixed is true where the simulator's size (or, for a surface, its
	// place) is fixed by the boundary: a reference at MMB or LMB.
	Fixed bool
	// Size is the fixed simulator's size (a diameter or a width) where
	// SizeKnown; From names what set it: "" for the feature's MMC or LMC
	// alone, or the tolerance whose virtual condition it is.
	Size      float64
	SizeKnown bool
	From      string
	// Ambiguous is set where several tolerances give different boundaries:
	// the drawing should state the boundary's value (rules/material).
	Ambiguous bool
	// Limits are the feature's limits of size, where it is a feature of
	// size with a readable size (HasLimits).
	Limits    material.Size
	HasLimits bool
	// Boundary is the letter's own material boundary: the reference's, or,
	// for a common datum whose letters carry one each (H(M)-J(M)), its own.
	Boundary material.Condition
	// Targets are the labels of the datum targets that establish the
	// datum, where they do ("A1", "A2", "A3"): the simulator is one at
	// each target, not the whole feature.
	Targets []string
}

// Relation is how a simulator stands to one of higher precedence, from the
// nominal geometry (which a drawing gives by basic dimensions).
type Relation struct {
	To string // the earlier reference ("A", "A-B")
	// Orientation is "parallel", "perpendicular", "inclined" (at Angle),
	// "coaxial", "coplanar", or "" where one of them has no direction (a
	// sphere's centre, a surface) or is a pattern of several directions.
	Orientation string
	// Angle is the angle between them in degrees: between two planes or
	// two axes, or between an axis and a plane (0 when they are parallel).
	Angle    float64
	HasAngle bool
	// Distance is the basic distance between them where they are parallel
	// or one of them is a point: plane to plane, axis to plane, axis to
	// axis, centre to anything.
	Distance    float64
	HasDistance bool
}

// Text says the relation in words: "perpendicular to A", "parallel to B,
// 40 from it", "coaxial with A", "at 30° to A", "25 from C".
func (r Relation) Text() string {
	dist := ""
	switch {
	case r.HasDistance && r.Distance != 0:
		dist = ", " + number(r.Distance) + " from it"
	case r.HasDistance && r.Orientation == "parallel":
		// A plane through an axis (a keyway's mid-plane through a bore's
		// axis): parallel at 0 is neither coaxial nor coplanar.
		dist = " and through it"
	}
	switch r.Orientation {
	case "coaxial":
		return "coaxial with " + r.To
	case "coplanar":
		return "coplanar with " + r.To
	case "parallel":
		return "parallel to " + r.To + dist
	case "perpendicular":
		return "perpendicular to " + r.To + dist
	case "inclined":
		return fmt.Sprintf("at %s° to %s%s", number(r.Angle), r.To, dist)
	}
	switch {
	case r.HasDistance && r.Distance == 0:
		return "centred on " + r.To
	case r.HasDistance:
		return number(r.Distance) + " from " + r.To
	}
	return "placed at basic to " + r.To
}

// Contact is the least contact a simulator needs with its datum feature.
type Contact struct {
	// Points is the least number of points of contact; 0 where none is
	// needed (a fixed-size simulator, a reference that removes nothing).
	Points int
	// Text says where the contact falls.
	Text string
}

// Reference is the simulator of one datum reference.
type Reference struct {
	// Ref is the reference as written, with its boundary modifier ("A",
	// "B(M)", "A-B").
	Ref string
	// Name is the reference without its modifier, as `datumlint dof`
	// names it ("A-B").
	Name       string
	Precedence int // 1 primary, 2 secondary, 3 tertiary
	Boundary   material.Condition
	Shape      Shape
	Elements   []Element
	// Relations is how the simulator stands to each earlier one.
	Relations []Relation
	// Together is, for a common datum, how its features stand to one
	// another where they all agree: "coaxial", "coplanar" (ASME Y14.5-2018,
	// common datum features; ISO 5459:2011, common datums; from memory);
	// "" otherwise.
	Together string
	// Constrains is the number of degrees of freedom the reference newly
	// removes (the kinematic engine's count, as in `datumlint dof`).
	Constrains int
	Contact    Contact
}

// PrecedenceWord is "primary", "secondary" or "tertiary".
func (r Reference) PrecedenceWord() string {
	switch r.Precedence {
	case 1:
		return "primary"
	case 2:
		return "secondary"
	case 3:
		return "tertiary"
	}
	return fmt.Sprintf("reference %d", r.Precedence)
}

// BoundaryWord is "RMB", "MMB" or "LMB".
func (r Reference) BoundaryWord() string { return r.Boundary.Boundary() }

// Adjustable reports whether any of the reference's simulators adjusts its
// size to the feature.
func (r Reference) Adjustable() bool {
	for _, e := range r.Elements {
		if e.Adjustable {
			return true
		}
	}
	return false
}

// Fixed reports whether every simulator of the reference is fixed by its
// boundary (MMB or LMB).
func (r Reference) Fixed() bool {
	for _, e := range r.Elements {
		if !e.Fixed {
			return false
		}
	}
	return len(r.Elements) > 0
}

// Kind names the simulator's kind: "plane", "adjustable cylinder",
// "fixed-size width", "cone", "extruded shape", "surface"; for a pattern
// "4 fixed-size cylinders".
func (r Reference) Kind() string {
	word := r.Shape.String()
	if r.Shape.sized() {
		switch {
		case r.Fixed():
			word = "fixed-size " + word
		case r.Adjustable():
			word = "adjustable " + word
		}
	}
	if len(r.Elements) == 1 && r.Elements[0].Members > 1 {
		word = fmt.Sprintf("%d %ss", r.Elements[0].Members, word)
	}
	return word
}

// Setup is the inspection set-up of one datum reference frame.
type Setup struct {
	// Key tells frames apart by their references as written, boundary
	// modifiers included ("A,B(M),C"): the same letters at another
	// boundary need another simulator.
	Key        string
	References []Reference
	// Problem says why the frame could not be worked out ("datum E is not
	// declared"); References is then empty.
	Problem string
}

// Label is the frame as a reader writes it: "A, B(M), C".
func (s *Setup) Label() string { return strings.ReplaceAll(s.Key, ",", ", ") }

// Result holds the set-ups of one part, each distinct frame worked out
// once.
type Result struct {
	part   *model.Part
	kin    *kinematics.Result
	setups map[string]*Setup
}

// Analyze prepares the set-ups of a part; kin is its kinematic result (nil
// for kinematics.Analyze(part)).
func Analyze(part *model.Part, kin *kinematics.Result) *Result {
	if kin == nil {
		kin = kinematics.Analyze(part)
	}
	return &Result{part: part, kin: kin, setups: map[string]*Setup{}}
}

// Key is a reference list as Setup.Key writes it.
func Key(refs []*model.DatumRef) string {
	parts := make([]string, len(refs))
	for i, r := range refs {
		parts[i] = r.Label()
	}
	return strings.Join(parts, ",")
}

// Of returns the set-up of a reference list (nil for an empty one: a frame
// without datums needs no set-up).
func (res *Result) Of(refs []*model.DatumRef) *Setup {
	if len(refs) == 0 {
		return nil
	}
	key := Key(refs)
	if s, ok := res.setups[key]; ok {
		return s
	}
	s := &Setup{Key: key}
	res.setups[key] = s
	if p := kinematics.RefsProblem(refs); p != "" {
		s.Problem = p
		return s
	}
	steps := res.kin.DRF(refs).Steps()
	for k, r := range refs {
		ref := res.reference(r, refs[:k])
		ref.Precedence = k + 1
		if k < len(steps) {
			ref.Constrains = steps[k].Constrains
		}
		ref.Contact = contact(ref)
		s.References = append(s.References, ref)
	}
	return s
}

// Use is one frame segment that a set-up serves.
type Use struct {
	Frame   *model.Frame
	Segment int
}

// Frames returns every distinct datum reference frame of the part's
// frames, in the order they are first used, with the segments that use
// each.
func (res *Result) Frames() ([]*Setup, map[*Setup][]Use) {
	var out []*Setup
	uses := map[*Setup][]Use{}
	for _, fr := range res.part.Frames {
		for i, seg := range fr.Segments {
			s := res.Of(seg.Refs)
			if s == nil {
				continue
			}
			if _, ok := uses[s]; !ok {
				out = append(out, s)
			}
			uses[s] = append(uses[s], Use{fr, i})
		}
	}
	return out, uses
}

// reference works out the simulator of r after the references higher.
func (res *Result) reference(r *model.DatumRef, higher []*model.DatumRef) Reference {
	out := Reference{Ref: r.Label(), Name: strings.Join(r.Letters, "-"), Boundary: material.ConditionOf(r.Material)}
	var letters []string
	for _, h := range higher {
		letters = append(letters, h.Letters...)
	}
	for i, d := range r.Datums {
		f := d.Target.Feature
		mat, _ := r.Boundary(i)
		e := Element{Letter: r.Letters[i], Feature: d.Target.Name, Kind: f.Kind, Shape: ShapeOf(f.Kind),
			Members: len(d.Target.Points()), Internal: f.Kind.Internal(), Boundary: material.ConditionOf(mat)}
		for _, t := range d.Targets {
			e.Targets = append(e.Targets, t.Label)
		}
		e.Limits, e.HasLimits = material.SizeOf(f)
		switch {
		case e.Boundary == material.RFS:
			e.Adjustable = e.Shape.sized() && len(e.Targets) == 0
		default:
			e.Fixed = true
			if e.HasLimits {
				if b, err := material.BoundaryOf(e.Limits, e.Boundary, material.Relations(res.part, f, letters)); err == nil {
					e.Size, e.SizeKnown, e.From, e.Ambiguous = round(b.Size), true, b.From, b.Ambiguous
				}
			}
		}
		if i > 0 && e.Boundary != out.Elements[0].Boundary {
			out.Boundary = material.RFS // the letters differ: each has its own (Element.Boundary)
		} else if i == 0 {
			out.Boundary = e.Boundary
		}
		if i == 0 {
			out.Shape = e.Shape
		} else if e.Shape != out.Shape {
			out.Shape = Mixed
		}
		out.Elements = append(out.Elements, e)
	}
	here := placeOf(r)
	if len(r.Datums) > 1 {
		out.Together = together(res.part, r)
	}
	for _, h := range higher {
		out.Relations = append(out.Relations, relate(res.part, strings.Join(h.Letters, "-"), placeOf(h), here))
	}
	return out
}

// contact works out the least contact a reference's simulator needs.
func contact(r Reference) Contact {
	if r.Constrains == 0 {
		return Contact{Text: "none: this reference removes no motion that the references before it left free"}
	}
	if r.Fixed() {
		return Contact{Text: "none required: the feature may move inside the fixed simulator (datum feature shift); " +
			"the part is held wherever it settles within it"}
	}
	adjust := 0
	for _, e := range r.Elements {
		if e.Adjustable {
			adjust++
		}
	}
	n := r.Constrains + adjust
	c := Contact{Points: n, Text: plural(n, "point")}
	common := len(r.Elements) > 1
	switch {
	case common:
		c.Text += fmt.Sprintf(" in all, over the %d features together, with contact on each", len(r.Elements))
	case r.Shape == Plane && n == 3:
		c.Text += ", not on one line (the feature rests on the plane)"
	case r.Shape == Plane && n == 2:
		c.Text += " along a line, set well apart (a line of contact)"
	case r.Shape == Plane && n == 1:
		c.Text += " (the feature is brought against the plane)"
	case r.Shape == Cylinder && r.Constrains == 4:
		c.Text += ": the simulator closes on the feature along its length, with contact in at least two cross-sections well apart (full contact of a cylinder in practice)"
	case r.Shape == Cylinder && r.Constrains == 2:
		c.Text += " around the feature, as in one cross-section (a circle of contact)"
	case r.Shape == Cylinder && r.Constrains == 1:
		c.Text += ", on opposite sides of the feature, across the direction of the rotation it stops"
	case r.Shape == Width && adjust == 1:
		c.Text += " over both faces, at least one on each"
	case r.Shape == Sphere && r.Constrains == 3:
		c.Text += " around the feature, not all on one circle"
	case r.Shape == Cone:
		c.Text += " around the cone, in at least two cross-sections"
	}
	if r.Elements[0].Members > 1 {
		c.Text += fmt.Sprintf(", shared among the %d features of the pattern", r.Elements[0].Members)
	}
	return c
}

func plural(n int, word string) string {
	if n == 1 {
		return "1 " + word
	}
	return fmt.Sprintf("%d %ss", n, word)
}

// place is the nominal geometry of a reference's first datum feature: a
// plane (normal, point), an axis (direction, point) or a point (a
// centre). A pattern has no single place; a surface none at all.
type place struct {
	kind  int // 0 none, 1 plane, 2 axis, 3 point
	dir   model.Vec
	point model.Vec
	many  bool // a pattern: orientation only
}

func placeOf(r *model.DatumRef) place {
	if len(r.Datums) == 0 {
		return place{}
	}
	return placeOfDatum(r.Datums[0])
}

// together says how the features of a common datum stand to its first:
// "coaxial" or "coplanar" where every one is, "" otherwise.
func together(part *model.Part, r *model.DatumRef) string {
	first := placeOfDatum(r.Datums[0])
	word := ""
	for _, d := range r.Datums[1:] {
		rel := relate(part, "", first, placeOfDatum(d))
		if rel.Orientation != "coaxial" && rel.Orientation != "coplanar" || word != "" && rel.Orientation != word {
			return ""
		}
		word = rel.Orientation
	}
	return word
}

func placeOfDatum(d *model.Datum) place {
	if d == nil || !d.Target.Resolved() {
		return place{}
	}
	t := &d.Target
	f := t.Feature
	pts := t.Points()
	p := place{dir: f.Dir.Unit(), many: len(pts) != 1}
	if len(pts) > 0 {
		p.point = pts[0]
	}
	switch f.Kind {
	case model.Plane, model.Slot, model.Tab:
		p.kind = 1
	case model.Hole, model.Pin, model.Cone, model.Extrusion:
		p.kind = 2
	case model.Socket, model.Ball:
		p.kind = 3
	}
	if (p.kind == 1 || p.kind == 2) && p.dir.Norm() == 0 {
		p.kind = 0
	}
	return p
}

// relate works out how the place b stands to the earlier place a.
func relate(part *model.Part, to string, a, b place) Relation {
	r := Relation{To: to}
	if a.kind == 0 || b.kind == 0 {
		return r
	}
	tol := part.Tolerance()
	if !(tol > 0) {
		tol = 1e-9
	}
	d := b.point.Sub(a.point)
	setDist := func(x float64) {
		if a.many || b.many {
			return
		}
		x = math.Abs(x)
		if x < tol {
			x = 0
		}
		// Six decimals: finer than any drawing's, and a distance worked
		// out through a square root does not print sixteen digits.
		r.Distance, r.HasDistance = math.Round(x*1e6)/1e6, true
	}
	// cos is |cos| of the angle between the two directions.
	cos := math.Min(1, math.Abs(a.dir.Dot(b.dir)))
	const eps = 1e-9
	switch {
	case a.kind == 3 || b.kind == 3:
		// A centre to anything: the distance only.
		switch {
		case a.kind == 1:
			setDist(a.dir.Dot(d))
		case b.kind == 1:
			setDist(b.dir.Dot(d))
		case a.kind == 2:
			setDist(d.Cross(a.dir).Norm())
		case b.kind == 2:
			setDist(d.Cross(b.dir).Norm())
		default:
			setDist(d.Norm())
		}
		return r
	case a.kind == b.kind:
		// Plane to plane, or axis to axis: the angle between normals or
		// axes.
		r.HasAngle = true
		switch {
		case cos > 1-eps:
			r.Orientation = "parallel"
			if a.kind == 1 {
				setDist(a.dir.Dot(d))
			} else {
				setDist(d.Cross(a.dir).Norm())
			}
			if r.HasDistance && r.Distance == 0 {
				r.Orientation = map[int]string{1: "coplanar", 2: "coaxial"}[a.kind]
			}
		case cos < eps:
			r.Orientation, r.Angle = "perpendicular", 90
			if a.kind == 2 {
				// The offset between two square axes (0 where they meet).
				n := a.dir.Cross(b.dir)
				setDist(d.Dot(n) / n.Norm())
			}
		default:
			r.Orientation, r.Angle = "inclined", degrees(math.Acos(cos))
		}
	default:
		// An axis to a plane: square to it when the axis is along the
		// normal, parallel to it when across.
		r.HasAngle = true
		n := a.dir
		if b.kind == 1 {
			n = b.dir
		}
		switch {
		case cos > 1-eps:
			r.Orientation, r.Angle = "perpendicular", 90
		case cos < eps:
			r.Orientation = "parallel"
			setDist(n.Dot(d))
		default:
			r.Orientation, r.Angle = "inclined", 90-degrees(math.Acos(cos))
		}
	}
	return r
}

// round keeps nine decimals, so that 25 − 0.05 is 24.95 and a distance
// worked out from points prints as written.
func round(x float64) float64 {
	x = math.Round(x*1e9) / 1e9
	if x == 0 {
		return 0
	}
	return x
}

// degrees turns radians into degrees to four decimals: a direction written
// to nine digits gives its angle to about 1e-8 degrees, which is noise.
func degrees(rad float64) float64 { return math.Round(rad*180/math.Pi*1e4) / 1e4 }

func number(x float64) string { return fmt.Sprint(round(x)) }

// Describe says what the simulator of a reference is, for a reader: "an
// expanding pin that grows until it touches the hole all round".
func (r Reference) Describe() string {
	if len(r.Elements) == 1 {
		return r.Elements[0].describe(r.Elements[0].Boundary)
	}
	parts := make([]string, len(r.Elements))
	for i, e := range r.Elements {
		parts[i] = fmt.Sprintf("for %s on %s, %s", e.Letter, e.Feature, e.describe(e.Boundary))
	}
	held := "at their basic places to one another"
	if r.Together != "" {
		held = r.Together
	}
	return fmt.Sprintf("one simulator for the common datum %s, its parts held %s: %s", r.Name, held, strings.Join(parts, "; "))
}

func (e Element) describe(b material.Condition) string {
	if len(e.Targets) > 0 {
		// ASME Y14.5-2018, datum targets: a simulator at each target (a
		// pointed or spherical pin, a line, a flat pad of the area's size),
		// at its basic place.
		return fmt.Sprintf("a simulator at each datum target (%s), at its basic place: a pin for a point, a line for a line target, a pad for an area", strings.Join(e.Targets, ", "))
	}
	size := ""
	if e.SizeKnown {
		sign := ""
		if e.Shape == Cylinder {
			sign = "⌀"
		} else if e.Shape == Sphere {
			sign = "S⌀"
		}
		size = " " + sign + number(e.Size)
	}
	what := map[model.Kind][3]string{
		// RMB, MMB, LMB
		model.Hole:   {"an expanding pin (a mandrel) that grows until it touches the hole", "a fixed pin" + size + " that the hole fits over", "a fixed cylinder" + size + " in the material that the hole's surface must not pass (checked by measurement)"},
		model.Pin:    {"a closing collet that shrinks until it touches the pin", "a fixed ring" + size + " that the pin fits into", "a fixed cylinder" + size + " inside the pin that its surface must not pass (checked by measurement)"},
		model.Slot:   {"two parallel plates that spread until they touch both faces of the slot", "a fixed block" + size + " wide that the slot fits over", "two fixed planes" + size + " apart in the material that the slot's faces must not pass (checked by measurement)"},
		model.Tab:    {"two parallel jaws that close until they touch both faces of the tab", "a fixed slot" + size + " wide that the tab fits into", "two fixed planes" + size + " apart inside the tab that its faces must not pass (checked by measurement)"},
		model.Socket: {"an expanding ball that grows until it touches the socket", "a fixed ball" + size + " that the socket fits over", "a fixed sphere" + size + " in the material that the socket must not pass (checked by measurement)"},
		model.Ball:   {"a closing spherical cup that shrinks until it touches the ball", "a fixed spherical cup" + size + " that the ball fits into", "a fixed sphere" + size + " inside the ball that its surface must not pass (checked by measurement)"},
	}
	k := 0
	switch b {
	case material.MMC:
		k = 1
	case material.LMC:
		k = 2
	}
	var s string
	if w, ok := what[e.Kind]; ok {
		s = w[k]
	} else {
		s = map[Shape]string{
			Plane:     "a plane the feature is brought against (a surface plate or a gauge's face)",
			Cone:      "a cone at the basic angle that the feature seats in or on",
			Extrusion: "the basic profile, extruded along its direction",
			Surface:   "the basic surface",
		}[e.Shape]
		if e.Fixed {
			s += ", fixed at its basic place by the " + b.Boundary() + " (the tolerance relating it to the datums before it sets the offset)"
		}
	}
	if s == "" {
		s = "a simulator of the feature's nominal shape"
	}
	if e.Members > 1 {
		s = fmt.Sprintf("%d of them, one in each feature of the pattern %s at its basic place, as one simulator: %s", e.Members, e.Feature, s)
	}
	return s
}
