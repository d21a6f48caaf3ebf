package dof

import "math"

// Vec is a point or a direction in the part's coordinates.
type Vec = [3]float64

// Class is the invariance class of a nominal surface (ISO 5459:2011, the
// seven classes of the TTRS model less the revolute one, which a datum
// feature in this notation never is). It decides which small motions leave
// the surface unchanged, and so how many a datum on it can remove.
type Class int

// The zero Class is deliberately not a class: a Surface left unset
// contributes no conditions instead of silently acting as a plane.
const (
	Plane     Class = iota + 1 // a plane, or the mid-plane of a slot or tab
	Cylinder                   // the axis of a hole or pin
	Sphere                     // the centre of a socket or ball
	Cone                       // the axis and apex of a cone
	Prismatic                  // a linear extruded shape, free only along its direction
	Complex                    // a free-form surface: no motion leaves it unchanged
	// Contact is a point contact on a surface: a datum target point (or
	// area, or one end of a line target) where a simulator touches the
	// datum feature along the surface's normal Dir at Point. It stops the
	// one motion that moves that point of the surface along the normal
	// (ASME Y14.5-2018, datum targets; ISO 5459:2011, datum targets), so
	// three contacts not on one line of a plane remove what the plane
	// does, two along a line two, one one.
	Contact
)

var classNames = [...]string{"unknown", "plane", "cylinder", "sphere", "cone", "prismatic", "complex", "contact"}

func (c Class) String() string {
	if c < 0 || int(c) >= len(classNames) {
		return classNames[0]
	}
	return classNames[c]
}

// Surface is the nominal geometry a datum or a tolerance zone is built on.
// Dir is the normal (Plane), the axis (Cylinder, Cone) or the extrusion
// direction (Prismatic); it is normalised here and its sign does not matter.
// Point is a point on the plane, on the axis, the centre (Sphere) or the apex
// (Cone); Complex ignores both.
type Surface struct {
	Class Class
	Dir   Vec
	Point Vec
}

// Valid reports whether the surface carries enough geometry to state its
// conditions. An invalid surface (unknown class, a zero or non-finite
// direction where one is needed, a non-finite point) contributes no
// conditions: a datum made only of such surfaces removes nothing, which the
// caller can report, rather than something this package would have to guess.
func (s Surface) Valid() bool {
	switch s.Class {
	case Complex:
		return true
	case Sphere:
		return finite(s.Point)
	case Plane, Cylinder, Cone, Prismatic, Contact:
		n := norm(s.Dir)
		return finite(s.Point) && n > 0 && !math.IsInf(n, 0) && !math.IsNaN(n)
	}
	return false
}

// conditions returns the linear conditions r·ξ = 0 on a normalised twist
// ξ = (ω, v) that hold exactly when the motion leaves the surface unchanged
// (its invariance subspace, ISO 5459:2011 and Srinivasan 1999). With t1, t2
// perpendicular to the direction d and p the surface's point:
//
//	plane      ω·t1 = ω·t2 = 0,  d·(v + ω×p) = 0
//	cylinder   ω·ti = 0,         ti·(v + ω×p) = 0
//	sphere     v + ω×p = 0
//	cone       ω·ti = 0,         v + ω×p = 0
//	prismatic  ω = 0,            v·ti = 0
//	complex    ξ = 0
//	contact    d·(v + ω×p) = 0
//
// The identity a·(ω×p) = ω·(p×a) turns each into a row (p×a, a).
func (s Surface) conditions(f Frame) [][]float64 {
	flat := s.appendConditions(nil, f)
	if len(flat) == 0 {
		return nil
	}
	return rowsOf(flat)
}

// appendConditions appends the rows of conditions to dst, six numbers a
// row, without a slice per row: the engine copies them straight into an
// SVD's matrix, and a pattern's zone has four rows for each member.
func (s Surface) appendConditions(dst []float64, f Frame) []float64 {
	if !s.Valid() {
		return dst
	}
	p := f.point(s.Point)
	d := unit(s.Dir)
	t1, t2 := perpendiculars(d)
	row := func(w, v Vec) { dst = append(dst, w[0], w[1], w[2], v[0], v[1], v[2]) }
	rot := func(a Vec) { row(a, Vec{}) }
	trans := func(a Vec) { row(Vec{}, a) }
	at := func(a Vec) { row(cross(p, a), a) } // a·(v + ω×p)
	x, y, z := Vec{1, 0, 0}, Vec{0, 1, 0}, Vec{0, 0, 1}
	switch s.Class {
	case Plane:
		rot(t1)
		rot(t2)
		at(d)
	case Cylinder:
		rot(t1)
		rot(t2)
		at(t1)
		at(t2)
	case Sphere:
		at(x)
		at(y)
		at(z)
	case Cone:
		rot(t1)
		rot(t2)
		at(x)
		at(y)
		at(z)
	case Prismatic:
		rot(x)
		rot(y)
		rot(z)
		trans(t1)
		trans(t2)
	case Complex:
		rot(x)
		rot(y)
		rot(z)
		trans(x)
		trans(y)
		trans(z)
	case Contact:
		at(d)
	}
	return dst
}

// rowsOf cuts a flat list of six-number rows into rows (sharing it).
func rowsOf(flat []float64) [][]float64 {
	rows := make([][]float64, len(flat)/6)
	for i := range rows {
		rows[i] = flat[i*6 : (i+1)*6 : (i+1)*6]
	}
	return rows
}

// perpendiculars returns two unit vectors completing d to an orthonormal
// frame. Which two does not matter: only the subspace they span enters the
// conditions. Crossing with the axis least aligned with d keeps it well
// conditioned.
func perpendiculars(d Vec) (Vec, Vec) {
	k := 0
	for i := 1; i < 3; i++ {
		if math.Abs(d[i]) < math.Abs(d[k]) {
			k = i
		}
	}
	var e Vec
	e[k] = 1
	t1 := unit(cross(d, e))
	return t1, cross(d, t1)
}

func cross(a, b Vec) Vec {
	return Vec{a[1]*b[2] - a[2]*b[1], a[2]*b[0] - a[0]*b[2], a[0]*b[1] - a[1]*b[0]}
}

func norm(a Vec) float64 { return math.Sqrt(a[0]*a[0] + a[1]*a[1] + a[2]*a[2]) }

func unit(a Vec) Vec {
	n := norm(a)
	if n == 0 {
		return a
	}
	return Vec{a[0] / n, a[1] / n, a[2] / n}
}

func sub(a, b Vec) Vec           { return Vec{a[0] - b[0], a[1] - b[1], a[2] - b[2]} }
func add(a, b Vec) Vec           { return Vec{a[0] + b[0], a[1] + b[1], a[2] + b[2]} }
func scale(a Vec, k float64) Vec { return Vec{a[0] * k, a[1] * k, a[2] * k} }

func finite(a Vec) bool {
	for _, x := range a {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}
