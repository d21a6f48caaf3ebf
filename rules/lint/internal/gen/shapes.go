package gen

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
)

// Shape names a kind of generated part. Every shape is clean by
// construction (TestShapesAreClean holds it): each located feature is
// placed by basic dimensions, written or implied, from the datums its
// frames reference, and every datum feature is qualified.
type Shape string

const (
	// ShapePlate is the plate Plate writes: datum planes A, B, C, a bore
	// that is datum D and rectangular hole and pin patterns under
	// composite position, half of them to A, D(M), B. At a given size it
	// is a grid of such patterns.
	ShapePlate Shape = "plate"
	// ShapeComposite is a plate of single holes, some refined by
	// perpendicularity at MMC, and four-hole patterns under composite
	// position (upper segment A, B, C; lower segment A), every feature
	// located by basic dimensions to A, B, C.
	ShapeComposite Shape = "composite"
	// ShapeMix is a plate of every kind of located feature: holes (some
	// refined), pins, slots and tabs, inclined drilled holes under
	// position and angularity, rectangular patterns under composite
	// position to A, B, C or to A, D(M), B, and bolt circles about
	// located hubs.
	ShapeMix Shape = "mix"
	// ShapeTurned is the mix drawn turned in its coordinates: the whole
	// part rotated about z, and every other part also about x, so that no
	// datum is along an axis of the model.
	ShapeTurned Shape = "turned"
	// ShapeInch is the mix in inches, with inch sizes and tolerances.
	ShapeInch Shape = "inch"
	// ShapeFlange is a turned part: a flange face A, a pilot B, a keyway
	// or a flat C, and bolt circles about B, some clocked by a member on
	// C's centre line (an implied zero), the others by a basic angle, some
	// under composite position with a lower segment to A, B.
	ShapeFlange Shape = "flange"
)

// Shapes lists every shape, in the order benchmarks and docs show them.
var Shapes = []Shape{ShapePlate, ShapeComposite, ShapeMix, ShapeTurned, ShapeInch, ShapeFlange}

// ParseShape returns the shape named s.
func ParseShape(s string) (Shape, error) {
	for _, sh := range Shapes {
		if string(sh) == s {
			return sh, nil
		}
	}
	names := make([]string, len(Shapes))
	for i, sh := range Shapes {
		names[i] = string(sh)
	}
	return "", fmt.Errorf("unknown shape %q: choose one of %s", s, strings.Join(names, ", "))
}

// Part returns part number i (any i >= 0) of a shape with the given number
// of located features (each hole, pin or width under position or located
// profile, each member of a pattern counted), or, for features <= 0, the
// shape's own size for a repository: 12 to 28 located features, about 50
// to 150 lines. The same arguments always give the same part.
func Part(s Shape, i, features int) []byte {
	if s == ShapePlate && features <= 0 {
		return Plate(i)
	}
	rng := rand.New(rand.NewPCG(uint64(i)+1, 0x51ed2701b3a6f1c5^uint64(len(s))))
	if features <= 0 {
		features = 12 + rng.IntN(17)
	}
	switch s {
	case ShapeFlange:
		return flange(rng, i, features)
	case ShapeInch:
		return grid(rng, i, features, s, inchUnits)
	}
	return grid(rng, i, features, s, mmUnits)
}

// system is what a part's units change: the cell every item is drawn in,
// the sizes and the tolerances, all in the part's units.
type system struct {
	name   string
	cell   float64 // side of the square cell each item is drawn in
	margin float64
	thick  float64
	// offsets within a cell, as fractions of it, are the same in every
	// system; sizes and tolerances are not.
	holes      []float64 // clearance holes for single features
	small      float64   // pattern holes
	sizeTol    float64
	pin        float64
	pinTol     float64
	slot       float64
	slotTol    float64
	hub, ring  float64 // a bolt circle's hub and its holes
	pos, comp  float64 // position of a pattern, upper and lower segment
	single     float64 // position of a single feature
	refine     float64 // perpendicularity refining a single hole's position
	datumForm  float64
	datumOrien float64
}

var mmUnits = system{
	name: "mm", cell: 40, margin: 10, thick: 12,
	holes: []float64{5.5, 6.6, 9, 11}, small: 4.5, sizeTol: 0.1,
	pin: 6, pinTol: 0.01, slot: 10, slotTol: 0.05, hub: 12, ring: 3.4,
	pos: 0.4, comp: 0.1, single: 0.2, refine: 0.05, datumForm: 0.02, datumOrien: 0.05,
}

var inchUnits = system{
	name: "in", cell: 1.5, margin: 0.5, thick: 0.5,
	holes: []float64{0.201, 0.257, 0.344, 0.406}, small: 0.177, sizeTol: 0.005,
	pin: 0.25, pinTol: 0.0005, slot: 0.375, slotTol: 0.002, hub: 0.5, ring: 0.136,
	pos: 0.014, comp: 0.004, single: 0.008, refine: 0.002, datumForm: 0.001, datumOrien: 0.002,
}

// grid writes a rectangular plate whose located features each sit in one
// square cell of a grid, filled row by row.
func grid(rng *rand.Rand, i, features int, s Shape, u system) []byte {
	d := &drawing{units: u.name, standard: []string{"asme-2018", "asme-2018", "asme-2009", "iso"}[rng.IntN(4)]}
	code := fmt.Sprintf("%s-%d", prefixes[rng.IntN(len(prefixes))], 100+i)
	noun := nouns[rng.IntN(len(nouns))]
	d.title = fmt.Sprintf("%s plate %s", noun, code)
	d.comments = []string{
		fmt.Sprintf("%s plate %s (%s, %d located features).", noun, code, s, features),
		"Synthetic part written by datumlint's benchmark generator (rules/lint/internal/gen).",
		"Datum frame: A the bottom face, B the rear edge, C the left edge; D a located bore.",
	}
	if s == ShapeTurned {
		b := 0.0
		if i%2 == 1 {
			b = float64(10 + rng.IntN(50))
		}
		d.turn = rotation(float64(5+rng.IntN(80)), b)
		d.comments = append(d.comments, "Drawn turned in its coordinates: no datum lies along an axis of the model.")
	}
	cols := int(math.Ceil(math.Sqrt(float64(features)/2))) + 1
	g := &plate{d: d, u: u, rng: rng, shape: s, cols: cols}
	g.datums()
	for d.located < features {
		g.item(features - d.located)
	}
	g.outline()
	return d.bytes()
}

// plate is a grid part being drawn.
type plate struct {
	d     *drawing
	u     system
	rng   *rand.Rand
	shape Shape
	cols  int
	cells int // cells used
	n     map[string]int
	// bore is datum D's design point; usedD says whether a frame
	// references D (its symbol is written only then).
	bx, by float64
	usedD  bool
}

// cell returns the next free cell's lower left corner, moved by up to an
// eighth of a cell in whole steps (millimetres, or twentieths of an inch),
// so that features of different cells seldom line up: an implied zero
// between them would relate them, and real parts do not line up so often.
func (g *plate) cell() (x, y float64) {
	c := g.cells
	g.cells++
	step := g.u.cell / 40
	jx, jy := float64(g.rng.IntN(11)-5)*step, float64(g.rng.IntN(11)-5)*step
	return round6(g.u.margin + float64(c%g.cols)*g.u.cell + jx), round6(g.u.margin + float64(c/g.cols)*g.u.cell + jy)
}

// name returns a fresh name with the prefix.
func (g *plate) name(prefix string) string {
	if g.n == nil {
		g.n = map[string]int{}
	}
	g.n[prefix]++
	return fmt.Sprintf("%s%d", prefix, g.n[prefix])
}

// at is a cell's point at fractions fx, fy of its side.
func (g *plate) at(x0, y0, fx, fy float64) (float64, float64) {
	return round6(x0 + fx*g.u.cell), round6(y0 + fy*g.u.cell)
}

func round6(v float64) float64 { return math.Round(v*1e6) / 1e6 }

func (g *plate) datums() {
	d, u := g.d, g.u
	d.feature("base  plane normal %s at %s", d.dir(0, 0, -1), d.pt(0, 0, 0))
	d.feature("rear  plane normal %s at %s", d.dir(0, -1, 0), d.pt(0, 0, 0))
	d.feature("left  plane normal %s at %s", d.dir(-1, 0, 0), d.pt(0, 0, 0))
	d.datum("A on base")
	d.datum("B on rear")
	d.datum("C on left")
	d.frame("base: flatness %s", coord(u.datumForm))
	d.frame("rear: perpendicularity %s datums A", coord(u.datumOrien))
	d.frame("left: perpendicularity %s datums A, B", coord(u.datumOrien))
	if g.shape == ShapeComposite {
		return
	}
	x0, y0 := g.cell()
	g.bx, g.by = g.at(x0, y0, 0.5, 0.5)
	d.feature("bore  hole size %s +%s -0 axis %s at %s", coord(2*u.hub), coord(u.slotTol), d.dir(0, 0, 1), d.pt(g.bx, g.by, 0))
	d.frame("bore: position dia %s (M) datums A, B, C", coord(u.refine))
	d.frame("bore: perpendicularity dia %s (M) datums A", coord(u.refine/2))
	d.dim("basic %s from left to bore", coord(g.bx))
	d.dim("basic %s from rear to bore", coord(g.by))
	d.located++
}

// outline closes the plate: its other faces, qualified, and its size as
// toleranced dimensions between faces that no frame locates.
func (g *plate) outline() {
	d, u := g.d, g.u
	if g.usedD {
		d.datum("D on bore")
	}
	rows := (g.cells + g.cols - 1) / g.cols
	w := round6(2*u.margin + float64(g.cols)*u.cell)
	h := round6(2*u.margin + float64(rows)*u.cell)
	d.feature("top   plane normal %s at %s", d.dir(0, 0, 1), d.pt(0, 0, u.thick))
	d.feature("front plane normal %s at %s", d.dir(0, 1, 0), d.pt(0, h, 0))
	d.feature("right plane normal %s at %s", d.dir(1, 0, 0), d.pt(w, 0, 0))
	d.frame("top: parallelism %s datums A", coord(2*u.datumOrien))
	d.frame("front: perpendicularity %s datums A, B", coord(2*u.datumOrien))
	d.frame("right: perpendicularity %s datums A, B", coord(2*u.datumOrien))
	d.dim("dim %s +-%s from base to top", coord(u.thick), coord(2*u.sizeTol))
	d.dim("dim %s +-%s from rear to front", coord(h), coord(2*u.sizeTol))
	d.dim("dim %s +-%s from left to right", coord(w), coord(2*u.sizeTol))
}

// item draws one located item of at most budget located features in the
// next cell.
func (g *plate) item(budget int) {
	switch g.shape {
	case ShapePlate:
		if budget >= 4 {
			g.pattern(budget)
			return
		}
		g.hole(false)
	case ShapeComposite:
		if budget >= 4 && g.rng.IntN(2) == 0 {
			g.pattern4()
			return
		}
		g.hole(g.rng.IntN(3) == 0)
	default:
		switch k := g.rng.IntN(9); {
		case k < 2:
			g.hole(g.rng.IntN(2) == 0)
		case k == 2:
			g.pin()
		case k == 3:
			g.width()
		case k == 4:
			g.inclined()
		case k < 7 && budget >= 4:
			g.pattern(budget)
		case k < 9 && budget >= 5:
			g.circle(budget)
		default:
			g.hole(false)
		}
	}
}

// fromDatums locates a design point from C and B.
func (g *plate) fromDatums(name string, x, y float64) {
	g.d.dim("basic %s from left to %s", coord(x), name)
	g.d.dim("basic %s from rear to %s", coord(y), name)
}

func (g *plate) hole(refined bool) {
	d, u := g.d, g.u
	x0, y0 := g.cell()
	x, y := g.at(x0, y0, 0.5, 0.5)
	n := g.name("h")
	size := u.holes[g.rng.IntN(len(u.holes))]
	d.feature("%s hole size %s +-%s axis %s at %s", n, coord(size), coord(u.sizeTol), d.dir(0, 0, 1), d.pt(x, y, 0))
	d.frame("%s: position dia %s (M) datums A, B, C", n, coord(u.single))
	if refined {
		d.frame("%s: perpendicularity dia %s (M) datums A", n, coord(u.refine))
	}
	g.fromDatums(n, x, y)
	d.located++
}

func (g *plate) pin() {
	d, u := g.d, g.u
	x0, y0 := g.cell()
	x, y := g.at(x0, y0, 0.5, 0.5)
	n := g.name("pin")
	d.feature("%s pin size %s -0 -%s axis %s at %s", n, coord(u.pin), coord(u.pinTol), d.dir(0, 0, 1), d.pt(x, y, 0))
	d.frame("%s: position dia %s datums A, B, C", n, coord(u.refine))
	g.fromDatums(n, x, y)
	d.located++
}

// width is a slot or a tab across x, located from C by its mid-plane.
func (g *plate) width() {
	d, u := g.d, g.u
	x0, y0 := g.cell()
	x, y := g.at(x0, y0, 0.5, 0.5)
	kind, n := "slot", g.name("slot")
	if g.rng.IntN(2) == 0 {
		kind, n = "tab", g.name("tab")
	}
	d.feature("%s %s size %s +-%s normal %s at %s", n, kind, coord(u.slot), coord(u.slotTol), d.dir(1, 0, 0), d.pt(x, y, u.thick))
	d.frame("%s: position %s (M) datums A, B, C", n, coord(u.single))
	d.dim("basic %s from left to %s", coord(x), n)
	d.located++
}

// inclined is a hole drilled at an angle to A, in a plane across x.
func (g *plate) inclined() {
	d, u := g.d, g.u
	x0, y0 := g.cell()
	x, y := g.at(x0, y0, 0.5, 0.5)
	n := g.name("drill")
	a := []float64{15, 20, 30, 45}[g.rng.IntN(4)]
	s, c := math.Sin(a*math.Pi/180), math.Cos(a*math.Pi/180)
	d.feature("%s hole size %s +-%s axis %s at %s", n, coord(u.holes[0]), coord(u.sizeTol), d.dir(0, s, c), d.pt(x, y, 0))
	d.frame("%s: position dia %s datums A, B, C", n, coord(u.single))
	d.frame("%s: angularity dia %s datums A", n, coord(u.refine))
	d.dim("basic %sdeg from base to %s", coord(a), n)
	g.fromDatums(n, x, y)
	d.located++
}

// pattern4 is four holes at the corners of a square under composite
// position, upper segment A, B, C and lower segment A.
func (g *plate) pattern4() {
	d, u := g.d, g.u
	x0, y0 := g.cell()
	n := g.name("pat")
	var pts []string
	var xy [][2]float64
	for _, f := range [][2]float64{{0.2, 0.2}, {0.8, 0.2}, {0.2, 0.8}, {0.8, 0.8}} {
		x, y := g.at(x0, y0, f[0], f[1])
		xy = append(xy, [2]float64{x, y})
		pts = append(pts, d.pt(x, y, 0))
	}
	d.feature("%s hole 4x size %s +-%s axis %s at %s", n, coord(u.small), coord(u.sizeTol), d.dir(0, 0, 1), strings.Join(pts, " "))
	d.frame("%s: position dia %s (M) datums A, B, C", n, coord(u.pos))
	d.frames = append(d.frames, fmt.Sprintf("    composite dia %s (M) datums A", coord(u.comp)))
	g.fromDatums(n+".1", xy[0][0], xy[0][1])
	g.spacings(n, xy)
	d.located += 4
}

// spacings places each member of a pattern from its first along the
// plate's x and y.
func (g *plate) spacings(n string, xy [][2]float64) {
	d := g.d
	for j := 1; j < len(xy); j++ {
		dx, dy := round6(xy[j][0]-xy[0][0]), round6(xy[j][1]-xy[0][1])
		if dx != 0 {
			d.dim("basic %s from %s.1 to %s.%d along %s", coord(math.Abs(dx)), n, n, j+1, d.dir(1, 0, 0))
		}
		if dy != 0 {
			d.dim("basic %s from %s.1 to %s.%d along %s", coord(math.Abs(dy)), n, n, j+1, d.dir(0, 1, 0))
		}
	}
}

// pattern is a rectangular grid of holes or pins (2 to 4 by 2 to 3, at
// most budget members) under composite position, to A, B, C or, every
// other one, to A, D(M), B with its first member located from the bore.
func (g *plate) pattern(budget int) {
	d, u := g.d, g.u
	x0, y0 := g.cell()
	cols, rows := 2+g.rng.IntN(3), 2+g.rng.IntN(2)
	for cols*rows > budget {
		if cols > rows {
			cols--
		} else {
			rows--
		}
	}
	kind, size, tol := "hole", u.small, "+-"+coord(u.sizeTol)
	n := g.name("pat")
	if g.rng.IntN(5) == 0 {
		kind, size, tol = "pin", u.pin/2, "-0 -"+coord(u.pinTol)
	}
	var pts []string
	var xy [][2]float64
	for r := range rows {
		for c := range cols {
			x, y := g.at(x0, y0, 0.2+0.6*float64(c)/float64(cols-1), 0.2+0.6*float64(r)/float64(rows-1))
			xy = append(xy, [2]float64{x, y})
			pts = append(pts, d.pt(x, y, 0))
		}
	}
	d.feature("%s %s %dx size %s %s axis %s at %s", n, kind, len(xy), coord(size), tol, d.dir(0, 0, 1), strings.Join(pts, " "))
	toBore := g.shape != ShapeComposite && g.n["pat"]%2 == 0
	refs := "A, B, C"
	if toBore {
		refs, g.usedD = "A, D(M), B", true
	}
	d.frame("%s: position dia %s (M) datums %s", n, coord(u.pos), refs)
	d.frames = append(d.frames, fmt.Sprintf("    composite dia %s (M) datums A", coord(u.comp)))
	if toBore {
		d.dim("basic %s from bore to %s.1 along %s", coord(math.Abs(round6(xy[0][0]-g.bx))), n, d.dir(1, 0, 0))
		d.dim("basic %s from bore to %s.1 along %s", coord(math.Abs(round6(xy[0][1]-g.by))), n, d.dir(0, 1, 0))
	} else {
		g.fromDatums(n+".1", xy[0][0], xy[0][1])
	}
	g.spacings(n, xy)
	d.located += len(xy)
}

// circle is a located hub with a bolt circle of 4 or 6 holes about it,
// the first on the hub's centre line along x (an implied zero clocks it).
func (g *plate) circle(budget int) {
	d, u := g.d, g.u
	x0, y0 := g.cell()
	k := 4
	if budget >= 7 && g.rng.IntN(2) == 0 {
		k = 6
	}
	x, y := g.at(x0, y0, 0.5, 0.5)
	hub, ring := g.name("hub"), g.name("ring")
	d.feature("%s hole size %s +%s -0 axis %s at %s", hub, coord(u.hub), coord(u.slotTol), d.dir(0, 0, 1), d.pt(x, y, 0))
	r := 0.325 * u.cell
	var pts []string
	for j := range k {
		a := 2 * math.Pi * float64(j) / float64(k)
		pts = append(pts, d.pt(x+r*math.Cos(a), y+r*math.Sin(a), 0))
	}
	d.feature("%s hole %dx size %s +-%s axis %s at %s", ring, k, coord(u.ring), coord(u.sizeTol), d.dir(0, 0, 1), strings.Join(pts, " "))
	d.frame("%s: position dia %s (M) datums A, B, C", hub, coord(u.refine))
	d.frame("%s: position dia %s (M) datums A, B, C", ring, coord(u.single))
	if g.rng.IntN(2) == 0 {
		d.frames = append(d.frames, fmt.Sprintf("    composite dia %s (M) datums A", coord(u.comp)))
	}
	g.fromDatums(hub, x, y)
	d.dim("basic dia %s through %s about %s", coord(2*r), ring, hub)
	d.located += k + 1
}

// flange writes a turned part: face A, pilot B, a keyway or a flat C, and
// bolt circles about B until the part has the features asked for.
func flange(rng *rand.Rand, i, features int) []byte {
	d := &drawing{units: "mm", standard: []string{"asme-2018", "asme-2009", "iso"}[rng.IntN(3)]}
	code := fmt.Sprintf("FL-%d", 100+i)
	d.title = "Flange " + code
	d.comments = []string{
		fmt.Sprintf("Flange %s (flange, %d located features).", code, features),
		"Synthetic part written by datumlint's benchmark generator (rules/lint/internal/gen).",
		"Datum frame: A the flange face, B the pilot's axis, C the keyway or the flat that clocks it.",
	}
	pilot := float64(40 + 10*rng.IntN(5))
	d.feature("face  plane normal -z at (0, 0, 0)")
	d.feature("back  plane normal +z at (0, 0, 20)")
	d.feature("pilot pin size %s -0 -0.02 axis +z at (0, 0, 0)", coord(pilot))
	key := rng.IntN(2) == 0
	if key {
		// a keyway whose mid-plane runs through the pilot's axis
		d.feature("key   slot size 8 +0.03 -0 normal +x at (0, %s, 0)", coord(pilot/2))
	} else {
		d.feature("flat  plane normal -y at (0, %s, 0)", coord(-pilot/2+3))
	}
	d.datum("A on face")
	d.datum("B on pilot")
	c := "key"
	if key {
		d.datum("C on key")
	} else {
		c = "flat"
		d.datum("C on flat")
	}
	d.frame("face: flatness 0.02")
	d.frame("back: parallelism 0.05 datums A")
	d.frame("pilot: perpendicularity dia 0.02 (M) datums A")
	if key {
		d.frame("key: position 0.05 datums A, B")
	} else {
		d.frame("flat: perpendicularity 0.05 datums A")
		d.dim("basic %s from pilot to flat", coord(pilot/2-3))
	}
	d.dim("dim 20 +-0.1 from face to back")
	// Rings of holes about B, 12 mm apart in diameter, each with as many
	// members as a 10 mm pitch leaves room for (4 to 120).
	dia := pilot + 24
	ring := 0
	for d.located < features {
		ring++
		room := features - d.located
		n := min(120, max(4, int(math.Pi*dia/10)), max(4, (room+1)/2), room)
		if n < 3 {
			// a last hole or two: single holes on the keyway's centre line
			for range room {
				ring++
				name := fmt.Sprintf("port%d", ring)
				d.feature("%s hole size 5 +-0.1 axis +z at (0, %s, 0)", name, coord(dia/2))
				d.frame("%s: position dia 0.2 (M) datums A, B, C", name)
				d.dim("basic %s from pilot to %s", coord(dia/2), name)
				d.located++
				dia += 12
			}
			break
		}
		name := fmt.Sprintf("ring%d", ring)
		// The first member on C's centre line through B (along y): an
		// implied zero clocks the ring. Every other ring is turned by half a
		// pitch and clocked by a basic angle instead.
		off := 90.0
		turned := ring%2 == 0
		if turned {
			off += 180 / float64(n)
		}
		var pts []string
		for j := range n {
			a := (off + 360*float64(j)/float64(n)) * math.Pi / 180
			pts = append(pts, "("+coord(dia/2*math.Cos(a))+", "+coord(dia/2*math.Sin(a))+", 0)")
		}
		d.feature("%s hole %dx size 5 +-0.1 axis +z at %s", name, n, strings.Join(pts, " "))
		d.frame("%s: position dia 0.2 (M) datums A, B, C", name)
		if ring%3 != 1 {
			d.frames = append(d.frames, "    composite dia 0.1 (M) datums A, B")
		}
		d.dim("basic dia %s through %s about pilot", coord(dia), name)
		if turned {
			// the radial line to the first member against C's normal (x for
			// the keyway, y for the flat), as undirected lines
			v := math.Mod(off, 180)
			if !key {
				v = math.Abs(90 - v)
			} else if v > 90 {
				v = 180 - v
			}
			d.dim("basic %sdeg from %s.1 to %s about pilot", coord(v), name, c)
		}
		d.located += n
		dia += 12
	}
	return d.bytes()
}
