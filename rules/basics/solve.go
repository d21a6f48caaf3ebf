package basics

// This file is the solver: a query's variables, the motions its datums
// leave free, and the rank decision of whether a combination of variables
// is fixed by the part's basic relations.

import (
	"math"
	"slices"
	"sync"

	"gonum.org/v1/gonum/mat"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/dof"
)

// scratch is what one query indexes by variable, class or general row,
// kept between queries in one pool for every engine (queries may run at
// once). The pool is the package's, not the engine's: a pool registers
// itself with the runtime until the next collections, and a pool in each
// engine kept every file's engine and syntax tree alive that long (the
// 2,000-plate check's peak went from 32 to 190 MB). Between queries every
// entry is clean (−1 or false); a query cleans what it wrote, so that it
// costs time in proportion to what it touched, not to the part.
type scratch struct {
	index   []int   // variable → position in params, −1 for none
	ground  []bool  // class → held by the datums
	col     []int32 // class → column of the local factor, −1 for none
	near    []bool  // class → reached by the local search
	rowIn   []bool  // general row → taken by the local search
	held    []int   // classes set in ground
	indexed []int   // variables set in index
	nears   []int   // classes set in near
	rows    []int32 // rows set in rowIn
	// support counts the rows the local search took by their classes
	// (redundant)
	support map[uint64]int
	// two sparse accumulators over classes: a row summed over its
	// classes, and its reduced form
	sum, red acc
}

// acc is a sparse vector over classes being summed: dense values, with the
// classes touched listed so that clearing it costs what was touched.
type acc struct {
	x       []float64
	in      []bool
	touched []int
}

func (a *acc) grow(n int) {
	a.x, a.in = grow(a.x, n, 0), grow(a.in, n, false)
}

func (a *acc) add(c int, v float64) {
	if !a.in[c] {
		a.in[c] = true
		a.touched = append(a.touched, c)
	}
	a.x[c] += v
}

func (a *acc) reset() {
	for _, c := range a.touched {
		a.x[c], a.in[c] = 0, false
	}
	a.touched = a.touched[:0]
}

func (a *acc) norm() float64 {
	t := 0.0
	for _, c := range a.touched {
		t += a.x[c] * a.x[c]
	}
	return math.Sqrt(t)
}

var scratchPool = sync.Pool{New: func() any { return new(scratch) }}

func (e *Engine) getScratch() *scratch {
	sc := scratchPool.Get().(*scratch)
	sc.index = grow(sc.index, e.nvars, -1)
	sc.ground = grow(sc.ground, e.nvars, false)
	sc.col = grow(sc.col, e.nvars, -1)
	sc.near = grow(sc.near, e.nvars, false)
	sc.rowIn = grow(sc.rowIn, len(e.general), false)
	sc.sum.grow(e.nvars)
	sc.red.grow(e.nvars)
	return sc
}

// putScratch cleans what a query wrote and gives the scratch back.
func putScratch(sc *scratch) {
	for _, v := range sc.indexed {
		sc.index[v] = -1
	}
	sc.indexed = sc.indexed[:0]
	for _, c := range sc.held {
		sc.ground[c] = false
	}
	sc.held = sc.held[:0]
	sc.clearLocal()
	sc.sum.reset()
	sc.red.reset()
	scratchPool.Put(sc)
}

// clearLocal cleans what the local search wrote.
func (sc *scratch) clearLocal() {
	for _, c := range sc.nears {
		sc.near[c] = false
	}
	for _, r := range sc.rows {
		sc.rowIn[r] = false
	}
	sc.nears, sc.rows = sc.nears[:0], sc.rows[:0]
	clear(sc.support)
}

// grow returns s with length n, every entry clean: entries past the length
// it had within its capacity are clean already (the scratch invariant),
// and a new array is filled with the clean value.
func grow[T any](s []T, n int, clean T) []T {
	if cap(s) >= n {
		return s[:n]
	}
	out := make([]T, n, n+n/4)
	for i := range out[:cap(out)] {
		out[:cap(out)][i] = clean
	}
	return out
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
	sc      *scratch
	hold    *holding  // what the datums hold
	f       *factor   // the relations with the datums held: local or the part's
	budget  int       // rows the local search may take
	whole   bool      // the local search took every row connected to the target
	sum     *acc      // a row over classes (undetermined)
	red     *acc      // its reduced form
	cand    sv        // candidate buffer (unit)
	basis   [][]term  // orthonormal reduced forms (over free classes) of what the query found missing
	found   []row     // the rows it found missing, over classes
	last    row       // the row decide last found missing, over classes
	hubs    []*entity // axis datum features, for circles and clocking
}

func (e *Engine) newSolve(q Query, sc *scratch) *solve {
	s := &solve{e: e, q: q, index: sc.index, ground: sc.ground, sc: sc, sum: &sc.sum, red: &sc.red}
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
		sc.indexed = append(sc.indexed, p.v)
	}
	var held []int
	for _, ref := range q.Refs {
		for _, m := range ref {
			x := e.byMem[m]
			if x == nil {
				return nil
			}
			held = append(held, x.t0)
			for v := x.t0; v < x.r0+len(x.rb); v++ {
				if c := e.class[v]; !s.ground[c] {
					s.ground[c] = true
					sc.held = append(sc.held, c)
				}
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
	s.hold = e.holdingFor(groundKey(held), s.ground)
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

// undetermined returns the part of a row over variables that the
// relations, with the datums held, and what the query found missing so far
// do not fix: the reduced form of the row scaled by 1/n, less its
// projections on the query's basis, normalised; nil when it is fixed. n is
// the length of the row before its datum features' terms were left out and
// its equal variables merged, so that what cancels there counts as fixed
// however small the rounding left it.
func (s *solve) undetermined(r row, n float64) []term {
	for _, t := range r {
		if c := s.e.class[t.v]; !s.hold.held[c] {
			s.sum.add(c, t.c)
		}
	}
	return s.decide(n)
}

// decide is undetermined for the row summed over its classes in s.sum
// (the held ones left out); it empties s.sum. Where the row is not fixed it
// keeps it, over classes, in s.last, for accept.
func (s *solve) decide(n float64) []term {
	sum, red := s.sum, s.red
	defer sum.reset()
	defer red.reset()
	if n == 0 || sum.norm() <= rankTol*n {
		return nil
	}
	// Each pivot class by its reduced form over the free classes.
	for _, c := range sum.touched {
		a := sum.x[c] / n
		if a == 0 {
			continue
		}
		if rf, ok := s.factor().reduced(c); ok {
			for _, t := range rf {
				red.add(t.v, a*t.c)
			}
		} else {
			red.add(c, a)
		}
	}
	for _, b := range s.basis {
		d := 0.0
		for _, t := range b {
			if red.in[t.v] {
				d += red.x[t.v] * t.c
			}
		}
		if d == 0 {
			continue
		}
		for _, t := range b {
			red.add(t.v, -d*t.c)
		}
	}
	rn := red.norm()
	if rn <= rankTol {
		return nil
	}
	// The reduced form's length bounds the row's distance from the span
	// from above (the null space's basis that it is the coordinates in
	// holds the unit vectors of the free classes, so its Gram matrix is at
	// least the identity), and is the distance when the pivots are well
	// conditioned. Where a pivot was small the bound is loose, and the
	// distance itself decides: taken as the SVD took it, over the rows
	// near the row.
	if d, ok := s.exact(n); ok && d <= rankTol {
		return nil
	}
	s.last = s.last[:0]
	for _, c := range sum.touched {
		if x := sum.x[c]; x != 0 {
			s.last = append(s.last, term{c, x})
		}
	}
	out := make([]term, 0, len(red.touched))
	for _, c := range red.touched {
		if x := red.x[c]; x != 0 {
			out = append(out, term{c, x / rn})
		}
	}
	return out
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
	res := s.undetermined(s.toRow(c), c.norm())
	if res == nil {
		return false
	}
	s.accept(res)
	return true
}

// accept counts the row decide last found missing as fixed from now on:
// its residual goes to the basis, and the row itself (over classes) to
// found, for exact.
func (s *solve) accept(res []term) {
	s.basis = append(s.basis, res)
	s.found = append(s.found, slices.Clone(s.last))
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

func rowNorm(r row) float64 {
	t := 0.0
	for _, x := range r {
		t += x.c * x.c
	}
	return math.Sqrt(t)
}

// answer runs the query on the rows near its target first, and on the
// whole part's factor only where those cannot decide. Rows near the target
// span part of what all the rows span, so a query that finds nothing
// missing there finds nothing with all of them (the span only grows); and
// where the search took the target's whole connected block of rows (no
// hub left out, no budget reached) its answer is the whole part's. On a
// clean part the rows near each target settle it, so no query factorises
// the part.
func (s *solve) answer(local bool) []Missing {
	for _, budget := range []int{localRows + len(s.params), 8 * (localRows + len(s.params))} {
		if !local {
			break
		}
		s.budget, s.whole = budget, false
		out := s.run()
		if s.f != nil {
			s.f.release()
			s.f = nil
			s.sc.clearLocal()
		}
		if len(out) == 0 || s.whole {
			return out
		}
		s.basis, s.found, s.cand = nil, nil, s.cand[:0]
	}
	s.f = s.hold.factor(s.e, s.ground)
	return s.run()
}

// factor returns the factor the query's rank decisions use: the whole
// part's once answer has fallen back to it, else that of the rows near the
// target, searched on first use (a query whose every candidate cancels
// over the classes, or is held, needs none).
func (s *solve) factor() *factor {
	if s.f == nil {
		s.whole = s.local(s.budget)
	}
	return s.f
}

// localRows, hubRows and ownRows bound the local search: it takes every
// row of the target's own classes (up to ownRows), then about localRows
// rows and four per target variable more, breadth first, passing through a
// class in more than hubRows rows (a datum plane that every hole is
// located from) only when it is the target's own. The bounds only decide
// how often the whole part's factor is needed, never an answer.
const (
	localRows = 32
	hubRows   = 24
	ownRows   = 4096
)

// local builds the factor of the general rows near the target: those that
// hold its classes, then those that hold the classes these reach, breadth
// first, until the budget is spent. whole reports whether the search ended
// by itself, having taken every row connected to the target.
func (s *solve) local(budget int) (whole bool) {
	sc, e := s.sc, s.e
	queue := sc.nears
	for _, p := range s.params {
		if c := e.class[p.v]; !s.hold.held[c] && !sc.near[c] {
			sc.near[c] = true
			queue = append(queue, c)
		}
	}
	own := len(queue)
	whole = true
search:
	for i := 0; i < len(queue); i++ {
		rs := e.rowsOf(queue[i])
		// A class in many rows is passed through only when it is the
		// target's own, and then only on the second search: a class that
		// many features share (the x of every hole chained to one bore)
		// holds the rows of all of them, and the target's rows that matter
		// are reached through its other classes.
		if len(rs) > hubRows && (i >= own || budget < 8*(localRows+len(s.params))) {
			whole = false
			continue
		}
		for _, ri := range rs {
			if sc.rowIn[ri] {
				continue
			}

			if i >= own && len(sc.rows) >= budget || len(sc.rows) >= ownRows {
				whole = false
				break search
			}
			if s.redundant(ri) {
				whole = false
				continue
			}
			sc.rowIn[ri] = true
			sc.rows = append(sc.rows, ri)
			for _, t := range e.general[ri] {
				if !s.hold.held[t.v] && !sc.near[t.v] {
					sc.near[t.v] = true
					queue = append(queue, t.v)
				}
			}
		}
	}
	sc.nears = queue
	s.f = e.factorise(s.ground, s.hold.held, sc.rows, sc.col)
	return whole
}

// redundant reports whether the local search has already taken as many
// rows over the same classes as there are classes: the rows of a class
// that many features share (a line of holes at an implied zero, located
// from one datum plane) span no more than their classes, and taking them
// all would make the search as long as the line. The rows are told apart
// by a hash of their classes; a collision only leaves out a row, which
// makes the local answer weaker, never wrong.
func (s *solve) redundant(ri int32) bool {
	var buf [16]int
	cs := buf[:0]
	for _, t := range s.e.general[ri] {
		if !s.hold.held[t.v] {
			cs = append(cs, t.v)
		}
	}
	if len(cs) == 0 {
		return true
	}
	slices.Sort(cs)
	h := uint64(14695981039346656037)
	for _, c := range cs {
		h = (h ^ uint64(c)) * 1099511628211
	}
	if s.sc.support == nil {
		s.sc.support = map[uint64]int{}
	}
	if s.sc.support[h] >= len(cs) {
		return true
	}
	s.sc.support[h]++
	return false
}

// exactRows bounds the rows exact takes into its dense SVD; beyond them
// the reduced form's bound decides (and may report as missing what a
// badly conditioned chain of more rows fixes).
const exactRows = 400

// exact returns the distance of r/n from the span of the rows near it and
// of what the query found missing, by gonum's SVD as the engine decided
// it before the sparse elimination: rows scaled to unit length over the
// classes the datums do not hold, singular values above rankTol counted.
// The rows are those the local factor took, or, for the whole part's
// factor, those connected to r's classes; ok is false where they are more
// than exactRows.
func (s *solve) exact(n float64) (float64, bool) {
	e := s.e
	held := s.hold.held
	var ids []int32
	if s.f != nil && s.f.ids != nil {
		ids = s.f.ids
	} else {
		seen := map[int32]bool{}
		near := map[int]bool{}
		var queue []int
		for _, c := range s.sum.touched {
			if !near[c] {
				near[c] = true
				queue = append(queue, c)
			}
		}
		for i := 0; i < len(queue); i++ {
			for _, ri := range e.rowsOf(queue[i]) {
				if seen[ri] {
					continue
				}
				if len(ids) >= exactRows {
					return 0, false
				}
				seen[ri] = true
				ids = append(ids, ri)
				for _, t := range e.general[ri] {
					if !held[t.v] && !near[t.v] {
						near[t.v] = true
						queue = append(queue, t.v)
					}
				}
			}
		}
	}
	if len(ids)+len(s.found) > exactRows {
		return 0, false
	}
	col := map[int]int{}
	column := func(c int) int {
		k, ok := col[c]
		if !ok {
			k = len(col)
			col[c] = k
		}
		return k
	}
	type dense map[int]float64
	var rows []dense
	addRow := func(terms []term) {
		d := dense{}
		l := 0.0
		for _, t := range terms {
			c := t.v
			if held[c] {
				if !s.ground[c] {
					l += t.c * t.c
				}
				continue
			}
			d[column(c)] += t.c
			l += t.c * t.c
		}
		if len(d) == 0 || l == 0 {
			return
		}
		for k := range d {
			d[k] /= math.Sqrt(l)
		}
		rows = append(rows, d)
	}
	for _, id := range ids {
		addRow(e.general[id])
	}
	for _, f := range s.found {
		addRow(f)
	}
	v := make(dense)
	for _, c := range s.sum.touched {
		v[column(c)] += s.sum.x[c] / n
	}
	w := len(col)
	res := make([]float64, w)
	for k, x := range v {
		res[k] = x
	}
	if len(rows) > 0 {
		a := mat.NewDense(len(rows), w, nil)
		for i, d := range rows {
			for k, x := range d {
				a.Set(i, k, x)
			}
		}
		var svd mat.SVD
		if !svd.Factorize(a, mat.SVDThinV) {
			return 0, false
		}
		vals := svd.Values(nil)
		var vt mat.Dense
		svd.VTo(&vt)
		for j, sv := range vals {
			if sv <= rankTol {
				continue
			}
			b := mat.Col(nil, j, &vt)
			d := dot(res, b)
			for k := range res {
				res[k] -= d * b[k]
			}
		}
	}
	return math.Sqrt(dot(res, res)), true
}
