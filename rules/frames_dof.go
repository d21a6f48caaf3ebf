package rules

import (
	"fmt"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/dof"
	"github.com/datumlint/datumlint/rules/kinematics"
)

// The frame rules built on the kinematic engine (kinematics.go, rules/dof):
// what each datum reference removes, and whether the freedom a frame leaves
// moves its tolerance zone.

// DatumRedundant reports a reference that removes no degree of freedom.
var DatumRedundant = Register(&Rule{
	ID:       "datum-redundant",
	Summary:  "a reference that removes no degree of freedom left by those before it",
	Severity: Error,
	Rationale: `Datum references are applied in precedence order, and each must stop some motion of the part
that the ones before it left free: the primary takes what it can, the secondary some of the
rest, the tertiary what remains. A reference that removes nothing (a plane parallel to the
primary plane, an axis coaxial with the primary axis, anything after a frame that is already
fully fixed) adds a datum feature to contact, inspect and qualify without adding any meaning,
and usually shows that a different feature was intended.`,
	Source: "ASME Y14.5-2018, datum reference frames and degrees of freedom (section 7); ISO 5459:2011, datum systems and invariance classes",
	Bad: `feature base plane normal -z at (0, 0, 0)
feature top  plane normal +z at (0, 0, 10)
feature rear plane normal -y at (0, 0, 0)
feature left plane normal -x at (0, 0, 0)
feature bore hole size 10 +-0.1 axis +z at (20, 20, 0)
datum A on base
datum B on top
datum C on rear
frame bore: position dia 0.1 datums A, B, C`,
	Good: `feature base plane normal -z at (0, 0, 0)
feature rear plane normal -y at (0, 0, 0)
feature left plane normal -x at (0, 0, 0)
feature bore hole size 10 +-0.1 axis +z at (20, 20, 0)
datum A on base
datum B on rear
datum C on left
frame bore: position dia 0.1 datums A, B, C`,
	Fix: "remove the reference",
	Run: func(p *Pass) {
		forEachSegment(p, func(fr *model.Frame, a *kinematics.Segment) {
			steps := a.DRF.Steps()
			for k, st := range steps {
				r := a.Segment.Refs[k]
				if st.Constrains > 0 || repeatsLetters(a.Segment.Refs[:k], r) {
					continue // a repeated letter is datum-duplicate's finding
				}
				msg := redundantReason(a, k, p.Part.Tolerance())
				if isSelfReference(fr, r) {
					// One finding for the slip: say that the datum is the
					// feature's own (datum-self-reference leaves it here).
					msg = fmt.Sprintf("%s is the datum that '%s' itself establishes, so it relates the feature to itself, %s", refName(r), fr.Target.Name, strings.TrimPrefix(msg, refName(r)+" "))
				}
				p.ReportDiagnostic(Diagnostic{Span: r.Span, Message: msg,
					Fixes: []Fix{{Message: "remove datum " + refName(r) + " from the frame", Edits: []Edit{dropRef(p.Part.Source, a.Segment, k)}}}})
			}
		})
	},
})

// FrameUnderconstrained reports a single feature's location zone that a
// free translation moves.
var FrameUnderconstrained = Register(&Rule{
	ID:       "frame-underconstrained",
	Summary:  "a location tolerance (position, or profile with datums) on a single feature, not a pattern or a composite lower segment, whose frame leaves free a translation that moves its zone",
	Severity: Warning,
	Rationale: `A position or located profile tolerance places its zone at the true position given by basic
dimensions from the datums. If the datum reference frame leaves the part free to slide in a
direction that moves the zone, the basic dimensions along that direction start from nothing:
the feature's location is not controlled along it and different inspectors will fixture the part
differently. A pattern of features, or the lower segment of a composite frame, may float
deliberately; a single feature's zone should not.`,
	Source: "ASME Y14.5-2018, position tolerancing and datum reference frames (sections 7 and 10); ISO 5458:2018 and ISO 5459:2011",
	Bad: `feature base plane normal -z at (0, 0, 0)
feature bore hole size 10 +-0.1 axis +z at (20, 20, 0)
datum A on base
frame bore: position dia 0.1 datums A`,
	Good: `feature base plane normal -z at (0, 0, 0)
feature rear plane normal -y at (0, 0, 0)
feature left plane normal -x at (0, 0, 0)
feature bore hole size 10 +-0.1 axis +z at (20, 20, 0)
datum A on base
datum B on rear
datum C on left
frame bore: position dia 0.1 datums A, B, C`,
	Run: func(p *Pass) {
		forEachLocated(p, func(fr *model.Frame, a *kinematics.Segment) {
			if !a.Zone.TranslationMoves {
				return
			}
			var along []string
			for _, m := range a.Zone.Free {
				if m.Twist.W == (dof.Vec{}) {
					along = append(along, strings.TrimPrefix(m.Name, "translation "))
				}
			}
			dirs := joinAnd(along)
			if len(along) == 1 {
				p.Report(fr.CharSpan, "the zone of %s is free to slide along %s: add a datum that fixes it, e.g. a plane normal to %s", fr.Target.Name, dirs, dirs)
				return
			}
			p.Report(fr.CharSpan, "the zone of %s is free to slide along %s: add datums that fix them, e.g. planes normal to %s", fr.Target.Name, dirs, dirs)
		})
	},
})

// FrameUnclocked reports a single feature's location zone that only a free
// rotation moves.
var FrameUnclocked = Register(&Rule{
	ID:       "frame-unclocked",
	Summary:  "a location tolerance on a single feature whose frame leaves free a rotation, and no translation, that moves its zone",
	Severity: Info,
	Rationale: `When the datums are a plane and an axis, the part may still turn about that axis. A feature on
the axis does not care, but the zone of a feature off the axis turns with the part: its
angular place about the axis is set by nothing. That is sometimes intended (the feature may
be anywhere around the axis, as long as it is at the right radius), and often a missing
clocking datum. Worth a look.`,
	Source: "ASME Y14.5-2018, datum reference frames: rotational degrees of freedom and clocking (section 7)",
	Bad: `feature base plane normal -z at (0, 0, 0)
feature hub  hole size 20 +0.05 -0 axis +z at (0, 0, 0)
feature pinhole hole size 5 +-0.05 axis +z at (30, 0, 0)
datum A on base
datum B on hub
frame pinhole: position dia 0.1 datums A, B
basic 30 from hub to pinhole`,
	Good: `feature base plane normal -z at (0, 0, 0)
feature hub  hole size 20 +0.05 -0 axis +z at (0, 0, 0)
feature key  slot size 6 +-0.05 normal +y at (0, 0, 0)
feature pinhole hole size 5 +-0.05 axis +z at (30, 0, 0)
datum A on base
datum B on hub
datum C on key
frame pinhole: position dia 0.1 datums A, B, C
basic 30 from hub to pinhole`,
	Run: func(p *Pass) {
		forEachLocated(p, func(fr *model.Frame, a *kinematics.Segment) {
			if a.Zone.TranslationMoves || len(a.Zone.Free) == 0 {
				return
			}
			var about []string
			for _, m := range a.Zone.Free {
				about = append(about, strings.TrimPrefix(m.Name, "rotation "))
			}
			p.Report(fr.CharSpan, "the zone of %s may turn about %s: add a datum that clocks it, or leave it if its place about that axis does not matter", fr.Target.Name, joinAnd(about))
		})
	},
})

// DatumUnneeded reports a reference that fixes nothing more of the zone.
var DatumUnneeded = Register(&Rule{
	ID:       "datum-unneeded",
	Summary:  "a reference that fixes nothing more of the zone than the references before it already did (for orientation tolerances only rotations count)",
	Severity: Info,
	Rationale: `A datum reference stops motions of the part, but it only matters to a tolerance if some of those
motions would move (or, for orientation, turn) the tolerance zone. A reference that removes
freedom the zone does not care about is harmless, but it must be contacted in inspection and
it suggests a control the frame does not have: the perpendicularity of a hole to a plane is
complete with that plane alone.`,
	Source: "ASME Y14.5-2018, datum reference frames and orientation tolerances (sections 7 and 9); ISO 5459:2011",
	Bad: `feature base plane normal -z at (0, 0, 0)
feature rear plane normal -y at (0, 0, 0)
feature bore hole size 10 +-0.1 axis +z at (20, 20, 0)
datum A on base
datum B on rear
frame bore: perpendicularity dia 0.05 datums A, B`,
	Good: `feature base plane normal -z at (0, 0, 0)
feature bore hole size 10 +-0.1 axis +z at (20, 20, 0)
datum A on base
frame bore: perpendicularity dia 0.05 datums A`,
	Run: func(p *Pass) {
		forEachSegment(p, func(fr *model.Frame, a *kinematics.Segment) {
			per := a.Zone.PerStep
			for k, st := range a.DRF.Steps() {
				if st.Constrains == 0 || k+1 >= len(per) || per[k+1] != per[k] {
					continue
				}
				r := a.Segment.Refs[k]
				if fr.Characteristic.Category() == model.Runout && establishesAxis(r) {
					// Runout is read while the part turns about the datum
					// axis (ASME Y14.5-2018, runout), so the reference that
					// gives the axis is needed even where the zone of a face
					// would not move without it.
					continue
				}
				what := "moves"
				if fr.Characteristic.Category() == model.Orientation {
					what = "turns"
				}
				if per[k] == 0 {
					p.Report(r.Span, "%s is not needed by this %s: the references before it already fix everything that %s its zone", refName(r), fr.Characteristic, what)
					continue
				}
				p.Report(r.Span, "%s is not needed by this %s: what it fixes (%s) does not %s the zone", refName(r), fr.Characteristic, motionNames(st.Removed), strings.TrimSuffix(what, "s"))
			}
		})
	},
})

// forEachSegment calls fn for every analysed segment of every frame.
func forEachSegment(p *Pass, fn func(*model.Frame, *kinematics.Segment)) {
	for _, fr := range p.Part.Frames {
		for i := range fr.Segments {
			if a := p.Kinematics().Segment(fr, i); a.Resolved {
				fn(fr, a)
			}
		}
	}
}

// forEachLocated calls fn for the upper segment of every position or
// located profile frame (profile with datums) on a single feature. A
// pattern, and a composite lower segment, may float as the standards allow
// (ASME Y14.5-2018, pattern location and composite tolerancing).
func forEachLocated(p *Pass, fn func(*model.Frame, *kinematics.Segment)) {
	for _, fr := range p.Part.Frames {
		if !fr.Located() || fr.Target.IsPattern() || isNextDatum(p, fr) {
			continue
		}
		if a := p.Kinematics().Segment(fr, 0); a.Resolved {
			fn(fr, a)
		}
	}
}

// isNextDatum reports whether the frame's target is itself the datum
// feature that some frame of the part references right after this frame's
// references (a secondary or tertiary datum feature located to the datums
// above it). The motions it leaves free are the ones it is there to fix,
// so its own zone may move with them: the datum feature is related to the
// higher-precedence datums only (ASME Y14.5-2018, section 7, datum feature
// qualification and datum reference frame; ISO 5459:2011, datum systems).
func isNextDatum(p *Pass, fr *model.Frame) bool {
	if fr.Target.Member != nil {
		return false
	}
	used := p.Kinematics().RefPrefixes()
	prefix := kinematics.RefsKey(fr.Upper().Refs)
	for _, d := range p.Part.DatumsOn(fr.Target.Feature) {
		if d.Target.Member != nil {
			continue
		}
		want := d.Letter
		if prefix != "" {
			want = prefix + "," + d.Letter
		}
		if used[want] {
			return true
		}
	}
	return false
}

func repeatsLetters(before []*model.DatumRef, r *model.DatumRef) bool {
	seen := map[string]bool{}
	for _, b := range before {
		for _, l := range b.Letters {
			seen[l] = true
		}
	}
	for _, l := range r.Letters {
		if !seen[l] {
			return false
		}
	}
	return true
}

// redundantReason explains why reference k of a segment removes nothing.
func redundantReason(a *kinematics.Segment, k int, tol float64) string {
	refs := a.Segment.Refs
	r := refs[k]
	name := refName(r)
	if k > 0 && len(a.DRF.Steps()[k-1].Free) == 0 {
		return fmt.Sprintf("%s removes no degree of freedom: %s already fix every motion of the part; remove %s", name, joinAnd(refNames(refs[:k])), name)
	}
	if len(r.Datums) == 1 {
		d := r.Datums[0]
		for _, e := range refs[:k] {
			if len(e.Datums) != 1 {
				continue
			}
			if why := sameConstraint(d, e.Datums[0], tol); why != "" {
				return fmt.Sprintf("%s %s %s and fixes nothing that %s has not; remove it or reference another feature", name, why, refName(e), refName(e))
			}
		}
	}
	return fmt.Sprintf("%s removes no degree of freedom that %s left free; remove it or reference another feature", name, joinAnd(refNames(refs[:k])))
}

// sameConstraint names how datum d repeats datum e ("is parallel to"), or
// returns "" when no simple reason applies. Directions are compared to a
// microradian and offsets to tol (about a millionth of the part's size), as
// the engine decides ranks.
func sameConstraint(d, e *model.Datum, tol float64) string {
	if len(d.Targets) > 0 || len(e.Targets) > 0 {
		return "" // targets remove what they touch, not what their feature would
	}
	fd, fe := d.Target.Feature, e.Target.Feature
	if fd == fe && (d.Target.Member == e.Target.Member) {
		return "is on the same feature as"
	}
	cd, ce := kinematics.SurfaceClass(fd.Kind), kinematics.SurfaceClass(fe.Kind)
	if cd != ce || len(d.Target.Points()) != 1 || len(e.Target.Points()) != 1 {
		return ""
	}
	pd, pe := d.Target.Points()[0], e.Target.Points()[0]
	switch cd {
	case dof.Plane:
		if model.Parallel(fd.Dir, fe.Dir, 1e-6) {
			return "is parallel to"
		}
	case dof.Cylinder:
		off := pd.Sub(pe)
		off = off.Sub(fe.Dir.Unit().Scale(off.Dot(fe.Dir.Unit())))
		if model.Parallel(fd.Dir, fe.Dir, 1e-6) && off.Norm() <= tol {
			return "is coaxial with"
		}
	case dof.Sphere:
		if pd.Sub(pe).Norm() <= tol {
			return "has the same centre as"
		}
	}
	return ""
}

func refNames(refs []*model.DatumRef) []string {
	out := make([]string, len(refs))
	for i, r := range refs {
		out[i] = refName(r)
	}
	return out
}

// refName is a reference as written, without its material modifier.
func refName(r *model.DatumRef) string { return strings.Join(r.Letters, "-") }

func motionNames(ms []dof.Motion) string {
	out := make([]string, len(ms))
	for i, m := range ms {
		out[i] = m.Name
	}
	return strings.Join(out, ", ")
}

// joinAnd writes "x", "x and y", "x, y and z".
func joinAnd(s []string) string {
	switch len(s) {
	case 0:
		return ""
	case 1:
		return s[0]
	}
	return strings.Join(s[:len(s)-1], ", ") + " and " + s[len(s)-1]
}

// establishesAxis reports whether a reference's features give an axis: a
// cylinder, a cone, or spheres (a common datum of two spheres is an axis).
func establishesAxis(r *model.DatumRef) bool {
	for _, d := range r.Datums {
		if d == nil || !d.Target.Resolved() || len(d.Targets) > 0 {
			continue
		}
		switch k := d.Target.Feature.Kind; {
		case k.IsCylinder(), k == model.Cone, k.IsSphere():
			return true
		}
	}
	return false
}
