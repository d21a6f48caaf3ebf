package dof

import (
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"strconv"
	"testing"
)

// A scenario is one frame and one zone, the unit of the property tests.
type scenario struct {
	name  string
	frame Frame
	refs  []Datum
	zone  Zone
}

// counts is everything a rule decides on; names are left out because they
// legitimately change with the coordinates.
type counts struct {
	Constrains []int
	Free       int
	PerStep    []int
	Translates bool
}

func (s scenario) counts() counts {
	d := s.frame.Analyze(s.refs)
	z := d.Zone(s.zone)
	return counts{constrains(d), len(d.Free()), z.PerStep, z.TranslationMoves}
}

func scenarios() []scenario {
	tilt := 10 * math.Pi / 180
	coaxial := Datum{cylinder(Vec{0, 0, 1}, Vec{60, 40, 0}), cylinder(Vec{0, 0, 1}, Vec{60, 40, 35})}
	return []scenario{
		{"3-2-1 and hole position", plate, []Datum{planeZ, planeY, planeX}, Zone{Surfaces: []Surface{bore}}},
		{"primary plane and hole position", plate, []Datum{planeZ}, Zone{Surfaces: []Surface{bore}}},
		{"parallel secondary", plate, []Datum{planeZ, {plane(Vec{0, 0, 1}, Vec{0, 0, 12.7})}}, Zone{Surfaces: []Surface{bore}}},
		{"tilted secondary", plate, []Datum{planeZ, {plane(Vec{0, math.Cos(tilt), math.Sin(tilt)}, Vec{0, 0, 0})}, planeX}, Zone{Surfaces: bolts}},
		{"bore then face", plate, []Datum{{bore}, planeZ}, Zone{Surfaces: bolts}},
		{"coaxial common datum", plate, []Datum{coaxial, planeZ}, Zone{Surfaces: []Surface{cylinder(Vec{0, 0, 1}, Vec{60, 40, 20})}}},
		{"two holes as one datum", plate, []Datum{planeZ, {bolts[0], bolts[3]}}, Zone{Surfaces: []Surface{bore}}},
		{"perpendicularity", plate, []Datum{planeZ, planeY}, Zone{Surfaces: []Surface{plane(Vec{1, 0, 0}, Vec{120, 0, 0})}, OrientationOnly: true}},
		{"pattern about a central bore", plate, []Datum{planeZ, {bore}}, Zone{Surfaces: bolts}},
		{"axial runout", plate, []Datum{{bore}}, Zone{Surfaces: []Surface{plane(Vec{0, 0, 1}, Vec{60, 40, 10})}, Extra: []Twist{{V: Vec{0, 0, 1}}}}},
		{"sphere and cone", plate, []Datum{{{Class: Sphere, Point: Vec{30, 20, 10}}}, {{Class: Cone, Dir: Vec{1, 1, 1}, Point: Vec{90, 60, 10}}}}, Zone{Surfaces: []Surface{bore}}},
	}
}

// placement maps the part's coordinates x to k·(R·x + s), optionally
// rounding every exported number to six significant digits afterwards.
type placement struct {
	r     [3]Vec
	s     Vec
	k     float64
	round bool
}

func (p placement) rotate(v Vec) Vec {
	return Vec{dot(p.r[0][:], v[:]), dot(p.r[1][:], v[:]), dot(p.r[2][:], v[:])}
}

func (p placement) pt(v Vec) Vec  { return p.rnd(scale(add(p.rotate(v), p.s), p.k)) }
func (p placement) dir(v Vec) Vec { return p.rnd(p.rotate(v)) }

func (p placement) rnd(v Vec) Vec {
	if !p.round {
		return v
	}
	for i, x := range v {
		v[i], _ = strconv.ParseFloat(strconv.FormatFloat(x, 'g', 6, 64), 64)
	}
	return v
}

func (p placement) surfaces(in []Surface) []Surface {
	out := make([]Surface, len(in))
	for i, s := range in {
		out[i] = Surface{Class: s.Class, Dir: p.dir(s.Dir), Point: p.pt(s.Point)}
	}
	return out
}

// apply moves the whole scenario. A twist (ω, v) at the old origin becomes
// (Rω, k(Rv − Rω×s)) at the new one.
func (p placement) apply(sc scenario) scenario {
	out := scenario{name: sc.name, frame: Frame{Center: p.pt(sc.frame.Center), Scale: sc.frame.Scale * p.k}}
	for _, d := range sc.refs {
		out.refs = append(out.refs, Datum(p.surfaces(d)))
	}
	out.zone = Zone{Surfaces: p.surfaces(sc.zone.Surfaces), OrientationOnly: sc.zone.OrientationOnly}
	for _, t := range sc.zone.Extra {
		w := p.rotate(t.W)
		out.zone.Extra = append(out.zone.Extra, Twist{W: w, V: scale(sub(p.rotate(t.V), cross(w, p.s)), p.k)})
	}
	return out
}

var unmoved = [3]Vec{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}

// randomPlacement draws a uniformly random rotation (from a random unit
// quaternion) and a shift of up to 200 part units.
func randomPlacement(rng *rand.Rand, k float64, round bool) placement {
	q := [4]float64{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
	n := math.Sqrt(q[0]*q[0] + q[1]*q[1] + q[2]*q[2] + q[3]*q[3])
	a, b, c, d := q[0]/n, q[1]/n, q[2]/n, q[3]/n
	r := [3]Vec{
		{a*a + b*b - c*c - d*d, 2 * (b*c - a*d), 2 * (b*d + a*c)},
		{2 * (b*c + a*d), a*a - b*b + c*c - d*d, 2 * (c*d - a*b)},
		{2 * (b*d - a*c), 2 * (c*d + a*b), a*a - b*b - c*c + d*d},
	}
	s := Vec{400*rng.Float64() - 200, 400*rng.Float64() - 200, 400*rng.Float64() - 200}
	return placement{r: r, s: s, k: k, round: round}
}

func TestCountsDoNotDependOnPlacementOrUnits(t *testing.T) {
	// Common practice: the degrees of freedom a frame leaves are a property
	// of the part, not of where it sits in the model space or of its units
	// (ASME Y14.5-2018 section 7 states them for the part, in any units).
	rng := rand.New(rand.NewPCG(1994, 1999))
	placements := map[string]placement{
		"inches":                  {r: unmoved, k: 1 / 25.4},
		"1 km along x":            {r: unmoved, s: Vec{1e6, 0, 0}, k: 1},
		"1 km along a diagonal":   {r: unmoved, s: Vec{-577350, 577350, 577350}, k: 1},
		"1 km, in metres":         {r: unmoved, s: Vec{1e6, 0, 0}, k: 1e-3},
		"rounded, as written":     {r: unmoved, k: 1, round: true},
		"inches, rounded":         {r: unmoved, k: 1 / 25.4, round: true},
		"inches, 1 km, unrounded": {r: unmoved, s: Vec{0, 1e6, 0}, k: 1 / 25.4},
	}
	for i := 0; i < 200; i++ {
		placements[fmt.Sprintf("random %d", i)] = randomPlacement(rng, 1, false)
		placements[fmt.Sprintf("random %d, rounded", i)] = randomPlacement(rng, 1, true)
		placements[fmt.Sprintf("random %d, inches, rounded", i)] = randomPlacement(rng, 1/25.4, true)
	}
	for _, sc := range scenarios() {
		want := sc.counts()
		for pname, p := range placements {
			if got := p.apply(sc).counts(); !reflect.DeepEqual(got, want) {
				t.Errorf("%s, %s: %+v, want %+v", sc.name, pname, got, want)
			}
		}
	}
}

// Without normalisation the same 1 km shift would change the answer; this
// checks that the property test above is not passing vacuously.
func TestNormalisationMatters(t *testing.T) {
	sc := scenarios()[0]
	far := placement{r: unmoved, s: Vec{1e6, 0, 0}, k: 1}.apply(sc)
	far.frame = Frame{} // no centre, unit scale
	if got, want := far.counts(), sc.counts(); reflect.DeepEqual(got, want) {
		t.Errorf("unnormalised frame 1 km away gave the same counts %+v; the placement test proves nothing", got)
	}
}
