package dof

import (
	"math"
	"sync"
)

// rankTol is the singular value below which a normalised condition counts as
// satisfied. The conditions are built from unit vectors and from points
// measured from the part's centre in units of its size, so their natural
// scale is 1 and the tolerance is absolute in those units.
//
// Why 5e-5 and not 1e-6: a value written with six significant digits is off
// by up to 5e-6 of itself, so a coordinate a couple of part sizes from the
// origin is off by about 1e-5 of the part's size, and two nominally coaxial
// holes or parallel planes then disagree by that much. Measured on this
// package's property test (random placements within 200 mm of the origin of a
// 120 mm part, rounded to six digits): 1e-6 misreads many frames, 1e-5 a few
// in a thousand, 2e-5 none; 5e-5 leaves a margin. The price: geometry tilted
// by less than about 0.003 degrees, or offset by less than 5e-5 of the part's
// size, reads as aligned, which no drawing means as a real difference.
const rankTol = 5e-5

// pickTol is how far outside the span of the motions already chosen a
// candidate direction must reach to be chosen too (unit vectors; see pick).
const pickTol = 1e-4

// A space is an orthonormal basis, one vector per element, all of one length.
// An empty space is the zero subspace. gonum's matrices cannot have a zero
// dimension, so the helpers below handle the empty cases before building one.
type space [][]float64

func identity(n int) space {
	s := make(space, n)
	for i := range s {
		s[i] = make([]float64, n)
		s[i][i] = 1
	}
	return s
}

func dot(a, b []float64) float64 {
	var t float64
	for i := range a {
		t += a[i] * b[i]
	}
	return t
}

// nullSpace returns an orthonormal basis of {x in R^n : r·x = 0 for every row r}.
// When the factorisation fails (it does not for finite input) the rows are
// ignored rather than trusted: the caller then sees no constraint, which a
// linter reports as a reference that removes nothing, not as a crash.
func nullSpace(rows [][]float64, n int) space {
	null, _ := nullAndRowSpace(rows, n)
	return null
}

// nullAndRowSpace returns nullSpace(rows, n) and, from the same SVD, an
// orthonormal basis of its orthogonal complement (the span of the rows, to
// the rank tolerance): the right singular vectors whose singular values
// exceed rankTol.
func nullAndRowSpace(rows [][]float64, n int) (null, row space) {
	if n == 0 {
		return nil, nil
	}
	if len(rows) == 0 {
		return identity(n), nil
	}
	b := getSVD(len(rows), n)
	defer putSVD(b)
	for i, r := range rows {
		copy(b.a[i*n:(i+1)*n], r)
	}
	return b.nullAndRow()
}

// nullAndRowSpaceFlat is nullAndRowSpace for rows given one after another
// in flat, n numbers each.
func nullAndRowSpaceFlat(flat []float64, n int) (null, row space) {
	m := len(flat) / n
	if m == 0 {
		return identity(n), nil
	}
	b := getSVD(m, n)
	defer putSVD(b)
	copy(b.a, flat)
	return b.nullAndRow()
}

// nullAndRow is nullAndRowSpace for the rows already in b.a. Only V is
// read: asking for U as well made LAPACK build an m × m matrix, 48 × 48 for
// the zone of a 12-hole pattern, for nothing.
func (b *svdBuf) nullAndRow() (null, row space) {
	n := b.n
	if !b.factorize(false, false, true) {
		return identity(n), nil
	}
	rank := 0
	for j := range n {
		if j < len(b.s) && b.s[j] > rankTol {
			rank++
		}
	}
	if rank > 0 {
		row = make(space, 0, rank)
	}
	if rank < n {
		null = make(space, 0, n-rank)
	}
	vs := vectors(n, n)
	for j, v := range vs {
		b.vCol(v, j)
		if j < len(b.s) && b.s[j] > rankTol {
			row = append(row, v)
		} else {
			null = append(null, v)
		}
	}
	return null, row
}

// restrict returns an orthonormal basis of S ∩ {x : r·x = 0 for every row r},
// found as S times the null space of the conditions expressed in S's basis.
// Because S is orthonormal the product is orthonormal too.
func restrict(s space, rows [][]float64) space {
	return restrictRows(s, len(rows), func(i int) []float64 { return rows[i] })
}

// restrictFlat is restrict for rows given one after another in flat, six
// numbers each.
func restrictFlat(s space, flat []float64) space {
	return restrictRows(s, len(flat)/6, func(i int) []float64 { return flat[i*6 : (i+1)*6] })
}

func restrictRows(s space, m int, row func(int) []float64) space {
	if len(s) == 0 {
		return nil
	}
	if m == 0 {
		return combine(s, identity(len(s)))
	}
	b := getSVD(m, len(s))
	defer putSVD(b)
	for i := range m {
		r := row(i)
		for j, v := range s {
			b.a[i*len(s)+j] = dot(r, v)
		}
	}
	null, _ := b.nullAndRow()
	return combine(s, null)
}

// combine returns the vectors Σ_j c[j]·s[j], one per coefficient vector c.
func combine(s space, coeffs space) space {
	if len(coeffs) == 0 {
		return nil
	}
	out := space(vectors(len(coeffs), len(s[0])))
	for k, c := range coeffs {
		x := out[k]
		for j, b := range s {
			for i := range x {
				x[i] += c[j] * b[i]
			}
		}
	}
	return out
}

// orth returns an orthonormal basis of the span of vecs (each of length n).
// Vectors are scaled to unit length first so that the tolerance means the
// same thing for every one of them; zero and non-finite vectors are dropped.
func orth(vecs [][]float64, n int) space {
	var lens []float64
	var keep [][]float64
	for _, v := range vecs {
		l := math.Sqrt(dot(v, v))
		if l == 0 || math.IsNaN(l) || math.IsInf(l, 0) {
			continue
		}
		lens, keep = append(lens, l), append(keep, v)
	}
	if len(keep) == 0 {
		return nil
	}
	k := len(keep)
	b := getSVD(n, k) // one unit column per kept vector
	defer putSVD(b)
	for j, v := range keep {
		for i := range n {
			b.a[i*k+j] = v[i] / lens[j]
		}
	}
	if !b.factorize(false, true, false) { // only U is read
		return nil
	}
	var out space
	for j, s := range b.s {
		if s > rankTol {
			u := make([]float64, n)
			b.uCol(u, j)
			out = append(out, u)
		}
	}
	return out
}

// complementRows returns a basis of the orthogonal complement of s in R^n,
// to be used as condition rows: x is in span(s) exactly when it is
// orthogonal to all of them.
func complementRows(s space, n int) [][]float64 {
	rows := make([][]float64, len(s))
	copy(rows, s)
	return nullSpace(rows, n)
}

// split separates a space of twists into its pure translations S ∩ {ω = 0}
// and its rotation parts ω(S). Both come from one SVD of the ω rows, so
// dim(translations) + dim(rotations) = dim S holds exactly, which keeps the
// number of named motions equal to the counted dimension.
type split struct {
	basis space
	trans [][3]float64 // orthonormal directions of the pure translations
	rot   [][3]float64 // orthonormal basis of the rotation parts
	// pseudo-inverse of the ω map, to lift a rotation back into S
	u    [][3]float64
	v    [][]float64
	vals []float64
}

// wholeSplit is splitSpace(identity(6)), the split of every frame's
// freedom before its first reference, computed once. Callers must not
// change it.
var wholeSplit = sync.OnceValue(func() split { return splitSpace(identity(6)) })

func splitSpace(s space) split {
	sp := split{basis: s}
	k := len(s)
	if k == 0 {
		return sp
	}
	b := getSVD(3, k)
	defer putSVD(b)
	for j, v := range s {
		for i := range 3 {
			b.a[i*k+j] = v[i]
		}
	}
	if !b.factorize(true, false, true) {
		// Not reached for finite input; call everything a rotation-free
		// translation-free remainder rather than guess.
		return sp
	}
	rank := 0
	for _, x := range b.s {
		if x > rankTol {
			rank++
		}
	}
	vs := vectors(k, k)
	for j, v := range vs {
		b.vCol(v, j)
	}
	if rank > 0 {
		sp.rot = make([][3]float64, rank)
		for j := range rank {
			b.uCol(sp.rot[j][:], j)
		}
		sp.u = sp.rot
		sp.v = vs[:rank:rank]
		sp.vals = append([]float64(nil), b.s[:rank]...)
	}
	if rank < k {
		ts := combine(s, vs[rank:])
		sp.trans = make([][3]float64, len(ts))
		for i, t := range ts {
			var d [3]float64
			copy(d[:], t[3:])
			sp.trans[i] = unit(d)
		}
	}
	return sp
}

// lift returns a twist of S whose rotation part is (as near as S allows) w.
func (sp split) lift(w [3]float64) []float64 {
	coef := make([]float64, len(sp.basis))
	for i := range sp.u {
		c := dot(sp.u[i][:], w[:]) / sp.vals[i]
		for j := range coef {
			coef[j] += c * sp.v[i][j]
		}
	}
	return combine(sp.basis, space{coef})[0]
}

func vecs3(s [][3]float64) [][]float64 {
	out := make([][]float64, len(s))
	for i := range s {
		out[i] = s[i][:]
	}
	return out
}
