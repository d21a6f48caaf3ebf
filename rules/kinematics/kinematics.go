// Package kinematics connects the part model to the kinematic engine
// rules/dof: it turns datum features and tolerance zones into invariance
// classes and analyses each distinct datum reference frame of a part once.
// Its Result is the one kinematic answer per part that the frame rules, the
// dof command, the review report and the editor's hover all read.
package kinematics

import (
	"encoding/binary"
	"fmt"
	"math"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/dof"
)

// SurfaceClass is the invariance class a feature's nominal geometry
// belongs to: the datum it gives in the contract's feature table, with the
// classes of ISO 5459:2011 (a width's mid-plane is a plane, a hole's or
// pin's axis a cylinder, a socket's or ball's centre a sphere).
func SurfaceClass(k model.Kind) dof.Class {
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
	// Elements of the geometry have the invariance of what they are: a
	// line that of an axis, a point that of a centre, a circle that of
	// its axis through its centre (turning about it only, which is the
	// cone class's invariance).
	case model.Line:
		return dof.Cylinder
	case model.Point:
		return dof.Sphere
	case model.Circle:
		return dof.Cone
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
	class := SurfaceClass(t.Feature.Kind)
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
//
// A datum established by datum targets takes its conditions from the
// targets instead (ContactSurfaces).
func DatumSurfaces(d *model.Datum) dof.Datum {
	if d == nil {
		return nil
	}
	if len(d.Targets) > 0 {
		var out dof.Datum
		for _, t := range d.Targets {
			out = append(out, ContactSurfaces(t)...)
		}
		return out
	}
	if !d.Target.Resolved() || !hasGeometry(d.Target.Feature) {
		return nil
	}
	return dof.Datum(targetSurfaces(&d.Target))
}

// ContactSurfaces maps a datum target to point contacts (dof.Contact): a
// point target to one at its point, a line target to one at each end, an
// area target to one at its centre (a target area is touched as a point
// in the datum scheme: common practice; a flat-ended simulator of the
// area's size), each along the surface's normal where the target lies (a
// target on an inclined face, a cylinder or a cone acts as it lies: ASME
// Y14.5-2018, datum targets). The normal is the one written with the
// target, or else the surface's own (model.Target.NormalAt); a target
// with neither, or one that did not read, gives nothing.
func ContactSurfaces(t *model.DatumTarget) []dof.Surface {
	if t == nil || t.Broken {
		return nil
	}
	normal := func(p model.Vec) (model.Vec, bool) {
		if t.Normal.Norm() > 0 {
			return t.Normal, true
		}
		return t.On.NormalAt(p)
	}
	points := []model.Vec{t.Point}
	if t.Shape == model.TargetLine {
		points = append(points, t.End)
	}
	var out []dof.Surface
	for _, p := range points {
		if n, ok := normal(p); ok {
			out = append(out, dof.Surface{Class: dof.Contact, Dir: dof.Vec(n), Point: dof.Vec(p)})
		}
	}
	return out
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
//
// A position written with a zone direction (bidirectional positional
// tolerancing: a parallel-planes zone normal to that direction about each
// member's axis or centre; ASME Y14.5-2018, from memory) is a zone between
// two planes: the plane class with that normal through each member.
//
// Every segment of a frame controls the same feature with the same zone
// shape, so the zone is the frame's.
func ZoneOf(fr *model.Frame) dof.Zone {
	surfs := targetSurfaces(&fr.Target)
	if u := fr.Upper().ZoneDir; u != nil && fr.Characteristic.Category() == model.Location {
		for i := range surfs {
			surfs[i].Class, surfs[i].Dir = dof.Plane, dof.Vec(*u)
		}
	}
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

// Segment is the kinematic analysis of one segment of a frame.
type Segment struct {
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

// Result is the kinematic analysis of one part: every frame segment's
// degrees of freedom and what moves its zone, each distinct datum reference
// list and each distinct zone analysed once. It is built by Analyze and
// filled on first use; one goroutine uses it at a time.
type Result struct {
	part     *model.Part
	frame    dof.Frame
	drfs     map[string]*dof.DRF
	segments map[segmentKey]*Segment
	prepared map[string]*dof.PreparedZone
	results  map[zoneInKey]dof.ZoneResult
	prefixes map[string]bool
}

type segmentKey struct {
	frame *model.Frame
	index int
}

// Analyze returns the kinematic result of a part. The engine frame is
// normalised by the part's extent, so that rank decisions do not depend on
// units or on where the part sits.
func Analyze(p *model.Part) *Result {
	return &Result{
		part:     p,
		frame:    dof.Frame{Center: dof.Vec(p.Center), Scale: p.Scale},
		drfs:     map[string]*dof.DRF{},
		segments: map[segmentKey]*Segment{},
		prepared: map[string]*dof.PreparedZone{},
		results:  map[zoneInKey]dof.ZoneResult{},
	}
}

// RefsKey identifies a datum reference frame by its references' letters in
// order; material modifiers are left out because a reference at MMB or LMB
// constrains the same freedoms as at RMB (ASME Y14.5-2018, datum feature
// modifiers change the boundary, not the degrees of freedom removed).
func RefsKey(refs []*model.DatumRef) string {
	parts := make([]string, len(refs))
	for i, r := range refs {
		parts[i] = strings.Join(r.Letters, "-")
	}
	return strings.Join(parts, ",")
}

// DRF analyses a reference list, once per distinct list per part, as the
// analysis of the list without its last reference extended by that
// reference (dof.DRF.Extend: the same steps as analysing the whole list),
// so that the frames of a part analyse A, A, B and A, B, C with one
// analysis of A.
func (r *Result) DRF(refs []*model.DatumRef) *dof.DRF {
	key := RefsKey(refs)
	if d, ok := r.drfs[key]; ok {
		return d
	}
	var d *dof.DRF
	if n := len(refs); n == 0 {
		d = r.frame.Analyze(nil)
	} else {
		d = r.DRF(refs[:n-1]).Extend(RefSurfaces(refs[n-1]))
	}
	r.drfs[key] = d
	return d
}

// Segment returns the analysis of segment seg of a frame.
func (r *Result) Segment(fr *model.Frame, seg int) *Segment {
	if fr == nil || seg < 0 || seg >= len(fr.Segments) {
		return &Segment{Frame: fr, Index: seg, Problem: "no such segment"}
	}
	k := segmentKey{fr, seg}
	if out, ok := r.segments[k]; ok {
		return out
	}
	s := fr.Segments[seg]
	out := &Segment{Frame: fr, Segment: s, Index: seg}
	out.Problem = segmentProblem(fr, s)
	if out.Problem == "" {
		out.Resolved = true
		out.DRF = r.DRF(s.Refs)
		out.Zone = r.zoneIn(out.DRF, ZoneOf(fr))
	}
	r.segments[k] = out
	return out
}

// Segments returns the analysis of every segment of a frame, upper first.
func (r *Result) Segments(fr *model.Frame) []*Segment {
	out := make([]*Segment, len(fr.Segments))
	for i := range fr.Segments {
		out[i] = r.Segment(fr, i)
	}
	return out
}

// RefPrefixes is the set of every leading part of every segment's
// reference list ("A", "A,B", "A,B,C" for A, B, C) in RefsKey form, built
// once per part.
func (r *Result) RefPrefixes() map[string]bool {
	if r.prefixes != nil {
		return r.prefixes
	}
	out := map[string]bool{}
	for _, fr := range r.part.Frames {
		for _, seg := range fr.Segments {
			k := RefsKey(seg.Refs)
			for i := range k {
				if k[i] == ',' {
					out[k[:i]] = true
				}
			}
			out[k] = true
		}
	}
	r.prefixes = out
	return out
}

// zoneIn analyses a zone against a frame once per part for each distinct
// pair: the zone's invariance once per distinct zone (the upper and lower
// segments of a composite frame, several frames on one feature), and the
// result once per frame and zone. Zones are told apart by what they are
// (see zoneKey), not by which frame asked. Segments that share a result
// share its slices; readers only read them.
func (r *Result) zoneIn(d *dof.DRF, z dof.Zone) dof.ZoneResult {
	key := zoneKey(z)
	k := zoneInKey{d, key}
	if res, ok := r.results[k]; ok {
		return res
	}
	pz, ok := r.prepared[key]
	if !ok {
		pz = r.frame.PrepareZone(z)
		r.prepared[key] = pz
	}
	res := d.ZoneIn(pz)
	r.results[k] = res
	return res
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
	return RefsProblem(s.Refs)
}

// RefsProblem says why a datum reference list cannot be analysed (a datum
// that is not declared, or is on a feature that is not declared or has no
// readable geometry), or "" when every reference can be.
func RefsProblem(refs []*model.DatumRef) string {
	for _, r := range refs {
		for i, d := range r.Datums {
			switch {
			case d == nil:
				return fmt.Sprintf("datum %s is not declared", r.Letters[i])
			case len(d.Targets) > 0:
				if why := targetsProblem(d); why != "" {
					return why
				}
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

// targetsProblem says why a datum's targets cannot be analysed, or "".
func targetsProblem(d *model.Datum) string {
	for _, t := range d.Targets {
		switch {
		case t.Broken:
			return fmt.Sprintf("datum target %s of datum %s does not read", t.Label, d.Letter)
		case !t.On.Resolved():
			return fmt.Sprintf("datum target %s is on %s, which is not a declared feature", t.Label, t.On.Name)
		case len(ContactSurfaces(t)) == 0:
			return fmt.Sprintf("datum target %s gives no normal to touch it along: write one, e.g. normal +z", t.Label)
		}
	}
	return ""
}

// Step is what one datum reference of a segment newly removes.
type Step struct {
	Ref *model.DatumRef
	// Name is the reference without its material modifier ("A", "A-B").
	Name       string
	Constrains int
	Removed    []dof.Motion
}

// Steps returns, per datum reference in precedence order, what it newly
// removes; a segment that did not resolve removes nothing.
func (s *Segment) Steps() []Step {
	out := make([]Step, len(s.Segment.Refs))
	var steps []dof.Step
	if s.Resolved {
		steps = s.DRF.Steps()
	}
	for k, r := range s.Segment.Refs {
		out[k] = Step{Ref: r, Name: strings.Join(r.Letters, "-")}
		if k < len(steps) {
			out[k].Constrains, out[k].Removed = steps[k].Constrains, steps[k].Removed
		}
	}
	return out
}

// Free returns a basis of the motions the segment's datums leave free (nil
// when it did not resolve).
func (s *Segment) Free() []dof.Motion {
	if !s.Resolved {
		return nil
	}
	return s.DRF.Free()
}

// ZoneFree returns a basis of the free motions that move the zone (for an
// orientation tolerance, that turn it).
func (s *Segment) ZoneFree() []dof.Motion {
	if !s.Resolved {
		return nil
	}
	return s.Zone.Free
}
