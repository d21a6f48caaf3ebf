package rules

import (
	"fmt"
	"math"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
)

// CharacteristicMismatch reports a characteristic that the nominal geometry
// contradicts.
var CharacteristicMismatch = Register(&Rule{
	ID:       "characteristic-mismatch",
	Summary:  "a characteristic the nominal geometry contradicts: perpendicularity of a parallel feature, form of a kind it does not apply to, runout of an inclined plane, a dia orientation zone on a feature without an axis",
	Severity: Error,
	Rationale: `Each characteristic states a relation that the nominal part must have. Perpendicularity holds a
feature at 90 degrees to its primary datum and parallelism at 0, so perpendicularity of a face
that the model draws parallel to datum A (or parallelism of one drawn at right angles, or either
at another angle) asks for a part that is not the one drawn: the other orientation
characteristic, or angularity with its basic angle, was meant. Angles are those of the
features' elements: a plane or a width by its surface or mid-plane, a hole or pin by its axis;
an axis is parallel to a plane when it is at right angles to the plane's normal. Angularity at a
nominal 0 or 90 degrees is legal, but parallelism or perpendicularity states it directly, so
that finding is information only. Form tolerances apply to the kinds whose form they describe:
cylindricity to a cylinder, circularity to a feature of revolution (a cylinder, cone or
sphere), flatness to a plane or a width's median plane, so cylindricity or circularity on a
plane and flatness on a hole or pin describe nothing. An orientation zone is a cylinder (dia)
only about an axis, so dia on the orientation of a plane or width is reported here (zone-shape
keeps dia on other characteristics). Runout applies to surfaces constructed around the datum
axis and to faces at right angles to it: the runout of a plane whose normal is not along the
datum axis is read on a surface that swings as the part turns, and profile is the control for
it. The angle is checked against the primary datum (for runout, the axis the datums give),
allowing for the rounding of directions written with three or more decimals. Where the angle to
the primary is an implied 0 or 90 degrees, a later datum of the frame may carry the relation
(perpendicularity to A, B of a hole that lies parallel to A and across B), which is not
reported; and angularity is information only where it is at 0 or 90 degrees to every datum it
references (at another angle to a secondary datum it is a compound angle, angularity's own).`,
	Source: "ASME Y14.5-2018, form tolerances (flatness, circularity, cylindricity: the features each applies to), orientation tolerances (parallelism, perpendicularity, angularity at a basic angle) and runout (surfaces around or at right angles to the datum axis), from memory, sections 8, 9 and 12; ISO 1101:2017, the same characteristics",
	Bad: `feature base plane normal -z at (0, 0, 0)
feature top plane normal +z at (0, 0, 10)
datum A on base
frame base: flatness 0.02
frame top: perpendicularity 0.05 datums A`,
	Good: `feature base plane normal -z at (0, 0, 0)
feature top plane normal +z at (0, 0, 10)
datum A on base
frame base: flatness 0.02
frame top: parallelism 0.05 datums A`,
	Fix:     "remove dia from the orientation zone of a feature without an axis",
	FixSafe: true,
	Run:     runCharacteristicMismatch,
})

func runCharacteristicMismatch(p *Pass) {
	for _, fr := range p.Part.Frames {
		if !fr.Target.Known() || p.facts.brokenMentions()[fr.Target.Feature.Name] {
			continue
		}
		f, c, seg := fr.Target.Feature, fr.Characteristic, fr.Upper()
		if msg := formMismatch(c, f.Kind); msg != "" {
			p.Report(fr.CharSpan, "%s: use %s", msg, formFor(f.Kind, seg.Zone))
			continue
		}
		switch c.Category() {
		case model.Orientation:
			if seg.Zone == "dia" && !hasAxis(f.Kind) {
				p.ReportDiagnostic(Diagnostic{Span: seg.ZoneSpan,
					Message: fmt.Sprintf("a %s has no axis, so its %s zone cannot be a cylinder: remove dia (the zone is two parallel planes)", f.Kind, c),
					Fixes:   []Fix{{Message: "remove dia", Safe: true, Edits: []Edit{deleteWithBlankAfter(p.Part.Source, seg.ZoneSpan)}}}})
			}
			orientationMismatch(p, fr)
		case model.Runout:
			runoutMismatch(p, fr)
		}
	}
}

// hasAxis reports whether a kind has an axis a cylindrical zone can be
// about.
func hasAxis(k model.Kind) bool { return k.IsCylinder() || k == model.Cone }

// formMismatch says why a form characteristic does not apply to the kind,
// or "". Straightness applies to line elements of any kind and to a
// cylinder's axis; extrusions and free-form surfaces are left alone, as
// their sections may be anything.
func formMismatch(c model.Characteristic, k model.Kind) string {
	switch c {
	case model.Cylindricity:
		if k.IsCylinder() || k == model.Extrusion || k == model.Surface || k == model.KindUnknown {
			return ""
		}
		return fmt.Sprintf("cylindricity applies to a cylinder (a hole or pin), and a %s is not one", k)
	case model.Circularity:
		if k == model.Plane || k.IsWidth() {
			return fmt.Sprintf("circularity applies to a feature of revolution (a hole, pin, cone or sphere), and a %s has no circular elements", k)
		}
	case model.Flatness:
		if k.IsCylinder() || k.IsSphere() || k == model.Cone {
			return fmt.Sprintf("flatness applies to a plane or a width's median plane, and a %s is not flat", k)
		}
	}
	return ""
}

// formFor names the form control that suits a kind, for a message, and
// says to drop a dia that the control would not take.
func formFor(k model.Kind, zone string) string {
	switch {
	case k.IsCylinder() && zone == "dia":
		return "straightness dia for its axis (or cylindricity, without dia, for its surface)"
	case k.IsCylinder():
		return "cylindricity (or straightness dia for its axis)"
	case zone == "dia":
		return string(formCharFor(k)) + " without dia"
	}
	return string(formCharFor(k))
}

// element is a feature's geometric element for orientation: a plane (a
// plane's surface, a width's mid-plane) by its normal, or a line (an axis)
// by its direction.
type element struct {
	dir    model.Vec
	line   bool
	slack  float64 // degrees its direction may be off by rounding alone
	of     *model.Feature
	exists bool
}

func elementOf(f *model.Feature) element {
	if !f.Known() || !f.HasGeometry || f.Dir.Norm() == 0 {
		return element{}
	}
	e := element{dir: f.Dir, of: f, slack: dirSlack(f), exists: true}
	switch {
	case f.Kind == model.Plane || f.Kind.IsWidth():
	case hasAxis(f.Kind):
		e.line = true
	default:
		return element{}
	}
	return e
}

// refElement is the element a datum reference gives: that of its feature,
// or of every feature of a common datum when they agree (two coaxial
// journals, two coplanar faces).
func refElement(r *model.DatumRef) element {
	var e element
	for i, d := range r.Datums {
		if !d.Usable() {
			return element{}
		}
		ei := elementOf(d.Target.Feature)
		if !ei.exists || i > 0 && (ei.line != e.line || !model.Parallel(ei.dir, e.dir, 1e-6)) {
			return element{}
		}
		if i == 0 {
			e = ei
		}
	}
	return e
}

// angleTo is the angle in degrees, in [0, 90], between two elements: a
// plane and an axis are parallel when the axis is at right angles to the
// plane's normal.
func (e element) angleTo(o element) float64 {
	a := model.AngleBetweenLines(e.dir, o.dir)
	if e.line != o.line {
		a = 90 - a
	}
	return a
}

// dirSlack is how far, in degrees, a feature's written direction may be
// from the one meant by rounding alone: a component written with three or
// more decimals is read as rounded to that digit (as the basic-dimension
// engine reads it), and off by half a unit turns a unit vector by at most
// about √2 times that, in radians. Below that, a microdegree.
func dirSlack(f *model.Feature) float64 {
	u := 0.0
	for _, d := range f.DirDecimals {
		if d >= 3 {
			u = math.Max(u, 0.5*math.Pow(10, -float64(d)))
		}
	}
	return math.Sqrt2*u*180/math.Pi + 1e-6
}

// orientationMismatch reports perpendicularity, parallelism or angularity
// that the nominal angle to the primary datum contradicts. A later datum
// may carry the relation when the primary's angle is an implied 0 or 90
// degrees (a hole parallel to A and perpendicular to B under
// perpendicularity to A, B orients its zone by both; ASME Y14.5-2018,
// orientation tolerances with more than one datum, from memory), so that
// is not reported; and angularity is reported as information only where
// every datum it references is at 0 or 90 degrees (at another angle to a
// secondary datum it is a compound angle, which is angularity's).
func orientationMismatch(p *Pass, fr *model.Frame) {
	refs := fr.Upper().Refs
	if len(refs) == 0 {
		return // datums-required
	}
	fe := elementOf(fr.Target.Feature)
	if !fe.exists {
		return
	}
	type rel struct{ parallel, perpendicular bool }
	var rels []rel
	var ang float64
	for i, r := range refs {
		de := refElement(r)
		if !de.exists || de.of == fe.of {
			if i == 0 {
				return // a self-reference is datum-self-reference's
			}
			continue
		}
		a, slack := fe.angleTo(de), fe.slack+de.slack
		if i == 0 {
			ang = a
		}
		rels = append(rels, rel{a <= slack, a >= 90-slack})
	}
	primary := rels[0]
	implied := primary.parallel || primary.perpendicular
	holds := func(perpendicular bool) bool {
		for i, r := range rels {
			if (i == 0 || implied) && (perpendicular && r.perpendicular || !perpendicular && r.parallel) {
				return true
			}
		}
		return false
	}
	f, c := fr.Target.Feature, fr.Characteristic
	how := fmt.Sprintf("at %s degrees to", trimFloat(ang))
	switch {
	case primary.parallel:
		how = "parallel to"
	case primary.perpendicular:
		how = "perpendicular to"
	}
	what := fmt.Sprintf("the %s '%s' is %s datum %s in the model", kindWord(f), fr.Target.Name, how, refs[0].Name)
	switch c {
	case model.Perpendicularity, model.Parallelism:
		if holds(c == model.Perpendicularity) {
			return
		}
		switch {
		case primary.parallel:
			p.Report(fr.CharSpan, "%s, so %s cannot hold: write `%s`", what, c, frameText(fr, model.Parallelism))
		case primary.perpendicular:
			p.Report(fr.CharSpan, "%s, so %s cannot hold: write `%s`", what, c, frameText(fr, model.Perpendicularity))
		default:
			p.Report(fr.CharSpan, "%s, so %s cannot hold: write `%s`, at the basic angle of %s degrees", what, c, frameText(fr, model.Angularity), trimFloat(ang))
		}
	case model.Angularity:
		for _, r := range rels {
			if !r.parallel && !r.perpendicular {
				return
			}
		}
		switch {
		case primary.parallel:
			p.Inform(fr.CharSpan, nil, "%s: at a nominal 0 degrees parallelism says this directly, `%s`", what, frameText(fr, model.Parallelism))
		case primary.perpendicular:
			p.Inform(fr.CharSpan, nil, "%s: at a nominal 90 degrees perpendicularity says this directly, `%s`", what, frameText(fr, model.Perpendicularity))
		}
	}
}

// runoutMismatch reports runout of a plane whose normal is not along the
// axis the datums give (a face at right angles to the axis is right).
func runoutMismatch(p *Pass, fr *model.Frame) {
	f := fr.Target.Feature
	fe := elementOf(f)
	if f.Kind != model.Plane || !fe.exists || len(fr.Upper().Refs) == 0 {
		return
	}
	an := p.Kinematics().Segment(fr, 0)
	if !an.Resolved {
		return
	}
	axis, ok := turningAxis(an.DRF.Free())
	if !ok {
		return // runout-axis-missing
	}
	ang := model.AngleBetweenLines(f.Dir, axis)
	if ang <= fe.slack+1e-6 {
		return
	}
	how := fmt.Sprintf("inclined at %s degrees to it", trimFloat(90-ang))
	if ang >= 90-fe.slack-1e-6 {
		how = "parallel to it"
	}
	p.Report(fr.CharSpan, "%s of the plane '%s' is read while the part turns about the datum axis, but the plane is %s, not at right angles to it, so its surface swings past the indicator: control it with profile, `%s`",
		fr.Characteristic, fr.Target.Name, how, frameText(fr, model.SurfaceProfile))
}

// frameText writes the frame's upper segment back in the notation with
// another characteristic, for a suggestion.
func frameText(fr *model.Frame, c model.Characteristic) string {
	seg := fr.Upper()
	w := []string{"frame " + fr.Target.Name + ":", string(c)}
	if seg.Zone != "" && !(seg.Zone == "dia" && (c.Category() == model.Profile || !hasAxis(fr.Target.Feature.Kind))) {
		w = append(w, seg.Zone)
	}
	w = append(w, seg.ValueText)
	for _, m := range seg.Modifiers {
		if c.Category() == model.Profile && (m.Letter == "M" || m.Letter == "L") {
			continue
		}
		s := "(" + m.Letter + ")"
		if m.HasValue {
			s += " " + trimFloat(m.Value)
		}
		w = append(w, s)
	}
	if len(seg.Refs) > 0 {
		names := make([]string, len(seg.Refs))
		for i, r := range seg.Refs {
			names[i] = r.Label()
		}
		w = append(w, "datums "+strings.Join(names, ", "))
	}
	return strings.Join(w, " ")
}

// trimFloat writes a number with at most four decimals and no trailing
// zeros.
func trimFloat(x float64) string {
	return strings.TrimSuffix(strings.TrimRight(fmt.Sprintf("%.4f", x), "0"), ".")
}
