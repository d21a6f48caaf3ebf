package basics

import (
	"fmt"

	"github.com/datumlint/datumlint/grammar/model"
)

// Suggestion is a basic dimension to add, as data: what Missing.Suggest
// writes, for a fix to build its edit from.
type Suggestion struct {
	// From and To are the members it runs between; for a bolt circle, To
	// is the pattern's first member and From is nil.
	From, To *model.Member
	// Value is the model's nominal: a length, an angle in degrees, or the
	// circle's diameter.
	Value float64
	// Along is the direction of a length measured along one (the
	// notation's `along`); nil for the contract's own measure.
	Along *Vec
	// Angle is set for an angle; About is the axis feature of an angle
	// about an axis, or of a bolt circle.
	Angle bool
	About *model.Member
	// Circle is set for a bolt circle's diameter through To's pattern.
	Circle bool
}

// String writes the suggestion as a line of the notation.
func (sg *Suggestion) String() string {
	if sg == nil {
		return ""
	}
	switch {
	case sg.Circle:
		return fmt.Sprintf("basic dia %s through %s about %s", Num(sg.Value), sg.To.Feature.Name, Name(sg.About))
	case sg.Angle && sg.About != nil:
		return fmt.Sprintf("basic %sdeg from %s to %s about %s", NumAngle(sg.Value), Name(sg.From), Name(sg.To), Name(sg.About))
	case sg.Angle:
		return fmt.Sprintf("basic %sdeg from %s to %s", NumAngle(sg.Value), Name(sg.From), Name(sg.To))
	case sg.Along != nil:
		return fmt.Sprintf("basic %s from %s to %s along %s", Num(sg.Value), Name(sg.From), Name(sg.To), AlongName(*sg.Along))
	}
	return fmt.Sprintf("basic %s from %s to %s", Num(sg.Value), Name(sg.From), Name(sg.To))
}

// target is a member as a dimension names it.
func target(m *model.Member) model.Target {
	t := model.Target{Name: Name(m), Feature: m.Feature}
	if m.Feature.Pattern {
		t.Member = m
	}
	return t
}

// rows returns the relations the suggested dimension adds, built as the
// line the file would then hold is built.
func (e *Engine) rows(sg *Suggestion) []row {
	d := &model.Dimension{Basic: true, Angle: sg.Angle, Value: sg.Value, Along: sg.Along}
	switch {
	case sg.Circle:
		d.Circle = &model.BoltCircle{Diameter: sg.Value, Pattern: model.Target{Name: sg.To.Feature.Name, Feature: sg.To.Feature}, About: target(sg.About)}
	default:
		d.From, d.To = target(sg.From), target(sg.To)
		if sg.About != nil {
			about := target(sg.About)
			d.About = &about
		}
	}
	b := &builder{Engine: e}
	b.dimRows(d)
	return b.built
}

// clears reports whether adding the suggestion would fix the quantity the
// query found missing last (the last of its basis): a suggestion is a
// promise, so one that the relations it adds would leave the quantity
// unfixed by (measuring along the wrong line, turning about the wrong
// axis) is not made. The quantity's residual must lie in the span of the
// suggestion's rows' residuals against what fixes the rest.
func (s *solve) clears(sg *Suggestion) bool {
	rows := s.e.rows(sg)
	if len(rows) == 0 {
		return false
	}
	n := len(s.basis)
	res := s.basis[n-1]
	s.basis = s.basis[:n-1]
	nf := len(s.found)
	last := s.found[nf-1]
	s.found = s.found[:nf-1]
	defer func() {
		s.basis = append(s.basis[:n-1], res)
		s.found = append(s.found[:nf-1], last)
	}()
	for _, r := range rows {
		if rr := s.undetermined(r, rowNorm(r)); rr != nil {
			s.basis = append(s.basis, rr)
		}
	}
	p := 0.0
	for _, b := range s.basis[n-1:] {
		d := dotTerms(res, b)
		p += d * d
	}
	return p >= 1-rankTol*rankTol
}

// dotTerms is the dot product of two sparse vectors over classes, each
// class at most once in each.
func dotTerms(a, b []term) float64 {
	if len(a) > len(b) {
		a, b = b, a
	}
	t := 0.0
	for _, x := range a {
		for _, y := range b {
			if x.v == y.v {
				t += x.c * y.c
				break
			}
		}
	}
	return t
}

// suggestFromRef writes the dimension to the member from the datum
// feature it is naturally measured from: the earliest reference, up to the
// one that fixes the quantity, whose feature can measure it and whose
// dimension would fix it. With A|B|C planes that is the one that fixes it
// (x from C, y from B); with a datum axis B clocked by C, a location across
// the axis is measured from B, as drawings measure it from the origin the
// axis gives. It returns the reference used (m.Ref when none can measure
// it) and the dimension.
func (s *solve) suggestFromRef(m Missing, x *entity) (int, *Suggestion) {
	for k := 0; k <= m.Ref && k < len(s.q.Refs); k++ {
		for _, dm := range s.q.Refs[k] {
			if d := s.e.byMem[dm]; d != nil && d != x {
				if sg := s.e.suggestBetween(d, x, m.Kind, m.Dir); sg != nil && s.clears(sg) {
					return k, sg
				}
			}
		}
	}
	// Otherwise: the contract's own measure between the two (a radius from
	// an axis the part may still turn about), or an angle about a datum
	// axis from another datum feature of the frame (a face or a hole
	// clocked by a dowel at an angle that is not implied), where it clears.
	for k := 0; k <= m.Ref && k < len(s.q.Refs); k++ {
		for _, dm := range s.q.Refs[k] {
			d := s.e.byMem[dm]
			if d == nil || d == x || m.Kind == Angle {
				continue
			}
			if v, ok := distance(d, x, nil, s.e.tol); ok && v > s.e.tol {
				if sg := (&Suggestion{From: d.m, To: x.m, Value: v}); s.clears(sg) {
					return k, sg
				}
			}
		}
	}
	for k := 0; k < len(s.q.Refs); k++ {
		for _, hm := range s.q.Refs[k] {
			hub := s.e.byMem[hm]
			if hub == nil || hub == x || hub.shape != axisShape {
				continue
			}
			for j := 0; j < len(s.q.Refs); j++ {
				for _, cm := range s.q.Refs[j] {
					c := s.e.byMem[cm]
					if c == nil || c == hub || c == x {
						continue
					}
					if sg := s.e.aboutSuggestion(c, x, hub); sg != nil && s.clears(sg) {
						return max(k, j), sg
					}
				}
			}
		}
	}
	return m.Ref, nil
}

// suggestBetween writes a basic dimension from a to b that fixes b's
// location along dir (or its angle about dir), with the model's nominal
// value. It adds `along` only where the contract's own measure is in
// another direction.
func (e *Engine) suggestBetween(a, b *entity, k Kind, dir Vec) *Suggestion {
	if k == Angle {
		if len(a.rb) == 0 || len(b.rb) == 0 {
			return nil
		}
		return &Suggestion{From: a.m, To: b.m, Angle: true, Value: lineAngle(a.d, b.d)}
	}
	if _, ok := e.shift(a, dir); !ok {
		return nil
	}
	if _, ok := e.shift(b, dir); !ok {
		return nil
	}
	u, zero, ok := measureDir(a, b, e.tol)
	if ok && !zero && parallel(u, dir) {
		if v, ok := distance(a, b, nil, e.tol); ok {
			return &Suggestion{From: a.m, To: b.m, Value: v}
		}
	}
	v, ok := distance(a, b, &dir, e.tol)
	if !ok {
		return nil
	}
	along := dir
	return &Suggestion{From: a.m, To: b.m, Value: v, Along: &along}
}

// aboutSuggestion writes the angle about hub's axis from a to b, or nil
// where it has none.
func (e *Engine) aboutSuggestion(a, b, hub *entity) *Suggestion {
	v, ok := e.aboutAngle(a, b, hub)
	if !ok {
		return nil
	}
	return &Suggestion{From: a.m, To: b.m, Angle: true, About: hub.m, Value: v}
}

// circleSuggestion writes the bolt circle of diameter dia through the
// pattern of first about hub.
func circleSuggestion(first *entity, hub *entity, dia float64) *Suggestion {
	return &Suggestion{To: first.m, About: hub.m, Value: dia, Circle: true}
}
