package draw

import (
	"regexp"
	"strings"
	"testing"
)

// goldenSetups are representative inspection set-ups: three planes
// (3-2-1), a bore at MMB and a keyway at MMB after a face (the pump
// flange's), an adjustable pin and tab, a sphere and a cone, a pattern,
// and an extruded shape with a surface.
var goldenSetups = map[string]Setup{
	"planes": {Label: "A, B, C", Simulators: []Simulator{
		{Ref: "A", Precedence: "primary", Shape: SimPlane, Kind: "plane", Points: 3, Constrains: 3},
		{Ref: "B", Precedence: "secondary", Shape: SimPlane, Kind: "plane", Points: 2, Constrains: 2, Relations: []string{"perpendicular to A"}},
		{Ref: "C", Precedence: "tertiary", Shape: SimPlane, Kind: "plane", Points: 1, Constrains: 1, Relations: []string{"perpendicular to A", "perpendicular to B"}},
	}},
	"flange-mmb": {Label: "A, B(M), C(M)", Simulators: []Simulator{
		{Ref: "A", Precedence: "primary", Shape: SimPlane, Kind: "plane", Points: 3, Constrains: 3},
		{Ref: "B(M)", Precedence: "secondary", Shape: SimCylinder, Kind: "fixed-size cylinder", Internal: true, Fixed: true,
			Size: "⌀24.95", Constrains: 2, Relations: []string{"perpendicular to A"}},
		{Ref: "C(M)", Precedence: "tertiary", Shape: SimWidth, Kind: "fixed-size width", Internal: true, Fixed: true,
			Size: "5.9", Constrains: 1, Relations: []string{"perpendicular to A", "parallel to B and through it"}},
	}},
	"pin-tab": {Label: "E, D", Simulators: []Simulator{
		{Ref: "E", Precedence: "primary", Shape: SimCylinder, Kind: "adjustable cylinder", Adjustable: true, Points: 5, Constrains: 4},
		{Ref: "D", Precedence: "secondary", Shape: SimWidth, Kind: "adjustable width", Adjustable: true, Points: 2, Constrains: 1,
			Relations: []string{"parallel to E, 12 from it"}},
	}},
	"sphere-cone": {Label: "F, H", Simulators: []Simulator{
		{Ref: "F", Precedence: "primary", Shape: SimSphere, Kind: "adjustable sphere", Internal: true, Adjustable: true, Points: 4, Constrains: 3},
		{Ref: "H", Precedence: "secondary", Shape: SimCone, Kind: "cone", Points: 3, Constrains: 3, Relations: []string{"56.568542 from F"}},
	}},
	"pattern": {Label: "A, L", Simulators: []Simulator{
		{Ref: "A", Precedence: "primary", Shape: SimPlane, Kind: "plane", Points: 3, Constrains: 3},
		{Ref: "L", Precedence: "secondary", Shape: SimCylinder, Kind: "4 adjustable cylinders", Internal: true, Adjustable: true,
			Members: 4, Points: 4, Constrains: 3, Relations: []string{"perpendicular to A"}},
	}},
	"extrusion-surface": {Label: "J, K", Simulators: []Simulator{
		{Ref: "J", Precedence: "primary", Shape: SimExtrusion, Kind: "extruded shape", Points: 5, Constrains: 5},
		{Ref: "K", Precedence: "secondary", Shape: SimSurface, Kind: "surface", Points: 1, Constrains: 1, Relations: []string{"placed at basic to J"}},
	}},
}

func TestSetupGolden(t *testing.T) {
	for name, s := range goldenSetups {
		t.Run(name, func(t *testing.T) {
			golden(t, "setup-"+name, SetupSVG(s))
		})
	}
}

var contactDot = regexp.MustCompile(`<circle [^>]*r="3.2" fill="#000"`)

// Each panel draws as many dots as the simulator needs points of contact
// (a sphere's centre mark is a dot too), and says its kind, size, contact
// and relations in words, so that nothing is told by the picture alone.
func TestSetupPanels(t *testing.T) {
	for name, s := range goldenSetups {
		svg := SetupSVG(s)
		want := 0
		for _, sim := range s.Simulators {
			want += min(sim.Points, 8)
			if sim.Shape == SimSphere {
				want++
			}
		}
		if got := len(contactDot.FindAllString(svg, -1)); got != want {
			t.Errorf("%s: %d dots, want %d", name, got, want)
		}
		for i, sim := range s.Simulators {
			words := []string{sim.Ref, sim.Precedence, sim.Kind}
			words = append(words, sim.Relations...)
			if sim.Size != "" {
				words = append(words, sim.Size)
			}
			for _, w := range words {
				if !strings.Contains(svg, esc(w)) {
					t.Errorf("%s, panel %d: %q is not written", name, i+1, w)
				}
			}
		}
		if !strings.Contains(svg, `data-setup="`+esc(s.Label)+`"`) || !strings.Contains(svg, "<title>inspection set-up for datums "+esc(s.Label)) {
			t.Errorf("%s: no data-setup or title", name)
		}
	}
	// Fixed-size simulators need no contact, and say so.
	svg := SetupSVG(goldenSetups["flange-mmb"])
	if strings.Count(svg, "no contact needed") != 2 {
		t.Errorf("the fixed-size simulators do not say they need no contact:\n%s", svg)
	}
	if !strings.Contains(svg, "3 points of contact") {
		t.Error("the primary plane does not say 3 points")
	}
}

// A panel's long line is cut with an ellipsis, never run into the next.
func TestSetupFitsLongText(t *testing.T) {
	long := "parallel to A-B-C, 123456.789012 from it, and a great deal more"
	got := fit(long, 160, 12)
	if !strings.HasSuffix(got, "…") || TextWidth(got, 12) > 160 {
		t.Errorf("fit gave %q (%g wide)", got, TextWidth(got, 12))
	}
	if fit("short", 160, 12) != "short" {
		t.Error("a short line was cut")
	}
}
