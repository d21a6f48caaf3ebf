package basics

import (
	"math"
	"slices"
	"sort"
	"sync"

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
	L     float64    // the part's size: translation variables are in units of it
	tol   float64    // lengths below this are zero
	ax    *axesFrame // the part's axes, which the variables are taken along
	ents  []*entity
	byMem map[*model.Member]*entity
	nvars int

	// class maps a variable to its class: variables that written or implied
	// dimensions make equal share one. general holds the remaining rows,
	// over classes; rowsOf indexes them by class (rowList[rowStart[c]:
	// rowStart[c+1]] are class c's, in order).
	class    []int
	general  []row
	rowStart []int32
	rowList  []int32

	// circles are the bolt circles written for each pattern.
	circles map[*model.Feature][]*model.Dimension

	// near memoises nearest (a pattern's members' nearest earlier ones),
	// targets targetVars and holdings what each set of datum features
	// holds (holdingFor), all under memoMu.
	memoMu   sync.Mutex
	near     map[*model.Feature][]int
	targets  map[targetKey]*targetVars
	holdings map[string]*holding

	stats workStats
}

// Build collects the part's variables and relations: every basic
// dimension, the toleranced dimensions in counted (a rule that reports them
// as belonging in basic form counts them so as not to report one problem
// twice), and the implied basic zeros and angles.
func Build(p *model.Part, counted []*model.Dimension) *Engine {
	e := &Engine{part: p, L: p.Scale, byMem: map[*model.Member]*entity{}, circles: map[*model.Feature][]*model.Dimension{}, ax: partAxes(p)}
	if !(e.L > 0) || math.IsInf(e.L, 0) {
		e.L = 1
	}
	e.tol = alignTol * e.L
	for _, f := range p.Features {
		for _, m := range f.Members {
			en := e.ax.newEntity(m)
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
	for _, d := range p.Dims {
		if d.Circle != nil && d.Circle.Pattern.Resolved() {
			e.circles[d.Circle.Pattern.Feature] = append(e.circles[d.Circle.Pattern.Feature], d)
		}
	}
	b := &builder{Engine: e, built: make([]row, 0, 2*len(p.Dims)+4*len(e.ents))}
	for _, d := range p.Dims {
		if d.Basic {
			b.dimRows(d)
		}
	}
	for _, d := range counted {
		if !d.Basic {
			b.dimRows(d)
		}
	}
	b.impliedZeros()
	b.impliedAngles()
	b.impliedClocking()
	b.impliedCentring()
	e.eliminate(b.built)
	return e
}

// A builder collects relations: while the engine is built, the part's, in
// the order they are found, most of their terms in arena, a few rows to an
// allocation; afterwards, those a suggested dimension would add (the
// engine is only read, so queries may do it at once).
type builder struct {
	*Engine
	built []row
	arena []term
}

// open returns an empty row with room for n terms at the arena's end.
func (e *builder) open(n int) row {
	if cap(e.arena)-len(e.arena) < n {
		e.arena = make([]term, 0, max(512, n))
	}
	l := len(e.arena)
	return e.arena[l : l : l+n]
}

// keep adds r, filled within the room open gave it, to the relations.
func (e *builder) keep(r row) {
	e.arena = e.arena[:len(e.arena)+len(r)]
	e.built = append(e.built, r[:len(r):len(r)])
}

// keepShiftDiff adds diff(shift(b, u), shift(a, u)) when both are defined,
// each measured at its foot of the pair's meeting point (meetPoint), so
// that a turn of a plane or an axis about its written point is counted.
func (e *builder) keepShiftDiff(a, b *entity, u Vec) {
	var tmp [6]term
	u = u.Unit()
	c := meetPoint(a, b)
	ra, oka := e.shiftUnitTo(tmp[:0], a, u)
	if !oka {
		return
	}
	if r, ok := tilt(a, u, foot(a, c).Sub(a.p), e.L); ok {
		ra = turnTo(ra, a, r)
	}
	r, okb := e.shiftUnitTo(e.open(len(b.tb)+len(b.rb)+len(ra)), b, u)
	if !okb {
		return
	}
	if t, ok := tilt(b, u, foot(b, c).Sub(b.p), e.L); ok {
		r = turnTo(r, b, t)
	}
	for _, t := range ra {
		r = append(r, term{t.v, -t.c})
	}
	e.keep(r)
}

// keepTurnDiff adds diff(turn(b, r), turn(a, r)).
func (e *builder) keepTurnDiff(a, b *entity, rot Vec) {
	r := turnTo(e.open(len(a.rb)+len(b.rb)), b, rot)
	for k, v := range a.rb {
		r = append(r, term{a.r0 + k, -rot.Dot(v)})
	}
	e.keep(r)
}

// rowsOf returns the general rows a class appears in, in order.
func (e *Engine) rowsOf(c int) []int32 { return e.rowList[e.rowStart[c]:e.rowStart[c+1]] }

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
	return e.shiftTo(make(row, 0, len(x.tb)), x, u)
}

// shiftTo appends shift(x, u) to out.
func (e *Engine) shiftTo(out row, x *entity, u Vec) (row, bool) {
	return e.shiftUnitTo(out, x, u.Unit())
}

// shiftUnitTo is shiftTo for u already made a unit vector by Unit.
func (e *Engine) shiftUnitTo(out row, x *entity, u Vec) (row, bool) {
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
	return turnTo(make(row, 0, len(x.rb)), x, r)
}

// turnTo appends turn(x, r) to out.
func turnTo(out row, x *entity, r Vec) row {
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
	out := make(row, 0, len(x.tb)+len(hub.tb))
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
	out := make(row, len(a), len(a)+len(b))
	copy(out, a)
	for _, t := range b {
		out = append(out, term{t.v, -t.c})
	}
	return out
}

// endsOf returns the entities a dimension's end stands for: one, or every
// member where the end is a whole pattern (a dimension on a pattern's name
// applies to every member: docs/notation.md, patterns and members).
func (e *Engine) endsOf(t *model.Target) []*entity {
	if t == nil || !t.Resolved() {
		return nil
	}
	if t.Member == nil && t.Feature.Pattern {
		out := make([]*entity, 0, len(t.Feature.Members))
		for _, m := range t.Feature.Members {
			if x := e.byMem[m]; x != nil {
				out = append(out, x)
			}
		}
		return out
	}
	if x := e.entityOf(t); x != nil {
		return []*entity{x}
	}
	return nil
}

// dimensionPairs calls f for each pair of entities a dimension relates:
// one pair, or one per member where one end is a whole pattern. A
// dimension between two whole patterns, or between a pattern and one of
// its own members, relates no one pair and is left out.
func (e *Engine) dimensionPairs(d *model.Dimension, f func(a, b *entity)) {
	as, bs := e.endsOf(&d.From), e.endsOf(&d.To)
	if len(as) > 1 && len(bs) > 1 || (len(as) > 1 || len(bs) > 1) && d.From.Feature == d.To.Feature {
		return
	}
	for _, a := range as {
		for _, b := range bs {
			if a != b {
				f(a, b)
			}
		}
	}
}

// dimRows turns a written dimension into relations (added to built).
func (e *builder) dimRows(d *model.Dimension) {
	if d.Circle != nil {
		e.built = append(e.built, e.circleRows(d.Circle)...)
		return
	}
	e.dimensionPairs(d, func(a, b *entity) { e.pairRows(d, a, b) })
}

// pairRows turns a dimension between two entities into relations.
func (e *builder) pairRows(d *model.Dimension, a, b *entity) {
	if d.Angle {
		if d.About != nil {
			hub := e.entityOf(d.About)
			if hub == nil || len(hub.rb) == 0 || hub.shape == planeShape {
				return
			}
			ta, oka := e.aboutTerm(a, hub)
			tb, okb := e.aboutTerm(b, hub)
			if !oka || !okb {
				return
			}
			e.built = append(e.built, diff(tb, ta))
			return
		}
		e.angleRows(a, b)
		return
	}
	e.linearRows(a, b, d.Along)
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
func (e *builder) angleRows(a, b *entity) {
	if len(a.rb) == 0 || len(b.rb) == 0 {
		return
	}
	if parallel(a.d, b.d) {
		for _, r := range a.rb {
			e.keepTurnDiff(a, b, r)
		}
		return
	}
	m := a.d.Cross(b.d).Unit()
	e.keepTurnDiff(a, b, m)
}

// linearRows relates two places along the dimension's direction; a zero
// distance fixes every direction the two share.
func (e *builder) linearRows(a, b *entity, along *Vec) {
	var one [1]Vec
	var dirs []Vec
	if along != nil {
		one[0] = *along
		dirs = one[:]
	} else {
		u, zero, ok := measureDir(a, b, e.tol)
		switch {
		case !ok:
			return
		case !zero:
			one[0] = u
			dirs = one[:]
		case a.shape == pointShape:
			dirs = b.tb
		default:
			dirs = a.tb
		}
	}
	for _, u := range dirs {
		e.keepShiftDiff(a, b, u)
	}
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
	var angles, slack []float64
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
			// how far rounding alone may have turned the member about the axis
			slack = append(slack, (x.h+hub.h)/w.Norm())
		}
	}
	if equallySpaced(angles, slack) {
		for i := 1; i < len(clocks); i++ {
			spacing = append(spacing, diff(clocks[i], clocks[i-1]))
		}
	}
	return radius, spacing
}

// equallySpaced reports whether angles (radians, any order) divide the
// circle into equal parts, each angle within its slack (radians: how far
// the rounding of the member's written coordinates may have turned it; a
// bolt circle written with four decimals in inches is off 360/N by a
// thousandth of a degree or more) and angleTol of its place.
func equallySpaced(angles, slack []float64) bool {
	n := len(angles)
	if n < 2 {
		return false
	}
	idx := make([]int, n)
	for i := range idx {
		idx[i] = i
	}
	sort.Slice(idx, func(a, b int) bool { return angles[idx[a]] < angles[idx[b]] })
	step := 2 * math.Pi / float64(n)
	for i, k := range idx {
		j := idx[(i+1)%n]
		next := angles[j]
		if i == n-1 {
			next += 2 * math.Pi
		}
		if math.Abs(next-angles[k]-step) > angleTol*math.Pi/180+slack[k]+slack[j] {
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
func (e *builder) impliedZeros() {
	var dirs []Vec
	add := func(d Vec) {
		if d.Norm() == 0 {
			return
		}
		// A direction already there as it is, or reversed, is parallel
		// to it (their cross product is exactly zero): the usual case,
		// found without the products.
		cd := canonical(d)
		for _, x := range dirs {
			if x == cd {
				return
			}
		}
		for _, x := range dirs {
			if parallel(x, d) {
				return
			}
		}
		dirs = append(dirs, cd)
	}
	for _, a := range e.ax.ax {
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
				add(e.ax.snap(c))
			}
		}
	}
	type at struct {
		s float64
		x *entity
	}
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
		// The same stable merge sort as sort.SliceStable, asked the same
		// question (a before b exactly when a.s < b.s), so the same order.
		slices.SortStableFunc(list, func(a, b at) int {
			if a.s < b.s {
				return -1
			}
			return 0
		})
		// Faces line up with faces (coplanar surfaces); axes, centres and
		// mid-planes with each other. A face through a hole's axis is no
		// centre line, so the two kinds are chained apart.
		// Each member of a run that lines up is linked to the one before
		// it, and a mid-plane also to the run's anchor (its first centre,
		// else axis): a mid-plane through two axes is then tied to each, so
		// the relation does not depend on which of them the sort put first.
		// (Between centres and axes at one height the links are plain
		// differences, so the chain already implies every pair.)
		uu := u.Unit()
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
				e.keepShiftDiff(prev.x, cur.x, uu)
				if anchor != prev && (cur.x.shape == planeShape || anchor.x.shape == planeShape) {
					e.keepShiftDiff(anchor.x, cur.x, uu)
				}
				if shapeRank(cur.x.shape) < shapeRank(anchor.x.shape) {
					anchor = cur
				}
				prev = cur
			}
		}
	}
}

// isFace reports whether an entity is a planar surface rather than a
// mid-plane, axis or centre.
func isFace(x *entity) bool { return x.m.Feature.Kind == model.Plane }

// impliedAngles: nominal 0 and 90 degrees are implied basic angles (ASME
// Y14.5-2018, implied 90 degree and 0 degree basic angles). Directions are
// grouped by line; members of a group are related to their neighbour, and
// groups at right angles through one representative each.
func (e *builder) impliedAngles() {
	type group struct {
		d   Vec
		rep *entity
	}
	var groups []*group
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
		e.angleRows(g.rep, x)
	}
	for i, g := range groups {
		for _, h := range groups[i+1:] {
			if perpendicular(g.d, h.d) {
				e.angleRows(g.rep, h.rep)
			}
		}
	}
}

// impliedClocking adds the implied basic 0 and 90 degree relationships to
// the direction that a clocking datum feature defines from a datum axis
// (ASME Y14.5-2018, implied basic relationships hold to every datum of the
// frame; ISO 5459:2011, a datum system's orientation by a secondary axis and
// a tertiary feature off it). Where a frame references an axis (a hole or
// pin) and, after it, a hole, pin or sphere off that axis, the radial line
// from the axis to that feature sets the part's turn about the axis: a
// plane or an axis across the datum axis whose direction is at 0 or 90
// degrees to that line, and a feature along the axis whose radial line is
// at 0 or 90 degrees to it, turn with it, as a basic angle about the axis
// would say (`basic 90deg from dowel to face about pilot`). The clocking
// a width or a plane gives (a keyway) is the implied angle between
// directions already.
func (e *builder) impliedClocking() {
	type pair struct{ hub, clk *entity }
	seen := map[pair]bool{}
	single := func(r *model.DatumRef) *entity {
		if len(r.Datums) != 1 || r.Datums[0] == nil || !r.Datums[0].Target.Resolved() {
			return nil
		}
		t := r.Datums[0].Target
		if t.Member == nil && len(t.Feature.Members) != 1 {
			return nil
		}
		m := t.Member
		if m == nil {
			m = t.Feature.Members[0]
		}
		return e.byMem[m]
	}
	var pairs []pair
	for _, fr := range e.part.Frames {
		for _, seg := range fr.Segments {
			for i, ri := range seg.Refs {
				hub := single(ri)
				if hub == nil || hub.shape != axisShape {
					continue
				}
				for _, rj := range seg.Refs[i+1:] {
					clk := single(rj)
					if clk == nil || clk == hub || seen[pair{hub, clk}] {
						continue
					}
					along := clk.shape == pointShape && len(clk.rb) == 0 || clk.shape == axisShape && parallel(clk.d, hub.d)
					if !along || radial(hub, clk.p).Norm() <= e.tol {
						continue
					}
					seen[pair{hub, clk}] = true
					pairs = append(pairs, pair{hub, clk})
				}
			}
		}
	}
	square := func(a, b Vec) bool { return parallel(a, b) || perpendicular(a, b) }
	for _, pr := range pairs {
		hub, clk := pr.hub, pr.clk
		ref, ok := e.clock(clk, hub)
		if !ok {
			continue
		}
		u := radial(hub, clk.p).Unit()
		for _, x := range e.ents {
			if x == hub || x == clk {
				continue
			}
			switch {
			case len(x.rb) > 0 && x.shape != pointShape && perpendicular(x.d, hub.d) && square(x.d, u):
				// Its direction turns with the part about the axis.
				e.built = append(e.built, diff(turn(x, hub.d), ref))
			case x.shape == axisShape && parallel(x.d, hub.d) || x.shape == pointShape && len(x.rb) == 0:
				w := radial(hub, x.p)
				if w.Norm() > e.tol && square(w, u) {
					if r, ok := e.clock(x, hub); ok {
						e.built = append(e.built, diff(r, ref))
					}
				}
			}
		}
	}
}

// impliedCentring: a pattern drawn centred on a datum feature's mid-plane
// or axis is centred on it by implication (common drafting practice; ASME
// Y14.5-2018, implied basic zero between a pattern's centre and the
// centre plane or axis it is drawn symmetrical about, from memory): the
// mean of its members' places along the mid-plane's normal, or across the
// axis, is the datum's. Two holes drawn either side of a slot's mid-plane
// and dimensioned only to each other are then located from it.
func (e *builder) impliedCentring() {
	var centres []*entity
	for _, d := range e.part.Datums {
		t := d.Target
		if d.Broken || !t.Resolved() || t.Member == nil && len(t.Feature.Members) != 1 {
			continue
		}
		k := t.Feature.Kind
		if !(k.IsWidth() || k.IsCylinder()) {
			continue
		}
		m := t.Member
		if m == nil {
			m = t.Feature.Members[0]
		}
		if x := e.byMem[m]; x != nil && !containsEnt(centres, x) {
			centres = append(centres, x)
		}
	}
	if len(centres) == 0 {
		return
	}
	for _, f := range e.part.Features {
		if !f.Pattern || len(f.Members) < 2 {
			continue
		}
		ms := make([]*entity, 0, len(f.Members))
		var c Vec
		for _, m := range f.Members {
			x := e.byMem[m]
			if x == nil {
				ms = nil
				break
			}
			ms = append(ms, x)
			c = c.Add(x.p)
		}
		if ms == nil {
			continue
		}
		c = c.Scale(1 / float64(len(ms)))
		for _, d := range centres {
			dirs := d.tb // across an axis; a mid-plane's normal
			for _, n := range dirs {
				if math.Abs(n.Dot(c.Sub(d.p))) > e.tol {
					continue
				}
				var r row
				ok := true
				for _, x := range ms {
					sx, fine := e.shift(x, n)
					if !fine {
						ok = false
						break
					}
					for _, t := range sx {
						r = append(r, term{t.v, t.c / float64(len(ms))})
					}
				}
				sd, fine := e.shift(d, n)
				if !ok || !fine {
					continue
				}
				e.built = append(e.built, diff(r, sd))
			}
		}
	}
}

// eliminate merges the variables that rows of the form x − y = 0 make
// equal (exact Gaussian elimination of those rows) and keeps the other rows,
// rewritten over the classes, for the rank decisions.
//
// The rows are rewritten pass after pass until a pass merges nothing, as
// they always were; but a row already rewritten whose variables are all
// still their classes' own is left as it is (rewriting it again gives the
// same terms, bit for bit), and a rewrite sums a row's few terms in place
// of a map, in the order they come, so the sums are the ones the map made.
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
	// rewrite appends r over the classes to buf's end and returns it.
	var buf []term
	rewrite := func(r row) row {
		if cap(buf)-len(buf) < len(r) {
			buf = make([]term, 0, max(256, 2*len(r)))
		}
		start := len(buf)
		out := buf[start : start : start+len(r)]
		for _, t := range r {
			c := find(t.v)
			k := 0
			for k < len(out) && out[k].v != c {
				k++
			}
			if k == len(out) {
				out = append(out, term{c, 0})
			}
			out[k].c += t.c
		}
		big := 0.0
		for _, t := range out {
			big = math.Max(big, math.Abs(t.c))
		}
		n := 0
		for _, t := range out {
			if math.Abs(t.c) > 1e-12*big {
				out[n] = t
				n++
			}
		}
		out = out[:n:n]
		buf = buf[:start+n]
		return out
	}
	settled := func(r row) bool {
		for _, t := range r {
			if parent[t.v] != t.v {
				return false
			}
		}
		return true
	}
	equality := func(r row) bool {
		return len(r) == 2 && math.Abs(r[0].c+r[1].c) <= 1e-12*math.Max(math.Abs(r[0].c), math.Abs(r[1].c))
	}
	// The rows kept by a pass are written over the ones it has read.
	pending := rows
	for pass := 0; ; pass++ {
		n := 0
		merged := false
		for _, r := range pending {
			if pass > 0 && settled(r) {
				pending[n] = r
				n++
				continue
			}
			r = rewrite(r)
			switch {
			case len(r) == 0:
			case equality(r):
				parent[find(r[0].v)] = find(r[1].v)
				merged = true
			default:
				pending[n] = r
				n++
			}
		}
		pending = pending[:n]
		if !merged {
			break
		}
	}
	e.class = make([]int, e.nvars)
	for i := range e.class {
		e.class[i] = find(i)
	}
	// The last pass merged nothing, so every row left is over classes
	// already and rewriting it once more would change nothing.
	pending = distinctRows(pending)
	e.general = pending
	e.rowStart = make([]int32, e.nvars+1)
	for _, r := range pending {
		for _, t := range r {
			e.rowStart[t.v+1]++
		}
	}
	for i := 1; i <= e.nvars; i++ {
		e.rowStart[i] += e.rowStart[i-1]
	}
	e.rowList = make([]int32, e.rowStart[e.nvars])
	fill := append([]int32(nil), e.rowStart[:e.nvars]...)
	for i, r := range pending {
		for _, t := range r {
			e.rowList[fill[t.v]] = int32(i)
			fill[t.v]++
		}
	}
}

// distinctRows keeps the first of rows that are one relation: the same
// classes with proportional coefficients, to 1e-12 of the largest. Features
// drawn alike in line with each other (a row of identical bolt circles
// whose members line up, at implied zeros, with the members of the next)
// give one relation many times over; the span is the same with one copy,
// and a rank decision that read n copies as a singular value √n times
// larger would only be nearer to its bound. Rows are over classes, each
// class once, in the order eliminate wrote them.
func distinctRows(rows []row) []row {
	type key struct {
		h uint64
		n int
	}
	seen := make(map[key][]int, len(rows))
	scaled := func(r row, k int) (int, int64) {
		big := 0.0
		for _, t := range r {
			if math.Abs(t.c) > math.Abs(big) {
				big = t.c
			}
		}
		return r[k].v, int64(math.Round(r[k].c / big * 1e12))
	}
	same := func(a, b row) bool {
		if len(a) != len(b) {
			return false
		}
		for k := range a {
			va, ca := scaled(a, k)
			vb, cb := scaled(b, k)
			if va != vb || ca != cb {
				return false
			}
		}
		return true
	}
	out := rows[:0]
next:
	for _, r := range rows {
		h := uint64(14695981039346656037)
		for k := range r {
			v, c := scaled(r, k)
			h = (h ^ uint64(v)) * 1099511628211
			h = (h ^ uint64(c)) * 1099511628211
		}
		kk := key{h, len(r)}
		for _, i := range seen[kk] {
			if same(out[i], r) {
				continue next
			}
		}
		seen[kk] = append(seen[kk], len(out))
		out = append(out, r)
	}
	return out
}
