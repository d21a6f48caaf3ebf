package draw

import (
	"fmt"
	"math"
	"strings"
)

// SimShape is the shape of a datum feature simulator as drawn.
type SimShape int

const (
	SimUnknown SimShape = iota
	SimPlane
	SimWidth
	SimCylinder
	SimSphere
	SimCone
	SimExtrusion
	SimSurface
)

// Simulator is one datum reference's simulator, in precedence order.
type Simulator struct {
	Ref        string // as written: "B(M)", "A-B"
	Precedence string // "primary", "secondary", "tertiary"
	Shape      SimShape
	Kind       string // "fixed-size cylinder", "plane", "4 adjustable cylinders"
	// Internal is true where the datum feature is internal (a hole, a
	// slot, a socket): the simulator is drawn inside it.
	Internal   bool
	Adjustable bool
	Fixed      bool
	Size       string // the fixed size as a reader reads it ("⌀24.95"), or ""
	Members    int    // features the simulator stands for (a pattern: more than 1)
	Points     int    // the least points of contact (0: none needed)
	Constrains int
	Relations  []string // "perpendicular to A"
}

// Setup is the inspection set-up of one datum reference frame.
type Setup struct {
	Label      string // "A, B(M), C"
	Simulators []Simulator
}

// SetupSVG draws a set-up as one panel per reference, left to right in
// precedence order: the simulator's shape (a plane the feature rests on,
// a pin in a hole or a ring on a pin, plates in a slot or jaws on a tab,
// arrows where it adjusts to the feature, the size where it is fixed),
// its points of contact as dots, and below it the kind, the contact and
// how it stands to the panels before it, in words.
func SetupSVG(s Setup) string {
	const panelW, pictH, fs = 176.0, 84.0, 12.0
	lines := 0
	for _, sim := range s.Simulators {
		lines = max(lines, 3+len(sim.Relations))
	}
	w := float64(max(len(s.Simulators), 1))*panelW + 2*margin
	h := margin + 22 + pictH + float64(lines)*(fs+4) + 8 + margin
	var c canvas
	label := "inspection set-up for datums " + s.Label
	c.open("setup", w, h, fmt.Sprintf(` data-setup="%s" role="img" aria-label="%s"`, esc(s.Label), esc(label)))
	c.title(label)
	for i, sim := range s.Simulators {
		x0 := margin + float64(i)*panelW
		if i > 0 {
			// The panels are read in order: a rule between them.
			c.printf(`<line x1="%s" y1="%s" x2="%s" y2="%s" stroke="%s" stroke-dasharray="2 3"/>`,
				num(x0), num(margin), num(x0), num(h-margin), LightText)
		}
		c.printf(`<g font-family="%s" fill="%s">`, FontFamily, CellText)
		c.printf(`<text x="%s" y="%s" font-size="%s" font-weight="bold">%s</text>`,
			num(x0+8), num(margin+14), num(fs+1), esc(fmt.Sprintf("%d. %s %s", i+1, sim.Precedence, sim.Ref)))
		c.printf(`</g>`)
		pictogram(&c, sim, x0+panelW/2, margin+22+pictH/2)
		y := margin + 22 + pictH + fs
		c.printf(`<g font-family="%s" fill="%s">`, FontFamily, CellText)
		text := []string{sim.Kind}
		if sim.Size != "" {
			text[0] += " " + sim.Size
		}
		switch {
		case sim.Points == 0:
			// A fixed-size simulator, or one that removes nothing.
			text = append(text, "no contact needed")
		default:
			text = append(text, plural(sim.Points, "point")+" of contact")
		}
		text = append(text, fmt.Sprintf("removes %d", sim.Constrains))
		text = append(text, sim.Relations...)
		for _, t := range text {
			c.text(x0+8, y, fs, "start", fit(t, panelW-12, fs))
			y += fs + 4
		}
		c.printf(`</g>`)
	}
	c.printf(`</svg>`)
	return c.String()
}

// LightText is the colour of light rules and hatching: decoration only,
// never the only carrier of meaning.
const LightText = "#767676"

func plural(n int, word string) string {
	if n == 1 {
		return "1 " + word
	}
	return fmt.Sprintf("%d %ss", n, word)
}

// fit shortens s with an ellipsis to fit width w (the full text is in the
// page's table beside the drawing).
func fit(s string, w, fs float64) string {
	if TextWidth(s, fs) <= w {
		return s
	}
	r := []rune(s)
	for len(r) > 1 && TextWidth(string(r)+"…", fs) > w {
		r = r[:len(r)-1]
	}
	return strings.TrimRight(string(r), " ,") + "…"
}

// pictogram draws the simulator centred on (cx, cy) in a box about 150
// by 80.
func pictogram(c *canvas, s Simulator, cx, cy float64) {
	c.printf(`<g fill="none" stroke="%s" stroke-width="1.4">`, Ink)
	switch s.Shape {
	case SimPlane:
		planePict(c, s, cx, cy)
	case SimWidth:
		widthPict(c, s, cx, cy)
	case SimCylinder, SimSphere:
		roundPict(c, s, cx, cy)
	case SimCone:
		conePict(c, s, cx, cy)
	case SimExtrusion:
		// The basic profile (an L), extruded: drawn with depth lines.
		c.printf(`<path d="M%s %sh40v-14h-26v-30h-14z"/>`, num(cx-20), num(cy+22))
		c.printf(`<path d="M%s %sl12 -10M%s %sl12 -10M%s %sl12 -10" stroke-dasharray="3 2"/>`,
			num(cx+20), num(cy+22), num(cx+20), num(cy+8), num(cx-20), num(cy-22))
		pts := [][2]float64{{-20, -14}, {-20, 8}, {-6, -4}, {0, 22}, {14, 22}, {20, 15}, {-13, -22}, {-6, 15}}
		contacts(c, s, func(i, n int) (float64, float64) { return cx + pts[i][0], cy + pts[i][1] })
	case SimSurface:
		// The basic surface, and the feature beside it.
		c.printf(`<path d="M%s %sc20 -30 40 20 60 -6s30 -20 50 4"/>`, num(cx-55), num(cy+10))
		c.printf(`<path d="M%s %sc20 -30 40 20 60 -6s30 -20 50 4" stroke-width="1" stroke-dasharray="4 3" transform="translate(0 -5)"/>`, num(cx-55), num(cy+10))
		xs := []float64{0.5, 0.2, 0.8, 0.35, 0.65, 0.1, 0.9, 0.45}
		contacts(c, s, func(i, n int) (float64, float64) { return surfacePoint(cx-55, cy+10, xs[i]) })
	default:
		c.printf(`<rect x="%s" y="%s" width="40" height="30" stroke-dasharray="4 3"/>`, num(cx-20), num(cy-15))
	}
	c.printf(`</g>`)
	if s.Members > 1 {
		c.printf(`<text x="%s" y="%s" font-size="12" font-family="%s" fill="%s" text-anchor="end">%s</text>`,
			num(cx+72), num(cy-30), FontFamily, CellText, esc(fmt.Sprintf("× %d", s.Members)))
	}
}

// dot marks a point of contact.
func dot(c *canvas, x, y float64) {
	c.printf(`<circle cx="%s" cy="%s" r="3.2" fill="%s" stroke="none"/>`, num(x), num(y), Ink)
}

// hatch draws the simulator's material under a line from x1 to x2 at y
// (below when down, above otherwise).
func hatch(c *canvas, x1, x2, y float64, down bool) {
	d := 6.0
	if !down {
		d = -6
	}
	for x := x1 + 4; x < x2; x += 7 {
		c.printf(`<line x1="%s" y1="%s" x2="%s" y2="%s" stroke="%s" stroke-width="1"/>`, num(x), num(y), num(x-5), num(y+d), LightText)
	}
}

// planePict: the simulator's surface, hatched, and the part resting on
// it at its points of contact.
func planePict(c *canvas, s Simulator, cx, cy float64) {
	y := cy + 12
	c.line(cx-60, y, cx+60, y)
	hatch(c, cx-60, cx+60, y, true)
	n := min(s.Points, 5)
	xs := spread(n, cx-44, cx+44)
	// The part: a block whose underside is a little above the plane and
	// comes down to it at each contact.
	var b strings.Builder
	fmt.Fprintf(&b, "M%s %s", num(cx-52), num(y-8))
	for _, x := range xs {
		fmt.Fprintf(&b, "L%s %sL%s %sL%s %s", num(x-7), num(y-6), num(x), num(y), num(x+7), num(y-6))
	}
	fmt.Fprintf(&b, "L%s %sV%sH%sZ", num(cx+52), num(y-8), num(y-30), num(cx-52))
	c.printf(`<path d="%s" stroke-width="1"/>`, b.String())
	for _, x := range xs {
		dot(c, x, y)
	}
}

func spread(n int, a, b float64) []float64 {
	switch n {
	case 0:
		return nil
	case 1:
		return []float64{(a + b) / 2}
	}
	out := make([]float64, n)
	for i := range out {
		out[i] = a + (b-a)*float64(i)/float64(n-1)
	}
	return out
}

// widthPict: the two faces of the width, and the simulator's two planes
// between them (a slot) or outside them (a tab): against the faces with
// arrows where they adjust, clear of them with the fixed width dimensioned
// where the boundary fixes it.
func widthPict(c *canvas, s Simulator, cx, cy float64) {
	const ht = 30.0
	face, sim := 24.0, 22.5 // a slot: the plates inside its faces
	if s.Fixed {
		sim = 17
	}
	if !s.Internal {
		face, sim = 18.0, 19.5 // a tab: the jaws outside its faces
		if s.Fixed {
			sim = 25
		}
	}
	// The feature's faces, thin, with the part's material hatched on
	// their far side.
	c.printf(`<g stroke-width="1">`)
	c.line(cx-face, cy-ht, cx-face, cy+ht)
	c.line(cx+face, cy-ht, cx+face, cy+ht)
	c.printf(`</g>`)
	if s.Internal {
		vhatch(c, cx-face, cy-ht, cy+ht, -1)
		vhatch(c, cx+face, cy-ht, cy+ht, 1)
	} else {
		vhatch(c, cx-face, cy-ht, cy+ht, 1)
		vhatch(c, cx+face, cy-ht, cy+ht, -1)
	}
	// The simulator's planes, thick.
	c.printf(`<g stroke-width="3">`)
	c.line(cx-sim, cy-ht+6, cx-sim, cy+ht-6)
	c.line(cx+sim, cy-ht+6, cx+sim, cy+ht-6)
	c.printf(`</g>`)
	switch {
	case s.Adjustable && s.Internal:
		simArrow(c, cx-5, cy, cx-sim+4, cy)
		simArrow(c, cx+5, cy, cx+sim-4, cy)
	case s.Adjustable:
		simArrow(c, cx-sim-20, cy, cx-sim-4, cy)
		simArrow(c, cx+sim+20, cy, cx+sim+4, cy)
	case s.Fixed:
		c.printf(`<g stroke-width="1">`)
		simArrow(c, cx, cy+ht-2, cx-sim+2, cy+ht-2)
		simArrow(c, cx, cy+ht-2, cx+sim-2, cy+ht-2)
		c.printf(`</g>`)
	}
	contacts(c, s, func(i, n int) (float64, float64) {
		// Alternate faces, so that each face has one where there are two.
		x := cx - face
		if i%2 == 1 {
			x = cx + face
		}
		ys := spread((n+1-i%2)/2, cy-ht+12, cy+ht-12)
		k := i / 2
		if k >= len(ys) {
			k = len(ys) - 1
		}
		return x, ys[k]
	})
}

// vhatch hatches the material beside a vertical face at x, on the side
// side (-1 left, 1 right).
func vhatch(c *canvas, x, y1, y2, side float64) {
	for y := y1 + 4; y < y2; y += 7 {
		c.printf(`<line x1="%s" y1="%s" x2="%s" y2="%s" stroke="%s" stroke-width="1"/>`, num(x), num(y), num(x+side*5), num(y-5), LightText)
	}
}

// roundPict: a cylinder or a sphere seen end-on: for a hole the simulator
// is a pin inside it, for a pin a ring around it; touching it with arrows
// where it adjusts, clear of it where its size is fixed.
func roundPict(c *canvas, s Simulator, cx, cy float64) {
	feat, sim := 24.0, 22.6 // a hole: the pin inside it
	if s.Fixed {
		sim = 18
	}
	if !s.Internal {
		feat, sim = 18.0, 21.5 // a pin: the ring around it
		if s.Fixed {
			sim = 25
		}
	}
	// The feature, thin, with the part's material hatched beyond it for a
	// hole; the simulator, thick (a pin is shaded).
	c.printf(`<circle cx="%s" cy="%s" r="%s" stroke-width="1"/>`, num(cx), num(cy), num(feat))
	if s.Internal {
		// The part's material around the hole.
		for a := 0.0; a < 360; a += 30 {
			r := (a + 15) * math.Pi / 180
			c.printf(`<line x1="%s" y1="%s" x2="%s" y2="%s" stroke="%s" stroke-width="1"/>`,
				num(cx+feat*math.Cos(r)), num(cy-feat*math.Sin(r)), num(cx+(feat+5)*math.Cos(r+0.2)), num(cy-(feat+5)*math.Sin(r+0.2)), LightText)
		}
	}
	if s.Internal {
		c.printf(`<circle cx="%s" cy="%s" r="%s" stroke-width="2.6" fill="%s"/>`, num(cx), num(cy), num(sim), LightCell)
	} else {
		c.printf(`<circle cx="%s" cy="%s" r="%s" stroke-width="3.5"/>`, num(cx), num(cy), num(sim))
	}
	if s.Shape == SimSphere {
		// A sphere: its centre marked, and an equator.
		c.printf(`<ellipse cx="%s" cy="%s" rx="%s" ry="6" stroke-width="0.8" stroke-dasharray="3 2"/>`, num(cx), num(cy), num(min(feat, sim)))
		dot(c, cx, cy)
	} else {
		c.printf(`<path d="M%s %sh14M%s %sv14" stroke-width="0.8"/>`, num(cx-7), num(cy), num(cx), num(cy-7))
	}
	if s.Adjustable {
		for _, a := range []float64{45, 135, 225, 315} {
			r := a * math.Pi / 180
			dx, dy := math.Cos(r), -math.Sin(r)
			if s.Internal {
				simArrow(c, cx+dx*8, cy+dy*8, cx+dx*(sim-4), cy+dy*(sim-4))
			} else {
				simArrow(c, cx+dx*(sim+18), cy+dy*(sim+18), cx+dx*(sim+4), cy+dy*(sim+4))
			}
		}
	}
	contacts(c, s, func(i, n int) (float64, float64) {
		a := (90 + 360*float64(i)/float64(n)) * math.Pi / 180
		return cx + feat*math.Cos(a), cy - feat*math.Sin(a)
	})
}

// conePict: the cone seated in the simulator's conical seat, touching its
// two sides.
func conePict(c *canvas, s Simulator, cx, cy float64) {
	top, tip := cy-26, cy+22
	// The seat: a thick V, hatched outside.
	c.printf(`<path d="M%s %sL%s %sL%s %s" stroke-width="3"/>`, num(cx-30), num(top), num(cx), num(tip+4), num(cx+30), num(top))
	// The cone: a thin triangle resting in it, its tip clear of the seat's.
	c.printf(`<path d="M%s %sL%s %sL%s %sZ" stroke-width="1"/>`, num(cx-27), num(top-4), num(cx), num(tip-2), num(cx+27), num(top-4))
	contacts(c, s, func(i, n int) (float64, float64) {
		k := i / 2
		m := (n + 1) / 2
		t := 0.3
		if m > 1 {
			t = 0.2 + 0.5*float64(k)/float64(m-1)
		}
		x := 30 * (1 - t)
		if i%2 == 1 {
			x = -x
		}
		return cx + x, top + (tip+4-top)*t
	})
}

// surfacePoint is the point at t (0 to 1, by x) of the surface pictogram's
// curve from (x0, y0): two cubic Bézier pieces, evaluated on their x.
func surfacePoint(x0, y0, t float64) (float64, float64) {
	bez := func(p0, p1, p2, p3, u float64) float64 {
		v := 1 - u
		return v*v*v*p0 + 3*v*v*u*p1 + 3*v*u*u*p2 + u*u*u*p3
	}
	x := t * 110
	if x <= 60 {
		u := x / 60
		return x0 + bez(0, 20, 40, 60, u), y0 + bez(0, -30, 20, -6, u)
	}
	// The second piece's first control point mirrors the first's last.
	u := (x - 60) / 50
	return x0 + 60 + bez(0, 20, 30, 50, u), y0 - 6 + bez(0, -26, -20, 4, u)
}

// contacts draws a simulator's points of contact where at picks them.
func contacts(c *canvas, s Simulator, at func(i, n int) (float64, float64)) {
	n := min(s.Points, 8)
	for i := 0; i < n; i++ {
		x, y := at(i, n)
		dot(c, x, y)
	}
}

// simArrow draws a line from (x1, y1) with an open head at (x2, y2).
func simArrow(c *canvas, x1, y1, x2, y2 float64) {
	c.line(x1, y1, x2, y2)
	a := math.Atan2(y2-y1, x2-x1)
	for _, d := range []float64{2.6, -2.6} {
		c.line(x2, y2, x2-5*math.Cos(a+d/6), y2-5*math.Sin(a+d/6))
	}
}
