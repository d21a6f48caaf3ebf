package basicsref

import (
	"math"
	"sort"

	"github.com/datumlint/datumlint/grammar/model"
)

// term is one coefficient of a row: coefficient c on variable (or class) v.
type term struct {
	v int
	c float64
}

// row is a linear relation "Σ c·x = 0" between variations: a basic
// dimension, implied or written, fixes one combination of them.
type row []term

// Engine holds the relations of one part. Build it once per file; it is
// not changed by queries, so one Engine may be shared by goroutines.
type Engine struct {
	part  *model.Part
	L     float64 // the part's size: translation variables are in units of it
	tol   float64 // lengths below this are zero
	ents  []*entity
	byMem map[*model.Member]*entity
	nvars int

	// class maps a variable to its class: variables that written or implied
	// dimensions make equal share one. general holds the remaining rows,
	// over classes; rowsOf indexes them by class.
	class   []int
	general []row
	rowsOf  map[int][]int

	// circles are the bolt circles written for each pattern.
	circles map[*model.Feature][]*model.Dimension
}

// Build collects the part's variables and relations: every basic
// dimension, the toleranced dimensions in counted (a rule that reports them
// as belonging in basic form counts them so as not to report one problem
// twice), and the implied basic zeros and angles.
func Build(p *model.Part, counted []*model.Dimension) *Engine {
	e := &Engine{part: p, L: p.Scale, byMem: map[*model.Member]*entity{}, circles: map[*model.Feature][]*model.Dimension{}}
	if !(e.L > 0) || math.IsInf(e.L, 0) {
		e.L = 1
	}
	e.tol = alignTol * e.L
	for _, f := range p.Features {
		for _, m := range f.Members {
			en := newEntity(m)
			if en == nil {
				continue
			}
			en.t0 = e.nvars
			en.r0 = en.t0 + len(en.tb)
			e.nvars = en.r0 + len(en.rb)
			e.ents = append(e.ents, en)
			e.byMem[m] = en
		}
	}
	var rows []row
	for _, d := range p.Dims {
		if d.Circle != nil && d.Circle.Pattern.Resolved() {
			e.circles[d.Circle.Pattern.Feature] = append(e.circles[d.Circle.Pattern.Feature], d)
		}
	}
	for _, d := range p.Dims {
		if d.Basic {
			rows = append(rows, e.dimRows(d)...)
		}
	}
	for _, d := range counted {
		if !d.Basic {
			rows = append(rows, e.dimRows(d)...)
		}
	}
	rows = append(rows, e.impliedZeros()...)
	rows = append(rows, e.impliedAngles()...)
	e.eliminate(rows)
	return e
}

// entityOf returns the entity a dimension's name stands for: a member, or
// a single feature. A whole pattern stands for no one place.
func (e *Engine) entityOf(t *model.Target) *entity {
	if t == nil || !t.Resolved() {
		return nil
	}
	if t.Member != nil {
		return e.byMem[t.Member]
	}
	if t.Feature.Pattern || len(t.Feature.Members) == 0 {
		return nil
	}
	return e.byMem[t.Feature.Members[0]]
}

// shift is the variation of an entity's place measured along u, in units
// of the part's size: for a plane, how far it moves along the line through
// a point in direction u; for an axis, how far across it; for a centre, the
// component along u. ok is false where u does not meet the geometry (a
// plane's own direction, an axis's own direction).
func (e *Engine) shift(x *entity, u Vec) (row, bool) {
	u = u.Unit()
	var out row
	switch x.shape {
	case planeShape:
		nu := x.d.Dot(u)
		if math.Abs(nu) <= alignTol {
			return nil, false
		}
		out = append(out, term{x.t0, x.d.Dot(x.tb[0]) / nu})
	case axisShape:
		up := u.Sub(x.d.Scale(x.d.Dot(u)))
		n2 := up.Dot(up)
		if n2 <= alignTol*alignTol {
			return nil, false
		}
		for k, b := range x.tb {
			out = append(out, term{x.t0 + k, up.Dot(b) / n2})
		}
	case pointShape:
		for k, b := range x.tb {
			out = append(out, term{x.t0 + k, u.Dot(b)})
		}
	}
	return out, true
}

// turn is the variation of an entity's direction as a rotation about r.
func turn(x *entity, r Vec) row {
	var out row
	for k, b := range x.rb {
		out = append(out, term{x.r0 + k, r.Dot(b)})
	}
	return out
}

// clock is the variation of the angle about hub's axis of the radial line
// from the hub to x: (a × w)·δ / |w|², in radians, with δ in units of the
// part's size. ok is false for a member on the axis.
func (e *Engine) clock(x, hub *entity) (row, bool) {
	w := radial(hub, x.p)
	r := w.Norm()
	if r <= e.tol {
		return nil, false
	}
	t := hub.d.Cross(w).Unit()
	k := e.L / r
	var out row
	for i, b := range x.tb {
		out = append(out, term{x.t0 + i, k * t.Dot(b)})
	}
	for i, b := range hub.tb {
		out = append(out, term{hub.t0 + i, -k * t.Dot(b)})
	}
	return out, true
}

// planeClock is the variation of the angle about hub's axis of a plane's
// normal that lies across the axis: the plane's rotation about the axis.
func planeClock(x, hub *entity) (row, bool) {
	if x.shape != planeShape || !perpendicular(x.d, hub.d) {
		return nil, false
	}
	return turn(x, hub.d), true
}

func diff(a, b row) row {
	out := append(row(nil), a...)
	for _, t := range b {
		out = append(out, term{t.v, -t.c})
	}
	return out
}

// dimRows turns a written dimension into relations.
func (e *Engine) dimRows(d *model.Dimension) []row {
	if d.Circle != nil {
		return e.circleRows(d.Circle)
	}
	a, b := e.entityOf(&d.From), e.entityOf(&d.To)
	if a == nil || b == nil || a == b {
		return nil
	}
	if d.Angle {
		if d.About != nil {
			hub := e.entityOf(d.About)
			if hub == nil || len(hub.rb) == 0 || hub.shape == planeShape {
				return nil
			}
			ta, oka := e.aboutTerm(a, hub)
			tb, okb := e.aboutTerm(b, hub)
			if !oka || !okb {
				return nil
			}
			return []row{diff(tb, ta)}
		}
		return angleRows(a, b)
	}
	return e.linearRows(a, b, d.Along)
}

func (e *Engine) aboutTerm(x, hub *entity) (row, bool) {
	if x == hub {
		return nil, false
	}
	if x.shape == planeShape {
		return planeClock(x, hub)
	}
	return e.clock(x, hub)
}

// angleRows relates two directions: parallel ones in both rotations across
// them, others in the rotation about their common normal (the only one
// that changes the angle between them to first order).
func angleRows(a, b *entity) []row {
	if len(a.rb) == 0 || len(b.rb) == 0 {
		return nil
	}
	if parallel(a.d, b.d) {
		var out []row
		for _, r := range a.rb {
			out = append(out, diff(turn(b, r), turn(a, r)))
		}
		return out
	}
	m := a.d.Cross(b.d).Unit()
	return []row{diff(turn(b, m), turn(a, m))}
}

// linearRows relates two places along the dimension's direction; a zero
// distance fixes every direction the two share.
func (e *Engine) linearRows(a, b *entity, along *Vec) []row {
	var dirs []Vec
	if along != nil {
		dirs = []Vec{*along}
	} else {
		u, zero, ok := measureDir(a, b, e.tol)
		switch {
		case !ok:
			return nil
		case !zero:
			dirs = []Vec{u}
		case a.shape == pointShape:
			dirs = b.tb
		default:
			dirs = a.tb
		}
	}
	var out []row
	for _, u := range dirs {
		ra, oka := e.shiftAt(a, u, meetPoint(a, b))
		rb, okb := e.shiftAt(b, u, meetPoint(a, b))
		if oka && okb {
			out = append(out, diff(rb, ra))
		}
	}
	return out
}

// shiftAt is shift measured at x's foot of the meeting point c, counting
// x's turn about its written point (the current engine's keepShiftDiff;
// added to the reference with it, so the reference still pins the rest).
func (e *Engine) shiftAt(x *entity, u, c Vec) (row, bool) {
	r, ok := e.shift(x, u)
	if !ok {
		return nil, false
	}
	if t, ok := tilt(x, u.Unit(), foot(x, c).Sub(x.p), e.L); ok {
		r = append(r, turn(x, t)...)
	}
	return r, true
}

// circleRows: the basic diameter fixes each member's distance from the
// hub's axis; equal spacing (360/N) is implied when the members are
// nominally equally spaced, and otherwise the angles must be written
// (`basic 45deg from bolts.1 to bolts.2 about hub`).
func (e *Engine) circleRows(c *model.BoltCircle) []row {
	hub := e.entityOf(&c.About)
	if hub == nil || hub.shape == planeShape || len(hub.rb) == 0 || !c.Pattern.Resolved() {
		return nil
	}
	var members []*entity
	for _, m := range c.Pattern.Feature.Members {
		if x := e.byMem[m]; x != nil && x != hub {
			members = append(members, x)
		}
	}
	radius, spacing := e.circleRowsOf(members, hub)
	return append(radius, spacing...)
}

// circleRowsOf returns the rows that fix each member's distance from the
// hub's axis, and those of the implied equal spacing.
func (e *Engine) circleRowsOf(members []*entity, hub *entity) (radius, spacing []row) {
	var clocks []row
	var angles []float64
	for _, x := range members {
		w := radial(hub, x.p)
		if w.Norm() <= e.tol {
			continue
		}
		ra, oka := e.shift(x, w)
		rh, okh := e.shift(hub, w)
		if oka && okh {
			radius = append(radius, diff(ra, rh))
		}
		if cr, ok := e.clock(x, hub); ok {
			clocks = append(clocks, cr)
			t1, t2 := perp(hub.d)[0], perp(hub.d)[1]
			angles = append(angles, math.Atan2(w.Dot(t2), w.Dot(t1)))
		}
	}
	if equallySpaced(angles) {
		for i := 1; i < len(clocks); i++ {
			spacing = append(spacing, diff(clocks[i], clocks[i-1]))
		}
	}
	return radius, spacing
}

// equallySpaced reports whether angles (radians, any order) divide the
// circle into equal parts.
func equallySpaced(angles []float64) bool {
	n := len(angles)
	if n < 2 {
		return false
	}
	s := append([]float64(nil), angles...)
	sort.Float64s(s)
	step := 2 * math.Pi / float64(n)
	for i := range s {
		next := s[(i+1)%n]
		if i == n-1 {
			next += 2 * math.Pi
		}
		if math.Abs(next-s[i]-step) > angleTol*math.Pi/180 {
			return false
		}
	}
	return true
}

// impliedZeros: features whose axes, centres or mid-planes coincide or line
// up in the nominal geometry are at an implied basic zero along that
// direction (ASME Y14.5-2018, implied basic zero dimensions; ISO 1101:2017,
// implied theoretically exact dimensions of 0), and so are coplanar faces
// (from memory: common drafting practice draws no zero between them). For
// every direction that occurs in the part, the entities that can move along
// it are sorted by their coordinate, and neighbours within tolerance are
// related.
func (e *Engine) impliedZeros() []row {
	var dirs []Vec
	add := func(d Vec) {
		if d.Norm() == 0 {
			return
		}
		for _, x := range dirs {
			if parallel(x, d) {
				return
			}
		}
		dirs = append(dirs, canonical(d))
	}
	for _, a := range axes {
		add(a)
	}
	for _, x := range e.ents {
		add(x.d)
		if x.shape == axisShape {
			for _, b := range x.tb {
				add(b)
			}
		}
	}
	// Directions across two of the part's directions too: on a part drawn
	// turned in its coordinates, the line through two holes' centres may lie
	// along a face's normal, and the holes line up across it.
	for i, n := 0, len(dirs); i < n; i++ {
		for j := i + 1; j < n; j++ {
			if c := dirs[i].Cross(dirs[j]); c.Norm() > alignTol {
				add(snap(c))
			}
		}
	}
	type at struct {
		s float64
		x *entity
	}
	var out []row
	list := make([]at, 0, len(e.ents))
	for _, u := range dirs {
		list = list[:0]
		for _, x := range e.ents {
			ok := x.shape == pointShape ||
				(x.shape == planeShape && parallel(x.d, u)) ||
				(x.shape == axisShape && perpendicular(x.d, u))
			if ok {
				list = append(list, at{u.Dot(x.p), x})
			}
		}
		sort.SliceStable(list, func(i, j int) bool { return list[i].s < list[j].s })
		// Faces line up with faces (coplanar surfaces); axes, centres and
		// mid-planes with each other. A face through a hole's axis is no
		// centre line, so the two kinds are chained apart.
		link := func(a, b *entity) {
			ra, oka := e.shiftAt(a, u, meetPoint(a, b))
			rb, okb := e.shiftAt(b, u, meetPoint(a, b))
			if oka && okb {
				out = append(out, diff(rb, ra))
			}
		}
		for _, faces := range []bool{false, true} {
			var prev, anchor *at
			for i := range list {
				if isFace(list[i].x) != faces {
					continue
				}
				cur := &list[i]
				if prev == nil || cur.s-prev.s > e.tol {
					prev, anchor = cur, cur
					continue
				}
				link(prev.x, cur.x)
				if anchor != prev && (cur.x.shape == planeShape || anchor.x.shape == planeShape) {
					link(anchor.x, cur.x)
				}
				if shapeRank(cur.x.shape) < shapeRank(anchor.x.shape) {
					anchor = cur
				}
				prev = cur
			}
		}
	}
	return out
}

// isFace reports whether an entity is a planar surface rather than a
// mid-plane, axis or centre.
func isFace(x *entity) bool { return x.m.Feature.Kind == model.Plane }

// impliedAngles: nominal 0 and 90 degrees are implied basic angles (ASME
// Y14.5-2018, implied 90 degree and 0 degree basic angles). Directions are
// grouped by line; members of a group are related to their neighbour, and
// groups at right angles through one representative each.
func (e *Engine) impliedAngles() []row {
	type group struct {
		d   Vec
		rep *entity
	}
	var groups []*group
	var out []row
	for _, x := range e.ents {
		if len(x.rb) == 0 {
			continue
		}
		var g *group
		for _, h := range groups {
			if parallel(h.d, x.d) {
				g = h
				break
			}
		}
		if g == nil {
			groups = append(groups, &group{d: x.d, rep: x})
			continue
		}
		out = append(out, angleRows(g.rep, x)...)
	}
	for i, g := range groups {
		for _, h := range groups[i+1:] {
			if perpendicular(g.d, h.d) {
				out = append(out, angleRows(g.rep, h.rep)...)
			}
		}
	}
	return out
}

// eliminate merges the variables that rows of the form x − y = 0 make
// equal (exact Gaussian elimination of those rows) and keeps the other rows,
// rewritten over the classes, for the rank decisions.
func (e *Engine) eliminate(rows []row) {
	parent := make([]int, e.nvars)
	for i := range parent {
		parent[i] = i
	}
	var find func(int) int
	find = func(i int) int {
		for parent[i] != i {
			parent[i] = parent[parent[i]]
			i = parent[i]
		}
		return i
	}
	rewrite := func(r row) row {
		acc := map[int]float64{}
		var order []int
		for _, t := range r {
			c := find(t.v)
			if _, ok := acc[c]; !ok {
				order = append(order, c)
			}
			acc[c] += t.c
		}
		big := 0.0
		for _, c := range acc {
			big = math.Max(big, math.Abs(c))
		}
		var out row
		for _, c := range order {
			if math.Abs(acc[c]) > 1e-12*big {
				out = append(out, term{c, acc[c]})
			}
		}
		return out
	}
	equality := func(r row) bool {
		return len(r) == 2 && math.Abs(r[0].c+r[1].c) <= 1e-12*math.Max(math.Abs(r[0].c), math.Abs(r[1].c))
	}
	pending := rows
	for {
		var rest []row
		merged := false
		for _, r := range pending {
			r = rewrite(r)
			switch {
			case len(r) == 0:
			case equality(r):
				parent[find(r[0].v)] = find(r[1].v)
				merged = true
			default:
				rest = append(rest, r)
			}
		}
		pending = rest
		if !merged {
			break
		}
	}
	e.class = make([]int, e.nvars)
	for i := range e.class {
		e.class[i] = find(i)
	}
	e.rowsOf = map[int][]int{}
	for _, r := range pending {
		r = rewrite(r)
		if len(r) == 0 {
			continue
		}
		e.general = append(e.general, r)
		for _, t := range r {
			e.rowsOf[t.v] = append(e.rowsOf[t.v], len(e.general)-1)
		}
	}
}
