package basics

import (
	"math"
	"strconv"

	"github.com/datumlint/datumlint/grammar/model"
)

// Vec is a point or a direction in the part's coordinates.
type Vec = model.Vec

// alignTol decides what counts as aligned: directions within this many
// radians of each other, and coordinates within this fraction of the part's
// size. It is the kinematic engine's reasoning (rules/dof, rankTol): values
// exported with six significant digits disagree by about 1e-5 of the part's
// size a couple of sizes from the origin, and no drawing means a difference
// that small.
const alignTol = 2e-5

// rankTol is the residual below which a unit-length row counts as a
// combination of others.
const rankTol = 5e-5

// shape is how a feature's nominal geometry can vary (see the package doc).
type shape int

const (
	planeShape shape = iota + 1 // offset along the normal
	axisShape                   // position across the axis
	pointShape                  // a centre, an apex or a surface's point
)

// entity is one member of one feature with its variables.
type entity struct {
	m     *model.Member
	shape shape
	p, d  Vec   // nominal point; unit direction (zero for a centre)
	tb    []Vec // orthonormal directions of its translation variables
	rb    []Vec // orthonormal axes of its rotation variables
	t0    int   // index of the first translation variable
	r0    int   // index of the first rotation variable
	// h and ah are how far the written geometry may be from what was meant
	// by rounding alone: a length, and an angle in degrees (see written).
	h, ah float64
}

// Name is how a member is written: "bore", or "bolts.3" in a pattern.
func Name(m *model.Member) string {
	if m == nil || m.Feature == nil {
		return ""
	}
	if m.Feature.Pattern {
		return m.Feature.Name + "." + strconv.Itoa(m.Index)
	}
	return m.Feature.Name
}

func (e *entity) name() string { return Name(e.m) }

var axes = [3]Vec{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}

// axesFrame is three orthonormal directions that the engine's variables
// are taken along: the part's own axes. Where a relation runs along one of
// them (a hole located from a datum plane, two holes on one centre line) it
// is then a row "this variable equals that one", which union-find merges
// exactly; taken along other directions the same relation would be a
// general row that the rank decisions must factorise.
type axesFrame struct {
	ax [3]Vec
	// across[i] is perp(ax[i]), shared: nothing writes to the directions
	// of an entity's variables.
	across [3][2]Vec
}

func newAxesFrame(ax [3]Vec) *axesFrame {
	return &axesFrame{ax: ax, across: [3][2]Vec{{ax[1], ax[2]}, {ax[2], ax[0]}, {ax[0], ax[1]}}}
}

// modelAxes are the model's coordinate axes, which a part drawn along them
// takes as its own.
var modelAxes = newAxesFrame(axes)

// snap returns the coordinate axis d is within alignTol of (keeping its
// sign), or d normalised.
func snap(d Vec) Vec { return modelAxes.snap(d) }

// snap returns the frame's axis d is within alignTol of (keeping its
// sign), or d normalised. Aligned geometry then gives exact rows.
func (f *axesFrame) snap(d Vec) Vec {
	d = d.Unit()
	for i, a := range f.ax {
		if c := d.Dot(a); math.Abs(c) >= 1-alignTol*alignTol/2 {
			if c < 0 {
				return a.Scale(-1)
			}
			return f.ax[i]
		}
	}
	return d
}

// canonical flips a direction so that its first non-zero component is
// positive: a line and its opposite are one line.
func canonical(d Vec) Vec {
	for _, x := range d {
		if math.Abs(x) > 1e-12 {
			if x < 0 {
				return d.Scale(-1)
			}
			return d
		}
	}
	return d
}

// perp returns two orthonormal directions across d: the other two axes
// when d is a coordinate axis, else a frame built on the axis least aligned
// with d.
func perp(d Vec) []Vec { return modelAxes.perp(d) }

// perp is the package's perp with the frame's axes.
func (f *axesFrame) perp(d Vec) []Vec {
	for i, a := range f.ax {
		if math.Abs(d.Dot(a)) == 1 {
			return f.across[i][:]
		}
	}
	k := 0
	for i := 1; i < 3; i++ {
		if math.Abs(d.Dot(f.ax[i])) < math.Abs(d.Dot(f.ax[k])) {
			k = i
		}
	}
	t1 := d.Cross(f.ax[k]).Unit()
	return []Vec{t1, d.Cross(t1).Unit()}
}

// partAxes returns the part's own axes: those of its datum features'
// directions (the datum reference frame's, where a drawing's x, y and z
// run), or, without datum features, of the directions most of its features
// share; the model's axes when these lie along them, so that a part drawn
// along the model's axes is built exactly as the model gives it. The first
// axis is the direction with the most weight (a datum feature counts as a
// thousand features), the second the weightiest at right angles to it.
func partAxes(p *model.Part) *axesFrame {
	type line struct {
		d Vec
		w int
	}
	var lines []line
	add := func(d Vec, w int) {
		if !(d.Norm() > 0) {
			return
		}
		d = canonical(d.Unit())
		for i := range lines {
			if parallel(lines[i].d, d) {
				lines[i].w += w
				return
			}
		}
		if len(lines) < maxFrameLines {
			lines = append(lines, line{d, w})
		}
	}
	datum := map[*model.Feature]bool{}
	for _, d := range p.Datums {
		if d.Target.Resolved() {
			datum[d.Target.Feature] = true
		}
	}
	for _, f := range p.Features {
		if f.Broken || !f.HasGeometry {
			continue
		}
		w := len(f.Members)
		if datum[f] {
			w = 1000
		}
		add(f.Dir, w)
	}
	best := func(ok func(Vec) bool) (Vec, bool) {
		k := -1
		for i, l := range lines {
			if ok(l.d) && (k < 0 || l.w > lines[k].w) {
				k = i
			}
		}
		if k < 0 {
			return Vec{}, false
		}
		return lines[k].d, true
	}
	u1, ok := best(func(Vec) bool { return true })
	if !ok {
		return modelAxes
	}
	u2, ok2 := best(func(d Vec) bool { return perpendicular(d, u1) })
	aligned := func(d Vec) bool {
		return snap(d) != d.Unit() || math.Abs(math.Abs(d[0])+math.Abs(d[1])+math.Abs(d[2])-1) == 0
	}
	if aligned(u1) && (!ok2 || aligned(u2)) {
		return modelAxes
	}
	if !ok2 {
		u2 = modelAxes.perp(u1)[0]
	}
	u2 = u2.Sub(u1.Scale(u1.Dot(u2))).Unit()
	u3 := u1.Cross(u2).Unit()
	// Each axis in the slot of the model's axis it is nearest, pointing
	// its way, so that a part turned a little keeps its x, y and z.
	var ax [3]Vec
	var used [3]bool
	for _, u := range []Vec{u1, u2, u3} {
		k, best := -1, -1.0
		for i := range 3 {
			if !used[i] && math.Abs(u[i]) > best {
				k, best = i, math.Abs(u[i])
			}
		}
		if u[k] < 0 {
			u = u.Scale(-1)
		}
		ax[k], used[k] = u, true
	}
	return newAxesFrame(ax)
}

// maxFrameLines bounds the distinct directions partAxes weighs, so that a
// part of many differently inclined features costs time in proportion to
// them: the datum features' and the commonest directions come first in any
// drawing that has a frame.
const maxFrameLines = 64

// parallel is |a × b| ≤ alignTol. The square root is taken only near the
// bound, where comparing squares could round the other way.
func parallel(a, b Vec) bool {
	c := a.Cross(b)
	n2 := c.Dot(c)
	switch {
	case n2 <= alignTol*alignTol*(1-1e-9):
		return true
	case n2 > alignTol*alignTol*(1+1e-9):
		return false
	}
	return c.Norm() <= alignTol
}

func perpendicular(a, b Vec) bool { return math.Abs(a.Dot(b)) <= alignTol }

// newEntity gives a member its variables' directions along the part's
// axes, or nil when its geometry is unknown.
func (ax *axesFrame) newEntity(m *model.Member) *entity {
	f := m.Feature
	if f == nil || f.Broken || !f.HasGeometry {
		return nil
	}
	e := &entity{m: m, p: m.Point}
	if f.Dir.Norm() > 0 {
		e.d = ax.snap(f.Dir)
	}
	hasDir := e.d.Norm() > 0
	switch f.Kind {
	case model.Plane, model.Slot, model.Tab:
		if !hasDir {
			return nil
		}
		e.shape, e.tb, e.rb = planeShape, []Vec{canonical(e.d)}, ax.perp(e.d)
	case model.Hole, model.Pin, model.Extrusion:
		if !hasDir {
			return nil
		}
		across := ax.perp(e.d) // read only, so one slice serves both
		e.shape, e.tb, e.rb = axisShape, across, across
	case model.Cone:
		if !hasDir {
			return nil
		}
		e.shape, e.tb, e.rb = pointShape, ax.ax[:], ax.perp(e.d)
	case model.Socket, model.Ball, model.Surface:
		e.shape, e.tb = pointShape, ax.ax[:]
	default:
		return nil
	}
	e.h, e.ah = written(m)
	return e
}

// written returns how far a member's written point (h, a length) and
// direction (ah, degrees) may be from the values meant, by rounding alone.
// A coordinate written with three or more decimals (34.641, 0.866025) is
// taken as a computed value rounded to that digit, so ±half a unit of it;
// one with fewer (15, 12.5) as exact, as designers write design values
// (from memory: drawing practice; a bolt circle's coordinates are computed,
// its diameter is chosen). Without this, a bolt circle written with
// three-decimal coordinates would disagree with its diameter at 1e-6 of the
// part's size.
func written(m *model.Member) (h, ah float64) {
	d := m.Decimals
	h = math.Sqrt(3) * math.Max(halfUnit(d[0]), math.Max(halfUnit(d[1]), halfUnit(d[2])))
	if fd := m.Feature.DirDecimals; m.Feature.Dir.Norm() > 0 {
		// Each component off by u turns a unit vector by at most about
		// √2·u radians.
		u := math.Max(halfUnit(fd[0]), math.Max(halfUnit(fd[1]), halfUnit(fd[2])))
		ah = math.Sqrt2 * u * 180 / math.Pi
	}
	return h, ah
}

// halfUnit is half a unit of the last written decimal of a number written
// with three or more decimals, else 0 (decimals < 0: not written in
// decimals).
func halfUnit(decimals int) float64 {
	if decimals < 3 {
		return 0
	}
	return 0.5 * math.Pow(10, -float64(decimals))
}

// offset is the vector from a to b that a distance between them measures:
// across an axis, along the common normal of two skew axes, straight
// between centres.
func offset(a, b *entity) Vec {
	w := b.p.Sub(a.p)
	switch {
	case a.shape == axisShape && b.shape == axisShape && !parallel(a.d, b.d):
		m := a.d.Cross(b.d).Unit()
		return m.Scale(m.Dot(w))
	case a.shape == axisShape:
		return w.Sub(a.d.Scale(a.d.Dot(w)))
	case b.shape == axisShape:
		return w.Sub(b.d.Scale(b.d.Dot(w)))
	}
	return w
}

// measureDir is the direction a linear dimension from a to b measures
// along when it has no 'along': a plane's normal, else the offset. ok is
// false where the contract gives the dimension no meaning (two planes that
// are not parallel, a plane and an axis normal to it).
func measureDir(a, b *entity, tol float64) (u Vec, zero, ok bool) {
	switch {
	case a.shape == planeShape && b.shape == planeShape:
		return a.d, false, parallel(a.d, b.d)
	case a.shape == planeShape:
		return a.d, false, b.shape != axisShape || !parallel(a.d, b.d)
	case b.shape == planeShape:
		return b.d, false, a.shape != axisShape || !parallel(a.d, b.d)
	}
	w := offset(a, b)
	if w.Norm() <= tol {
		return Vec{}, true, true
	}
	return w.Unit(), false, true
}

// distance measures a linear dimension from a to b in the nominal
// geometry, along u when along is set (the contract's `along DIR`).
func distance(a, b *entity, along *Vec, tol float64) (float64, bool) {
	if along != nil {
		u := along.Unit()
		switch {
		case a.shape == planeShape:
			nu := a.d.Dot(u)
			if math.Abs(nu) <= alignTol {
				return 0, false
			}
			return math.Abs(a.d.Dot(b.p.Sub(a.p)) / nu), true
		case b.shape == planeShape:
			nu := b.d.Dot(u)
			if math.Abs(nu) <= alignTol {
				return 0, false
			}
			return math.Abs(b.d.Dot(a.p.Sub(b.p)) / nu), true
		}
		return math.Abs(u.Dot(offset(a, b))), true
	}
	u, zero, ok := measureDir(a, b, tol)
	switch {
	case !ok:
		return 0, false
	case zero:
		return 0, true
	case a.shape == planeShape:
		return math.Abs(u.Dot(b.p.Sub(a.p))), true
	case b.shape == planeShape:
		return math.Abs(u.Dot(a.p.Sub(b.p))), true
	}
	return offset(a, b).Norm(), true
}

// radial is the part of p − hub's point across the hub's axis.
func radial(hub *entity, p Vec) Vec {
	w := p.Sub(hub.p)
	return w.Sub(hub.d.Scale(hub.d.Dot(w)))
}

// lineAngle is the angle in degrees, in [0, 90], between two undirected lines.
func lineAngle(a, b Vec) float64 { return model.AngleBetweenLines(a, b) }

// sameAngle reports whether a written angle v (degrees) names the nominal
// angle between two undirected lines, nominal in [0, 90]: v or its
// supplement (the contract: 30deg and 150deg are the same dimension),
// within angleTol and the slack that the geometry's rounding allows.
func sameAngle(v, nominal, slack float64) bool {
	v = math.Mod(math.Abs(v), 180)
	t := angleTol + slack
	return math.Abs(v-nominal) <= t || math.Abs(180-v-nominal) <= t
}

// angleTol, in degrees, is how far a written angle may be from the model's.
// Directions exported as vectors with four or more significant digits
// reproduce the intended angle to within a few ten-thousandths of a degree;
// a wrong angle on a drawing is wrong by far more (from memory, common
// practice in model-based definition exports).
const angleTol = 1e-3

// Num formats a nominal value as a drawing would: up to six decimals,
// without trailing zeros.
func Num(x float64) string {
	r := math.Round(x*1e6) / 1e6
	if r == 0 {
		r = 0 // no "-0"
	}
	return strconv.FormatFloat(r, 'f', -1, 64)
}

// NumAngle formats a nominal angle in degrees to the 1e-4 degree that
// directions written with six significant digits carry.
func NumAngle(x float64) string {
	return Num(math.Round(x*1e4) / 1e4)
}

// DirName names a direction "x", "y", "z" when it is one of the part's
// axes (either sense), else as a vector.
func DirName(d Vec) string {
	d = snap(d)
	for i, a := range axes {
		if math.Abs(d.Dot(a)) == 1 {
			return [...]string{"x", "y", "z"}[i]
		}
	}
	d = canonical(d)
	return "(" + Num(d[0]) + ", " + Num(d[1]) + ", " + Num(d[2]) + ")"
}

// AlongName names a direction with its sense, as `along` takes it.
func AlongName(d Vec) string {
	d = snap(d)
	for i, a := range axes {
		if c := d.Dot(a); math.Abs(c) == 1 {
			s := "+"
			if c < 0 {
				s = "-"
			}
			return s + [...]string{"x", "y", "z"}[i]
		}
	}
	return "(" + Num(d[0]) + ", " + Num(d[1]) + ", " + Num(d[2]) + ")"
}

// meetPoint is where a linear relation between a and b is measured: the
// written point of the one with the fewest dimensions (a centre, then an
// axis, then a plane; a on a tie). Its feet on a and b then differ only
// along the measuring direction, so the relation is the same wherever the
// features' points were written and a rigid motion of the whole part leaves
// it unchanged (a plane 25 from a hub's axis is 25 from it at the foot of
// the axis, whichever point of the plane the file names).
func meetPoint(a, b *entity) Vec {
	if shapeRank(b.shape) < shapeRank(a.shape) {
		return b.p
	}
	return a.p
}

func shapeRank(s shape) int {
	switch s {
	case pointShape:
		return 0
	case axisShape:
		return 1
	}
	return 2
}

// foot returns the point of x nearest to c: for a plane, c projected onto
// it; for an axis, c projected onto the line; for a centre, the centre.
func foot(x *entity, c Vec) Vec {
	switch x.shape {
	case planeShape:
		return c.Sub(x.d.Scale(x.d.Dot(c.Sub(x.p))))
	case axisShape:
		return x.p.Add(x.d.Scale(x.d.Dot(c.Sub(x.p))))
	}
	return x.p
}

// tilt is the rotation about which x's turn variables move the point
// x.p + w of x along u, in the units shift uses: a plane or an axis that
// turns about its written point moves its other points (δθ × w), and a
// relation measured elsewhere than at the written point must count that.
// ok is false where nothing couples (a centre, or w zero).
func tilt(x *entity, u, w Vec, L float64) (Vec, bool) {
	if len(x.rb) == 0 || w == (Vec{}) {
		return Vec{}, false
	}
	switch x.shape {
	case planeShape:
		nu := x.d.Dot(u)
		return w.Cross(x.d).Scale(1 / (L * nu)), true
	case axisShape:
		up := u.Sub(x.d.Scale(x.d.Dot(u)))
		return w.Cross(up).Scale(1 / (L * up.Dot(up))), true
	}
	return Vec{}, false
}
