package dof

import (
	"encoding/binary"
	"math"
	"math/rand/v2"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/rules/longtest"
)

// The engine is held to the reference engine of reference_test.go on
// random frames here, and on the repository's test data in
// differential_test.go: the same counts, the same names, and twists equal
// to rounding.

// randomScenario draws a frame and a zone from a small vocabulary chosen
// so that the cases the fast paths and the sharing depend on occur often:
// directions along the part's axes (either sign), slightly and strongly
// tilted ones; points on a coarse grid (so that planes coincide, axes are
// coaxial and patterns line up) or anywhere; patterns of parallel members;
// frames that fix everything, nothing or something in between; invalid
// surfaces; runout's extra slide and orientation zones.
func randomScenario(rng *rand.Rand) scenario {
	dir := func() Vec {
		switch rng.IntN(6) {
		case 0, 1, 2:
			var d Vec
			d[rng.IntN(3)] = float64(1 - 2*rng.IntN(2))
			return d
		case 3:
			var d Vec
			d[rng.IntN(3)] = 1
			d[rng.IntN(3)] += 1e-3 * rng.NormFloat64()
			return d
		case 4:
			return Vec{}
		}
		return Vec{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
	}
	point := func() Vec {
		if rng.IntN(40) == 0 { // beyond turningRows' farPoint
			return Vec{2e5 * rng.Float64(), 1e5, 0}
		}
		if rng.IntN(4) == 0 {
			return Vec{200 * rng.Float64(), 200 * rng.Float64(), 50 * rng.Float64()}
		}
		return Vec{float64(20 * rng.IntN(6)), float64(20 * rng.IntN(5)), float64(10 * rng.IntN(3))}
	}
	surface := func() Surface {
		c := Class(rng.IntN(8)) // 0 and 7 are not classes
		if rng.IntN(3) > 0 {
			c = Class(1 + rng.IntN(2)) // planes and cylinders, as on most parts
		}
		d := dir()
		if d == (Vec{}) && rng.IntN(4) > 0 {
			d = Vec{0, 0, 1}
		}
		return Surface{Class: c, Dir: d, Point: point()}
	}
	members := func(max int) []Surface {
		s := surface()
		out := []Surface{s}
		n := rng.IntN(max)
		for range n {
			m := s
			if rng.IntN(3) > 0 {
				m.Point = point() // a pattern: same class and direction
			} else {
				m = surface()
			}
			out = append(out, m)
		}
		return out
	}
	sc := scenario{frame: Frame{Center: Vec{100 * rng.Float64(), 100 * rng.Float64(), 20 * rng.Float64()}, Scale: 50 + 300*rng.Float64()}}
	nref := rng.IntN(5)
	for range nref {
		switch rng.IntN(8) {
		case 0:
			sc.refs = append(sc.refs, nil) // a reference that did not resolve
		case 1, 2:
			sc.refs = append(sc.refs, members(4))
		default:
			sc.refs = append(sc.refs, Datum{surface()})
		}
	}
	sc.zone.Surfaces = members(14)
	switch rng.IntN(5) {
	case 0:
		sc.zone.OrientationOnly = true
	case 1:
		sc.zone.Extra = []Twist{{V: dir()}}
		if rng.IntN(3) == 0 {
			sc.zone.Extra = append(sc.zone.Extra, Twist{W: dir(), V: point()}, Twist{V: Vec{math.NaN(), 0, 0}})
		}
	}
	return sc
}

// sameAsReference compares the engine with the reference engine on one
// scenario, through both ways a caller reaches a zone: DRF.Zone, and a
// PreparedZone shared between frames.
func sameAsReference(t *testing.T, sc scenario) {
	t.Helper()
	ref := refAnalyze(sc.frame, sc.refs)
	want := refZone(ref, sc.zone)
	d := sc.frame.Analyze(sc.refs)
	steps := d.Steps()
	if len(steps) != len(ref.Steps) {
		t.Fatalf("%+v: %d steps, reference %d", sc, len(steps), len(ref.Steps))
	}
	for k := range steps {
		if steps[k].Constrains != ref.Steps[k].Constrains ||
			!SameMotions(sc.frame, steps[k].Removed, ref.Steps[k].Removed) || !SameMotions(sc.frame, steps[k].Free, ref.Steps[k].Free) {
			t.Fatalf("%+v: step %d is %+v, reference %+v", sc, k+1, steps[k], ref.Steps[k])
		}
	}
	if !SameMotions(sc.frame, d.Free(), ref.Free) {
		t.Fatalf("%+v: free %v, reference %v", sc, d.Free(), ref.Free)
	}
	// The same references analysed one at a time by Extend give the same
	// analysis, bit for bit.
	x := sc.frame.Analyze(nil)
	for _, r := range sc.refs {
		x = x.Extend(r)
	}
	if !reflect.DeepEqual(x.Steps(), steps) || !reflect.DeepEqual(x.Free(), d.Free()) {
		t.Fatalf("%+v: extended step by step, %+v and %v; analysed at once, %+v and %v", sc, x.Steps(), x.Free(), steps, d.Free())
	}
	got := map[string]ZoneResult{
		"Zone":     d.Zone(sc.zone),
		"prepared": d.ZoneIn(sc.frame.PrepareZone(sc.zone)),
		"extended": x.ZoneIn(sc.frame.PrepareZone(sc.zone)),
	}
	for how, z := range got {
		if !sameZoneResult(sc.frame, z, want) {
			t.Fatalf("%+v: %s gives %+v, reference %+v", sc, how, z, want)
		}
	}
}

func sameZoneResult(f Frame, a, b ZoneResult) bool {
	if len(a.PerStep) != len(b.PerStep) || a.TranslationMoves != b.TranslationMoves || !SameMotions(f, a.Free, b.Free) {
		return false
	}
	for i := range a.PerStep {
		if a.PerStep[i] != b.PerStep[i] {
			return false
		}
	}
	return true
}

// SameMotions requires the same names, in the same order, and twists that
// agree to rounding: within 1e-9 in normalised coordinates of frame f, where
// a twist's components are of the order of 1. (The zone's invariance is no
// longer orthonormalised twice, which changes the last bits of a zone's
// twists, never their span, their count or the names printed from them.)
// It is exported to the external test package.
func SameMotions(f Frame, a, b []Motion) bool {
	if len(a) != len(b) {
		return false
	}
	f = f.sanitized()
	for i := range a {
		if a[i].Name != b[i].Name {
			return false
		}
		x, y := f.in(a[i].Twist), f.in(b[i].Twist)
		for j := range x {
			if math.Abs(x[j]-y[j]) > 1e-9*max(1, math.Abs(y[j])) {
				return false
			}
		}
	}
	return true
}

func TestFastMatchesReferenceOnRandomFrames(t *testing.T) {
	rng := rand.New(rand.NewPCG(2011, 5459))
	n := longtest.N(2000, 20000)
	closed, cylinders := 0, 0
	for range n {
		sc := randomScenario(rng)
		sameAsReference(t, sc)
		if t.Failed() {
			return
		}
		if z := sc.zone; z.OrientationOnly && len(z.Surfaces) == 1 && len(z.Extra) == 0 {
			if _, ok := turningRows(sc.frame.sanitized(), z.Surfaces[0]); ok {
				closed++
			}
		}
		if z := sc.zone; !z.OrientationOnly && len(z.Surfaces) == 1 && len(z.Extra) == 0 {
			if _, ok := cylinderRows(sc.frame.sanitized(), z.Surfaces[0]); ok {
				cylinders++
			}
		}
	}
	t.Logf("%d of %d random zones took turningRows' closed form, %d cylinderRows'", closed, n, cylinders)
	if closed < n/200 {
		t.Errorf("only %d of %d random zones took turningRows' closed form; the test no longer exercises it", closed, n)
	}
	if cylinders < n/200 {
		t.Errorf("only %d of %d random zones took cylinderRows' closed form; the test no longer exercises it", cylinders, n)
	}
}

// FuzzFastMatchesReference draws the scenario from the fuzzer's seed.
func FuzzFastMatchesReference(f *testing.F) {
	for _, s := range []uint64{0, 1, 1994, 5459} {
		f.Add(binary.LittleEndian.AppendUint64(nil, s), uint64(7))
	}
	f.Fuzz(func(t *testing.T, seed []byte, s2 uint64) {
		var s1 uint64
		for i, b := range seed {
			s1 ^= uint64(b) << (8 * (i % 8))
		}
		sameAsReference(t, randomScenario(rand.New(rand.NewPCG(s1, s2))))
	})
}

// TestFormatNumMatchesPlainFormatting holds the buffer-building number
// formatting to the plain strconv-and-trim one it replaced.
func TestFormatNumMatchesPlainFormatting(t *testing.T) {
	plain := func(x float64, dec int) string {
		s := strconv.FormatFloat(x, 'f', dec, 64)
		if strings.Contains(s, ".") {
			s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
		}
		if s == "-0" {
			s = "0"
		}
		return s
	}
	rng := rand.New(rand.NewPCG(6, 15))
	xs := []float64{0, math.Copysign(0, -1), -1e-7, 1e-7, 0.5, -0.5, 10, 100, 1000060.4, -2.5, 123456789012, math.Inf(1), math.NaN(), 1e300}
	for range 20000 {
		xs = append(xs, rng.NormFloat64()*math.Pow(10, float64(rng.IntN(16)-8)))
	}
	for _, x := range xs {
		for dec := 0; dec <= 15; dec++ {
			if got, want := formatNum(x, dec), plain(x, dec); got != want {
				t.Fatalf("formatNum(%v, %d) = %q, want %q", x, dec, got, want)
			}
		}
	}
}

// TestNameShortcutsMatchFormatting holds Name's answers for motions along
// and about an axis to the names formatting gives, over lengths from far
// below to far above the part's size, both signs, -0 components, and
// frames of any size and place.
func TestNameShortcutsMatchFormatting(t *testing.T) {
	rng := rand.New(rand.NewPCG(1101, 8015))
	n := 0
	for range 100000 {
		f := Frame{Center: Vec{1000 * rng.NormFloat64(), 0, 0}, Scale: math.Pow(10, 6*rng.Float64()-3)}.sanitized()
		var w, v Vec
		x := math.Copysign(math.Pow(10, 240*rng.Float64()-120), rng.NormFloat64())
		switch rng.IntN(4) {
		case 0:
			v[rng.IntN(3)] = x
		case 1:
			w[rng.IntN(3)] = x
		case 2:
			w[rng.IntN(3)] = x
			v[rng.IntN(3)] = math.Copysign(0, -1)
		default: // near misses that must take the formatting path
			v[rng.IntN(3)] = x
			v[rng.IntN(3)] += 1e-7 * x
			w[rng.IntN(3)] = 1e-12 * rng.Float64()
		}
		tw := Twist{W: w, V: v}
		got := f.Name(tw)
		want := f.formattedName(tw, norm(tw.W), norm(tw.V))
		if got != want {
			t.Fatalf("Name(%v) in %+v = %q, formatting gives %q", tw, f, got, want)
		}
		if soleAxis(w) >= 0 || soleAxis(v) >= 0 {
			n++
		}
	}
	if n < 50000 {
		t.Fatalf("only %d of the twists were along or about an axis", n)
	}
}

// TestNamesIgnoreRoundingNoise: a rotation axis or a direction that is
// nominally a short decimal names the same whichever side of it rounding
// left the computed value, including a coordinate at a power of ten that
// sets the number of decimals (FuzzFastMatchesReference found
// 99999.99999999013 printing (62564.5, 100000, 0) where 100000.00000000001
// printed (62564, 100000, 0)).
func TestNamesIgnoreRoundingNoise(t *testing.T) {
	rng := rand.New(rand.NewPCG(5458, 1101))
	nudge := func(x float64) float64 {
		for range rng.IntN(40) {
			if rng.IntN(2) == 0 {
				x = math.Nextafter(x, math.Inf(1))
			} else {
				x = math.Nextafter(x, math.Inf(-1))
			}
		}
		return x
	}
	nominal := func() float64 {
		switch rng.IntN(4) {
		case 0:
			return math.Pow(10, float64(rng.IntN(9)-2)) // 0.01 … 1e6
		case 1:
			return float64(rng.IntN(2000000)-1000000) / 10000 // four decimals, ties for three
		default:
			return float64(rng.IntN(200000)-100000) / 10
		}
	}
	for range 50000 {
		f := Frame{Scale: math.Pow(10, 4*rng.Float64()-1)}
		p := Vec{nominal(), nominal(), nominal()}
		w := Vec{0, 0, 1}
		tw := Twist{W: w, V: cross(p, w)} // rotation about z through p
		noisy := Twist{W: w, V: Vec{nudge(tw.V[0]), nudge(tw.V[1]), nudge(tw.V[2])}}
		if a, b := f.Name(tw), f.Name(noisy); a != b {
			t.Fatalf("the axis through %v names as %q, and %q a few units in the last place away", p, a, b)
		}
		d := unit(Vec{nominal(), nominal(), 1})
		if a, b := f.Name(Twist{V: d}), f.Name(Twist{V: Vec{nudge(d[0]), nudge(d[1]), nudge(d[2])}}); a != b {
			t.Fatalf("the direction %v names as %q, and %q a few units in the last place away", d, a, b)
		}
	}
}

// TestCylinderRowsSpanTheConditions holds cylinderRows to the SVD it
// replaces on random cylinders out to farPoint: four orthonormal rows, each
// within rounding of the span of the SVD's rows, so both span one space.
func TestCylinderRowsSpanTheConditions(t *testing.T) {
	rng := rand.New(rand.NewPCG(5459, 4))
	f := Frame{Center: Vec{10, -20, 5}, Scale: 80}
	for i := range 2000 {
		d := Vec{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
		if i%4 == 0 {
			d = Vec{0, 0, 1}
		}
		r := farPoint * f.Scale * rng.Float64() / 2 // a normalised |p| within farPoint
		p := add(f.Center, scale(unit(Vec{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}), r))
		s := Surface{Class: Cylinder, Dir: d, Point: p}
		rows, ok := cylinderRows(f, s)
		if !ok {
			t.Fatalf("%+v: no closed form", s)
		}
		_, svd := nullAndRowSpaceFlat(s.appendConditions(nil, f), 6)
		if len(rows) != 4 || len(svd) != 4 {
			t.Fatalf("%+v: %d rows, the SVD %d", s, len(rows), len(svd))
		}
		for a, x := range rows {
			for b, y := range rows {
				want := 0.0
				if a == b {
					want = 1
				}
				if math.Abs(dot(x, y)-want) > 1e-12 {
					t.Fatalf("%+v: rows %d and %d have product %g", s, a, b, dot(x, y))
				}
			}
			in := 0.0
			for _, y := range svd {
				in += dot(x, y) * dot(x, y)
			}
			if math.Abs(in-1) > 1e-12 {
				t.Fatalf("%+v: row %d lies %g outside the SVD's span", s, a, 1-in)
			}
		}
	}
}

// TestGramCountMatchesTheSVD holds gramCount to the SVD it stands in for
// (the dimension restrict removes) on random orthonormal spaces and rows,
// a third of them built to have a singular value near rankTol: at it, it
// must leave the decision to the SVD, and away from it agree.
func TestGramCountMatchesTheSVD(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 5))
	randomSpace := func(k, n int) space {
		var vs [][]float64
		for range k {
			v := make([]float64, n)
			for i := range v {
				v[i] = rng.NormFloat64()
			}
			vs = append(vs, v)
		}
		return orth(vs, n)
	}
	answered, near := 0, 0
	for range 20000 {
		n := 6
		if rng.IntN(3) == 0 {
			n = 3
		}
		f := randomSpace(2+rng.IntN(n-2), n)
		rows := randomSpace(1+rng.IntN(n-1), n)
		if rng.IntN(3) == 0 {
			// rows orthogonal to f but for one, which leans into f by a
			// singular value near rankTol
			var w [][]float64
			for _, r := range rows {
				c := append([]float64(nil), r...)
				for _, v := range f {
					d := dot(c, v)
					for i := range c {
						c[i] -= d * v[i]
					}
				}
				w = append(w, c)
			}
			rows = orth(w, n)
			if len(rows) == 0 {
				continue
			}
			sigma := rankTol * (1 + (rng.Float64()-0.5)*1e-2)
			r := rows[0]
			for i := range r {
				r[i] = math.Sqrt(1-sigma*sigma)*r[i] + sigma*f[0][i]
			}
		}
		want := len(f) - len(restrict(f, rows))
		got, ok := gramCount(f, rows)
		if !ok {
			near++
			continue
		}
		answered++
		if got != want {
			t.Fatalf("gramCount %d, the SVD %d (f %v, rows %v)", got, want, f, rows)
		}
	}
	t.Logf("%d answered, %d left to the SVD", answered, near)
	if answered < 10000 || near == 0 {
		t.Errorf("%d answered, %d left to the SVD: the test no longer exercises both", answered, near)
	}
}
