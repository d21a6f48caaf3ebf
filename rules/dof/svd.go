package dof

import (
	"sync"

	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack"
	"gonum.org/v1/gonum/lapack/lapack64"
)

// svdBuf runs LAPACK's SVD (Dgesvd) through the very call gonum's
// mat.SVD.Factorize makes — the same jobs, the same row-major layout, the
// same optimal workspace length, so the same bits — but in buffers kept
// between calls. mat.SVD allocated a copy of the matrix, the factors and a
// copy of each factor read back, for every one of the engine's thousands of
// tiny SVDs (at most 6 columns), and the collector's share of a check was
// larger than the arithmetic's.
type svdBuf struct {
	a, u, vt, s, work []float64
	m, n              int
	ucols             int
}

var svdPool = sync.Pool{New: func() any { return new(svdBuf) }}

// getSVD returns a buffer whose matrix a is m × n, row-major, zeroed.
// Give it back with putSVD once the factors have been read.
func getSVD(m, n int) *svdBuf {
	b := svdPool.Get().(*svdBuf)
	b.m, b.n = m, n
	b.a = zeroed(b.a, m*n)
	return b
}

func putSVD(b *svdBuf) { svdPool.Put(b) }

func zeroed(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	s = s[:n]
	clear(s)
	return s
}

// factorize computes the SVD of a (destroying it). fullU asks for all m
// left singular vectors, thinU for min(m, n); wantV for all n right ones.
// It reports whether LAPACK converged (it does for finite input).
func (b *svdBuf) factorize(fullU, thinU, wantV bool) bool {
	m, n := b.m, b.n
	k := min(m, n)
	var u, vt blas64.General
	jobU, jobVT := lapack.SVDNone, lapack.SVDNone
	switch {
	case fullU:
		jobU, b.ucols = lapack.SVDAll, m
	case thinU:
		jobU, b.ucols = lapack.SVDStore, k
	default:
		b.ucols = 0
	}
	if jobU != lapack.SVDNone {
		b.u = zeroed(b.u, m*b.ucols)
		u = blas64.General{Rows: m, Cols: b.ucols, Stride: b.ucols, Data: b.u}
	}
	if wantV {
		jobVT = lapack.SVDAll
		b.vt = zeroed(b.vt, n*n)
		vt = blas64.General{Rows: n, Cols: n, Stride: n, Data: b.vt}
	}
	a := blas64.General{Rows: m, Cols: n, Stride: n, Data: b.a}
	b.s = zeroed(b.s, k)
	key := workKey{m, n, jobU, jobVT}
	lwork, ok := workSizes.Load(key)
	if !ok {
		var query [1]float64
		lapack64.Gesvd(jobU, jobVT, a, u, vt, b.s, query[:], -1)
		lwork, _ = workSizes.LoadOrStore(key, int(query[0]))
	}
	b.work = zeroed(b.work, lwork.(int))
	return lapack64.Gesvd(jobU, jobVT, a, u, vt, b.s, b.work, len(b.work))
}

// workSizes remembers LAPACK's optimal workspace length for each shape and
// job: the query depends on nothing else, and asking it again for every
// SVD cost as much as a small factorisation.
var workSizes sync.Map // workKey → int

type workKey struct {
	m, n        int
	jobU, jobVT lapack.SVDJob
}

// vCol copies right singular vector j (row j of Vᵀ) into dst.
func (b *svdBuf) vCol(dst []float64, j int) { copy(dst, b.vt[j*b.n:(j+1)*b.n]) }

// uCol copies left singular vector j into dst.
func (b *svdBuf) uCol(dst []float64, j int) {
	for i := range b.m {
		dst[i] = b.u[i*b.ucols+j]
	}
}

// vectors returns count slices of length n cut from one allocation.
func vectors(count, n int) [][]float64 {
	back := make([]float64, count*n)
	out := make([][]float64, count)
	for i := range out {
		out[i] = back[i*n : (i+1)*n : (i+1)*n]
	}
	return out
}
