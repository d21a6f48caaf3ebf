package basics

import (
	"container/heap"
	"math"
	"slices"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
)

// A factor is a set of the part's general rows (what union-find could not
// merge) eliminated for one set of held classes: the classes of a query's
// datum features, which the datum reference frame holds at zero. A row over
// classes is in the rows' span exactly when substituting each pivot class
// by its reduced form leaves nothing (see undetermined).
//
// The elimination is orthogonal (Householder reflections on the rows that
// meet the column eliminated, as in a multifrontal sparse QR) and takes
// the column whose rows hold the fewest other entries first (an
// approximate minimum degree), so that a hole located from a datum plane is
// eliminated with its own row before the plane's classes, which meet every
// such row, are reached: the rows left stay about as sparse as the
// drawing's chains. What it leaves is a basis of the rows' span in echelon
// form: each pivot class's row holds it and classes eliminated after it or
// left free. The reduced form of a pivot class (its row solved for it, the
// later pivots substituted in turn) is worked out once per factor, from
// the last pivot back, so a query costs time in proportion to the classes
// it touches and their reduced forms, not to the part.
//
// Rank decisions follow the SVD's they replace: rows are scaled to unit
// length over the classes not held, as that SVD took them; a class whose
// column, when it is eliminated, is no longer than rankTol has no pivot
// (its rows do not fix it), and a row that the reflections leave no longer
// than rankTol is a combination of the others within rounding and dropped.
type factor struct {
	// ids are the general rows it was built from, nil for all of them.
	ids []int32
	// col maps a class to its column, −1 for a class in none of the rows.
	col []int32
	// cls maps a column back to its class.
	cls []int
	// pivot[k] is the index in red of column k's reduced form, −1 for a
	// free column.
	pivot []int32
	// red[i] is the i-th pivot's reduced form: the combination of free
	// classes its class equals on every variation the rows allow.
	red [][]term
}

// reduced returns the reduced form of class c, or nil and false for a free
// class (which is its own reduced form).
func (f *factor) reduced(c int) ([]term, bool) {
	k := f.col[c]
	if k < 0 || f.pivot[k] < 0 {
		return nil, false
	}
	return f.red[f.pivot[k]], true
}

// release gives back the class → column map of a factor built over a
// scratch map, clean for the next one.
func (f *factor) release() {
	for _, c := range f.cls {
		f.col[c] = -1
	}
}

// groundKey names a set of held classes by the entities that hold them.
func groundKey(ents []int) string {
	slices.Sort(ents)
	ents = slices.Compact(ents)
	var b strings.Builder
	for _, x := range ents {
		b.WriteString(strconv.Itoa(x))
		b.WriteByte(',')
	}
	return b.String()
}

// A holding is what one set of datum features holds, shared by every
// query with those datum features: the classes the datums hold, with
// those that a row fixes once the others it holds are held (a hole
// located from a datum plane by one basic dimension: its class is as
// fixed as the plane's), and the whole part's factor for them, built when
// a query first needs it.
type holding struct {
	// held maps a class to whether it is held: by the datums, or fixed by
	// a row whose other classes are held.
	held []bool
	once sync.Once
	f    *factor
}

// holdingFor returns the holding of the classes ground holds (the datums'
// own), worked out on first use under key.
func (e *Engine) holdingFor(key string, ground []bool) *holding {
	e.memoMu.Lock()
	defer e.memoMu.Unlock()
	if h, ok := e.holdings[key]; ok {
		return h
	}
	h := &holding{held: e.propagate(ground)}
	if e.holdings == nil {
		e.holdings = map[string]*holding{}
	}
	e.holdings[key] = h
	return h
}

// propagate returns ground with every class added that a general row
// fixes once its other classes are held, in turn: exact elimination of
// the rows left with one class, as the SVD it replaces counted them (a row
// scaled over the classes the datums do not hold, whose one remaining
// class has a coefficient above rankTol, puts that class's unit vector in
// the span).
func (e *Engine) propagate(ground []bool) []bool {
	held := slices.Clone(ground)
	left := make([]int32, len(e.general)) // classes of the row not yet held
	var queue []int
	check := func(ri int) {
		r := e.general[ri]
		nr := 0.0
		var last term
		for _, t := range r {
			if !ground[t.v] {
				nr += t.c * t.c
			}
			if !held[t.v] {
				last = t
			}
		}
		if !held[last.v] && math.Abs(last.c) > rankTol*math.Sqrt(nr) {
			held[last.v] = true
			queue = append(queue, last.v)
		}
	}
	for ri, r := range e.general {
		for _, t := range r {
			if !held[t.v] {
				left[ri]++
			}
		}
		if left[ri] == 1 {
			check(ri)
		}
	}
	for len(queue) > 0 {
		c := queue[0]
		queue = queue[1:]
		for _, ri := range e.rowsOf(c) {
			if left[ri]--; left[ri] == 1 {
				check(int(ri))
			}
		}
	}
	return held
}

// factor returns the factor of all the part's general rows for the
// holding, built on first use: every query with the same datum features
// shares it, so the whole part is factorised at most once per distinct
// set of datum features in a file.
func (h *holding) factor(e *Engine, ground []bool) *factor {
	h.once.Do(func() {
		col := make([]int32, e.nvars)
		for i := range col {
			col[i] = -1
		}
		h.f = e.factorise(ground, h.held, nil, col)
	})
	return h.f
}

// degreeHeap orders columns by score, then by column, for a deterministic
// elimination order. An entry goes stale when its column's score changes;
// a stale one is skipped when it comes out.
type degreeHeap []degreeEntry

type degreeEntry struct{ score, k int32 }

func (h degreeHeap) Len() int { return len(h) }
func (h degreeHeap) Less(i, j int) bool {
	if h[i].score != h[j].score {
		return h[i].score < h[j].score
	}
	return h[i].k < h[j].k
}
func (h degreeHeap) Swap(i, j int) { h[i], h[j] = h[j], h[i] }
func (h *degreeHeap) Push(x any)   { *h = append(*h, x.(degreeEntry)) }
func (h *degreeHeap) Pop() any {
	old := *h
	x := old[len(old)-1]
	*h = old[:len(old)-1]
	return x
}

// dropTerm is how small an entry of a row scaled to unit length is taken
// as rounding noise and left out, so that reflections do not fill rows with
// entries of 1e-17 that would spread to every row they meet.
const dropTerm = 1e-13

// factorise eliminates the general rows numbered ids (all of them when ids
// is nil) with the held classes left out. col must map every class to −1;
// the factor fills it and keeps it.
func (e *Engine) factorise(ground, held []bool, ids []int32, col []int32) *factor {
	if ids == nil {
		e.stats.wholes.Add(1)
		e.stats.factorised.Add(int64(len(e.general)))
	} else {
		e.stats.factorised.Add(int64(len(ids)))
	}
	f := &factor{col: col, ids: ids}
	var rows [][]term // over columns
	// The rows as the SVD took them: scaled to unit length over the
	// classes the datums do not hold, then over the classes not held (a
	// class a row fixes is held, and the row adds nothing more), those
	// with nothing left dropped.
	take := func(r row) {
		var out []term
		l := 0.0
		for _, t := range r {
			if !ground[t.v] {
				l += t.c * t.c
			}
			if !held[t.v] {
				out = append(out, t)
			}
		}
		l = math.Sqrt(l)
		if len(out) == 0 || l == 0 || math.IsNaN(l) || math.IsInf(l, 0) {
			return
		}
		for k, t := range out {
			if col[t.v] < 0 {
				col[t.v] = int32(len(f.cls))
				f.cls = append(f.cls, t.v)
			}
			out[k] = term{int(col[t.v]), t.c / l}
		}
		rows = append(rows, out)
	}
	if ids == nil {
		for _, r := range e.general {
			take(r)
		}
	} else {
		for _, id := range ids {
			take(e.general[id])
		}
	}
	n := len(f.cls)
	f.pivot = make([]int32, n)
	alive := make([]bool, len(rows), 2*len(rows))
	colRows := make([][]int32, n)
	deg := make([]int32, n) // live rows holding the column
	done := make([]bool, n)
	// score is what eliminating a column would cost: the other entries of
	// its live rows, a bound on the width of its front. Columns whose
	// score changed go back on the heap once per step.
	score := make([]int32, n)
	dirty := make([]bool, n)
	var changed []int
	h := &degreeHeap{}
	touch := func(v int) {
		if !dirty[v] && !done[v] {
			dirty[v] = true
			changed = append(changed, v)
		}
	}
	flush := func() {
		for _, v := range changed {
			dirty[v] = false
			if deg[v] > 0 {
				heap.Push(h, degreeEntry{score[v], int32(v)})
			}
		}
		changed = changed[:0]
	}
	link := func(id int32) {
		r := rows[id]
		alive[id] = true
		for _, t := range r {
			colRows[t.v] = append(colRows[t.v], id)
			deg[t.v]++
			score[t.v] += int32(len(r) - 1)
			touch(t.v)
		}
	}
	for id := range rows {
		link(int32(id))
	}
	flush()
	type pivotRow struct {
		k   int
		row []term
	}
	var pivots []pivotRow
	var front []int32
	var cols []int
	colIndex := make([]int32, n)
	for i := range colIndex {
		colIndex[i] = -1
	}
	var m []float64 // the front, dense, row-major
	for h.Len() > 0 {
		top := heap.Pop(h).(degreeEntry)
		c := int(top.k)
		if done[c] || score[c] != top.score || deg[c] == 0 {
			continue
		}
		done[c] = true
		front = front[:0]
		norm := 0.0
		for _, id := range colRows[c] {
			if !alive[id] {
				continue
			}
			front = append(front, id)
			for _, t := range rows[id] {
				if t.v == c {
					norm += t.c * t.c
				}
			}
		}
		colRows[c] = nil
		if math.Sqrt(norm) <= rankTol {
			continue // no pivot: the rows do not fix c; it stays free
		}
		// The front's columns: c first, then the others in column order.
		cols = append(cols[:0], c)
		for _, id := range front {
			for _, t := range rows[id] {
				if colIndex[t.v] < 0 && t.v != c {
					colIndex[t.v] = 0
					cols = append(cols, t.v)
				}
			}
		}
		slices.Sort(cols[1:])
		for j, v := range cols {
			colIndex[v] = int32(j)
		}
		k, w := len(front), len(cols)
		m = resize(m, k*w)
		clear(m)
		for i, id := range front {
			alive[id] = false
			r := rows[id]
			for _, t := range r {
				m[i*w+int(colIndex[t.v])] = t.c
				deg[t.v]--
				score[t.v] -= int32(len(r) - 1)
				touch(t.v)
			}
			rows[id] = nil
		}
		// Householder QR of the front, skipping a column that is zero
		// below the rows already reduced.
		r := 0
		for j := 0; j < w && r < k; j++ {
			s := 0.0
			for i := r; i < k; i++ {
				s += m[i*w+j] * m[i*w+j]
			}
			if s == 0 || (j > 0 && math.Sqrt(s) <= dropTerm) {
				continue
			}
			householder(m, k, w, r, j, math.Sqrt(s))
			r++
		}
		// Row 0 is c's pivot row; rows 1 … r−1 go back to the pool.
		for i := range r {
			var out []term
			l := 0.0
			for j := range w {
				if i > 0 && j == 0 {
					continue // zero by construction
				}
				if x := m[i*w+j]; math.Abs(x) > dropTerm {
					out = append(out, term{cols[j], x})
					l += x * x
				}
			}
			if i == 0 {
				pivots = append(pivots, pivotRow{c, out})
				continue
			}
			if math.Sqrt(l) > rankTol {
				rows = append(rows, out)
				alive = append(alive, false)
				link(int32(len(rows) - 1))
			}
		}
		for _, v := range cols {
			colIndex[v] = -1
		}
		flush()
	}
	// Reduced forms, from the last pivot back: a pivot row holds its
	// column and columns eliminated after it or free.
	for i := range f.pivot {
		f.pivot[i] = -1
	}
	for i, p := range pivots {
		f.pivot[p.k] = int32(i)
	}
	f.red = make([][]term, len(pivots))
	acc := make([]float64, n)
	seen := make([]bool, n)
	var touched []int
	for i := len(pivots) - 1; i >= 0; i-- {
		p := pivots[i]
		var piv float64
		for _, t := range p.row {
			if t.v == p.k {
				piv = t.c
			}
		}
		touched = touched[:0]
		put := func(v int, x float64) {
			if !seen[v] {
				seen[v] = true
				touched = append(touched, v)
			}
			acc[v] += x
		}
		for _, t := range p.row {
			if t.v == p.k {
				continue
			}
			a := -t.c / piv
			if q := f.pivot[t.v]; q >= 0 {
				// a later pivot's reduced form, kept over classes
				for _, u := range f.red[q] {
					put(int(col[u.v]), a*u.c)
				}
			} else {
				put(t.v, a)
			}
		}
		slices.Sort(touched)
		var out []term
		for _, v := range touched {
			if math.Abs(acc[v]) > dropTerm {
				out = append(out, term{f.cls[v], acc[v]})
			}
			acc[v], seen[v] = 0, false
		}
		f.red[i] = out
	}
	return f
}

// householder reflects rows r … k−1 of the k × w row-major matrix m so
// that column j is zero below row r; s is that column's length from row r.
func householder(m []float64, k, w, r, j int, s float64) {
	a := m[r*w+j]
	alpha := -s
	if a < 0 {
		alpha = s
	}
	// v = x − alpha·e1 over rows r … k−1 of column j; below row r it is
	// the column itself.
	v0 := a - alpha
	vv := v0*v0 + (s*s - a*a)
	if vv <= 0 {
		return
	}
	for c := j + 1; c < w; c++ {
		d := v0 * m[r*w+c]
		for i := r + 1; i < k; i++ {
			d += m[i*w+j] * m[i*w+c]
		}
		d *= 2 / vv
		if d == 0 {
			continue
		}
		m[r*w+c] -= d * v0
		for i := r + 1; i < k; i++ {
			m[i*w+c] -= d * m[i*w+j]
		}
	}
	m[r*w+j] = alpha
	for i := r + 1; i < k; i++ {
		m[i*w+j] = 0
	}
}

// Stats says how much work an engine has done, for tests that bound how it
// grows with the part.
type Stats struct {
	// Relations is the number of general rows: what union-find left.
	Relations int
	// Factorised counts the rows every factorisation so far has taken:
	// each query's local one and the whole part's.
	Factorised int64
	// Wholes counts the whole part's factorisations (at most one per set
	// of datum features).
	Wholes int64
}

// Stats returns the work done so far.
func (e *Engine) Stats() Stats {
	return Stats{Relations: len(e.general), Factorised: e.stats.factorised.Load(), Wholes: e.stats.wholes.Load()}
}

// workStats are an engine's counters of Stats.
type workStats struct{ factorised, wholes atomic.Int64 }
