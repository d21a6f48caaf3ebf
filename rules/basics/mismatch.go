package basics

import (
	"fmt"
	"math"

	"github.com/datumlint/datumlint/grammar/model"
)

// Mismatch is a written dimension whose value is not what the nominal
// geometry gives.
type Mismatch struct {
	Dim *model.Dimension
	// Nominal is the model's value: a length, an angle in degrees (in
	// [0, 90]; its supplement is as good), or a bolt circle's diameter.
	Nominal float64
	// Member is the pattern member off a bolt circle, or the member that a
	// dimension on a whole pattern's name does not hold for; nil otherwise.
	Member *model.Member
	// Problem is set instead of Nominal when the dimension cannot hold in
	// the model at all ("the axis of bolts.2 is not parallel to hub's").
	Problem string
}

// Mismatches checks every written dimension against the model. Lengths
// agree within the part's tolerance (about 1e-6 of its size); angles
// within angleTol, as the angle or its supplement. Because every link of
// every chain is checked against one consistent model, two chains of basic
// dimensions that define one quantity differently always include a link
// reported here.
func (e *Engine) Mismatches() []Mismatch {
	var out []Mismatch
	tol := e.part.Tolerance()
	for _, d := range e.part.Dims {
		if d.Circle != nil {
			if m, bad := e.circleMismatch(d, tol); bad {
				out = append(out, m)
			}
			continue
		}
		// A dimension on a pattern's name holds for every member: the
		// first member it does not hold for is named.
		var found *Mismatch
		e.dimensionPairs(d, func(a, b *entity) {
			if found != nil {
				return
			}
			if m, bad := e.pairMismatch(d, a, b, tol); bad {
				switch {
				case wholePattern(d.From):
					m.Member = a.m
				case wholePattern(d.To):
					m.Member = b.m
				}
				found = &m
			}
		})
		if found != nil {
			out = append(out, *found)
		}
	}
	return out
}

func (e *Engine) circleMismatch(d *model.Dimension, tol float64) (Mismatch, bool) {
	c := d.Circle
	hub := e.entityOf(&c.About)
	if hub == nil || !c.Pattern.Resolved() {
		return Mismatch{}, false
	}
	if hub.shape != axisShape && !(hub.shape == pointShape && len(hub.rb) > 0) {
		return Mismatch{Dim: d, Problem: fmt.Sprintf("a bolt circle is about an axis, and %s has none", c.About.Name)}, true
	}
	for _, m := range c.Pattern.Feature.Members {
		x := e.byMem[m]
		if x == nil {
			continue
		}
		if x.shape == axisShape && !parallel(x.d, hub.d) {
			return Mismatch{Dim: d, Member: m, Problem: fmt.Sprintf("the axis of %s is not parallel to the axis of %s", Name(m), c.About.Name)}, true
		}
		if dia := 2 * radial(hub, x.p).Norm(); math.Abs(dia-math.Abs(c.Diameter)) > tol+2*(x.h+hub.h) {
			return Mismatch{Dim: d, Member: m, Nominal: dia}, true
		}
	}
	return Mismatch{}, false
}

// lineFold maps an angle in [0, 180] to the angle between the undirected
// lines, in [0, 90], which is what sameAngle compares against.
func lineFold(v float64) float64 {
	if v > 90 {
		return 180 - v
	}
	return v
}

// pairMismatch checks a dimension between two entities against the model.
func (e *Engine) pairMismatch(d *model.Dimension, a, b *entity, tol float64) (Mismatch, bool) {
	switch {
	case d.Angle && d.About != nil:
		hub := e.entityOf(d.About)
		if hub == nil || hub.shape == planeShape || hub == a || hub == b {
			return Mismatch{}, false
		}
		v, ok := e.aboutAngle(a, b, hub)
		if !ok {
			return Mismatch{}, false
		}
		// To a plane, the angle may be read to its normal or to the plane.
		plane := a.shape == planeShape || b.shape == planeShape
		slack := (a.h+b.h+2*hub.h)/math.Max(e.tol, math.Min(radial(hub, a.p).Norm(), radial(hub, b.p).Norm()))*180/math.Pi + a.ah + b.ah + hub.ah
		if !sameAngle(d.Value, lineFold(v), slack) && !(plane && sameAngle(d.Value, 90-v, slack)) {
			return Mismatch{Dim: d, Nominal: v}, true
		}
	case d.Angle:
		if len(a.rb) == 0 || len(b.rb) == 0 {
			return Mismatch{}, false
		}
		if v := lineAngle(a.d, b.d); !sameAngle(d.Value, v, a.ah+b.ah) {
			return Mismatch{Dim: d, Nominal: v}, true
		}
	default:
		v, ok := distance(a, b, d.Along, e.tol)
		if ok && math.Abs(math.Abs(d.Value)-v) > tol+a.h+b.h {
			return Mismatch{Dim: d, Nominal: v}, true
		}
	}
	return Mismatch{}, false
}

// wholePattern reports whether a dimension's end names a whole pattern.
func wholePattern(t model.Target) bool {
	return t.Resolved() && t.Member == nil && t.Feature.Pattern
}
