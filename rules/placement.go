package rules

import (
	"fmt"

	"github.com/datumlint/datumlint/grammar/model"
)

// MidplaneAmbiguous reports a datum whose target, placement or use
// contradict each other on whether it means a surface or a feature of
// size's mid-plane, axis or centre.
var MidplaneAmbiguous = Register(&Rule{
	ID:       "midplane-ambiguous",
	Summary:  "a datum whose target or placement contradicts how it is used: surface vs mid-plane or axis",
	Severity: Warning,
	Rationale: `Where a datum feature symbol is drawn decides what it means. In line with a size dimension
(or on the frame of a feature of size) it designates the feature of size, so the datum is its
mid-plane, axis or centre; offset onto the surface or onto an extension line, clear of the
dimension line, it designates that surface (ASME also reads a symbol on a cylinder's outline as
its axis; the notation records that intent as on-dimension-line, so datumlint asks for it). A file that attaches the letter to one face of a
width but records the symbol in line with the width's size dimension, or attaches it to a width
but records it on a surface, says two different things, and the inspector will set the part up
on one of them. The same confusion shows when a face of a width is referenced at MMB or LMB
(only a feature of size, or under ASME a surface located by a profile or position tolerance,
has a material boundary), when the two faces of one width carry separate letters and are used
together in one frame (together they are the width, whose datum is its mid-plane), or when the
symbol is recorded on a frame that the feature does not have. Each finding says which reading
the file gives and how to write the other.`,
	Source: "ASME Y14.5-2018, datum feature symbol placement (features of size versus surfaces; from memory, section 7); ISO 5459:2011, indication of datum features; MMB on surfaces: ASME Y14.5-2018",
	Bad: `feature slot_left plane normal -x at (40, 0, 0)
feature slot_right plane normal +x at (50, 0, 0)
feature slot slot size 10 +-0.05 between slot_left slot_right
datum C on slot_left placed on-dimension-line`,
	Good: `feature slot_left plane normal -x at (40, 0, 0)
feature slot_right plane normal +x at (50, 0, 0)
feature slot slot size 10 +-0.05 between slot_left slot_right
datum C on slot placed on-dimension-line`,
	Run: runMidplaneAmbiguous,
})

// widthOfFace returns the width (slot or tab) that names the plane as one
// of its faces with 'between' (the first in file order), or nil.
func widthOfFace(p *Pass, f *model.Feature) *model.Feature {
	if f == nil || f.Kind != model.Plane {
		return nil
	}
	return widthsOfFaces(p)[f]
}

// widthsOfFaces maps each plane to the first width that names it with
// 'between', built once per file: looking through every feature for each
// datum reference made a part of n features cost n².
func widthsOfFaces(p *Pass) map[*model.Feature]*model.Feature {
	return Memo(p.Facts, "placement.widthsOfFaces", func() map[*model.Feature]*model.Feature {
		out := map[*model.Feature]*model.Feature{}
		for _, w := range p.Part.Features {
			if w.Broken || !w.Kind.IsWidth() {
				continue
			}
			for _, fc := range w.Faces {
				if fc != nil && fc.Feature != nil && fc.Member == nil && out[fc.Feature] == nil {
					out[fc.Feature] = w
				}
			}
		}
		return out
	})
}

// gives names what a datum on a feature of size is, for messages.
func gives(k model.Kind) string {
	switch {
	case k.IsWidth():
		return "mid-plane"
	case k.IsCylinder():
		return "axis"
	case k.IsSphere():
		return "centre"
	}
	return k.DatumGives()
}

func runMidplaneAmbiguous(p *Pass) {
	usable := func(d *model.Datum) bool {
		return d != nil && !d.Broken && d.Target.Resolved() && !d.Target.Feature.Broken && d.Target.Feature.Kind != model.KindUnknown
	}
	for _, d := range p.Part.Datums {
		if usable(d) {
			placementContradiction(p, d)
		}
	}

	// Uses in frames: faces at MMB or LMB, and both faces of one width
	// used together. One finding per datum and kind of contradiction.
	atBoundary := map[*model.Datum]bool{}
	bothFaces := map[*model.Datum]bool{}
	for _, fr := range p.Part.Frames {
		for _, seg := range fr.Segments {
			faceOf := map[*model.Feature]*model.Datum{} // width -> first face datum seen
			for _, r := range seg.Refs {
				for _, d := range r.Datums {
					if !usable(d) || d.Target.Member != nil {
						continue
					}
					f := d.Target.Feature
					w := widthOfFace(p, f)
					if w == nil {
						continue
					}
					if r.Material != "" && !atBoundary[d] {
						// modifier-illegal leaves faces of a width to this
						// rule, so that one finding explains the mix-up.
						if ok, _ := boundaryAllowed(p, d, fr); !ok {
							atBoundary[d] = true
							bound := map[string]string{"M": "MMB", "L": "LMB"}[r.Material]
							p.Report(d.LetterSpan, "datum %s is on the face '%s' of the %s '%s' and is referenced at %s (line %d), but a single face has no material boundary, only the width has: attach the letter to the width, `datum %s on %s` (its mid-plane, which may be referenced at %s), or remove (%s)",
								d.Letter, f.Name, w.Kind, w.Name, bound, r.Span.Start.Line, d.Letter, w.Name, bound, r.Material)
						}
					}
					other := faceOf[w]
					if other == nil {
						faceOf[w] = d
						continue
					}
					if other.Target.Feature != f && !bothFaces[d] {
						bothFaces[d] = true
						p.Report(d.LetterSpan, "datums %s and %s are on the two faces '%s' and '%s' of the %s '%s' and are used together (line %d): each letter designates one surface, but together they stand for the width, whose datum is its mid-plane; to mean the mid-plane write one letter on the width, `datum %s on %s`, and reference it alone",
							other.Letter, d.Letter, other.Target.Name, f.Name, w.Kind, w.Name, r.Span.Start.Line, other.Letter, w.Name)
					}
				}
			}
		}
	}
}

// placementContradiction reports a datum whose recorded placement
// contradicts its target.
func placementContradiction(p *Pass, d *model.Datum) {
	f := d.Target.Feature
	switch d.Placement {
	case "on-dimension-line":
		// In line with a size dimension: the feature of size's mid-plane,
		// axis or centre (ASME Y14.5-2018, datum feature symbol placement).
		if w := widthOfFace(p, f); w != nil {
			p.Report(d.LetterSpan, "datum %s is on the face '%s' of the %s '%s' but is drawn in line with the size dimension, which means the mid-plane: write `datum %s on %s` for the mid-plane, or place it `on-surface` for the face",
				d.Letter, f.Name, w.Kind, w.Name, d.Letter, w.Name)
			return
		}
		if f.Kind == model.Plane || f.Kind == model.Surface {
			p.Report(d.LetterSpan, "datum %s is on the %s '%s', which has no size dimension, but is drawn in line with a dimension line, where the symbol designates a feature of size (its mid-plane or axis): place it `on-surface` for the surface, or declare the width it belongs to (e.g. `feature NAME tab size ... between %s OTHER-FACE`) and attach the letter to it",
				d.Letter, f.Kind, f.Name, f.Name)
		}
	case "on-surface", "on-extension-line":
		// Offset onto the surface or an extension line: that surface.
		if !f.Kind.IsFOS() {
			return
		}
		other := "attach the letter to one of its faces, declared as a plane"
		if f.Kind.IsWidth() && f.Faces[0].Resolved() {
			other = fmt.Sprintf("attach the letter to one face, e.g. `datum %s on %s placed %s`", d.Letter, f.Faces[0].Name, d.Placement)
		} else if f.Kind.IsCylinder() {
			// ASME Y14.5 also lets a symbol on a cylinder's outline mean
			// its axis (from memory: ASME Y14.5-2009, 4.3.3); the contract
			// reads on-surface as the surface, so ask for one reading.
			other = "declare a flat face as a plane and attach the letter to it (ASME Y14.5 also lets a symbol on a cylinder's outline mean its axis: if that is the drawing's intent, on-dimension-line records it unambiguously)"
		} else if !f.Kind.IsWidth() {
			other = "a single surface of a " + f.Kind.String() + " is not a datum the notation can name; if a flat face was meant, declare it as a plane and attach the letter to it"
		}
		p.Report(d.LetterSpan, "datum %s is on the %s '%s', which means its %s, but is placed %s, which designates a surface: place it `on-dimension-line` (in line with the size dimension) for the %s; for a surface, %s",
			d.Letter, f.Kind, f.Name, gives(f.Kind), d.Placement, gives(f.Kind), other)
	case "on-frame":
		// Under a control frame of the feature: there must be one.
		if len(framesOnDatum(p.Part, &d.Target)) == 0 {
			p.Report(d.LetterSpan, "datum %s is placed on-frame, under a control frame of '%s', but '%s' has no frame: add the frame it hangs from, or record where the symbol is drawn (on-surface for the surface, on-dimension-line for a feature of size)",
				d.Letter, d.Target.Name, d.Target.Name)
		}
	}
}
