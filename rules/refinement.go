package rules

import (
	"fmt"
	"math"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
)

// RefinementIneffective reports a form or orientation tolerance that is not
// smaller than a tolerance on the same feature that already controls what
// it refines.
var RefinementIneffective = Register(&Rule{
	ID:       "refinement-ineffective",
	Summary:  "a form or orientation tolerance not smaller than an orientation, location or runout tolerance on the same feature that already controls it",
	Severity: Warning,
	Rationale: `A tolerance zone that locates or orients a feature also limits the feature's form, and one
that locates it also limits its orientation to the datums that locate it: the feature cannot
lean or bend further than the zone is wide. A form or orientation tolerance on the same feature
is therefore a refinement and means something only where it is smaller. Flatness 0.05 on a
face that carries parallelism 0.05 to A, or perpendicularity 0.1 of a hole located within
position 0.1 to A, B, C, adds nothing a gauge or an inspector would check. The refinement is a
slip (the value meant to be tighter) or a frame to remove.

What controls what (ASME Y14.5-2018, from memory): the flatness and the straightness of a
plane's lines by an orientation, position or surface profile zone of that plane, or its total
runout; the flatness of a width's median plane by its orientation or position; the
straightness of an axis (straightness dia) by a cylindrical orientation or position zone of
that axis; cylindricity and surface straightness of a cylinder by its total runout or surface
profile; circularity by runout or surface profile. An orientation tolerance is controlled by
a position, or by a surface profile with datums on a plane, whose datum references begin with
the same datums, in the same order and at the same material boundary: the location zone is
oriented to them. On a hole or pin a cylindrical position zone controls the orientation of the
axis in every direction, so it refines either zone, while a position zone without dia (two
planes in one direction) is not compared.

How values are compared, with (M) and (L): each tolerance is taken at every size of the
feature, its value plus the bonus its modifier gives as the feature departs from MMC (or LMC),
and the refinement is reported only if it is not smaller at any size between MMC and LMC (both
are straight lines in the size, so the two limits decide). Perpendicularity 0.1 regardless of
size under position 0.1 (M) is therefore a refinement (it is tighter away from MMC), while
perpendicularity 0.1 (M) under position 0.1 (M), or under position 0.1 regardless of size, is
not. One finding is reported, on the looser frame, naming the tighter one; it suggests a value
that is smaller at some size against every frame that controls it. The bonus from datum
features at MMB, and composite lower segments that repeat no datum, are not counted for
orientation.`,
	Source: "ASME Y14.5-2018, refinement of form by orientation and location tolerances and of orientation by location tolerances; runout controls form (from memory, sections 8, 9, 10 and 12); material condition bonus, ASME Y14.5-2018 and ISO 2692:2014",
	Bad: `feature base plane normal -z at (0, 0, 0)
feature top plane normal +z at (0, 0, 10)
datum A on base
frame base: flatness 0.02
frame top: parallelism 0.05 datums A
frame top: flatness 0.05`,
	Good: `feature base plane normal -z at (0, 0, 0)
feature top plane normal +z at (0, 0, 10)
datum A on base
frame base: flatness 0.02
frame top: parallelism 0.05 datums A
frame top: flatness 0.02`,
	Run: runRefinementIneffective,
})

// zoneTol is a segment's tolerance as a function of the feature's size.
type zoneTol struct {
	value float64
	mat   string // "", "M" or "L"
}

func tolOf(seg *model.Segment) zoneTol {
	t := zoneTol{value: seg.Value}
	if _, ok := seg.Modifier("M"); ok {
		t.mat = "M"
	} else if _, ok := seg.Modifier("L"); ok {
		t.mat = "L"
	}
	return t
}

// at is the tolerance when the feature is at size s: the value plus the
// bonus as the size departs from MMC or LMC (ASME Y14.5-2018, bonus
// tolerance).
func (t zoneTol) at(f *model.Feature, s float64) float64 {
	switch {
	case f.Size == nil:
		return t.value
	case t.mat == "M":
		return t.value + math.Abs(s-f.MMC())
	case t.mat == "L":
		return t.value + math.Abs(s-f.LMC())
	}
	return t.value
}

// sizes are the sizes at which two tolerances are compared: the limits of
// size (both tolerances are linear in the size between them), or one
// where the feature has no size to vary.
func sizes(f *model.Feature) []float64 {
	if f.Size == nil || !f.Kind.IsFOS() {
		return []float64{0}
	}
	return []float64{f.MMC(), f.LMC()}
}

// notSmaller reports whether refinement r is at least l at every size.
func notSmaller(f *model.Feature, r, l zoneTol) bool {
	eps := 1e-9 * math.Max(1, math.Max(r.value, l.value))
	for _, s := range sizes(f) {
		if r.at(f, s) < l.at(f, s)-eps {
			return false
		}
	}
	return true
}

// controller is a segment of another frame on the feature that already
// controls what the refinement refines.
type controller struct {
	frame *model.Frame
	seg   *model.Segment
}

func runRefinementIneffective(p *Pass) {
	for _, r := range p.Part.Frames {
		if !r.Target.Known() || len(r.Segments) != 1 || p.facts.brokenMentions()[r.Target.Feature.Name] {
			continue
		}
		cat := r.Characteristic.Category()
		if cat != model.Form && cat != model.Orientation || r.Upper().Value <= 0 {
			continue
		}
		var tight []controller
		for _, l := range p.Part.FramesOn(r.Target.Feature) {
			if l == r || l.Target.Member != nil && l.Target.Member != r.Target.Member {
				continue // a frame on another member does not control this one
			}
			for _, seg := range l.Segments {
				if controls(r, l, seg) && notSmaller(r.Target.Feature, tolOf(r.Upper()), tolOf(seg)) {
					tight = append(tight, controller{l, seg})
				}
			}
		}
		if len(tight) == 0 {
			continue
		}
		reportIneffective(p, r, tight)
	}
}

// controls reports whether segment seg of frame l already controls what
// the form or orientation frame r refines (the table in the rationale).
func controls(r, l *model.Frame, seg *model.Segment) bool {
	f := r.Target.Feature
	rz, lz := r.Upper().Zone, seg.Zone
	lc, lcat := l.Characteristic, l.Characteristic.Category()
	if r.Characteristic.Category() == model.Orientation {
		if !(lc == model.Position || lc == model.SurfaceProfile && f.Kind == model.Plane) || !refsBegin(seg.Refs, r.Upper().Refs) {
			return false
		}
		if hasAxis(f.Kind) {
			return lz == "dia" // a cylinder holds the axis in every direction
		}
		return lz == "" && rz == ""
	}
	planar := lz == "" && (lcat == model.Orientation || lc == model.Position)
	switch r.Characteristic {
	case model.Flatness:
		switch {
		case f.Kind == model.Plane:
			return planar || lc == model.SurfaceProfile || lc == model.TotalRunout
		case f.Kind.IsWidth():
			return planar
		}
	case model.Straightness:
		switch {
		case f.Kind == model.Plane:
			return rz == "" && (planar || lc == model.SurfaceProfile || lc == model.TotalRunout)
		case f.Kind.IsCylinder() && rz == "dia":
			return lz == "dia" && (lcat == model.Orientation || lc == model.Position)
		case f.Kind.IsCylinder():
			return lc == model.SurfaceProfile || lc == model.TotalRunout
		}
	case model.Cylindricity:
		return f.Kind.IsCylinder() && (lc == model.SurfaceProfile || lc == model.TotalRunout)
	case model.Circularity:
		switch {
		case f.Kind.IsCylinder() || f.Kind == model.Cone:
			return lc == model.SurfaceProfile || lcat == model.Runout
		case f.Kind.IsSphere():
			return lc == model.SurfaceProfile
		}
	}
	return false
}

// refsBegin reports whether refs begin with want: the same datums, in the
// same order, at the same material boundary.
func refsBegin(refs, want []*model.DatumRef) bool {
	if len(want) == 0 || len(refs) < len(want) {
		return false
	}
	for i, w := range want {
		if refs[i].Label() != w.Label() {
			return false
		}
	}
	return true
}

func reportIneffective(p *Pass, r *model.Frame, tight []controller) {
	f, rt := r.Target.Feature, tolOf(r.Upper())
	// Name the tightest controller (smallest at MMC), and suggest a value
	// that is smaller than every controller at some size: half of the
	// widest margin the refinement's own bonus leaves against each.
	best := tight[0]
	suggest := math.Inf(1)
	for _, c := range tight {
		if tolOf(c.seg).at(f, sizes(f)[0]) < tolOf(best.seg).at(f, sizes(f)[0]) {
			best = c
		}
		margin := 0.0
		for _, s := range sizes(f) {
			margin = math.Max(margin, tolOf(c.seg).at(f, s)-(rt.at(f, s)-rt.value))
		}
		suggest = math.Min(suggest, margin/2)
	}
	what := map[model.Category]string{model.Form: "form", model.Orientation: "orientation"}[r.Characteristic.Category()]
	sizeWord := ""
	if rt.mat != "" || tolOf(best.seg).mat != "" {
		sizeWord = " at any size"
	}
	fix := "remove it"
	if v := trimFloat(suggest); v != "0" {
		mod := ""
		if rt.mat != "" {
			mod = " (" + rt.mat + ")"
		}
		fix = fmt.Sprintf("give it a smaller tolerance, e.g. %s%s, or remove it", v, mod)
	}
	refs := ""
	if len(best.seg.Refs) > 0 {
		refs = " to " + strings.Join(refNamesWithMaterial(best.seg.Refs), ", ")
	}
	line := best.seg.ValueSpan.Start.Line
	p.ReportRelated(r.Upper().ValueSpan, []Related{{best.seg.ValueSpan, "the tighter " + string(best.frame.Characteristic)}},
		"this %s %s is not smaller%s than the %s %s%s on line %d, which already controls the %s of '%s': %s",
		r.Characteristic, segTolText(r.Upper()), sizeWord, best.frame.Characteristic, segTolText(best.seg), refs, line, what, r.Target.Name, fix)
}

// segTolText writes a segment's zone, value and material condition as
// written ("dia 0.1 (M)").
func segTolText(seg *model.Segment) string {
	s := seg.ValueText
	if seg.Zone != "" {
		s = seg.Zone + " " + s
	}
	if t := tolOf(seg); t.mat != "" {
		s += " (" + t.mat + ")"
	}
	return s
}

func refNamesWithMaterial(refs []*model.DatumRef) []string {
	out := make([]string, len(refs))
	for i, r := range refs {
		out[i] = r.Label()
	}
	return out
}
