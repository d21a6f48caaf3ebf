package dof

import "math"

// Zone describes a tolerance zone by what leaves it unchanged. A zone about
// a feature has that feature's invariance (a cylindrical zone about a hole's
// axis is invariant under rotation about and slide along the axis; a planar
// zone like a plane; a spherical zone about its centre; a profile zone like
// its surface). For a pattern, Surfaces lists every member and the
// framework of zones is invariant only under what leaves all of them
// unchanged. Extra adds motions under which the zone is also unchanged, in
// the part's coordinates (for runout the zone may float along the datum
// axis). OrientationOnly is for orientation tolerances, whose zone may
// translate freely: only the rotations that turn it count.
type Zone struct {
	Surfaces        []Surface
	Extra           []Twist
	OrientationOnly bool
}

// ZoneResult says which of a frame's free motions move (or, for orientation
// tolerances, turn) a zone.
type ZoneResult struct {
	// Free is a basis of the free motions, after the last reference, that
	// move the zone: together with the free motions that leave the zone
	// unchanged they span the frame's freedom. For orientation tolerances
	// they are rotations about axes through the origin ("rotation x"), as
	// only their direction matters.
	Free []Motion
	// PerStep[k] is the dimension of the zone-moving free motions after k
	// references (k = 0 … n). A reference k with PerStep[k] == PerStep[k−1]
	// fixes nothing more of the zone.
	PerStep []int
	// TranslationMoves reports that some pure translation left free by the
	// frame moves the zone. Always false for orientation tolerances, which
	// translations do not affect.
	TranslationMoves bool
}

// Zone computes what of the frame's freedom moves the zone. With Z the
// zone's invariance subspace, the motions of F that leave the zone unchanged
// are F ∩ Z and those that move it are what F adds to them, of dimension
// dim F − dim(F ∩ Z). For orientation tolerances the same is computed on
// rotation parts: ω(F) against ω(Z). Invalid surfaces contribute no
// conditions; a zone with none at all is unchanged by every motion.
//
// Zone is d.ZoneIn(frame.PrepareZone(z)); a caller checking one zone
// against several frames of a part prepares it once.
func (d *DRF) Zone(z Zone) ZoneResult {
	d = d.orDefault()
	return d.ZoneIn(d.frame.PrepareZone(z))
}

// PreparedZone is the part of a zone's analysis that does not depend on the
// datum reference frame: the conditions under which a motion leaves the
// zone unchanged, for one normalisation Frame. It is not changed after
// PrepareZone returns, so it may be shared by goroutines.
type PreparedZone struct {
	frame Frame
	zone  Zone
	// moving: rows whose null space is the zone's invariance Z (location
	// zones, in R^6), or the rotation parts ω(Z) (orientation zones, in
	// R^3). Orthonormal.
	moving [][]float64
}

// PrepareZone computes the zone's invariance subspace Z once, to be checked
// against any number of frames analysed with the same Frame (DRF.ZoneIn).
// The zone's slices are kept, not copied: do not change them afterwards.
func (f Frame) PrepareZone(z Zone) *PreparedZone {
	f = f.sanitized()
	if len(z.Extra) == 0 && len(z.Surfaces) == 1 {
		if z.OrientationOnly {
			if rows, ok := turningRows(f, z.Surfaces[0]); ok {
				return &PreparedZone{frame: f, zone: z, moving: rows}
			}
		} else if _, rows, _, ok := planeSpaces(f, z.Surfaces[0]); ok {
			return &PreparedZone{frame: f, zone: z, moving: rows}
		} else if rows, ok := cylinderRows(f, z.Surfaces[0]); ok {
			return &PreparedZone{frame: f, zone: z, moving: rows}
		}
	}
	if len(z.Extra) == 0 && !z.OrientationOnly {
		if rows, ok := parallelCylinders(f, z.Surfaces); ok {
			return &PreparedZone{frame: f, zone: z, moving: rows}
		}
	}
	rows := make([]float64, 0, 6*6*len(z.Surfaces)) // six numbers a row
	for _, s := range z.Surfaces {
		rows = s.appendConditions(rows, f)
	}
	null, moving := nullAndRowSpaceFlat(rows, 6)
	gens := [][]float64(null)
	extra := false
	for _, t := range z.Extra {
		if finite(t.W) && finite(t.V) {
			gens = append(gens, f.in(t))
			extra = true
		}
	}
	pz := &PreparedZone{frame: f, zone: z}
	inv := space(null)
	if extra {
		inv = orth(gens, 6)
		moving = complementRows(inv, 6)
	}
	// Without extra twists Z is the null space of the conditions, already
	// orthonormal, and the rows that say "moves the zone" are its
	// complement from the same SVD. (Orthonormalising Z again and taking
	// its complement by two more SVDs, as the engine once did, gives the
	// same subspace to rounding and always the same dimension: an
	// orthonormal set has singular values 1.)
	if z.OrientationOnly {
		pz.moving = complementRows(space(vecs3(splitSpace(inv).rot)), 3)
	} else {
		pz.moving = moving
	}
	return pz
}

// farPoint bounds how far (in part sizes, from the part's centre) a
// surface may lie for turningRows to answer in closed form.
const farPoint = 50

// turningRows returns, in closed form, what PrepareZone computes by three
// SVDs for the orientation zone of one surface: an orthonormal basis of
// the rotation directions that turn it, the complement of ω(Z) in R^3. By
// class (ISO 5459:2011 invariance classes, as in Surface.conditions):
//
//	plane (normal d)       Z ∋ rotation about d      ω(Z) = span d  →  t1, t2
//	cylinder, cone (axis d) as for a plane
//	sphere                 every rotation about the centre: ω(Z) = R^3  →  none
//	prismatic, complex     no rotation: ω(Z) = 0  →  all of R^3
//	invalid (no conditions) every motion: ω(Z) = R^3  →  none
//
// The SVDs decide the same dimensions with certainty while the normalised
// point p is within farPoint: the conditions' rows then have singular
// values of at least 1/(2(1 + √3·|p|)) > 0.005 (their matrix is block lower
// triangular with orthonormal diagonal blocks), and the rotation parts of
// Z's basis singular values 1 or 1/√(1 + |p×d|²) > 0.019 (or 0 exactly),
// all far from rankTol. The subspaces are the same; the bases differ by
// rounding and a rotation within them, which no count or name depends on.
// ok is false beyond farPoint: the SVDs decide.
func turningRows(f Frame, s Surface) (rows [][]float64, ok bool) {
	if !s.Valid() {
		return nil, true
	}
	if s.Class != Complex && norm(f.point(s.Point)) > farPoint {
		return nil, false
	}
	switch s.Class {
	case Plane, Cylinder, Cone:
		t1, t2 := perpendiculars(unit(s.Dir))
		return [][]float64{t1[:], t2[:]}, true
	case Sphere:
		return nil, true
	case Prismatic, Complex:
		return identity(3), true
	}
	return nil, false
}

// ZoneIn is Zone for a prepared zone. A zone prepared with another Frame
// than the DRF's is prepared again with the DRF's, so the answer never
// depends on which Frame the caller happened to prepare it with.
func (d *DRF) ZoneIn(pz *PreparedZone) ZoneResult {
	d = d.orDefault()
	f := d.frame
	if pz == nil {
		pz = f.PrepareZone(Zone{})
	} else if pz.frame != f {
		pz = f.PrepareZone(pz.zone)
	}
	res := ZoneResult{PerStep: make([]int, len(d.spaces))}
	last := len(d.spaces) - 1

	// In the steps before the last only a count is needed, and it is often
	// certain without an SVD (certainCount).
	if pz.zone.OrientationOnly {
		for k := range d.spaces {
			wf := d.splits[k].rot
			if k != last {
				if n, ok := certainCount(vecs3(wf), pz.moving); ok {
					res.PerStep[k] = n
					continue
				}
			}
			kept := restrict(space(vecs3(wf)), pz.moving)
			res.PerStep[k] = len(wf) - len(kept)
			if k == last {
				for _, w := range pick(wf, to3(kept)) {
					res.Free = append(res.Free, f.motion(Twist{W: w}))
				}
			}
		}
		return res
	}

	for k, fk := range d.spaces {
		if k != last {
			if n, ok := certainCount(fk, pz.moving); ok {
				res.PerStep[k] = n
				continue
			}
		}
		kept := restrict(fk, pz.moving)
		res.PerStep[k] = len(fk) - len(kept)
		if k == last {
			res.Free = f.readableSplit(d.splits[k], splitSpace(kept))
			// Translations are listed first and exactly span the free
			// translations the zone is not invariant under.
			for _, m := range res.Free {
				if m.Twist.W == (Vec{}) {
					res.TranslationMoves = true
				}
			}
		}
	}
	return res
}

// certainCount returns len(f) − len(restrict(f, rows)), the number of
// dimensions of the space with orthonormal basis f that the conditions rows
// (orthonormal, as PreparedZone's are) do not leave free, when it is
// certain without an SVD; ok is false otherwise.
//
//   - f empty: 0.
//   - f spans the whole space (R^6, or R^3 of rotations): restricted to f's
//     orthonormal basis the rows are still orthonormal, so their singular
//     values are all 1, far above rankTol: len(rows).
//   - f one vector: the restricted conditions are one column, whose only
//     singular value is its length. LAPACK computes that length to a few
//     units in the last place, so unless it lies within a billionth of
//     rankTol (then the SVD decides) the comparison with rankTol gives the
//     SVD's answer.
//   - otherwise, at most six rows and six vectors: the singular values
//     of the restricted conditions M (rows times f) are the square roots of
//     the eigenvalues of MᵀM, which gramCount finds by Jacobi rotations.
//     Both LAPACK's singular values and these square roots are within
//     1e-9 of the exact ones here (M's entries are products of unit
//     vectors, so ‖M‖ ≤ 1 and every error is a few hundred units in the
//     last place of 1 at most, which a square root near rankTol turns
//     into less than 1e-9); so unless one lies within a thousandth of
//     rankTol (then the SVD decides), both count the same.
func certainCount(f [][]float64, rows [][]float64) (n int, ok bool) {
	switch {
	case len(f) == 0:
		return 0, true
	case len(f) == len(f[0]):
		return len(rows), true
	case len(f) == 1:
		var ss float64
		for _, r := range rows {
			x := dot(r, f[0]) // the same entries restrict would factorise
			ss += x * x
		}
		switch l := math.Sqrt(ss); {
		case l > rankTol*(1+1e-9):
			return 1, true
		case l < rankTol*(1-1e-9):
			return 0, true
		}
	case len(f) <= 6 && len(rows) <= 6:
		return gramCount(f, rows)
	}
	return 0, false
}

// gramCount is certainCount's last case: the number of eigenvalues of
// MᵀM above rankTol², M[i][j] = rows[i]·f[j], found by the cyclic Jacobi
// method (Golub and Van Loan, Matrix Computations, 4th ed., 2013, §8.5);
// ok is false when one lies within a thousandth of rankTol of it (in
// square root) or the rotations do not settle.
func gramCount(f [][]float64, rows [][]float64) (n int, ok bool) {
	k := len(f)
	var m [6][6]float64
	for i, r := range rows {
		for j, v := range f {
			m[i][j] = dot(r, v)
		}
	}
	var a [6][6]float64
	for p := range k {
		for q := range k {
			for i := range rows {
				a[p][q] += m[i][p] * m[i][q]
			}
		}
	}
	settled := false
	for sweep := 0; sweep < 30 && !settled; sweep++ {
		off := 0.0
		for p := range k {
			for q := p + 1; q < k; q++ {
				off += a[p][q] * a[p][q]
			}
		}
		if off <= 1e-32 {
			settled = true
			break
		}
		for p := 0; p < k-1; p++ {
			for q := p + 1; q < k; q++ {
				if math.Abs(a[p][q]) <= 1e-300 {
					continue
				}
				theta := (a[q][q] - a[p][p]) / (2 * a[p][q])
				t := 1 / (math.Abs(theta) + math.Sqrt(theta*theta+1))
				if theta < 0 {
					t = -t
				}
				c := 1 / math.Sqrt(t*t+1)
				s := t * c
				for i := range k {
					aip, aiq := a[i][p], a[i][q]
					a[i][p], a[i][q] = c*aip-s*aiq, s*aip+c*aiq
				}
				for i := range k {
					api, aqi := a[p][i], a[q][i]
					a[p][i], a[q][i] = c*api-s*aqi, s*api+c*aqi
				}
			}
		}
	}
	if !settled {
		return 0, false
	}
	lo, hi := rankTol*rankTol*(1-2e-3), rankTol*rankTol*(1+2e-3)
	for i := range k {
		switch l := a[i][i]; {
		case l > hi:
			n++
		case l >= lo:
			return 0, false
		}
	}
	return n, true
}

func to3(s space) [][3]float64 {
	out := make([][3]float64, len(s))
	for i, v := range s {
		copy(out[i][:], v)
	}
	return out
}
