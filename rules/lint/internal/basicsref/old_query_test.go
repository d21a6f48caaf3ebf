package basicsref

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/dof"
)

// Query asks what of a frame's target is not fixed by basic dimensions.
type Query struct {
	// Target is the frame's feature, member or whole pattern.
	Target model.Target
	// Orientation asks only for orientation (angularity).
	Orientation bool
	// Refs lists, per datum reference in precedence order, the members of
	// its datum features (both features of a common datum, every member of
	// a pattern used as a datum). Their variations are held at zero.
	Refs [][]*model.Member
	// Free[k] is a basis of the motions of the part still free after
	// references 0…k (rules/dof, DRF.Steps()[k].Free); len(Free) must
	// equal len(Refs). With no references every motion is free.
	Free [][]dof.Twist
}

// Kind says what sort of quantity is missing.
type Kind int

const (
	Location Kind = iota + 1 // a translation of a member
	Angle                    // an orientation of a member
	Circle                   // a bolt circle's diameter
	Clocking                 // a member's angle about a datum axis
)

// Missing is one quantity the frame needs that no basic dimension fixes.
type Missing struct {
	Kind   Kind
	Member *model.Member // the member whose place is not fixed
	// Other is the member it is not fixed relative to, within a pattern;
	// nil when it is relative to the datums.
	Other *model.Member
	// Ref is the index of the datum reference that fixes the quantity in
	// the frame (the first after which no free motion changes it); −1 when
	// Other is set.
	Ref int
	// Dir is the direction of a missing location, or the axis of a missing
	// angle.
	Dir Vec
	// Hub is the axis feature of a Circle or Clocking.
	Hub *model.Member
	// Suggest is the dimension to add, with its nominal value from the
	// model ("basic 60 from left to bore"); "" when none can be written.
	Suggest string
}

// Missing returns the quantities the frame needs that the basic relations
// do not fix, as few as possible and named as simply as possible: one
// finding per independent missing quantity. It returns nil when the
// target's or a datum's geometry is unknown.
func (e *Engine) Missing(q Query) []Missing {
	s := e.newSolve(q)
	if s == nil {
		return nil
	}
	return s.run()
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
	index   map[int]int // variable → position in params
	first   []int       // first[i]…first[i+1] are member i's params
	free    [][][]float64
	moves   [][]float64 // orthonormal basis of how free motions change the params
	ground  map[int]bool
	col     map[int]int // class → column of the dense rows below
	basis   [][]float64 // orthonormal rows (over columns) fixed so far; shorter ones end in zeros
	hubs    []*entity   // axis datum features, for circles and clocking
}

func (e *Engine) newSolve(q Query) *solve {
	s := &solve{e: e, q: q, index: map[int]int{}, ground: map[int]bool{}}
	if !q.Target.Resolved() || len(q.Free) != len(q.Refs) {
		return nil
	}
	ms := q.Target.Feature.Members
	if q.Target.Member != nil {
		ms = []*model.Member{q.Target.Member}
	}
	for i, m := range ms {
		x := e.byMem[m]
		if x == nil {
			return nil
		}
		s.first = append(s.first, len(s.params))
		s.members = append(s.members, x)
		if !q.Orientation {
			for k, b := range x.tb {
				s.index[x.t0+k] = len(s.params)
				s.params = append(s.params, param{x: x, mi: i, v: x.t0 + k, dir: b})
			}
		}
		for k, b := range x.rb {
			s.index[x.r0+k] = len(s.params)
			s.params = append(s.params, param{x: x, mi: i, v: x.r0 + k, rot: true, dir: b})
		}
	}
	s.first = append(s.first, len(s.params))
	if len(s.params) == 0 {
		return nil
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
	for _, fk := range q.Free {
		var rows [][]float64
		for _, t := range fk {
			rows = append(rows, s.motion(t))
		}
		s.free = append(s.free, rows)
	}
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
		last = s.free[len(s.free)-1]
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
		k, ok := s.col[c]
		if !ok {
			k = len(s.col)
			s.col[c] = k
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
	s.col = map[int]int{}
	seenRow := map[int]bool{}
	var queue []int
	for _, p := range s.params {
		c := s.e.class[p.v]
		if _, seen := s.col[c]; !s.ground[c] && !seen {
			s.col[c] = len(s.col)
			queue = append(queue, c)
		}
	}
	var rows [][]float64
	for len(queue) > 0 {
		c := queue[0]
		queue = queue[1:]
		for _, ri := range s.e.rowsOf[c] {
			if seenRow[ri] {
				continue
			}
			seenRow[ri] = true
			before := len(s.col)
			rows = append(rows, s.reduce(s.e.general[ri]))
			for _, cl := range s.e.general[ri] {
				if c2 := s.e.class[cl.v]; !s.ground[c2] && s.col[c2] >= before {
					queue = append(queue, c2)
				}
			}
		}
	}
	s.basis = orthDense(rows, len(s.col))
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

// fixedBy returns the first reference after which no free motion changes c.
func (s *solve) fixedBy(c sv) int {
	n := c.norm()
	for k, rows := range s.free {
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
		if i, ok := s.index[t.v]; ok {
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

func (s *solve) run() []Missing {
	var out []Missing
	pattern := len(s.members) > 1
	// A pattern's place about a datum axis is read as a bolt circle and a
	// clocking angle before its members are compared with each other; a
	// rigid turn of the whole pattern would otherwise read as spacings.
	// A single feature is asked for its coordinates from the datums, as
	// drawings locate one hole; polar dimensions are for patterns.
	if pattern && !s.q.Orientation {
		out = append(out, s.circles()...)
		out = append(out, s.clocking(s.members[0])...)
		out = append(out, s.spacings()...)
	}
	for mi, x := range s.members {
		if pattern && !s.q.Orientation && mi > 0 {
			out = append(out, s.clocking(x)...)
		}
		for i := s.first[mi]; i < s.first[mi+1]; i++ {
			p := s.params[i]
			c := unit(i)
			if !s.try(c) {
				continue
			}
			m := Missing{Kind: Location, Member: x.m, Ref: s.fixedBy(c), Dir: p.dir}
			if p.rot {
				m.Kind = Angle
			}
			m.Ref, m.Suggest = s.suggestFromRef(m, x)
			out = append(out, m)
		}
	}
	return append(out, s.rest()...)
}

// rest finds what no single variable, spacing or clocking names (a
// member's place relative to a datum axis the part may turn about, say):
// the needed parts of the single variables span what the frame needs, and
// each is tried in the classes' space, where it is as short as the part has
// distinct places. Each is named by its variable.
func (s *solve) rest() []Missing {
	if len(s.moves) == 0 {
		return nil // everything is needed: the single variables said it all
	}
	images := make([][]float64, len(s.moves))
	for k, m := range s.moves {
		var c sv
		for i, v := range m {
			if v != 0 {
				c = append(c, term{i, v})
			}
		}
		images[k] = s.reduce(s.toRow(c))
	}
	var out []Missing
	for i, p := range s.params {
		moved := 0.0
		for _, m := range s.moves {
			moved += m[i] * m[i]
		}
		if moved <= rankTol*rankTol || moved >= 1-rankTol {
			continue // needed whole (tried above), or not needed at all
		}
		w := s.reduce(row{{p.v, 1}})
		for k, m := range s.moves {
			for len(w) < len(images[k]) {
				w = append(w, 0)
			}
			for j, v := range images[k] {
				w[j] -= m[i] * v
			}
		}
		res := s.undetermined(w, math.Sqrt(1-moved))
		if res == nil {
			continue
		}
		s.basis = append(s.basis, res)
		c := unit(i)
		for _, m := range s.moves {
			for j, v := range m {
				if v != 0 {
					c = append(c, term{j, -m[i] * v})
				}
			}
		}
		mm := Missing{Kind: Location, Member: p.x.m, Ref: s.fixedBy(c), Dir: p.dir}
		if p.rot {
			mm.Kind = Angle
		}
		out = append(out, mm)
	}
	return out
}

// nearWindow bounds how many earlier members are searched for the nearest
// one, so that a long pattern costs time in proportion to its length. A
// grid's rows are far shorter; a longer window only changes which member
// a message names, never whether a quantity is missing.
const nearWindow = 32

// spacings asks for each member relative to its nearest earlier member.
func (s *solve) spacings() []Missing {
	var out []Missing
	for mi := 1; mi < len(s.members); mi++ {
		x := s.members[mi]
		nearIdx := 0
		for j := max(0, mi-nearWindow); j < mi; j++ {
			if s.members[j].p.Sub(x.p).Norm() < s.members[nearIdx].p.Sub(x.p).Norm()-s.e.tol {
				nearIdx = j
			}
		}
		near := s.members[nearIdx]
		out = append(out, s.relativeClocking(x, near)...)
		for i := s.first[mi]; i < s.first[mi+1]; i++ {
			p := s.params[i]
			c := unit(i)
			// the same variable of the nearer member, in its own basis
			for j := s.first[nearIdx]; j < s.first[nearIdx+1]; j++ {
				if o := s.params[j]; o.rot == p.rot {
					if d := o.dir.Dot(p.dir); d != 0 {
						c = append(c, term{j, -d})
					}
				}
			}
			if !s.try(c) {
				continue
			}
			m := Missing{Kind: Location, Member: x.m, Other: near.m, Ref: -1, Dir: p.dir}
			if p.rot {
				m.Kind = Angle
			}
			m.Suggest = s.e.suggestBetween(near, x, m.Kind, p.dir)
			out = append(out, m)
		}
	}
	return out
}

// relativeClocking asks for the angle about each datum axis between a
// member and a nearer one: what fixes the members of an unevenly spaced
// bolt circle relative to each other.
func (s *solve) relativeClocking(x, near *entity) []Missing {
	var out []Missing
	for _, hub := range s.hubs {
		rx, okx := s.e.clock(x, hub)
		rn, okn := s.e.clock(near, hub)
		if !okx || !okn || x.shape != axisShape || !parallel(x.d, hub.d) {
			continue
		}
		c, fine := s.fromRow(diff(rx, rn))
		if !fine || !s.try(c) {
			continue
		}
		m := Missing{Kind: Clocking, Member: x.m, Other: near.m, Ref: -1, Dir: hub.d, Hub: hub.m}
		if v, ok := s.e.aboutAngle(near, x, hub); ok {
			m.Suggest = fmt.Sprintf("basic %sdeg from %s to %s about %s", NumAngle(v), near.name(), x.name(), hub.name())
		}
		out = append(out, m)
	}
	return out
}

// circles suggests a bolt circle when the pattern's members lie on one
// circle about a datum axis and their distance from it is not fixed.
func (s *solve) circles() []Missing {
	if len(s.members) < 3 || len(s.e.circles[s.members[0].m.Feature]) > 0 {
		return nil
	}
	for _, hub := range s.hubs {
		r := -1.0
		ok := true
		for _, x := range s.members {
			if x.shape != axisShape || !parallel(x.d, hub.d) {
				ok = false
				break
			}
			ri := radial(hub, x.p).Norm()
			if r < 0 {
				r = ri
			}
			if ri <= s.e.tol || math.Abs(ri-r) > s.e.tol {
				ok = false
				break
			}
		}
		if !ok {
			continue
		}
		radius, spacing := s.e.circleRowsOf(s.members, hub)
		missing := false
		for _, rw := range radius {
			c, fine := s.fromRow(rw)
			if fine && s.needed(c) && s.undetermined(s.reduce(rw), rowNorm(rw)) != nil {
				missing = true
			}
		}
		if !missing {
			continue
		}
		for _, rw := range append(radius, spacing...) {
			if res := s.undetermined(s.reduce(rw), rowNorm(rw)); res != nil {
				s.basis = append(s.basis, res)
			}
		}
		pat := s.members[0].m.Feature
		return []Missing{{Kind: Circle, Member: s.members[0].m, Ref: -1, Dir: hub.d, Hub: hub.m,
			Suggest: fmt.Sprintf("basic dia %s through %s about %s", Num(2*r), pat.Name, hub.name())}}
	}
	return nil
}

// clocking asks for a member's angle about each datum axis it is off.
func (s *solve) clocking(x *entity) []Missing {
	var out []Missing
	for _, hub := range s.hubs {
		if hub == x || !parallel(hub.d, x.d) && x.shape == axisShape {
			continue
		}
		rw, ok := s.e.clock(x, hub)
		if !ok {
			continue
		}
		c, fine := s.fromRow(rw)
		if !fine || !s.try(c) {
			continue
		}
		m := Missing{Kind: Clocking, Member: x.m, Ref: s.fixedBy(c), Dir: hub.d, Hub: hub.m}
		if m.Ref >= 0 {
			for _, dm := range s.q.Refs[m.Ref] {
				d := s.e.byMem[dm]
				if d == nil || d == hub {
					continue
				}
				if v, ok := s.e.aboutAngle(x, d, hub); ok {
					m.Suggest = fmt.Sprintf("basic %sdeg from %s to %s about %s", NumAngle(v), x.name(), d.name(), hub.name())
					break
				}
			}
		}
		out = append(out, m)
	}
	return out
}

// aboutAngle is the nominal angle about hub's axis between the radial line
// to a and the radial line to b, in [0, 180], or between the radial line and
// a plane's normal (a plane across the axis), as undirected lines in
// [0, 90].
func (e *Engine) aboutAngle(a, b, hub *entity) (float64, bool) {
	line := func(x *entity) (Vec, bool) {
		if x.shape == planeShape {
			if !perpendicular(x.d, hub.d) {
				return Vec{}, false
			}
			return x.d, true
		}
		w := radial(hub, x.p)
		return w, w.Norm() > e.tol
	}
	la, oka := line(a)
	lb, okb := line(b)
	if !oka || !okb {
		return 0, false
	}
	if a.shape == planeShape || b.shape == planeShape {
		return lineAngle(la, lb), true
	}
	// Two radial lines start at the axis: the angle between them runs to
	// 180 degrees, as a drawing dimensions it.
	c := la.Unit().Dot(lb.Unit())
	return math.Acos(math.Max(-1, math.Min(1, c))) * 180 / math.Pi, true
}

// suggestFromRef writes the dimension to the member from the datum
// feature it is naturally measured from: the earliest reference, up to the
// one that fixes the quantity, whose feature can measure it. With A|B|C
// planes that is the one that fixes it (x from C, y from B); with a datum
// axis B clocked by C, a location across the axis is measured from B, as
// drawings measure it from the origin the axis gives. It returns the
// reference used (m.Ref when none can measure it) and the dimension.
func (s *solve) suggestFromRef(m Missing, x *entity) (int, string) {
	for k := 0; k <= m.Ref && k < len(s.q.Refs); k++ {
		for _, dm := range s.q.Refs[k] {
			if d := s.e.byMem[dm]; d != nil && d != x {
				if sg := s.e.suggestBetween(d, x, m.Kind, m.Dir); sg != "" {
					return k, sg
				}
			}
		}
	}
	return m.Ref, ""
}

// suggestBetween writes a basic dimension from a to b that fixes b's
// location along dir (or its angle), with the model's nominal value. It
// adds `along` only where the contract's own measure is in another
// direction.
func (e *Engine) suggestBetween(a, b *entity, k Kind, dir Vec) string {
	if k == Angle {
		if len(a.rb) == 0 || len(b.rb) == 0 {
			return ""
		}
		return fmt.Sprintf("basic %sdeg from %s to %s", NumAngle(lineAngle(a.d, b.d)), a.name(), b.name())
	}
	if _, ok := e.shift(a, dir); !ok {
		return ""
	}
	if _, ok := e.shift(b, dir); !ok {
		return ""
	}
	u, zero, ok := measureDir(a, b, e.tol)
	if ok && !zero && parallel(u, dir) {
		if v, ok := distance(a, b, nil, e.tol); ok {
			return fmt.Sprintf("basic %s from %s to %s", Num(v), a.name(), b.name())
		}
	}
	v, ok := distance(a, b, &dir, e.tol)
	if !ok {
		return ""
	}
	return fmt.Sprintf("basic %s from %s to %s along %s", Num(v), a.name(), b.name(), AlongName(dir))
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
// profile with datums, ASME Y14.5-2018 and ISO 1101:2017, profile located
// by basic dimensions), or only its orientation (angularity: the basic
// angle, ASME Y14.5-2018, angularity). Perpendicularity and parallelism
// carry their angle in their symbol, form floats, and runout is located by
// the datum axis it turns about, so they ask nothing. Nor does a free-form
// surface: the notation gives it at most a reference point, and its true
// profile and place are the model's own (ASME Y14.41-2019, model values are
// basic), so there is no distance to write.
func Asks(fr *model.Frame, seg *model.Segment) (ask, orientation bool) {
	switch {
	case fr.Target.Resolved() && fr.Target.Feature.Kind == model.Surface:
		return false, false
	case fr.Characteristic == "position":
		return true, false
	case fr.Characteristic.Category() == model.Profile:
		return len(seg.Refs) > 0, false
	case fr.Characteristic == "angularity":
		return len(seg.Refs) > 0, true
	}
	return false, false
}

// FrameQuery builds the query for one segment of a frame from the
// kinematic engine's analysis of its datum reference frame. ok is false
// when a reference names no datum with a target.
func FrameQuery(fr *model.Frame, seg *model.Segment, drf *dof.DRF) (q Query, ok bool) {
	_, q.Orientation = Asks(fr, seg)
	q.Target = fr.Target
	for _, r := range seg.Refs {
		var ms []*model.Member
		for _, d := range r.Datums {
			if d == nil || !d.Target.Resolved() {
				return q, false
			}
			if d.Target.Member != nil {
				ms = append(ms, d.Target.Member)
			} else {
				ms = append(ms, d.Target.Feature.Members...)
			}
		}
		if w := medianOf(r); w != nil {
			ms = append(ms, w.Members...)
		}
		q.Refs = append(q.Refs, ms)
	}
	steps := drf.Steps()
	if len(steps) != len(q.Refs) {
		return q, false
	}
	for _, st := range steps {
		var ts []dof.Twist
		for _, m := range st.Free {
			ts = append(ts, m.Twist)
		}
		q.Free = append(q.Free, ts)
	}
	return q, true
}

// medianOf returns the width whose two faces a common datum's two
// references are: two opposed parallel planes used as one datum establish
// their median plane (ISO 5459:2011, common datum of two parallel planes),
// which is that width's mid-plane; nil otherwise.
func medianOf(r *model.DatumRef) *model.Feature {
	if len(r.Datums) != 2 {
		return nil
	}
	a, b := r.Datums[0], r.Datums[1]
	if a == nil || b == nil || a.Target.Feature == nil || b.Target.Feature == nil {
		return nil
	}
	w := a.Target.Feature.FaceOf
	if w == nil || w != b.Target.Feature.FaceOf || a.Target.Feature == b.Target.Feature || w.Broken || !w.HasGeometry {
		return nil
	}
	return w
}
