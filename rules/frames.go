package rules

import (
	"fmt"
	"math"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// DatumsForbidden reports a form tolerance with datums.
var DatumsForbidden = Register(&Rule{
	ID:       "datums-forbidden",
	Summary:  "a form tolerance (straightness, flatness, circularity, cylindricity) with datums",
	Severity: Error,
	Rationale: `Form tolerances control a feature's shape against itself: the tolerance zone floats and is
related to no datum. A datum reference in a form frame has no meaning; if the feature must
also be oriented or located to a datum, that is a separate orientation, profile or position
tolerance.`,
	Source: "ASME Y14.5-2018, form tolerances (not related to datums); ISO 1101:2017, form tolerances have no datum",
	Bad:    "frame base: flatness 0.02 datums A",
	Good:   "frame base: flatness 0.02",
	Fix:    "remove the datum references",
	Run: func(p *Pass) {
		for _, fr := range p.Part.Frames {
			if fr.Characteristic.Category() != model.Form {
				continue
			}
			for _, seg := range fr.Segments {
				if len(seg.Refs) > 0 {
					p.ReportDiagnostic(Diagnostic{Span: seg.RefsSpan(),
						Message: fmt.Sprintf("%s is a form tolerance and takes no datums: remove 'datums ...' (add a separate orientation or location frame if the feature must relate to a datum)", fr.Characteristic),
						Fixes:   []Fix{{Message: "remove the datum references", Edits: []Edit{deleteWithBlankBefore(p.Part.Source, seg.DatumsSpan)}}}})
				}
			}
		}
	},
})

// DatumsRequired reports an orientation or runout tolerance without datums.
var DatumsRequired = Register(&Rule{
	ID:       "datums-required",
	Summary:  "an orientation or runout tolerance without datums",
	Severity: Error,
	Rationale: `Orientation (angularity, perpendicularity, parallelism) is always relative to a datum, and
runout is measured while the part turns about a datum axis. Without a datum reference the
tolerance has nothing to be perpendicular to or to turn about. The same holds for
concentricity and symmetry where the edition still has them.`,
	Source: "ASME Y14.5-2018, orientation tolerances and runout (datum reference required); ISO 1101:2017",
	Bad:    "frame rear: perpendicularity 0.05",
	Good:   "frame rear: perpendicularity 0.05 datums A",
	Run: func(p *Pass) {
		for _, fr := range p.Part.Frames {
			cat := fr.Characteristic.Category()
			// Concentricity and symmetry need datums too where the edition
			// has them; under asme-2018 characteristic-withdrawn already
			// reports the frame, so it is not reported twice.
			needs := cat == model.Orientation || cat == model.Runout ||
				((fr.Characteristic == model.Concentricity || fr.Characteristic == model.Symmetry) && p.Part.Standard != model.ASME2018)
			if needs && len(fr.Upper().Refs) == 0 {
				p.Report(fr.CharSpan, "%s needs at least one datum reference: add e.g. 'datums A' naming the feature it relates to", fr.Characteristic)
			}
		}
	},
})

// CharacteristicWithdrawn reports a characteristic the edition no longer has.
var CharacteristicWithdrawn = Register(&Rule{
	ID:       "characteristic-withdrawn",
	Summary:  "a characteristic the selected edition no longer has",
	Severity: Error,
	Rationale: `ASME Y14.5-2018 withdrew concentricity and symmetry: coaxial and symmetrical features are
controlled with position, runout or profile instead. ASME Y14.5-2009 and ISO 1101 still have
both.`,
	Source: "ASME Y14.5-2018, foreword and section 1 (concentricity and symmetry removed); ISO 1101:2017 keeps them",
	Bad:    "standard asme-2018\nframe hub: concentricity dia 0.05 datums A",
	Good:   "standard asme-2018\nframe hub: position dia 0.05 datums A",
	Fix:    "write position in its place, with dia for the coaxiality of a cylinder",
	Run: func(p *Pass) {
		if p.Part.Standard != model.ASME2018 {
			return
		}
		for _, fr := range p.Part.Frames {
			switch fr.Characteristic {
			case model.Concentricity:
				edits := []Edit{replace(fr.CharSpan, string(model.Position))}
				if up := fr.Upper(); up.Zone == "" && up.ZoneText == "" && fr.Target.Known() && fr.Target.Feature.Kind.IsCylinder() {
					edits = append(edits, insertAt(up.ValueSpan.Start, "dia "))
				}
				p.ReportDiagnostic(Diagnostic{Span: fr.CharSpan,
					Message: "ASME Y14.5-2018 has no concentricity: use position (dia zone) for coaxiality, or circular runout, to the same datums",
					Fixes:   []Fix{{Message: "use position to the same datums", Edits: edits}}})
			case model.Symmetry:
				p.ReportDiagnostic(Diagnostic{Span: fr.CharSpan,
					Message: "ASME Y14.5-2018 has no symmetry: use position of the width (its mid-plane) or profile to the same datums",
					Fixes:   []Fix{{Message: "use position of the width to the same datums", Edits: []Edit{replace(fr.CharSpan, string(model.Position))}}}})
			}
		}
	},
})

// ToleranceValue reports a zero or negative tolerance.
var ToleranceValue = Register(&Rule{
	ID:       "tolerance-value",
	Summary:  "a tolerance that is zero or negative (zero allowed only with (M) or (L))",
	Severity: Error,
	Rationale: `A tolerance zone must have a size. Zero is meaningful only at a material condition
(zero tolerance at MMC or LMC), where the whole tolerance comes from the bonus as the feature
departs from that condition.`,
	Source: "ASME Y14.5-2018, zero tolerance at MMC / LMC; ISO 2692:2014",
	Bad:    "frame bore: position dia 0 datums A, B, C",
	Good:   "frame bore: position dia 0 (M) datums A, B, C",
	Run: func(p *Pass) {
		for _, fr := range p.Part.Frames {
			for _, seg := range fr.Segments {
				_, m := seg.Modifier("M")
				_, l := seg.Modifier("L")
				switch {
				case seg.Value < 0:
					p.Report(seg.ValueSpan, "a tolerance cannot be negative (%g): write the zone's size", seg.Value)
				case seg.Value == 0 && !m && !l:
					p.Report(seg.ValueSpan, "a zero tolerance leaves no zone: give a tolerance, or write zero at a material condition, e.g. 0 (M)")
				}
				for _, mod := range seg.Modifiers {
					if mod.HasValue && ((mod.Letter == "P" && mod.Value <= 0) || (mod.Letter == "U" && mod.Value < 0)) {
						p.Report(mod.Span, "(%s) takes a positive value, found %g", mod.Letter, mod.Value)
					}
				}
				if u := seg.PerUnit; u != nil && (u.Length <= 0 || u.Area && u.Width <= 0) {
					p.Report(u.Span, "the unit a tolerance applies per is a positive length or area, found %s", u.Text)
				}
			}
		}
	},
})

// ZoneShape reports a diameter symbol where the zone cannot be cylindrical,
// and a hole or pin positioned without one.
var ZoneShape = Register(&Rule{
	ID:       "zone-shape",
	Summary:  "`dia` on a zone that cannot be cylindrical, or position of a hole or pin without `dia`",
	Severity: Warning,
	Rationale: `The diameter symbol makes a tolerance zone cylindrical; it belongs to zones about an axis
(a hole's or pin's axis under position, orientation or straightness of the axis). A surface,
a width's mid-plane or a form tolerance of a surface has a zone between two parallel planes
or surfaces, and a sphere's centre a spherical zone (sdia). Conversely, the position of a
hole or pin is nearly always meant as a cylindrical zone; without dia it is a zone between
two parallel planes, in one direction only. That is right where the frame says which direction
(bidirectional positional tolerancing: one frame per direction, each written with
'along DIR', a direction across the axis), and such a frame is not reported; a direction on a
cylindrical zone, on another characteristic or across the wrong line is. A QIF document that
states the zone outright as two parallel planes (NonDiametricalZone) without their direction
meant the planes, so that is information asking for the direction, not a warning. Two cases are
characteristic-mismatch's finding instead, so that one mistake gives one finding: dia on the
orientation of a feature without an axis, and any zone of a form characteristic on a kind it
does not apply to (flatness dia on a pin).`,
	Source:  "ASME Y14.5-2018, tolerance zones (diameter symbol, spherical diameter); ISO 1101:2017, tolerance zone shapes; bidirectional positional tolerancing (ASME Y14.5-2018, from memory)",
	Bad:     "feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)\nframe bore: position 0.1 datums A, B, C",
	Good:    "feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)\nframe bore: position dia 0.1 datums A, B, C",
	Fix:     "write dia (or sdia) where the zone must be one, remove it where it cannot be",
	FixSafe: true,
	Run: func(p *Pass) {
		for _, fr := range p.Part.Frames {
			if !fr.Target.Resolved() || fr.Target.Feature.Broken {
				continue
			}
			k := fr.Target.Feature.Kind
			if k.IsElement() {
				continue // a point, line or circle has no frame requirements of its own
			}
			if formMismatch(fr.Characteristic, k) != "" {
				continue // the characteristic itself is wrong: characteristic-mismatch
			}
			for _, seg := range fr.Segments {
				if seg.ZoneText != "" && seg.Zone == "" {
					continue // the word in the zone's place is reported already
				}
				if seg.ZoneDir != nil {
					if msg := zoneDirProblem(fr, seg); msg != "" {
						p.Report(seg.ZoneDirSpan, "%s", msg)
					}
					continue
				}
				if msg, to := zoneProblem(fr.Characteristic, k, seg.Zone); msg != "" {
					if seg.PlanesStated && to == "dia" {
						// Two parallel planes stated outright (QIF): meant,
						// not a forgotten dia; only their direction is not said.
						p.Inform(seg.ZoneSpan, nil, "the position of the %s %s is toleranced in a zone of two parallel planes without their direction: give the zone's direction (a ZoneOrientationVector, `along DIR` in the notation) so that it is defined which way the planes lie (bidirectional positional tolerancing)", k, fr.Target.Name)
						continue
					}
					sp := seg.ZoneSpan
					var e Edit
					switch {
					case sp.IsZero():
						sp, e = seg.ValueSpan, insertAt(seg.ValueSpan.Start, to+" ")
					case to == "":
						e = deleteWithBlankAfter(p.Part.Source, sp)
					default:
						e = replace(sp, to)
					}
					fix := "write " + to
					if to == "" {
						fix = "remove " + seg.Zone
					}
					p.ReportDiagnostic(Diagnostic{Span: sp, Message: msg, Fixes: []Fix{{Message: fix, Safe: true, Edits: []Edit{e}}}})
				}
			}
		}
	},
})

// zoneProblem says what is wrong with a segment's zone word, and the word
// that would be right in its place ("" for none).
func zoneProblem(c model.Characteristic, k model.Kind, zone string) (msg, to string) {
	cat := c.Category()
	axial := k.IsCylinder() || k == model.Cone
	switch zone {
	case "dia":
		switch {
		case k.IsSphere() && cat == model.Location:
			return fmt.Sprintf("the centre of a %s has a spherical zone: write sdia instead of dia", k), "sdia"
		case cat == model.Runout || cat == model.Profile:
			return fmt.Sprintf("%s has no cylindrical zone: remove dia", c), ""
		case c == model.Flatness || c == model.Circularity || c == model.Cylindricity:
			return fmt.Sprintf("%s has a zone between two surfaces, not a cylinder: remove dia", c), ""
		case c == model.Straightness && !axial:
			return fmt.Sprintf("straightness of a %s's surface lines has a zone between two lines: remove dia (dia applies to the axis of a hole or pin)", k), ""
		case !axial && k != model.KindUnknown && cat == model.Location:
			// (On orientation it is characteristic-mismatch's finding.)
			return fmt.Sprintf("a %s has no axis, so its %s zone cannot be a cylinder: remove dia (the zone is two parallel planes)", k, c), ""
		}
	case "sdia":
		if !(k.IsSphere() && cat == model.Location) {
			return fmt.Sprintf("a spherical zone (sdia) belongs to the position of a sphere's centre, not to %s of a %s", c, k), ""
		}
	case "":
		if c == model.Position && axial && k != model.Cone {
			return fmt.Sprintf("the position of a %s is normally a cylindrical zone about its axis: write dia before the value (without it the zone is two parallel planes), or give the direction of that two-plane zone with `along DIR` after the value (bidirectional positional tolerancing)", k), "dia"
		}
	}
	return "", ""
}

// zoneDirProblem says what is wrong with a segment's zone direction (a
// two-plane position zone in one direction), or "".
func zoneDirProblem(fr *model.Frame, seg *model.Segment) string {
	f := fr.Target.Feature
	u := *seg.ZoneDir
	switch {
	case seg.Zone == "dia" || seg.Zone == "sdia":
		return fmt.Sprintf("a %s zone has no direction: remove `along ...` (a zone in one direction is two parallel planes), or remove %s", map[string]string{"dia": "cylindrical", "sdia": "spherical"}[seg.Zone], seg.Zone)
	case fr.Characteristic != model.Position:
		return fmt.Sprintf("a zone direction belongs to position (bidirectional positional tolerancing), not to %s: remove `along ...`", fr.Characteristic)
	case f.Kind.IsCylinder():
		if !f.HasGeometry {
			return ""
		}
		if a := model.AngleBetweenLines(u, f.Dir); math.Abs(a-90) > 1e-6 {
			return fmt.Sprintf("the zone's direction is at %sdeg to the axis of %s: the two planes of the zone contain the axis, so give a direction at right angles to it", strings.TrimSuffix(strings.TrimRight(fmt.Sprintf("%.4f", a), "0"), "."), f.Name)
		}
	case f.Kind.IsWidth():
		if f.HasGeometry && !model.Parallel(u, f.Dir, 1e-6) {
			return fmt.Sprintf("the position zone of the width %s lies along its own normal; the direction given is not that normal: remove `along ...`", f.Name)
		}
	default:
		return fmt.Sprintf("a zone direction applies to the position of a hole or pin; the %s %s has no such zone: remove `along ...`", f.Kind, f.Name)
	}
	return ""
}

// ModifierIllegal reports a modifier where the standard does not allow it.
var ModifierIllegal = Register(&Rule{
	ID:       "modifier-illegal",
	Summary:  "a modifier where the standard does not allow it",
	Severity: Error,
	Rationale: `(M) and (L) apply to features of size, whose size can vary between MMC and LMC: on a
plane or other surface there is no material condition to vary from. Runout, and
concentricity and symmetry where they exist, are regardless of feature size only. A datum
reference at MMB or LMB needs a datum feature with a material boundary: a feature of size,
or (ASME Y14.5-2009 and later) a surface located by basic dimensions and a position or
profile tolerance to datums of higher precedence. Circularity and cylindricity cannot take a
material condition; (U) belongs to profile, and a projected zone (P) to the orientation or
location of a feature of size.

Datum references at MMB or LMB, by characteristic: runout's datums never take them, under any
edition, since the part is turned about a datum axis that is established regardless of
material boundary (ASME Y14.5-2009 and -2018, from memory; under ISO datumlint reads ISO 1101
run-out and ISO 2692 the same way, also from memory). Under ASME Y14.5-2009 concentricity and
symmetry are regardless of feature size and of material boundary, datums included. ISO 2692
allows the maximum material requirement on coaxiality and symmetry datums, and ASME
Y14.5-2018 has neither characteristic, so those are not reported. Orientation, position and
profile may reference datums at MMB or LMB in every edition (ASME Y14.5-2018, datum feature
modifiers; ISO 2692:2014).

Extension: each member of a common datum may carry its own modifier (H(M)-J(M)), and each is
checked as above. The extents all-around and between belong to profile, all-over to surface
profile; a separate requirement to position and profile, the only characteristics with a
simultaneous requirement; a thread's diameter (major-dia, minor-dia) to a threaded feature; a
tolerance per unit length to straightness and the orientation tolerances, per unit area to
flatness.`,
	Source:  "ASME Y14.5-2018, material condition modifiers, runout (RFS and RMB only; from memory, section 12), datum features at MMB/LMB, profile extents (all around, all over, between), simultaneous requirements, screw threads, per unit length and area (the last four from memory); ASME Y14.5-2009, concentricity and symmetry (RFS and RMB only; from memory); ISO 2692:2014; ISO 1101:2017",
	Bad:     "feature base plane normal -z at (0, 0, 0)\nframe base: flatness 0.02 (M)",
	Good:    "feature base plane normal -z at (0, 0, 0)\nframe base: flatness 0.02",
	Fix:     "remove (M) or (L) from a datum reference of runout (and of concentricity or symmetry under asme-2009), which applies regardless of material boundary anyway",
	FixSafe: true,
	Run:     runModifierIllegal,
})

func runModifierIllegal(p *Pass) {
	for _, fr := range p.Part.Frames {
		c, cat := fr.Characteristic, fr.Characteristic.Category()
		tgt := fr.Target.Feature
		known := fr.Target.Known()
		for _, seg := range fr.Segments {
			seen := map[string]bool{}
			for _, m := range seg.Modifiers {
				switch {
				case seen[m.Letter]:
					p.Report(m.Span, "(%s) is written twice in this segment; write it once", m.Letter)
				case (m.Letter == "M" && seen["L"]) || (m.Letter == "L" && seen["M"]):
					p.Report(m.Span, "a tolerance applies at MMC or at LMC, not both: keep (M) or (L)")
				}
				seen[m.Letter] = true
			}
			for _, m := range seg.Modifiers {
				switch m.Letter {
				case "M", "L":
					cond := map[string]string{"M": "MMC", "L": "LMC"}[m.Letter]
					switch {
					case cat == model.Runout:
						p.Report(m.Span, "runout applies regardless of feature size: remove (%s)", m.Letter)
					case c == model.Concentricity || c == model.Symmetry:
						p.Report(m.Span, "%s applies regardless of feature size: remove (%s)", c, m.Letter)
					case c == model.Circularity || c == model.Cylindricity:
						p.Report(m.Span, "%s controls surface elements and cannot be applied at %s: remove (%s)", c, cond, m.Letter)
					case known && !tgt.Kind.IsFOS():
						p.Report(m.Span, "(%s) needs a feature of size; the %s '%s' is not a feature of size and has no size to vary: remove (%s), or put the frame on a feature of size", m.Letter, tgt.Kind, tgt.Name, m.Letter)
					}
				case "U":
					if cat != model.Profile {
						p.Report(m.Span, "(U), the unequally disposed zone, belongs to profile tolerances only")
					}
				case "P":
					if cat == model.Form || cat == model.Runout || cat == model.Profile || (known && !tgt.Kind.IsFOS()) {
						p.Report(m.Span, "a projected tolerance zone (P) applies to the orientation or position of a hole or pin, not to %s of a %s", c, kindWord(tgt))
					}
				}
			}
			for _, r := range seg.Refs {
				if !r.AnyBoundary() || !r.Resolved() {
					continue
				}
				if why := boundaryForbidden(p.Part, c); why != "" {
					// Each modifier written once: A-B(M) has one for both
					// letters, H(M)-J(M) one each.
					done := map[source.Span]bool{}
					for i := range r.Letters {
						mat, sp := r.Boundary(i)
						if mat == "" || done[sp] {
							continue
						}
						done[sp] = true
						p.ReportDiagnostic(Diagnostic{Span: sp,
							Message: fmt.Sprintf("%s: remove (%s) from datum %s", why, mat, r.Name),
							Fixes:   []Fix{{Message: "remove (" + mat + ")", Safe: true, Edits: []Edit{deleteWithBlankBefore(p.Part.Source, sp)}}}})
					}
					continue
				}
				for i, d := range r.Datums {
					mat, sp := r.Boundary(i)
					f := d.Target.Feature
					// A face of a width at MMB/LMB is midplane-ambiguous's finding.
					if mat == "" || !f.Known() || f.Kind.IsFOS() || p.Part.WidthOfFace(f) != nil {
						continue
					}
					if ok, why := boundaryAllowed(p, d, fr); !ok {
						p.Report(sp, "datum %s is on the %s '%s', which is not a feature of size, so it has no %s boundary: %s", d.Letter, f.Kind, f.Name, map[string]string{"M": "maximum material", "L": "least material"}[mat], why)
					}
				}
			}
			if msg := perUnitProblem(c, seg.PerUnit); msg != "" {
				p.Report(seg.PerUnit.Span, "%s", msg)
			}
			if seg.Separate && c != model.Position && cat != model.Profile {
				p.Report(seg.SeparateSpan, "a separate requirement lifts the simultaneous requirement of position and profile; %s has none: remove 'separate'", c)
			}
		}
		frameNoteProblems(p, fr, known)
	}
}

// perUnitProblem says why a tolerance per unit does not suit the
// characteristic, or "": per unit length for straightness and the
// orientation tolerances, per unit area for flatness (ASME Y14.5-2018,
// straightness and flatness per unit length and area; ISO 1101:2017,
// restricted length and area; from memory).
func perUnitProblem(c model.Characteristic, u *model.PerUnit) string {
	if u == nil {
		return ""
	}
	switch {
	case c == model.Straightness && u.Area:
		return fmt.Sprintf("straightness applies per unit length, e.g. 0.01/25; %s is an area", u.Text)
	case c == model.Flatness && !u.Area:
		return fmt.Sprintf("flatness applies per unit area, e.g. 0.005/25x25; %s is a length", u.Text)
	case c == model.Straightness, c == model.Flatness, c.Category() == model.Orientation:
		return ""
	case c.Category() == model.CategoryUnknown:
		return ""
	}
	return fmt.Sprintf("%s takes no tolerance per unit; only straightness (per length), flatness (per area) and orientation tolerances do: remove /%s", c, u.Text)
}

// frameNoteProblems reports a frame's extent or thread diameter where the
// characteristic or the feature does not take it: all around and between
// belong to profile, all over to surface profile (ASME Y14.5-2018, profile:
// all around, all over, between; from memory), a thread diameter to a
// screw thread.
func frameNoteProblems(p *Pass, fr *model.Frame, known bool) {
	c := fr.Characteristic
	switch {
	case fr.Extent == "" || c.Category() == model.CategoryUnknown:
	case c.Category() != model.Profile:
		p.Report(fr.ExtentSpan, "'%s' is the extent of a profile tolerance; %s takes none: remove it, or control the outline with line-profile or surface-profile", fr.Extent, c)
	case fr.Extent == model.AllOver && c != model.SurfaceProfile:
		p.Report(fr.ExtentSpan, "'all-over' belongs to a surface profile; a line profile applies all around its outline: write 'all-around'")
	}
	if fr.ThreadDiameter != "" && known && fr.Target.Feature.Thread == "" {
		p.Report(fr.ThreadDiameterSpan, "'%s' says which diameter of a screw thread the tolerance applies to; %s is not threaded: remove it, or give the feature its thread (thread \"...\")", fr.ThreadDiameter, fr.Target.Name)
	}
}

// boundaryForbidden says why the characteristic takes no datum reference
// at MMB or LMB under the part's edition, or "". Runout is read while the
// part turns about its datum axis, which is established regardless of
// material boundary (ASME Y14.5-2009 and -2018, runout; from memory, 2018
// section 12; ISO 1101:2017 run-out and ISO 2692:2014, which applies the
// material requirements to derived features, not to a run-out setup).
// Concentricity and symmetry under ASME Y14.5-2009 apply regardless of
// feature size and of material boundary (from memory, 2009 sections 7.6.4
// and 7.7.2); ISO 2692 allows the maximum material requirement on
// coaxiality and symmetry, and asme-2018 has neither characteristic
// (characteristic-withdrawn), so those are left alone. Every other
// characteristic that takes datums may reference them at MMB or LMB.
func boundaryForbidden(part *model.Part, c model.Characteristic) string {
	switch {
	case c.Category() == model.Runout:
		return fmt.Sprintf("%s is read while the part turns about its datum axis, which is established regardless of material boundary (%s, runout)", c, editionName(part.Standard))
	case (c == model.Concentricity || c == model.Symmetry) && part.Standard == model.ASME2009:
		return fmt.Sprintf("%s is controlled regardless of feature size and its datums regardless of material boundary (ASME Y14.5-2009)", c)
	}
	return ""
}

// editionName names the governing edition in a message.
func editionName(s model.Standard) string {
	switch s {
	case model.ASME2018:
		return "ASME Y14.5-2018"
	case model.ASME2009:
		return "ASME Y14.5-2009"
	case model.ISO:
		return "ISO 1101"
	}
	return "ASME Y14.5 and ISO 1101"
}

// boundaryAllowed decides whether a surface datum feature may be referenced
// at MMB or LMB: under ASME Y14.5-2009 and later, a surface located by basic
// dimensions and a position or profile tolerance to datums of higher
// precedence has a boundary (ASME Y14.5-2018, datum features at MMB applied
// to surfaces), and the basic-dimension engine says whether the location is
// fully basic.
func boundaryAllowed(p *Pass, d *model.Datum, in *model.Frame) (bool, string) {
	if !p.Part.Standard.IsASME() {
		return false, "remove the modifier (ISO 2692 applies the maximum material requirement to datum features of size)"
	}
	f := d.Target.Feature
	for _, fr := range p.Part.FramesOn(f) {
		if fr.Located() && len(fr.Upper().Refs) > 0 && !fr.RefersTo(d.Letter) {
			if p.Basics().Located(fr) {
				return true, ""
			}
		}
	}
	return false, fmt.Sprintf("remove the modifier, or locate %s with basic dimensions and a profile or position tolerance to the higher-precedence datums", f.Name)
}
