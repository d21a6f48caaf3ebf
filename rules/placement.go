package rules

import (
	"fmt"
	"math"

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
the file gives and how to write the other. Where a letter is on one face of a width, with no
placement recorded, and a feature toleranced to that datum lies on the width's mid-plane, the
mid-plane was probably meant (measured from one face, the feature takes half the width's size
tolerance as an error of its location): that is information, since a face datum is legitimate,
and recording the placement (` + "`placed on-surface`" + `) says the face was meant.`,
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
	for _, d := range p.Part.Datums {
		if d.Usable() {
			placementContradiction(p, d)
			faceForMidplane(p, d)
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
				for i, d := range r.Datums {
					if !d.Usable() || d.Target.Member != nil {
						continue
					}
					f := d.Target.Feature
					w := p.Part.WidthOfFace(f)
					if w == nil {
						continue
					}
					mat, _ := r.Boundary(i)
					if mat != "" && !atBoundary[d] {
						// modifier-illegal leaves faces of a width to this
						// rule, so that one finding explains the mix-up.
						if ok, _ := boundaryAllowed(p, d, fr); !ok {
							atBoundary[d] = true
							bound := map[string]string{"M": "MMB", "L": "LMB"}[mat]
							p.ReportRelated(d.LetterSpan, []Related{{r.Span, "referenced at " + bound + " here"}}, "datum %s is on the face '%s' of the %s '%s' and is referenced at %s (line %d), but a single face has no material boundary, only the width has: attach the letter to the width, `datum %s on %s` (its mid-plane, which may be referenced at %s), or remove (%s)",
								d.Letter, f.Name, w.Kind, w.Name, bound, r.Span.Start.Line, d.Letter, w.Name, bound, mat)
						}
					}
					other := faceOf[w]
					if other == nil {
						faceOf[w] = d
						continue
					}
					if other.Target.Feature != f && !bothFaces[d] {
						bothFaces[d] = true
						p.ReportRelated(d.LetterSpan, []Related{{other.LetterSpan, "datum " + other.Letter + " is on the other face"}, {r.Span, "used together here"}}, "datums %s and %s are on the two faces '%s' and '%s' of the %s '%s' and are used together (line %d): each letter designates one surface, but together they stand for the width, whose datum is its mid-plane; to mean the mid-plane write one letter on the width, `datum %s on %s`, and reference it alone",
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
		if w := p.Part.WidthOfFace(f); w != nil {
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

// faceForMidplane informs where a letter is on one face of a width, with
// no placement recorded, and a feature toleranced to that datum lies on the
// width's mid-plane: features drawn symmetrical about a slot are usually
// meant to be centred on it, and measured from one face they take half the
// width's size tolerance as an error of their location (ASME Y14.5-2018,
// datum features of size versus surfaces; from memory). A face datum is
// legitimate, so this informs; recording the placement (`placed
// on-surface`) says the face was meant and silences it.
func faceForMidplane(p *Pass, d *model.Datum) {
	f := d.Target.Feature
	w := f.FaceOf
	if d.Placement != "" || d.Target.Member != nil || w == nil || !w.HasGeometry || w.Broken {
		return
	}
	a, b := w.Faces[0], w.Faces[1]
	if !a.Resolved() || !b.Resolved() || !a.Feature.HasGeometry || !b.Feature.HasGeometry {
		return
	}
	n := w.Dir.Unit()
	mid := n.Dot(a.Feature.Point().Add(b.Feature.Point())) / 2
	tol := p.Part.Tolerance()
	for _, fr := range p.Part.Frames {
		if !refersAlone(fr, d) || !fr.Target.Known() || fr.Target.Feature == f || fr.Target.Feature == w || fr.Target.Feature.FaceOf == w {
			continue
		}
		t := fr.Target.Feature
		if !t.HasGeometry || !(t.Kind.IsCylinder() || t.Kind.IsSphere()) || t.Kind.IsCylinder() && math.Abs(t.Dir.Unit().Dot(n)) > tol {
			continue
		}
		members := t.Members
		if fr.Target.Member != nil {
			members = []*model.Member{fr.Target.Member}
		}
		on := len(members) > 0
		for _, m := range members {
			if math.Abs(n.Dot(m.Point)-mid) > tol {
				on = false
				break
			}
		}
		if !on {
			continue
		}
		p.Inform(d.LetterSpan, []Related{{fr.Target.Span, t.Name + " lies on the mid-plane of " + w.Name}},
			"datum %s is on '%s', one face of the %s '%s', and %s, toleranced to %s (line %d), lies on the %s's mid-plane: if the mid-plane was meant, write `datum %s on %s`; if the face was, record it with `datum %s on %s placed on-surface`",
			d.Letter, f.Name, w.Kind, w.Name, fr.Target.Name, d.Letter, fr.Span.Start.Line, w.Kind, d.Letter, w.Name, d.Letter, f.Name)
		return
	}
}

// refersAlone reports whether a frame references the datum by itself, not
// only as one member of a common datum (two faces' common datum C-D is
// their median plane already: ISO 5459:2011, common datums).
func refersAlone(fr *model.Frame, d *model.Datum) bool {
	for _, seg := range fr.Segments {
		for _, r := range seg.Refs {
			if len(r.Datums) == 1 && r.Datums[0] == d {
				return true
			}
		}
	}
	return false
}
