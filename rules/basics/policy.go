package basics

// This file is the policy: which quantities a frame needs fixed (the
// members' places relative to the datums, to each other in a pattern, a
// bolt circle's diameter, a clocking angle) and how a missing one is named
// and written as a dimension to add. Where a false positive comes from, it
// is decided here; solve.go decides whether a quantity is fixed.

import (
	"math"

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
	// Adding it clears the quantity: a dimension that would not is not
	// suggested.
	Suggest string
	// Add is Suggest as data, for a fix to build its edit from; nil when
	// Suggest is "".
	Add *Suggestion
}

// Missing returns the quantities the frame needs that the basic relations
// do not fix, as few as possible and named as simply as possible: one
// finding per independent missing quantity. It returns nil when the
// target's or a datum's geometry is unknown.
func (e *Engine) Missing(q Query) []Missing { return e.missing(q, true) }

// MissingWhole is Missing decided by the factor of all the part's rows for
// every query, without first trying the rows near the target: the same
// answers by a slower path, for tests that hold the two together.
func (e *Engine) MissingWhole(q Query) []Missing { return e.missing(q, false) }

func (e *Engine) missing(q Query, local bool) []Missing {
	sc := e.getScratch()
	defer putScratch(sc)
	s := e.newSolve(q, sc)
	if s == nil {
		return nil
	}
	return s.answer(local)
}

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
			c := s.unit(i)
			if !s.try(c) {
				continue
			}
			m := Missing{Kind: Location, Member: x.m, Ref: s.fixedBy(c), Dir: p.dir}
			if p.rot {
				m.Kind = Angle
			}
			m.Ref, m.Add = s.suggestFromRef(m, x)
			m.Suggest = m.Add.String()
			out = append(out, m)
		}
	}
	return append(out, s.rest()...)
}

// rest finds what no single variable, spacing or clocking names (a
// member's place relative to a datum axis the part may turn about, say):
// the needed parts of the single variables span what the frame needs, and
// each is tried in the classes' space, where it is as short as the part has
// distinct places. Each is named by its variable, and given the dimension
// from a datum feature that fixes it where one does.
func (s *solve) rest() []Missing {
	if len(s.moves) == 0 {
		return nil // everything is needed: the single variables said it all
	}
	// The moves summed over the classes, when a variable first needs
	// them (on a clean part, none does): a variable less its projection on
	// the moves is then summed in time in proportion to the classes the
	// target has, not to its variables.
	var images [][]term
	var out []Missing
	for i, p := range s.params {
		moved := 0.0
		for _, m := range s.moves {
			moved += m[i] * m[i]
		}
		if moved <= rankTol*rankTol || moved >= 1-rankTol {
			continue // needed whole (tried above), or not needed at all
		}
		if images == nil {
			images = make([][]term, len(s.moves))
			for k, m := range s.moves {
				for j, v := range m {
					if c := s.e.class[s.params[j].v]; v != 0 && !s.hold.held[c] {
						s.sum.add(c, v)
					}
				}
				for _, c := range s.sum.touched {
					if x := s.sum.x[c]; x != 0 {
						images[k] = append(images[k], term{c, x})
					}
				}
				s.sum.reset()
			}
		}
		// The variable less its projection on the moves.
		if c := s.e.class[p.v]; !s.hold.held[c] {
			s.sum.add(c, 1)
		}
		for k, m := range s.moves {
			for _, t := range images[k] {
				s.sum.add(t.v, -m[i]*t.c)
			}
		}
		res := s.decide(math.Sqrt(1 - moved))
		if res == nil {
			continue
		}
		s.accept(res)
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
		mm.Ref, mm.Add = s.suggestFromRef(mm, p.x)
		mm.Suggest = mm.Add.String()
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
	nears := s.e.nearest(s.members)
	for mi := 1; mi < len(s.members); mi++ {
		x := s.members[mi]
		nearIdx := nears[mi]
		near := s.members[nearIdx]
		out = append(out, s.relativeClocking(x, near)...)
		for i := s.first[mi]; i < s.first[mi+1]; i++ {
			p := s.params[i]
			c := s.unit(i)
			// the same variable of the nearer member, in its own basis
			for j := s.first[nearIdx]; j < s.first[nearIdx+1]; j++ {
				if o := s.params[j]; o.rot == p.rot {
					if d := o.dir.Dot(p.dir); d != 0 {
						c = append(c, term{j, -d})
					}
				}
			}
			s.cand = c
			if !s.try(c) {
				continue
			}
			m := Missing{Kind: Location, Member: x.m, Other: near.m, Ref: -1, Dir: p.dir}
			if p.rot {
				m.Kind = Angle
			}
			if sg := s.e.suggestBetween(near, x, m.Kind, p.dir); sg != nil && s.clears(sg) {
				m.Add, m.Suggest = sg, sg.String()
			}
			out = append(out, m)
		}
	}
	return out
}

// nearest returns, for each member of a pattern after the first, the
// index of its nearest earlier member within nearWindow (the first of
// those within the tolerance of the nearest). It depends only on the
// pattern, so each engine works it out once per pattern, however many
// frames and segments ask.
func (e *Engine) nearest(members []*entity) []int {
	f := members[0].m.Feature
	e.memoMu.Lock()
	defer e.memoMu.Unlock()
	if n, ok := e.near[f]; ok && len(n) == len(members) {
		return n
	}
	out := make([]int, len(members))
	for mi := 1; mi < len(members); mi++ {
		x := members[mi]
		nearIdx := 0
		nearDist := members[0].p.Sub(x.p).Norm()
		for j := max(0, mi-nearWindow); j < mi; j++ {
			if d := members[j].p.Sub(x.p).Norm(); d < nearDist-e.tol {
				nearIdx, nearDist = j, d
			}
		}
		out[mi] = nearIdx
	}
	if e.near == nil {
		e.near = map[*model.Feature][]int{}
	}
	e.near[f] = out
	return out
}

// relativeClocking asks for the angle about each datum axis between a
// member and a nearer one: what fixes the members of an unevenly spaced
// bolt circle relative to each other.
func (s *solve) relativeClocking(x, near *entity) []Missing {
	var out []Missing
	for _, hub := range s.hubs {
		if x.shape != axisShape || !parallel(x.d, hub.d) {
			continue
		}
		rx, okx := s.e.clock(x, hub)
		rn, okn := s.e.clock(near, hub)
		if !okx || !okn {
			continue
		}
		c, fine := s.fromRow(diff(rx, rn))
		if !fine || !s.try(c) {
			continue
		}
		m := Missing{Kind: Clocking, Member: x.m, Other: near.m, Ref: -1, Dir: hub.d, Hub: hub.m}
		if sg := s.e.aboutSuggestion(near, x, hub); sg != nil && s.clears(sg) {
			m.Add, m.Suggest = sg, sg.String()
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
			if fine && s.needed(c) && s.undetermined(rw, rowNorm(rw)) != nil {
				missing = true
			}
		}
		if !missing {
			continue
		}
		for _, rw := range append(radius, spacing...) {
			if res := s.undetermined(rw, rowNorm(rw)); res != nil {
				s.accept(res)
			}
		}
		sg := circleSuggestion(s.members[0], hub, 2*r)
		return []Missing{{Kind: Circle, Member: s.members[0].m, Ref: -1, Dir: hub.d, Hub: hub.m, Add: sg, Suggest: sg.String()}}
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
				if sg := s.e.aboutSuggestion(x, d, hub); sg != nil && s.clears(sg) {
					m.Add, m.Suggest = sg, sg.String()
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
	case fr.Located():
		// A composite lower segment of a profile without datums refines
		// form and orientation only.
		return fr.Characteristic == model.Position || len(seg.Refs) > 0, false
	case fr.Characteristic == model.Angularity:
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
