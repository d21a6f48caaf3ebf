package dof

import "math"

// Closed forms for the commonest single surfaces, a plane and a hole's or
// pin's axis, and the commonest zone of several, a pattern of parallel
// holes or pins, used where the engine would otherwise run SVDs whose
// answer is certain: the invariance of one datum plane before any other
// reference (Analyze's first step), the location zone of one plane, of one
// hole or pin and that of a pattern (PrepareZone). The spaces are the
// same as the SVDs', to rounding; the bases differ by a rotation within
// them, which no count, name or twist depends on (the names and twists are
// chosen from the subspaces: see readableSplit and pick). The differential
// tests hold both uses to the reference engine.

// planeSpaces returns, for a valid plane (normal d, point p) within
// farPoint part sizes of the part's centre, orthonormal bases of its
// invariance Z and of Z's complement, in normalised twists, with the
// split of Z into translations and rotations:
//
//	Z  = span{(d, 0), (0, t1), (0, t2)}   turn about the normal, slide in the plane
//	Z⊥ = span{(t1, 0), (t2, 0), (0, d)}
//
// (d, 0) leaves the plane unchanged because d·(ω×p) = d·(d×p) = 0 for
// ω = d; with t1, t2 as in Surface.conditions every vector of Z meets the
// plane's three conditions and Z⊥ is spanned by them. The SVD of the
// conditions finds rank 3 with certainty for such a plane: their matrix is
// block lower triangular with orthonormal diagonal blocks and an
// off-diagonal block of norm at most |p| ≤ farPoint, so its smallest
// singular value is at least 1/(2(1 + farPoint)) ≈ 0.01, far above rankTol.
// ok is false otherwise.
func planeSpaces(f Frame, s Surface) (z, zPerp space, sp split, ok bool) {
	if s.Class != Plane || !s.Valid() || norm(f.point(s.Point)) > farPoint {
		return nil, nil, split{}, false
	}
	d := unit(s.Dir)
	t1, t2 := perpendiculars(d)
	rows := vectors(6, 6) // one allocation for both bases
	six := func(i int, w, v Vec) []float64 {
		copy(rows[i], w[:])
		copy(rows[i][3:], v[:])
		return rows[i]
	}
	z = space{six(0, d, Vec{}), six(1, Vec{}, t1), six(2, Vec{}, t2)}
	zPerp = space{six(3, t1, Vec{}), six(4, t2, Vec{}), six(5, Vec{}, d)}
	// The rotation parts of Z's basis are d, 0, 0: one rotation direction
	// d (singular value 1, reached by the first basis vector), and the
	// translations t1, t2 of the other two.
	sp = split{
		basis: z,
		trans: [][3]float64{t1, t2},
		rot:   [][3]float64{d},
		u:     [][3]float64{d},
		v:     [][]float64{{1, 0, 0}},
		vals:  []float64{1},
	}
	return z, zPerp, sp, true
}

// minSpread is the least distance across their common axis direction, in
// part sizes, at which parallelCylinders answers for a pattern's members.
const minSpread = 1e-2

// parallelCylinders returns, for the location zone of two or more valid
// cylinders with one axis direction d (a pattern of holes or pins), not
// all on one line, within farPoint part sizes of the part's centre, an
// orthonormal basis of the motions that move it: everything but the slide
// along d (ISO 5459:2011: parallel cylinders are invariant only under a
// translation along their common direction, the prismatic class of their
// section). In normalised twists:
//
//	Z  = span{(0, d)}
//	Z⊥ = span{(e1, 0), (e2, 0), (e3, 0), (0, t1), (0, t2)}
//
// The SVD finds rank 5 with certainty: a rotation across d moves each axis
// by its lever arm, and about d moves one axis by its distance from
// another, at least minSpread, far above rankTol; the translations across
// d move every axis by themselves. ok is false otherwise.
func parallelCylinders(f Frame, ss []Surface) (space, bool) {
	if len(ss) < 2 || ss[0].Class != Cylinder || !ss[0].Valid() {
		return nil, false
	}
	d := unit(ss[0].Dir)
	p0 := f.point(ss[0].Point)
	spread := 0.0
	for _, s := range ss {
		if s.Class != Cylinder || !s.Valid() || norm(cross(unit(s.Dir), d)) > 1e-12 {
			return nil, false
		}
		p := f.point(s.Point)
		if norm(p) > farPoint {
			return nil, false
		}
		w := sub(p, p0)
		spread = max(spread, norm(cross(w, d)))
	}
	if spread < minSpread {
		return nil, false
	}
	t1, t2 := perpendiculars(d)
	rows := vectors(5, 6)
	rows[0][0], rows[1][1], rows[2][2] = 1, 1, 1
	copy(rows[3][3:], t1[:])
	copy(rows[4][3:], t2[:])
	return rows, true
}

// cylinderRows returns, for a valid cylinder (axis d through p) within
// farPoint part sizes of the part's centre, an orthonormal basis of the
// motions that move its location zone: the span of its four conditions
// (Surface.conditions), by Gram-Schmidt on them in their own order. With
// t1, t2 as there and ci = (p×ti)·d, the conditions are
//
//	(t1, 0), (t2, 0), (p×t1, t1), (p×t2, t2)
//
// and the last two less their parts along the first two are (c1 d, t1) and
// (c2 d, t2), already orthogonal to (t1, 0) and (t2, 0); of these two the
// second less its part along the first is what remains. The cylinder's
// invariance, the rest of R^6, is the turn about its axis and the slide
// along it (ISO 5459:2011, the cylindrical class). The SVD of the
// conditions finds rank 4 with certainty for such a cylinder: as for a
// plane (planeSpaces) their matrix is block lower triangular with
// orthonormal diagonal blocks and an off-diagonal block of norm at most
// |p| ≤ farPoint, so its smallest singular value is at least
// 1/(1 + farPoint) ≈ 0.02, far above rankTol; the rows it keeps span the
// same space as these. ok is false otherwise.
func cylinderRows(f Frame, s Surface) (rows [][]float64, ok bool) {
	if s.Class != Cylinder || !s.Valid() {
		return nil, false
	}
	p := f.point(s.Point)
	if norm(p) > farPoint {
		return nil, false
	}
	d := unit(s.Dir)
	t1, t2 := perpendiculars(d)
	pt1, pt2 := cross(p, t1), cross(p, t2)
	c1, c2 := dot(pt1[:], d[:]), dot(pt2[:], d[:])
	out := vectors(4, 6)
	copy(out[0], t1[:])
	copy(out[1], t2[:])
	// (c1 d, t1), normalised
	n3 := math.Sqrt(1 + c1*c1)
	for i := range 3 {
		out[2][i], out[2][3+i] = c1*d[i]/n3, t1[i]/n3
	}
	// (c2 d, t2) less its part along the third row, normalised
	k := c1 * c2 / n3 // (c2 d, t2)·row 3
	r := out[3]
	for i := range 3 {
		r[i], r[3+i] = c2*d[i]-k*out[2][i], t2[i]-k*out[2][3+i]
	}
	n4 := math.Sqrt(dot(r, r))
	for i := range r {
		r[i] /= n4
	}
	return out, true
}
