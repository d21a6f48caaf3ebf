package dof

import (
	"math"
	"reflect"
	"testing"
)

// The mounting plate of docs/notation.md's example: datum planes at the
// origin, a bore at (60, 40, 0), a 120 × 80 plate.
var plate = Frame{Center: Vec{60, 40, 0}, Scale: 120}

func plane(n, p Vec) Surface    { return Surface{Class: Plane, Dir: n, Point: p} }
func cylinder(a, p Vec) Surface { return Surface{Class: Cylinder, Dir: a, Point: p} }

var (
	planeZ = Datum{plane(Vec{0, 0, -1}, Vec{})}
	planeY = Datum{plane(Vec{0, -1, 0}, Vec{})}
	planeX = Datum{plane(Vec{-1, 0, 0}, Vec{})}
	bore   = cylinder(Vec{0, 0, 1}, Vec{60, 40, 0})
)

func names(ms []Motion) []string {
	out := []string{}
	for _, m := range ms {
		out = append(out, m.Name)
	}
	return out
}

func constrains(d *DRF) []int {
	var out []int
	for _, s := range d.Steps() {
		out = append(out, s.Constrains)
	}
	return out
}

func TestDatumFeatureTypes(t *testing.T) {
	// Degrees of freedom a single datum feature constrains, by type:
	// ASME Y14.5-2009 section 4 and ASME Y14.5-2018 section 7 (datum feature
	// types and the degrees of freedom they constrain); ISO 5459:2011, the
	// invariance classes (remaining freedom = 6 − constrained).
	tests := []struct {
		name string
		s    Surface
		want int
	}{
		{"plane", plane(Vec{0, 0, 1}, Vec{0, 0, 5}), 3},
		{"width mid-plane", plane(Vec{1, 0, 0}, Vec{60, 0, 0}), 3},
		{"sphere", Surface{Class: Sphere, Point: Vec{10, 20, 30}}, 3},
		{"cylinder", cylinder(Vec{0, 0, 1}, Vec{60, 40, 0}), 4},
		{"cone", Surface{Class: Cone, Dir: Vec{1, 1, 0}, Point: Vec{5, 5, 5}}, 5},
		{"linear extruded", Surface{Class: Prismatic, Dir: Vec{0, 1, 0}, Point: Vec{1, 2, 3}}, 5},
		{"complex", Surface{Class: Complex}, 6},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			d := plate.Analyze([]Datum{{tc.s}})
			if got := d.Steps()[0].Constrains; got != tc.want {
				t.Errorf("constrains %d, want %d", got, tc.want)
			}
			if got := len(d.Free()); got != 6-tc.want {
				t.Errorf("free %d, want %d", got, 6-tc.want)
			}
			if got := len(d.Steps()[0].Removed); got != tc.want {
				t.Errorf("removed basis has %d motions, want %d", got, tc.want)
			}
		})
	}
}

func TestFrames(t *testing.T) {
	tilt := 10 * math.Pi / 180
	tests := []struct {
		name   string
		source string
		refs   []Datum
		want   []int
		free   []string // nil: not checked
	}{
		{
			name: "3-2-1", source: "common practice (3-2-1 location)",
			refs: []Datum{planeZ, planeY, planeX}, want: []int{3, 2, 1}, free: []string{},
		},
		{
			name: "primary plane only", source: "ASME Y14.5-2018 section 7",
			refs: []Datum{planeZ}, want: []int{3},
			free: []string{"translation x", "translation y", "rotation z"},
		},
		{
			name: "plane parallel to the primary", source: "common practice (a parallel plane repeats the primary)",
			refs: []Datum{planeZ, {plane(Vec{0, 0, 1}, Vec{0, 0, 12})}}, want: []int{3, 0},
		},
		{
			name: "cylinder then perpendicular plane", source: "ASME Y14.5-2018 section 7 (axis primary: 4 degrees of freedom)",
			refs: []Datum{{bore}, planeZ}, want: []int{4, 1},
			free: []string{"rotation (0, 0, 1) through (60, 40, 0)"},
		},
		{
			name: "secondary plane tilted 10 degrees about x", source: "common practice (a secondary plane not parallel to the primary)",
			refs: []Datum{planeZ, {plane(Vec{0, math.Cos(tilt), math.Sin(tilt)}, Vec{})}}, want: []int{3, 2},
			free: []string{"translation x"},
		},
		{
			name: "secondary plane turned 10 degrees about z", source: "common practice",
			refs: []Datum{planeZ, {plane(Vec{math.Sin(tilt), math.Cos(tilt), 0}, Vec{})}}, want: []int{3, 2},
			free: []string{"translation (0.984808, -0.173648, 0)"},
		},
		{
			name: "common datum of two coaxial cylinders", source: "ASME Y14.5-2018 section 7 (common datum axis)",
			refs: []Datum{{cylinder(Vec{0, 0, 1}, Vec{60, 40, 0}), cylinder(Vec{0, 0, -1}, Vec{60, 40, 30})}}, want: []int{4},
			free: []string{"translation z", "rotation (0, 0, 1) through (60, 40, 0)"},
		},
		{
			name: "two parallel holes as one datum", source: "ASME Y14.5-2018 section 7 (pattern of features as a datum)",
			refs: []Datum{{cylinder(Vec{0, 0, 1}, Vec{15, 15, 0}), cylinder(Vec{0, 0, 1}, Vec{105, 15, 0})}}, want: []int{5},
			free: []string{"translation z"},
		},
		{
			name: "plane, then hole pattern", source: "ASME Y14.5-2018 section 7 (pattern of features as a datum)",
			refs: []Datum{planeZ, {cylinder(Vec{0, 0, 1}, Vec{15, 15, 0}), cylinder(Vec{0, 0, 1}, Vec{105, 65, 0})}}, want: []int{3, 3},
			free: []string{},
		},
		{
			name: "sphere primary", source: "ASME Y14.5-2018 section 7 (spherical datum feature)",
			refs: []Datum{{Surface{Class: Sphere, Point: Vec{0, 0, 50}}}}, want: []int{3},
			free: []string{"rotation (1, 0, 0) through (0, 0, 50)", "rotation (0, 1, 0) through (0, 0, 50)", "rotation z"},
		},
		{
			name: "repeated primary", source: "common practice (a reference adds nothing if it repeats one above it)",
			refs: []Datum{planeZ, planeZ, planeY}, want: []int{3, 0, 2},
		},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			d := plate.Analyze(tc.refs)
			if got := constrains(d); !reflect.DeepEqual(got, tc.want) {
				t.Errorf("constrains %v, want %v (%s)", got, tc.want, tc.source)
			}
			if tc.free != nil {
				if got := names(d.Free()); !reflect.DeepEqual(got, tc.free) {
					t.Errorf("free %q, want %q", got, tc.free)
				}
			}
			checkBases(t, plate, tc.refs, d)
		})
	}
}

// checkBases verifies the bases themselves, not just their sizes: every
// motion listed as free after k references leaves those references'
// surfaces unchanged, every removed motion moves at least one of them, and
// each step's removed and free motions together are independent.
func checkBases(t *testing.T, f Frame, refs []Datum, d *DRF) {
	t.Helper()
	var rows [][]float64
	for k, st := range d.Steps() {
		prev := len(rows)
		for _, s := range refs[k] {
			rows = append(rows, s.conditions(f)...)
		}
		for _, m := range st.Free {
			if r := worst(rows, f.in(m.Twist)); r > 1e-9 {
				t.Errorf("step %d: free motion %q violates a datum by %g", k+1, m.Name, r)
			}
		}
		for _, m := range st.Removed {
			if r := worst(rows[prev:], f.in(m.Twist)); r < 1e-6 {
				t.Errorf("step %d: removed motion %q leaves the reference unchanged", k+1, m.Name)
			}
		}
		var all [][]float64
		for _, m := range append(append([]Motion{}, st.Removed...), st.Free...) {
			all = append(all, f.in(m.Twist))
		}
		if got := len(orth(all, 6)); got != len(all) {
			t.Errorf("step %d: removed and free motions are not independent", k+1)
		}
	}
}

func worst(rows [][]float64, x []float64) float64 {
	var w float64
	for _, r := range rows {
		w = math.Max(w, math.Abs(dot(r, x))/math.Sqrt(dot(x, x)))
	}
	return w
}

func TestRemovedNames(t *testing.T) {
	// 3-2-1: the primary removes the translation along its normal and the
	// rotations about the other two axes (common practice).
	d := plate.Analyze([]Datum{planeZ, planeY, planeX})
	want := [][]string{
		{"translation z", "rotation x", "rotation y"},
		{"translation y", "rotation z"},
		{"translation x"},
	}
	for k, st := range d.Steps() {
		if got := names(st.Removed); !reflect.DeepEqual(got, want[k]) {
			t.Errorf("step %d removed %q, want %q", k+1, got, want[k])
		}
	}
}

func TestDegenerateInput(t *testing.T) {
	nan := math.NaN()
	tests := []struct {
		name string
		f    Frame
		refs []Datum
		want []int
	}{
		{"zero normal contributes nothing", plate, []Datum{{plane(Vec{}, Vec{})}}, []int{0}},
		{"NaN point contributes nothing", plate, []Datum{{plane(Vec{0, 0, 1}, Vec{nan, 0, 0})}}, []int{0}},
		{"infinite direction contributes nothing", plate, []Datum{{cylinder(Vec{math.Inf(1), 0, 0}, Vec{})}}, []int{0}},
		{"unknown class contributes nothing", plate, []Datum{{Surface{Class: 99, Dir: Vec{0, 0, 1}}}}, []int{0}},
		{"zero class contributes nothing", plate, []Datum{{Surface{}}}, []int{0}},
		{"empty datum removes nothing", plate, []Datum{{}, planeZ}, []int{0, 3}},
		{"valid surface beside an invalid one still counts", plate, []Datum{{plane(Vec{}, Vec{}), planeZ[0]}}, []int{3}},
		{"bad frame falls back to unit scale", Frame{Center: Vec{nan, 0, 0}, Scale: -3}, []Datum{planeZ, planeY, planeX}, []int{3, 2, 1}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := constrains(tc.f.Analyze(tc.refs)); !reflect.DeepEqual(got, tc.want) {
				t.Errorf("constrains %v, want %v", got, tc.want)
			}
		})
	}

	var none *DRF
	if got := len(none.Free()); got != 6 {
		t.Errorf("nil DRF: %d free, want 6", got)
	}
	if got := none.Zone(Zone{Surfaces: []Surface{bore}}).PerStep; !reflect.DeepEqual(got, []int{4}) {
		t.Errorf("nil DRF zone per step %v, want [4]", got)
	}
	if got := len(none.Steps()); got != 0 {
		t.Errorf("nil DRF: %d steps, want 0", got)
	}
}
