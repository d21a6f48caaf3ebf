package model

import "math"

// This file is the nominal geometry of a feature's surface at a point:
// its normal there and how far a point is from it. Datum targets need
// both: a target touches its feature along the surface's normal at the
// target (ASME Y14.5-2018, datum targets: a target on an inclined or
// curved surface acts as it lies), and it must lie on that surface.

// nearestMember returns the member of t (the member itself, or the member
// of a whole pattern nearest to p).
func nearestMember(t *Target, p Vec) *Member {
	if t.Member != nil {
		return t.Member
	}
	var best *Member
	for _, m := range t.Feature.Members {
		if best == nil || m.Point.Sub(p).Norm() < best.Point.Sub(p).Norm() {
			best = m
		}
	}
	return best
}

// NormalAt returns the unit normal of the target's nominal surface at p,
// a point on it: a plane's or a width's normal; the radial direction of a
// cylinder or a sphere; on a cone, the direction at right angles to the
// cone's line through p, in the plane of that line and the axis. ok is
// false where the surface gives no normal there: a point on a cylinder's
// or a cone's axis or at a sphere's centre, an extrusion, a free-form
// surface, a point, line or circle, or unknown geometry.
func (t *Target) NormalAt(p Vec) (Vec, bool) {
	if !t.Resolved() || t.Feature.Broken || !t.Feature.HasGeometry {
		return Vec{}, false
	}
	f := t.Feature
	m := nearestMember(t, p)
	if m == nil {
		return Vec{}, false
	}
	d := f.Dir.Unit()
	tiny := 1e-9 * math.Max(1, p.Norm()+m.Point.Norm())
	switch {
	case f.Kind == Plane || f.Kind.IsWidth():
		return d, d.Norm() > 0
	case f.Kind.IsCylinder():
		w := p.Sub(m.Point)
		r := w.Sub(d.Scale(w.Dot(d)))
		return r.Unit(), r.Norm() > tiny
	case f.Kind.IsSphere():
		w := p.Sub(m.Point)
		return w.Unit(), w.Norm() > tiny
	case f.Kind == Cone:
		// m.Point is the apex; g runs along the cone's line through p.
		w := p.Sub(m.Point)
		r := w.Sub(d.Scale(w.Dot(d)))
		if r.Norm() <= tiny || w.Norm() <= tiny {
			return Vec{}, false
		}
		g, rh := w.Unit(), r.Unit()
		n := rh.Sub(g.Scale(rh.Dot(g)))
		return n.Unit(), n.Norm() > 1e-12
	}
	return Vec{}, false
}

// DistanceFrom returns how far p is from the target's nominal surface,
// where the model says enough to know: from a plane; from the nearer face
// of a width, and from a cylinder or a sphere, given their nominal size.
// ok is false otherwise (a cone's half-angle, an extrusion's or a
// free-form surface's shape are not in the model).
func (t *Target) DistanceFrom(p Vec) (float64, bool) {
	if !t.Resolved() || t.Feature.Broken || !t.Feature.HasGeometry {
		return 0, false
	}
	f := t.Feature
	m := nearestMember(t, p)
	if m == nil {
		return 0, false
	}
	d := f.Dir.Unit()
	w := p.Sub(m.Point)
	switch {
	case f.Kind == Plane:
		return math.Abs(w.Dot(d)), d.Norm() > 0
	case f.Kind.IsWidth() && f.Size != nil:
		return math.Abs(math.Abs(w.Dot(d)) - f.Size.Nominal/2), d.Norm() > 0
	case f.Kind.IsCylinder() && f.Size != nil:
		r := w.Sub(d.Scale(w.Dot(d)))
		return math.Abs(r.Norm() - f.Size.Nominal/2), d.Norm() > 0
	case f.Kind.IsSphere() && f.Size != nil:
		return math.Abs(w.Norm() - f.Size.Nominal/2), true
	}
	return 0, false
}
