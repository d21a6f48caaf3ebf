package dof

import (
	"math"
	"reflect"
	"strings"
	"testing"
)

func TestName(t *testing.T) {
	// The motion names are the command-line contract's
	// (docs/notation.md, "datumlint dof").
	s10, c10 := math.Sin(10*math.Pi/180), math.Cos(10*math.Pi/180)
	tests := []struct {
		name string
		f    Frame
		t    Twist
		want string
	}{
		{"translation along x", plate, Twist{V: Vec{1, 0, 0}}, "translation x"},
		{"length does not matter", plate, Twist{V: Vec{0, 25.4, 0}}, "translation y"},
		{"opposite direction names the same line", plate, Twist{V: Vec{0, 0, -3}}, "translation z"},
		{"oblique translation is a unit vector", plate, Twist{V: Vec{3, -4, 0}}, "translation (0.6, -0.8, 0)"},
		{"oblique translation flips to a positive first component", plate, Twist{V: Vec{-3, 4, 0}}, "translation (0.6, -0.8, 0)"},
		{"tilted 10 degrees", plate, Twist{V: Vec{c10, 0, -s10}}, "translation (0.984808, 0, -0.173648)"},
		{"noise prints as zero, never -0", plate, Twist{V: Vec{1, -1e-12, 1e-12}}, "translation x"},
		{"rotation about z through the origin", plate, Twist{W: Vec{0, 0, 2}}, "rotation z"},
		{"rotation about -x names x", plate, Twist{W: Vec{-1, 0, 0}}, "rotation x"},
		{"rotation about an axis through a point", plate, Twist{W: Vec{0, 0, 1}, V: Vec{40, -60, 0}}, "rotation (0, 0, 1) through (60, 40, 0)"},
		{"rotation through a point, axis reversed", plate, Twist{W: Vec{0, 0, -1}, V: Vec{-40, 60, 0}}, "rotation (0, 0, 1) through (60, 40, 0)"},
		{"the point is the one nearest the origin", plate, Twist{W: Vec{0, 0, 1}, V: Vec{0, -5, 0}}, "rotation (0, 0, 1) through (5, 0, 0)"},
		{"pitch does not change the axis", plate, Twist{W: Vec{0, 0, 1}, V: Vec{0, -5, 7}}, "rotation (0, 0, 1) through (5, 0, 0)"},
		{"oblique axis through the origin", plate, Twist{W: Vec{1, 1, 0}}, "rotation (0.707107, 0.707107, 0) through (0, 0, 0)"},
		{"inch part: point digits follow the part's size", Frame{Scale: 4.7}, Twist{W: Vec{0, 0, 1}, V: Vec{1.5748031, -2.3622047, 0}}, "rotation (0, 0, 1) through (2.3622, 1.5748, 0)"},
		{"far from the origin", Frame{Center: Vec{1e6, 0, 0}, Scale: 120}, Twist{W: Vec{0, 0, 1}, V: Vec{0, -1000060, 0}}, "rotation (0, 0, 1) through (1000060, 0, 0)"},
		{"offset far below the part's size prints as through the origin", plate, Twist{W: Vec{1, 0, 0}, V: Vec{0, 1e-9, 0}}, "rotation x"},
		{"zero twist", plate, Twist{}, "no motion"},
		{"non-finite twist", plate, Twist{V: Vec{math.NaN(), 0, 0}}, "no motion"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := tc.f.Name(tc.t); got != tc.want {
				t.Errorf("Name(%v) = %q, want %q", tc.t, got, tc.want)
			}
		})
	}
}

func TestFormatNum(t *testing.T) {
	tests := []struct {
		x    float64
		dec  int
		want string
	}{
		{60, 3, "60"},
		{12.5, 3, "12.5"},
		{-0.0000001, 6, "0"},
		{math.Copysign(0, -1), 3, "0"},
		{0.1234567, 6, "0.123457"},
		{1000060.4, 0, "1000060"},
		{-2.50, 2, "-2.5"},
	}
	for _, tc := range tests {
		if got := formatNum(tc.x, tc.dec); got != tc.want {
			t.Errorf("formatNum(%v, %d) = %q, want %q", tc.x, tc.dec, got, tc.want)
		}
	}
}

func TestNamesFollowTheUnits(t *testing.T) {
	// The same frame in inches names the same axis at the converted point
	// (1 in = 25.4 mm exactly, by the international yard and pound
	// agreement of 1959).
	inch := placement{r: unmoved, k: 1 / 25.4}.apply(scenario{frame: plate, refs: []Datum{{bore}, planeZ}})
	got := names(inch.frame.Analyze(inch.refs).Free())
	want := []string{"rotation (0, 0, 1) through (2.3622, 1.5748, 0)"}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("free %q, want %q", got, want)
	}
}

func TestMotionTwistsAreClean(t *testing.T) {
	// A tilted plane leaves a free rotation about its normal; the twist
	// handed back must not carry -0 or 1e-17 leftovers of the SVD.
	tilt := 10 * math.Pi / 180
	d := plate.Analyze([]Datum{{plane(Vec{0, math.Cos(tilt), math.Sin(tilt)}, Vec{10, 20, 30})}})
	for _, m := range d.Free() {
		for _, x := range append(m.Twist.W[:], m.Twist.V[:]...) {
			if x != 0 && math.Abs(x) < 1e-9 || math.Signbit(x) && x == 0 {
				t.Errorf("%q has dust %v in %+v", m.Name, x, m.Twist)
			}
		}
	}
}

// Phrase words every kind of motion one way for the text table: along a
// direction, about an axis, through a point where it does not pass
// through the origin, an axis of the part by its letter.
func TestPhrase(t *testing.T) {
	for name, want := range map[string]string{
		"translation x":                                      "translation along x",
		"translation (0.6, -0.8, 0)":                         "translation along (0.6, -0.8, 0)",
		"rotation z":                                         "rotation about z",
		"rotation (0, 0, 1) through (40, 30, 0)":             "rotation about z through (40, 30, 0)",
		"rotation (1, 0, 0) through (0, 5, 2)":               "rotation about x through (0, 5, 2)",
		"rotation (0.707107, 0.707107, 0) through (0, 0, 0)": "rotation about (0.707107, 0.707107, 0) through (0, 0, 0)",
		"no motion":                                          "no motion",
	} {
		if got := Phrase(name); got != want {
			t.Errorf("Phrase(%q) = %q, want %q", name, got, want)
		}
	}
	// Every name the engine gives reads as one of the two phrasings.
	for _, tw := range []Twist{{V: Vec{3, -4, 0}}, {W: Vec{0, 0, 1}, V: Vec{40, -60, 0}}, {W: Vec{1, 1, 0}}, {W: Vec{0, 2, 0}}} {
		p := Phrase(plate.Name(tw))
		if !strings.HasPrefix(p, "translation along ") && !strings.HasPrefix(p, "rotation about ") {
			t.Errorf("%v: %q reads neither as a translation along nor a rotation about", tw, p)
		}
	}
}
