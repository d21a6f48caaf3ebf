package basics

// This file is the solver: a query's variables, the motions its datums
// leave free, and the rank decision of whether a combination of variables
// is fixed by the part's basic relations.

import (
	"math"
	"sync"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/dof"
	"gonum.org/v1/gonum/mat"
)

// scratch is what one query indexes by variable, class or general row,
// kept between queries in one pool for every engine (queries may run at
// once). The pool is the package's, not the engine's: a pool registers
// itself with the runtime until the next collections, and a pool in each
// engine kept every file's engine and syntax tree alive that long (the
// 2,000-plate check's peak went from 32 to 190 MB).
type scratch struct {
	index  []int  // variable → position in params, −1 for none
	col    []int  // class → column of the dense rows, −1 for none
	ground []bool // class → held by the datums
	seen   []bool // general row → reached by fixed
}

var scratchPool = sync.Pool{New: func() any { return new(scratch) }}

func (e *Engine) getScratch() *scratch {
	sc := scratchPool.Get().(*scratch)
	sc.index = resize(sc.index, e.nvars)
	sc.col = resize(sc.col, e.nvars)
	sc.ground = resize(sc.ground, e.nvars)
	sc.seen = resize(sc.seen, len(e.general))
	for i := range sc.index {
		sc.index[i], sc.col[i] = -1, -1
	}
	clear(sc.ground)
	clear(sc.seen)
	return sc
}

// resize returns s with length n, reallocated only when it is too short.
func resize[T any](s []T, n int) []T {
	if cap(s) < n {
		return make([]T, n)
	}
	return s[:n]
}

// param is one variable of the target.
type param struct {
	x   *entity
	mi  int // member index in the target
	v   int // variable
	rot bool
	dir Vec
}

type solve struct {
	e       *Engine
	q       Query
	members []*entity
	params  []param
	index   []int // variable → position in params, −1 for none
	first   []int // first[i]…first[i+1] are member i's params
	free    [][][]float64
	moves   [][]float64 // orthonormal basis of how free motions change the params
	ground  []bool      // class → held at zero by the datums
	col     []int       // class → column of the dense rows below, −1 for none
	ncol    int         // columns given so far
	seen    []bool      // general row → reached by fixed
	cand    sv          // candidate buffer (unit)
	basis   [][]float64 // orthonormal rows (over columns) fixed so far; shorter ones end in zeros
	hubs    []*entity   // axis datum features, for circles and clocking
}

func (e *Engine) newSolve(q Query, sc *scratch) *solve {
	s := &solve{e: e, q: q, index: sc.index, ground: sc.ground, col: sc.col, seen: sc.seen}
	if !q.Target.Resolved() || len(q.Free) != len(q.Refs) {
		return nil
	}
	ms := q.Target.Feature.Members
	if q.Target.Member != nil {
		ms = []*model.Member{q.Target.Member}
	}
	tv := e.targetVars(q.Target.Feature, q.Target.Member, ms, q.Orientation)
	if tv == nil {
		return nil
	}
	s.members, s.params, s.first = tv.members, tv.params, tv.first
	for i, p := range s.params {
		s.index[p.v] = i
	}
	for _, ref := range q.Refs {
		for _, m := range ref {
			x := e.byMem[m]
			if x == nil {
				return nil
			}
			for v := x.t0; v < x.r0+len(x.rb); v++ {
				s.ground[e.class[v]] = true
			}
			if x.shape == axisShape && !containsEnt(s.hubs, x) {
				s.hubs = append(s.hubs, x)
			}
		}
	}
	// Only the last reference's motions are needed for every query; the
	// others only to say which reference fixes a missing quantity
	// (fixedBy), so they are worked out when it is first asked.
	s.free = make([][][]float64, len(q.Free))
	last := [][]float64(nil)
	if len(s.free) == 0 {
		for i := 0; i < 6; i++ {
			var t dof.Twist
			if i < 3 {
				t.W[i] = 1
			} else {
				t.V[i-3] = e.L
			}
			last = append(last, s.motion(t))
		}
	} else {
		last = s.freeRows(len(s.free) - 1)
	}
	// What the frame needs is everything no free motion changes: the
	// orthogonal complement of the motions' rows.
	s.moves = orthonormal(last)
	if len(s.moves) >= len(s.params) {
		return nil
	}
	s.fixed()
	return s
}

// targetVars are a target's members and variables, which depend only on
// the target and on whether only orientation is asked; each engine works
// them out once per target, and queries only read them.
type targetVars struct {
	members []*entity
	params  []param
	first   []int // first[i]…first[i+1] are member i's params
}

type targetKey struct {
	f           *model.Feature
	m           *model.Member
	orientation bool
}

// targetVars returns the members and variables of the target whose
// members are ms, or nil when one has unknown geometry or there are no
// variables.
func (e *Engine) targetVars(f *model.Feature, m *model.Member, ms []*model.Member, orientation bool) *targetVars {
	key := targetKey{f, m, orientation}
	e.memoMu.Lock()
	defer e.memoMu.Unlock()
	if tv, ok := e.targets[key]; ok {
		return tv
	}
	tv := e.newTargetVars(ms, orientation)
	if e.targets == nil {
		e.targets = map[targetKey]*targetVars{}
	}
	e.targets[key] = tv
	return tv
}

func (e *Engine) newTargetVars(ms []*model.Member, orientation bool) *targetVars {
	tv := &targetVars{first: make([]int, 0, len(ms)+1), members: make([]*entity, 0, len(ms))}
	n := 0
	for _, m := range ms {
		x := e.byMem[m]
		if x == nil {
			return nil
		}
		tv.members = append(tv.members, x)
		if !orientation {
			n += len(x.tb)
		}
		n += len(x.rb)
	}
	if n == 0 {
		return nil
	}
	tv.params = make([]param, 0, n)
	for i, x := range tv.members {
		tv.first = append(tv.first, len(tv.params))
		if !orientation {
			for k, b := range x.tb {
				tv.params = append(tv.params, param{x: x, mi: i, v: x.t0 + k, dir: b})
			}
		}
		for k, b := range x.rb {
			tv.params = append(tv.params, param{x: x, mi: i, v: x.r0 + k, rot: true, dir: b})
		}
	}
	tv.first = append(tv.first, len(tv.params))
	return tv
}

func containsEnt(xs []*entity, x *entity) bool {
	for _, y := range xs {
		if y == x {
			return true
		}
	}
	return false
}

// motion is how a rigid motion of the part changes the target's variables.
func (s *solve) motion(t dof.Twist) []float64 {
	out := make([]float64, len(s.params))
	w, v := Vec(t.W), Vec(t.V)
	for i, p := range s.params {
		if p.rot {
			out[i] = p.dir.Dot(w)
		} else {
			out[i] = p.dir.Dot(v.Add(w.Cross(p.x.p))) / s.e.L
		}
	}
	return out
}

// reduce maps a row over variables to a dense row over the classes'
// columns, leaving out the datum features' classes, which the frame holds
// at zero. Classes seen for the first time get new columns.
func (s *solve) reduce(r row) []float64 {
	var out []float64
	for _, t := range r {
		c := s.e.class[t.v]
		if s.ground[c] {
			continue
		}
		k := s.col[c]
		if k < 0 {
			k = s.ncol
			s.col[c] = k
			s.ncol++
		}
		for len(out) <= k {
			out = append(out, 0)
		}
		out[k] += t.c
	}
	return out
}

// fixed builds an orthonormal basis of the relations that bear on the
// target: the general rows reachable from its classes.
func (s *solve) fixed() {
	var queue []int
	for _, p := range s.params {
		c := s.e.class[p.v]
		if !s.ground[c] && s.col[c] < 0 {
			s.col[c] = s.ncol
			s.ncol++
			queue = append(queue, c)
		}
	}
	var rows [][]float64
	for len(queue) > 0 {
		c := queue[0]
		queue = queue[1:]
		for _, ri := range s.e.rowsOf(c) {
			if s.seen[ri] {
				continue
			}
			s.seen[ri] = true
			before := s.ncol
			rows = append(rows, s.reduce(s.e.general[ri]))
			for _, cl := range s.e.general[ri] {
				if c2 := s.e.class[cl.v]; !s.ground[c2] && s.col[c2] >= before {
					queue = append(queue, c2)
				}
			}
		}
	}
	s.basis = orthDense(rows, s.ncol)
}

// undetermined returns the part of a row that the relations found so far
// do not fix, normalised; nil when it is fixed. n is the length of the row
// before its datum features' terms were left out and its equal variables
// merged, so that what cancels there counts as fixed however small the
// rounding left it.
func (s *solve) undetermined(r []float64, n float64) []float64 {
	if n == 0 || math.Sqrt(dot(r, r)) <= rankTol*n {
		return nil
	}
	res := make([]float64, len(r))
	for k, v := range r {
		res[k] = v / n
	}
	for _, b := range s.basis {
		m := min(len(b), len(res))
		d := dot(res[:m], b[:m])
		if d == 0 {
			continue
		}
		for len(res) < len(b) {
			res = append(res, 0)
		}
		for k, v := range b {
			res[k] -= d * v
		}
	}
	rn := math.Sqrt(dot(res, res))
	if rn <= rankTol {
		return nil
	}
	for k := range res {
		res[k] /= rn
	}
	return res
}

// sv is a sparse vector over the target's variables (term.v indexes
// params). Candidates are sparse so that a pattern of many members costs
// time in proportion to its members, not to their square.
type sv []term

func (c sv) norm() float64 {
	t := 0.0
	for _, x := range c {
		t += x.c * x.c
	}
	return math.Sqrt(t)
}

func (c sv) dot(d []float64) float64 {
	t := 0.0
	for _, x := range c {
		t += x.c * d[x.v]
	}
	return t
}

// needed reports whether a vector over the target's variables is something
// the frame needs fixed: no free motion changes it.
func (s *solve) needed(c sv) bool {
	n := c.norm()
	if n == 0 {
		return false
	}
	moved := 0.0
	for _, m := range s.moves {
		d := c.dot(m)
		moved += d * d
	}
	return math.Sqrt(moved) <= rankTol*n
}

// freeRows returns how the motions left free after reference k change the
// target's variables, worked out on first use.
func (s *solve) freeRows(k int) [][]float64 {
	if s.free[k] == nil {
		rows := make([][]float64, 0, len(s.q.Free[k]))
		for _, t := range s.q.Free[k] {
			rows = append(rows, s.motion(t))
		}
		s.free[k] = rows
	}
	return s.free[k]
}

// fixedBy returns the first reference after which no free motion changes c.
func (s *solve) fixedBy(c sv) int {
	n := c.norm()
	for k := range s.free {
		rows := s.freeRows(k)
		ok := true
		for _, r := range rows {
			rn := math.Sqrt(dot(r, r))
			if rn > 0 && math.Abs(c.dot(r)) > rankTol*n*rn {
				ok = false
				break
			}
		}
		if ok {
			return k
		}
	}
	return -1
}

// toRow turns a vector over the target's variables into a row.
func (s *solve) toRow(c sv) row {
	r := make(row, 0, len(c))
	for _, t := range c {
		if t.c != 0 {
			r = append(r, term{s.params[t.v].v, t.c})
		}
	}
	return r
}

// fromRow turns a row into a vector over the target's variables; ok is
// false when it touches other variables that are not held by the datums.
func (s *solve) fromRow(r row) (sv, bool) {
	var c sv
	for _, t := range r {
		if i := s.index[t.v]; i >= 0 {
			c = append(c, term{i, t.c})
		} else if !s.ground[s.e.class[t.v]] {
			return nil, false
		}
	}
	return c, true
}

// try accepts a candidate when the frame needs it and nothing fixes it;
// it is then counted as fixed, so later candidates are independent of it.
func (s *solve) try(c sv) bool {
	if !s.needed(c) {
		return false
	}
	res := s.undetermined(s.reduce(s.toRow(c)), c.norm())
	if res == nil {
		return false
	}
	s.basis = append(s.basis, res)
	return true
}

func unit(p int) sv { return sv{{p, 1}} }

// unit is unit(p) in the solve's candidate buffer, for a candidate that
// is read and dropped (try and fixedBy keep nothing of it).
func (s *solve) unit(p int) sv {
	s.cand = append(s.cand[:0], term{p, 1})
	return s.cand
}

// --- linear algebra -------------------------------------------------------

func dot(a, b []float64) float64 {
	t := 0.0
	for i := range a {
		t += a[i] * b[i]
	}
	return t
}

// orthonormal returns an orthonormal basis of the span of rows (modified
// Gram-Schmidt on rows scaled to unit length; there are at most six).
func orthonormal(rows [][]float64) [][]float64 {
	var out [][]float64
	for _, r := range rows {
		l := math.Sqrt(dot(r, r))
		if l == 0 || math.IsNaN(l) || math.IsInf(l, 0) {
			continue
		}
		v := make([]float64, len(r))
		for i := range r {
			v[i] = r[i] / l
		}
		for _, b := range out {
			d := dot(v, b)
			for i := range v {
				v[i] -= d * b[i]
			}
		}
		n := math.Sqrt(dot(v, v))
		if n <= rankTol {
			continue
		}
		for i := range v {
			v[i] /= n
		}
		out = append(out, v)
	}
	return out
}

// orthDense returns an orthonormal basis of the span of rows over n
// columns (shorter rows end in zeros), by gonum's SVD: the rank decision.
func orthDense(rows [][]float64, n int) [][]float64 {
	var keep [][]float64
	for _, r := range rows {
		if l := math.Sqrt(dot(r, r)); l > 0 && !math.IsNaN(l) && !math.IsInf(l, 0) {
			keep = append(keep, r)
		}
	}
	if len(keep) == 0 || n == 0 {
		return nil
	}
	a := mat.NewDense(len(keep), n, nil)
	for i, r := range keep {
		l := math.Sqrt(dot(r, r))
		for k, v := range r {
			a.Set(i, k, v/l)
		}
	}
	var svd mat.SVD
	if !svd.Factorize(a, mat.SVDThinV) {
		return nil
	}
	vals := svd.Values(nil)
	var v mat.Dense
	svd.VTo(&v)
	var out [][]float64
	for j, sv := range vals {
		if sv > rankTol {
			out = append(out, mat.Col(nil, j, &v))
		}
	}
	return out
}

func rowNorm(r row) float64 {
	t := 0.0
	for _, x := range r {
		t += x.c * x.c
	}
	return math.Sqrt(t)
}

// Asks says what a frame's characteristic asks of basic dimensions for
// one of its segments: the location and orientation of its zone (position;
