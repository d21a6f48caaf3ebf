package dof

import (
	"math"

	"gonum.org/v1/gonum/mat"
)

// This file keeps the engine as it was before it was made cheaper (commit
// 899a851): every subspace by a full gonum SVD, nothing shared between
// steps, zones or frames. It is the oracle the faster engine is held to:
// the differential tests (differential_test.go, TestFastMatchesReference*)
// require the same counts, the same names and the same twists from both, on
// every frame of the repository's test data and on random frames. Do not
// "optimise" it.

// ReferenceAnalyze and ReferenceZone are exported to the external test
// package (which may import rules to read the test data).
var (
	ReferenceAnalyze = refAnalyze
	ReferenceZone    = refZone
)

// RefDRF is the reference engine's analysed frame.
type RefDRF struct {
	frame  Frame
	spaces []space
	Steps  []Step
	Free   []Motion
}

func refAnalyze(f Frame, refs []Datum) *RefDRF {
	f = f.sanitized()
	d := &RefDRF{frame: f}
	free := identity(6)
	d.spaces = append(d.spaces, free)
	for _, ref := range refs {
		var rows [][]float64
		for _, s := range ref {
			rows = append(rows, s.conditions(f)...)
		}
		next := refRestrict(free, rows)
		d.Steps = append(d.Steps, Step{
			Constrains: len(free) - len(next),
			Removed:    f.refReadable(free, next),
			Free:       f.refReadable(next, nil),
		})
		free = next
		d.spaces = append(d.spaces, free)
	}
	d.Free = f.refReadable(free, nil)
	return d
}

func refZone(d *RefDRF, z Zone) ZoneResult {
	f := d.frame
	var rows [][]float64
	for _, s := range z.Surfaces {
		rows = append(rows, s.conditions(f)...)
	}
	gens := [][]float64(refNullSpace(rows, 6))
	for _, t := range z.Extra {
		if finite(t.W) && finite(t.V) {
			gens = append(gens, f.in(t))
		}
	}
	inv := refOrth(gens, 6)
	res := ZoneResult{PerStep: make([]int, len(d.spaces))}
	last := len(d.spaces) - 1

	if z.OrientationOnly {
		notTurning := refComplementRows(space(vecs3(refSplitSpace(inv).rot)), 3)
		for k, fk := range d.spaces {
			wf := refSplitSpace(fk).rot
			kept := refRestrict(space(vecs3(wf)), notTurning)
			res.PerStep[k] = len(wf) - len(kept)
			if k == last {
				for _, w := range pick(wf, to3(kept)) {
					res.Free = append(res.Free, f.motion(Twist{W: w}))
				}
			}
		}
		return res
	}

	notMoving := refComplementRows(inv, 6)
	for k, fk := range d.spaces {
		kept := refRestrict(fk, notMoving)
		res.PerStep[k] = len(fk) - len(kept)
		if k == last {
			res.Free = f.refReadable(fk, kept)
			for _, m := range res.Free {
				if m.Twist.W == (Vec{}) {
					res.TranslationMoves = true
				}
			}
		}
	}
	return res
}

func refNullSpace(rows [][]float64, n int) space {
	if n == 0 {
		return nil
	}
	if len(rows) == 0 {
		return identity(n)
	}
	data := make([]float64, 0, len(rows)*n)
	for _, r := range rows {
		data = append(data, r...)
	}
	var svd mat.SVD
	if !svd.Factorize(mat.NewDense(len(rows), n, data), mat.SVDFull) {
		return identity(n)
	}
	vals := svd.Values(nil)
	var v mat.Dense
	svd.VTo(&v)
	var out space
	for j := 0; j < n; j++ {
		if j < len(vals) && vals[j] > rankTol {
			continue
		}
		out = append(out, mat.Col(nil, j, &v))
	}
	return out
}

func refRestrict(s space, rows [][]float64) space {
	if len(s) == 0 {
		return nil
	}
	m := make([][]float64, len(rows))
	for i, r := range rows {
		m[i] = make([]float64, len(s))
		for j, b := range s {
			m[i][j] = dot(r, b)
		}
	}
	return refCombine(s, refNullSpace(m, len(s)))
}

func refCombine(s space, coeffs space) space {
	if len(coeffs) == 0 {
		return nil
	}
	out := make(space, len(coeffs))
	for k, c := range coeffs {
		x := make([]float64, len(s[0]))
		for j, b := range s {
			for i := range x {
				x[i] += c[j] * b[i]
			}
		}
		out[k] = x
	}
	return out
}

func refOrth(vecs [][]float64, n int) space {
	var cols [][]float64
	for _, v := range vecs {
		l := math.Sqrt(dot(v, v))
		if l == 0 || math.IsNaN(l) || math.IsInf(l, 0) {
			continue
		}
		u := make([]float64, n)
		for i := range u {
			u[i] = v[i] / l
		}
		cols = append(cols, u)
	}
	if len(cols) == 0 {
		return nil
	}
	a := mat.NewDense(n, len(cols), nil)
	for j, c := range cols {
		a.SetCol(j, c)
	}
	var svd mat.SVD
	if !svd.Factorize(a, mat.SVDThin) {
		return nil
	}
	vals := svd.Values(nil)
	var u mat.Dense
	svd.UTo(&u)
	var out space
	for j, s := range vals {
		if s > rankTol {
			out = append(out, mat.Col(nil, j, &u))
		}
	}
	return out
}

func refComplementRows(s space, n int) [][]float64 {
	rows := make([][]float64, len(s))
	copy(rows, s)
	return refNullSpace(rows, n)
}

func refSplitSpace(s space) split {
	sp := split{basis: s}
	k := len(s)
	if k == 0 {
		return sp
	}
	a := mat.NewDense(3, k, nil)
	for j, b := range s {
		a.SetCol(j, b[:3])
	}
	var svd mat.SVD
	if !svd.Factorize(a, mat.SVDFull) {
		return sp
	}
	vals := svd.Values(nil)
	var u, v mat.Dense
	svd.UTo(&u)
	svd.VTo(&v)
	rank := 0
	for _, x := range vals {
		if x > rankTol {
			rank++
		}
	}
	for j := 0; j < rank; j++ {
		var w [3]float64
		copy(w[:], mat.Col(nil, j, &u))
		sp.rot = append(sp.rot, w)
		sp.u = append(sp.u, w)
		sp.v = append(sp.v, mat.Col(nil, j, &v))
		sp.vals = append(sp.vals, vals[j])
	}
	var coeffs space
	for j := rank; j < k; j++ {
		coeffs = append(coeffs, mat.Col(nil, j, &v))
	}
	for _, t := range refCombine(s, coeffs) {
		var d [3]float64
		copy(d[:], t[3:])
		sp.trans = append(sp.trans, unit(d))
	}
	return sp
}

func refLift(sp split, w [3]float64) []float64 {
	coef := make([]float64, len(sp.basis))
	for i := range sp.u {
		c := dot(sp.u[i][:], w[:]) / sp.vals[i]
		for j := range coef {
			coef[j] += c * sp.v[i][j]
		}
	}
	return refCombine(sp.basis, space{coef})[0]
}

func (f Frame) refReadable(s, k space) []Motion {
	ss, ks := refSplitSpace(s), refSplitSpace(k)
	var out []Motion
	for _, t := range pick(ss.trans, ks.trans) {
		out = append(out, f.motion(Twist{V: t}))
	}
	for _, w := range pick(ss.rot, ks.rot) {
		tw := f.out(refLift(ss, w))
		for _, t := range ss.trans {
			tw.V = sub(tw.V, scale(t, dot(tw.V[:], t[:])))
		}
		out = append(out, f.motion(tw))
	}
	return out
}
