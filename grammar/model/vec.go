package model

import "math"

// Vec is a point or a direction in the part's coordinates.
type Vec [3]float64

func (a Vec) Add(b Vec) Vec       { return Vec{a[0] + b[0], a[1] + b[1], a[2] + b[2]} }
func (a Vec) Sub(b Vec) Vec       { return Vec{a[0] - b[0], a[1] - b[1], a[2] - b[2]} }
func (a Vec) Scale(s float64) Vec { return Vec{a[0] * s, a[1] * s, a[2] * s} }
func (a Vec) Dot(b Vec) float64   { return a[0]*b[0] + a[1]*b[1] + a[2]*b[2] }
func (a Vec) Norm() float64       { return math.Sqrt(a.Dot(a)) }
func (a Vec) Cross(b Vec) Vec {
	return Vec{a[1]*b[2] - a[2]*b[1], a[2]*b[0] - a[0]*b[2], a[0]*b[1] - a[1]*b[0]}
}

// Unit returns a normalised to length one; the zero vector stays zero.
func (a Vec) Unit() Vec {
	n := a.Norm()
	if n == 0 {
		return a
	}
	return a.Scale(1 / n)
}

// Parallel reports whether two directions are parallel as undirected lines,
// within tol radians.
func Parallel(a, b Vec, tol float64) bool {
	return a.Unit().Cross(b.Unit()).Norm() <= tol
}

// AngleBetweenLines returns the angle in degrees between two undirected
// lines, in [0, 90].
func AngleBetweenLines(a, b Vec) float64 {
	c := math.Abs(a.Unit().Dot(b.Unit()))
	if c > 1 {
		c = 1
	}
	return math.Acos(c) * 180 / math.Pi
}
