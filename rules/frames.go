package rules

import (
	"fmt"

	"github.com/datumlint/datumlint/grammar/model"
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
	Run: func(p *Pass) {
		for _, fr := range p.Part.Frames {
			if fr.Characteristic.Category() != model.Form {
				continue
			}
			for _, seg := range fr.Segments {
				if len(seg.Refs) > 0 {
					p.Report(refsSpan(seg.Refs), "%s is a form tolerance and takes no datums: remove 'datums ...' (add a separate orientation or location frame if the feature must relate to a datum)", fr.Characteristic)
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
				((fr.Characteristic == "concentricity" || fr.Characteristic == "symmetry") && p.Part.Standard != model.ASME2018)
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
	Run: func(p *Pass) {
		if p.Part.Standard != model.ASME2018 {
			return
		}
		for _, fr := range p.Part.Frames {
			switch fr.Characteristic {
			case "concentricity":
				p.Report(fr.CharSpan, "ASME Y14.5-2018 has no concentricity: use position (dia zone) for coaxiality, or circular runout, to the same datums")
			case "symmetry":
				p.Report(fr.CharSpan, "ASME Y14.5-2018 has no symmetry: use position of the width (its mid-plane) or profile to the same datums")
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
two parallel planes, in one direction only.`,
	Source: "ASME Y14.5-2018, tolerance zones (diameter symbol, spherical diameter); ISO 1101:2017, tolerance zone shapes",
	Bad:    "feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)\nframe bore: position 0.1 datums A, B, C",
	Good:   "feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)\nframe bore: position dia 0.1 datums A, B, C",
	Run: func(p *Pass) {
		for _, fr := range p.Part.Frames {
			if !fr.Target.Resolved() || fr.Target.Feature.Broken {
				continue
			}
			k := fr.Target.Feature.Kind
			for _, seg := range fr.Segments {
				if seg.Tree != nil && seg.Tree.Zone != nil && seg.Zone == "" {
					continue // the word in the zone's place is reported already
				}
				if msg := zoneProblem(fr.Characteristic, k, seg.Zone); msg != "" {
					sp := seg.ZoneSpan
					if sp.IsZero() {
						sp = seg.ValueSpan
					}
					p.Report(sp, "%s", msg)
				}
			}
		}
	},
})

func zoneProblem(c model.Characteristic, k model.Kind, zone string) string {
	cat := c.Category()
	axial := k.IsCylinder() || k == model.Cone
	switch zone {
	case "dia":
		switch {
		case k.IsSphere() && cat == model.Location:
			return fmt.Sprintf("the centre of a %s has a spherical zone: write sdia instead of dia", k)
		case cat == model.Runout || cat == model.Profile:
			return fmt.Sprintf("%s has no cylindrical zone: remove dia", c)
		case c == "flatness" || c == "circularity" || c == "cylindricity":
			return fmt.Sprintf("%s has a zone between two surfaces, not a cylinder: remove dia", c)
		case c == "straightness" && !axial:
			return fmt.Sprintf("straightness of a %s's surface lines has a zone between two lines: remove dia (dia applies to the axis of a hole or pin)", k)
		case !axial && k != model.KindUnknown && (cat == model.Location || cat == model.Orientation):
			return fmt.Sprintf("a %s has no axis, so its %s zone cannot be a cylinder: remove dia (the zone is two parallel planes)", k, c)
		}
	case "sdia":
		if !(k.IsSphere() && cat == model.Location) {
			return fmt.Sprintf("a spherical zone (sdia) belongs to the position of a sphere's centre, not to %s of a %s", c, k)
		}
	case "":
		if c == "position" && axial && k != model.Cone {
			return fmt.Sprintf("the position of a %s is normally a cylindrical zone about its axis: write dia before the value (without it the zone is two parallel planes)", k)
		}
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
location of a feature of size.`,
	Source: "ASME Y14.5-2018, material condition modifiers, runout (RFS only), datum features at MMB/LMB; ISO 2692:2014; ISO 1101:2017",
	Bad:    "feature base plane normal -z at (0, 0, 0)\nframe base: flatness 0.02 (M)",
	Good:   "feature base plane normal -z at (0, 0, 0)\nframe base: flatness 0.02",
	Run:    runModifierIllegal,
})

func runModifierIllegal(p *Pass) {
	for _, fr := range p.Part.Frames {
		c, cat := fr.Characteristic, fr.Characteristic.Category()
		tgt := fr.Target.Feature
		known := fr.Target.Resolved() && !tgt.Broken && tgt.Kind != model.KindUnknown
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
					case c == "concentricity" || c == "symmetry":
						p.Report(m.Span, "%s applies regardless of feature size: remove (%s)", c, m.Letter)
					case c == "circularity" || c == "cylindricity":
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
				if r.Material == "" || !r.Resolved() {
					continue
				}
				for _, d := range r.Datums {
					f := d.Target.Feature
					// A face of a width at MMB/LMB is midplane-ambiguous's finding.
					if f.Broken || f.Kind == model.KindUnknown || f.Kind.IsFOS() || widthOfFace(p, f) != nil {
						continue
					}
					if ok, why := boundaryAllowed(p, d, fr); !ok {
						p.Report(r.MatSpan, "datum %s is on the %s '%s', which is not a feature of size, so it has no %s boundary: %s", d.Letter, f.Kind, f.Name, map[string]string{"M": "maximum material", "L": "least material"}[r.Material], why)
					}
				}
			}
		}
	}
}

// boundaryAllowed decides whether a surface datum feature may be referenced
// at MMB or LMB: under ASME Y14.5-2009 and later, a surface located by basic
// dimensions and a position or profile tolerance to datums of higher
// precedence has a boundary (ASME Y14.5-2018, datum features at MMB applied
// to surfaces). The basic-dimension engine's check that the location is
// fully basic is added by the basic-dimension rules.
func boundaryAllowed(p *Pass, d *model.Datum, in *model.Frame) (bool, string) {
	if !p.Part.Standard.IsASME() {
		return false, "remove the modifier (ISO 2692 applies the maximum material requirement to datum features of size)"
	}
	f := d.Target.Feature
	for _, fr := range p.Part.FramesOn(f) {
		cat := fr.Characteristic.Category()
		if (fr.Characteristic == "position" || cat == model.Profile) && len(fr.Upper().Refs) > 0 && !refersTo(fr, d.Letter) {
			if locatedByBasics(p, f, fr) {
				return true, ""
			}
		}
	}
	return false, fmt.Sprintf("remove the modifier, or locate %s with basic dimensions and a profile or position tolerance to the higher-precedence datums", f.Name)
}

// locatedByBasics is replaced by the basic-dimension engine's answer when
// that engine is linked in; by default a located tolerance is taken as
// locating the surface.
var locatedByBasics = func(p *Pass, f *model.Feature, fr *model.Frame) bool { return true }

func refersTo(fr *model.Frame, letter string) bool {
	for _, seg := range fr.Segments {
		for _, r := range seg.Refs {
			for _, l := range r.Letters {
				if l == letter {
					return true
				}
			}
		}
	}
	return false
}
