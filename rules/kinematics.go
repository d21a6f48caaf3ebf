package rules

import (
	"encoding/binary"
	"fmt"
	"math"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/dof"
)

// This file connects the part model to the kinematic engine rules/dof: it
// turns datum features and tolerance zones into invariance classes, and
// analyses each distinct datum reference frame of a file once. The frame
// rules (frames_dof.go) and the `datumlint dof` command read its results.

// surfaceClass is the invariance class a feature's nominal geometry
// belongs to: the datum it gives in the contract's feature table, with the
// classes of ISO 5459:2011 (a width's mid-plane is a plane, a hole's or
// pin's axis a cylinder, a socket's or ball's centre a sphere).
func surfaceClass(k model.Kind) dof.Class {
	switch k {
	case model.Plane, model.Slot, model.Tab:
		return dof.Plane
	case model.Hole, model.Pin:
		return dof.Cylinder
	case model.Socket, model.Ball:
		return dof.Sphere
	case model.Cone:
		return dof.Cone
	case model.Extrusion:
		return dof.Prismatic
	case model.Surface:
		return dof.Complex
	}
	return 0 // unknown kind: no conditions (dof.Surface.Valid is false)
}

// hasGeometry reports whether a feature's nominal geometry is known well
// enough to analyse. A complex surface needs none: no motion leaves it
// unchanged wherever it is (ISO 5459:2011, complex invariance class).
func hasGeometry(f *model.Feature) bool {
	if f == nil || f.Broken {
		return false
	}
	return f.HasGeometry || f.Kind == model.Surface
}

// targetSurfaces returns one surface per member the target stands for: the
// member itself, or every member of a whole pattern.
func targetSurfaces(t *model.Target) []dof.Surface {
	if !t.Resolved() {
		return nil
	}
	class := surfaceClass(t.Feature.Kind)
	points := t.Points()
	if len(points) == 0 {
		return nil
	}
	out := make([]dof.Surface, len(points))
	for i, p := range points {
		out[i] = dof.Surface{Class: class, Dir: dof.Vec(t.Feature.Dir), Point: dof.Vec(p)}
	}
	return out
}

// DatumSurfaces maps a datum's target feature (or member, or whole pattern)
// to the engine's surfaces: plane → Plane(n, p); slot/tab → Plane (the
// mid-plane); hole/pin → Cylinder (axis, point) per member; socket/ball →
// Sphere per member; cone → Cone; extrusion → Prismatic; surface → Complex.
// A pattern used as one datum stacks all its members' conditions (ASME
// Y14.5-2018, patterns of features as datum features). A datum whose target
// did not resolve gives no surfaces and so removes nothing.
func DatumSurfaces(d *model.Datum) dof.Datum {
	if d == nil || !d.Target.Resolved() || !hasGeometry(d.Target.Feature) {
		return nil
	}
	return dof.Datum(targetSurfaces(&d.Target))
}

// RefSurfaces maps a datum reference to the engine: for a common datum
// (A-B) both features' surfaces are stacked, so that the reference is one
// datum whose conditions are those of both (ASME Y14.5-2018, common datum
// features; ISO 5459:2011, common datums).
func RefSurfaces(r *model.DatumRef) dof.Datum {
	if r == nil {
		return nil
	}
	var out dof.Datum
	for _, d := range r.Datums {
		out = append(out, DatumSurfaces(d)...)
	}
	return out
}

// ZoneOf describes the tolerance zone of one segment of a frame by its
// invariance (what leaves it unchanged). The choices:
//
//   - position, concentricity, symmetry: a hole or pin gives a cylindrical
//     zone about each member's axis (ASME Y14.5-2018, position: cylindrical
//     tolerance zone; without `dia` the two-plane zone still contains the
//     axis, and zone-shape reports the missing symbol, so the cylinder is
//     kept); a slot or tab a zone about its mid-plane; a socket or ball a
//     spherical zone about its centre; a plane, cone, extrusion or surface
//     a zone like that surface (from memory: position of such features is
//     unusual, profile is the normal control).
//   - profile: a zone disposed about the true profile, so it has the
//     feature's own invariance (ASME Y14.5-2018, profile; ISO 1101:2017,
//     line and surface profile): plane, width → plane, cylinder, sphere,
//     cone, extrusion → prismatic, surface → complex.
//   - orientation: the zone's place is free and only its direction counts
//     (ASME Y14.5-2018, orientation tolerances "do not control location"),
//     so OrientationOnly with the feature's normal or axis.
//   - runout: the zone is generated as the part turns about the datum axis
//     and is read by an indicator that is placed along that axis, not
//     located by a basic dimension (ASME Y14.5-2018, runout); the
//     feature's surface plus a slide along its own axis or normal, and the
//     feature's radial size floats (a size is not a motion, so nothing is
//     added for it: the class already ignores size).
//   - form: the feature's own surface; form zones float (ASME Y14.5-2018,
//     form tolerances are not related to datums).
//
// For a pattern every member's surface is listed: the zone framework is
// invariant only under what leaves all of them unchanged (ASME
// Y14.5-2018, pattern location).
func ZoneOf(fr *model.Frame, seg *model.Segment) dof.Zone {
	_ = seg // every segment of a frame controls the same feature with the same zone shape
	surfs := targetSurfaces(&fr.Target)
	z := dof.Zone{Surfaces: surfs}
	switch fr.Characteristic.Category() {
	case model.Orientation:
		z.OrientationOnly = true
	case model.Runout:
		if fr.Target.Resolved() && model.Vec(fr.Target.Feature.Dir).Norm() > 0 {
			z.Extra = append(z.Extra, dof.Twist{V: dof.Vec(fr.Target.Feature.Dir)})
		}
	}
	return z
}

// SegmentDOF is the kinematic analysis of one segment of a frame.
type SegmentDOF struct {
	Frame   *model.Frame
	Segment *model.Segment
	Index   int // 0: the upper segment; 1… composite lower segments
	// Resolved is true when every reference resolved to a datum with
	// geometry and the frame's target resolved with geometry; rules skip
	// segments that are not.
	Resolved bool
	// DRF is shared between segments and frames with the same reference list.
	DRF  *dof.DRF
	Zone dof.ZoneResult
	// Problem says why the segment did not resolve ("datum D is not declared").
	Problem string
}

// NewFacts returns the per-file facts for a part, for commands that use the
// engines without running the rules (the dof command).
func NewFacts(p *model.Part) *Facts { return newFacts(p) }

// refsKey identifies a datum reference frame by its references' letters in
// order; material modifiers are left out because a reference at MMB or LMB
// constrains the same freedoms as at RMB (ASME Y14.5-2018, datum feature
// modifiers change the boundary, not the degrees of freedom removed).
func refsKey(refs []*model.DatumRef) string {
	parts := make([]string, len(refs))
	for i, r := range refs {
		parts[i] = strings.Join(r.Letters, "-")
	}
	return strings.Join(parts, ",")
}

// engineFrame normalises by the part's extent so rank decisions do not
// depend on units or on where the part sits.
func (f *Facts) engineFrame() dof.Frame {
	return dof.Frame{Center: dof.Vec(f.part.Center), Scale: f.part.Scale}
}

// DRFOf analyses a reference list, once per distinct list per file.
func (f *Facts) DRFOf(refs []*model.DatumRef) *dof.DRF {
	return Memo(f, "dof.drf:"+refsKey(refs), func() *dof.DRF {
		ds := make([]dof.Datum, len(refs))
		for i, r := range refs {
			ds[i] = RefSurfaces(r)
		}
		return f.engineFrame().Analyze(ds)
	})
}

// DOF returns the analysis of segment seg of a frame, memoised.
func (f *Facts) DOF(fr *model.Frame, seg int) *SegmentDOF {
	if fr == nil || seg < 0 || seg >= len(fr.Segments) {
		return &SegmentDOF{Frame: fr, Index: seg, Problem: "no such segment"}
	}
	return Memo(f, fmt.Sprintf("dof.seg:%p:%d", fr, seg), func() *SegmentDOF {
		s := fr.Segments[seg]
		out := &SegmentDOF{Frame: fr, Segment: s, Index: seg}
		out.Problem = segmentProblem(fr, s)
		if out.Problem != "" {
			return out
		}
		out.Resolved = true
		out.DRF = f.DRFOf(s.Refs)
		out.Zone = f.zoneIn(out.DRF, ZoneOf(fr, s))
		return out
	})
}

// zoneIn analyses a zone against a frame once per file for each distinct
// pair: the zone's invariance once per distinct zone (the upper and lower
// segments of a composite frame, several frames on one feature), and the
// result once per frame and zone. Zones are told apart by what they are
// (see zoneKey), not by which frame asked. Segments that share a result
// share its slices; rules only read them.
func (f *Facts) zoneIn(d *dof.DRF, z dof.Zone) dof.ZoneResult {
	c := Memo(f, "dof.zones", func() *zoneCache {
		return &zoneCache{prepared: map[string]*dof.PreparedZone{}, results: map[zoneInKey]dof.ZoneResult{}}
	})
	key := zoneKey(z)
	k := zoneInKey{d, key}
	if r, ok := c.results[k]; ok {
		return r
	}
	pz, ok := c.prepared[key]
	if !ok {
		pz = f.engineFrame().PrepareZone(z)
		c.prepared[key] = pz
	}
	r := d.ZoneIn(pz)
	c.results[k] = r
	return r
}

// zoneCache holds a file's prepared zones by zoneKey and their results by
// frame and zoneKey.
type zoneCache struct {
	prepared map[string]*dof.PreparedZone
	results  map[zoneInKey]dof.ZoneResult
}

type zoneInKey struct {
	drf  *dof.DRF
	zone string
}

// zoneKey encodes everything a zone's analysis depends on, bit for bit:
// the orientation flag, the numbers of surfaces and extra twists, each
// surface's class, direction and point, and the extra invariant twists.
// Equal keys give equal answers.
func zoneKey(z dof.Zone) string {
	b := make([]byte, 0, 17+len(z.Surfaces)*7*8+len(z.Extra)*6*8)
	num := func(x float64) { b = binary.LittleEndian.AppendUint64(b, math.Float64bits(x)) }
	vec := func(v dof.Vec) { num(v[0]); num(v[1]); num(v[2]) }
	if z.OrientationOnly {
		b = append(b, 'o')
	} else {
		b = append(b, 'l')
	}
	b = binary.LittleEndian.AppendUint64(b, uint64(len(z.Surfaces)))
	b = binary.LittleEndian.AppendUint64(b, uint64(len(z.Extra)))
	for _, s := range z.Surfaces {
		b = binary.LittleEndian.AppendUint64(b, uint64(s.Class))
		vec(s.Dir)
		vec(s.Point)
	}
	for _, t := range z.Extra {
		vec(t.W)
		vec(t.V)
	}
	return string(b)
}

// segmentProblem says why a segment cannot be analysed, or "".
func segmentProblem(fr *model.Frame, s *model.Segment) string {
	t := &fr.Target
	switch {
	case !t.Resolved():
		if t.Problem != "" {
			return t.Problem
		}
		return fmt.Sprintf("%s is not a declared feature", t.Name)
	case !hasGeometry(t.Feature):
		return fmt.Sprintf("%s has no readable geometry", t.Name)
	}
	for _, r := range s.Refs {
		for i, d := range r.Datums {
			switch {
			case d == nil:
				return fmt.Sprintf("datum %s is not declared", r.Letters[i])
			case !d.Target.Resolved():
				return fmt.Sprintf("datum %s is on %s, which is not a declared feature", d.Letter, d.Target.Name)
			case !hasGeometry(d.Target.Feature):
				return fmt.Sprintf("datum %s is on %s, which has no readable geometry", d.Letter, d.Target.Name)
			}
		}
		if len(r.Datums) == 0 {
			return fmt.Sprintf("datum reference %s names no datum", r.Name)
		}
	}
	return ""
}
