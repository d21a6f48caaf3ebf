package draw

import (
	"math"
	"strings"
)

// The symbols are drawn as strokes in a square of half-size k about a
// centre, after the shapes of ASME Y14.5-2018, figure of geometric
// characteristic symbols, and ISO 1101:2017, table of symbols (proportions
// from memory): a line, a parallelogram, a circle, a circle between two
// slanted lines, an open and a closed arc, an angle of 30°, a perpendicular,
// two slanted lines, a circle with a cross, two concentric circles, three
// lines, and one or two arrows.

// pen writes path data in unit coordinates (x right, y down, [-1, 1]).
type pen struct {
	cx, cy, k float64
	b         strings.Builder
}

func (p *pen) pt(x, y float64) {
	p.b.WriteString(num(p.cx + x*p.k))
	p.b.WriteByte(' ')
	p.b.WriteString(num(p.cy + y*p.k))
}

func (p *pen) move(x, y float64) { p.b.WriteString("M"); p.pt(x, y) }
func (p *pen) to(x, y float64)   { p.b.WriteString("L"); p.pt(x, y) }
func (p *pen) close()            { p.b.WriteString("Z") }
func (p *pen) seg(x1, y1, x2, y2 float64) {
	p.move(x1, y1)
	p.to(x2, y2)
}

// arc draws a circular arc of unit radius r to (x, y), sweeping clockwise
// on screen when sweep is 1.
func (p *pen) arc(r, x, y float64, sweep int) {
	p.b.WriteString("A" + num(r*p.k) + " " + num(r*p.k) + " 0 0 ")
	if sweep == 1 {
		p.b.WriteString("1 ")
	} else {
		p.b.WriteString("0 ")
	}
	p.pt(x, y)
}

// circle as two arcs, so that a symbol is one path.
func (p *pen) circle(x, y, r float64) {
	p.move(x-r, y)
	p.arc(r, x+r, y, 1)
	p.arc(r, x-r, y, 1)
	p.close()
}

// arrowHead draws a filled head at (x, y) pointing along (dx, dy).
func (p *pen) arrowHead(x, y, dx, dy, length float64) {
	n := math.Hypot(dx, dy)
	dx, dy = dx/n, dy/n
	bx, by := x-dx*length, y-dy*length
	w := length * 0.38
	p.move(x, y)
	p.to(bx-dy*w, by+dx*w)
	p.to(bx+dy*w, by-dx*w)
	p.close()
}

// arrow strokes a shaft on p from (x0, y0) towards (x1, y1) and fills a
// head on f that ends there.
func arrow(p, f *pen, x0, y0, x1, y1 float64) {
	const head = 0.5
	dx, dy := x1-x0, y1-y0
	n := math.Hypot(dx, dy)
	p.seg(x0, y0, x1-dx/n*head*0.8, y1-dy/n*head*0.8)
	f.arrowHead(x1, y1, dx, dy, head)
}

// symbolPaths returns the stroked path data and the filled path data of a
// characteristic's symbol centred at (cx, cy) with half-size k.
func symbolPaths(ch Characteristic, cx, cy, k float64) (stroke, fill string) {
	p := &pen{cx: cx, cy: cy, k: k}
	f := &pen{cx: cx, cy: cy, k: k}
	switch ch {
	case Straightness:
		p.seg(-0.85, 0, 0.85, 0)
	case Flatness:
		p.move(-0.9, 0.4)
		p.to(0.45, 0.4)
		p.to(0.9, -0.4)
		p.to(-0.45, -0.4)
		p.close()
	case Circularity:
		p.circle(0, 0, 0.75)
	case Cylindricity:
		r := 0.5
		p.circle(0, 0, r)
		// Two tangents at 60° to the base line.
		dx, dy := math.Cos(math.Pi/3), -math.Sin(math.Pi/3)
		nx, ny := -dy, dx
		for _, s := range []float64{-1, 1} {
			ox, oy := s*r*nx, s*r*ny
			p.seg(ox-1.0*dx, oy-1.0*dy, ox+1.0*dx, oy+1.0*dy)
		}
	case LineProfile:
		p.move(-0.85, 0.4)
		p.arc(0.85, 0.85, 0.4, 1)
	case SurfaceProfile:
		p.move(-0.85, 0.4)
		p.arc(0.85, 0.85, 0.4, 1)
		p.close()
	case Angularity:
		p.move(0.85, 0.55)
		p.to(-0.85, 0.55)
		a := math.Pi / 6
		p.to(-0.85+1.75*math.Cos(a), 0.55-1.75*math.Sin(a))
	case Perpendicularity:
		p.seg(-0.85, 0.7, 0.85, 0.7)
		p.seg(0, 0.7, 0, -0.85)
	case Parallelism:
		p.seg(-0.7, 0.75, -0.1, -0.8)
		p.seg(0.1, 0.75, 0.7, -0.8)
	case Position:
		p.circle(0, 0, 0.55)
		p.seg(-0.9, 0, 0.9, 0)
		p.seg(0, -0.9, 0, 0.9)
	case Concentricity:
		p.circle(0, 0, 0.8)
		p.circle(0, 0, 0.4)
	case Symmetry:
		p.seg(-0.5, -0.45, 0.5, -0.45)
		p.seg(-0.9, 0, 0.9, 0)
		p.seg(-0.5, 0.45, 0.5, 0.45)
	case CircularRunout:
		arrow(p, f, -0.55, 0.85, 0.45, -0.85)
	case TotalRunout:
		p.seg(-0.95, 0.85, 0.6, 0.85)
		arrow(p, f, -0.85, 0.85, 0.05, -0.85)
		arrow(p, f, -0.05, 0.85, 0.85, -0.85)
	}
	return p.b.String(), f.b.String()
}

// writeSymbol draws a characteristic's symbol; an unknown characteristic
// is a question mark, as text.
func writeSymbol(c *canvas, ch Characteristic, cx, cy, k float64) {
	stroke, fill := symbolPaths(ch, cx, cy, k)
	if stroke == "" {
		c.text(cx, cy+k*0.55, k*1.6, "middle", "?")
		return
	}
	c.printf(`<path class="symbol" d="%s" fill="none" stroke="%s" stroke-width="1.5" stroke-linejoin="round"/>`, stroke, Ink)
	if fill != "" {
		c.printf(`<path d="%s" fill="%s" stroke="none"/>`, fill, Ink)
	}
}

// diameterSign draws ⌀ (a circle crossed by a slanted stroke) with its
// left edge at x, centred on cy, for text of the given size; it returns its
// width.
func diameterSign(c *canvas, x, cy, size float64) float64 {
	r := size * 0.3
	cx := x + size*0.38
	p := &pen{cx: cx, cy: cy, k: 1}
	p.circle(0, 0, r)
	a := math.Pi * 0.36 // the stroke about 65° to the base line
	p.seg(-math.Cos(a)*r*1.55, math.Sin(a)*r*1.55, math.Cos(a)*r*1.55, -math.Sin(a)*r*1.55)
	c.printf(`<path class="dia" d="%s" fill="none" stroke="%s" stroke-width="1.2"/>`, p.b.String(), Ink)
	return size * 0.76
}

// diameterWidth is diameterSign's width without drawing.
func diameterWidth(size float64) float64 { return size * 0.76 }

// circled draws a letter in a circle with its left edge at x; it returns
// its width.
func circled(c *canvas, letter string, x, cy, size float64) float64 {
	r := size * 0.52
	c.printf(`<circle cx="%s" cy="%s" r="%s" fill="none" stroke="%s" stroke-width="1.1"/>`, num(x+r), num(cy), num(r), Ink)
	c.text(x+r, cy+size*0.25, size*0.68, "middle", letter)
	return 2 * r
}

func circledWidth(size float64) float64 { return size * 1.04 }
