package draw

import (
	"fmt"
	"math"
	"strings"
)

// Vec3 is a point or a direction in the part's coordinates.
type Vec3 [3]float64

func (a Vec3) dot(b Vec3) float64 { return a[0]*b[0] + a[1]*b[1] + a[2]*b[2] }

// ItemKind is how a feature is drawn in the views.
type ItemKind int

const (
	PlaneItem     ItemKind = iota + 1 // a line where seen edge-on
	WidthItem                         // a centre line and two faces where seen edge-on
	CylinderItem                      // circles seen end-on, centre line and outline from the side
	SphereItem                        // a circle in every view
	ConeItem                          // centre line and apex
	ExtrusionItem                     // centre line along its direction
	SurfaceItem                       // a marker at its point
)

// Item is one feature of the nominal geometry.
type Item struct {
	Name     string
	Kind     ItemKind
	Internal bool // a hole, slot or socket: its outline is hidden from the side
	Dir      Vec3 // unit normal, axis or direction; zero for spheres and surfaces
	Points   []Vec3
	Size     float64 // nominal diameter or width; 0 where unknown
	Datums   []string
	// Describe is the hover text: "bore: hole ⌀25, axis +z at (60, 40, 0)".
	Describe string
}

// Views is the nominal geometry to draw in three views.
type Views struct {
	Items []Item
	Units string
}

type view struct {
	Name, Looking string
	U, V, D       Vec3 // screen right, screen up, towards the viewer
	UName, VName  string
}

// The three views: top, front and right, laid out in third-angle
// projection (ASME Y14.3, from memory): the top view above the front, the
// right view to the right of the front. Each is labelled with the
// direction it looks along, so the arrangement is never needed to read it.
var threeViews = [3]view{
	{"Top", "−z", Vec3{1, 0, 0}, Vec3{0, 1, 0}, Vec3{0, 0, 1}, "x", "y"},
	{"Front", "+y", Vec3{1, 0, 0}, Vec3{0, 0, 1}, Vec3{0, -1, 0}, "x", "z"},
	{"Right", "−x", Vec3{0, 1, 0}, Vec3{0, 0, 1}, Vec3{1, 0, 0}, "y", "z"},
}

// Extent is the box the views are drawn in, and the axes along which the
// model gives no extent (drawn with an assumed depth).
type Extent struct {
	Min, Max Vec3
	Assumed  [3]bool
}

// ExtentOf computes the box around the nominal geometry: every point, with
// the radius of cylinders and spheres and half the width of widths. An axis
// along which everything lies in one place (a plate whose holes all start
// on one face) gets a depth of a sixth of the largest extent, on the
// material side of a plane facing along it where there is one.
func ExtentOf(v Views) Extent {
	e := Extent{Min: Vec3{math.Inf(1), math.Inf(1), math.Inf(1)}, Max: Vec3{math.Inf(-1), math.Inf(-1), math.Inf(-1)}}
	grow := func(p Vec3, r float64) {
		for i := 0; i < 3; i++ {
			e.Min[i] = math.Min(e.Min[i], p[i]-r)
			e.Max[i] = math.Max(e.Max[i], p[i]+r)
		}
	}
	seen := false
	for _, it := range v.Items {
		for _, p := range it.Points {
			seen = true
			switch it.Kind {
			case SphereItem:
				grow(p, it.Size/2)
			case CylinderItem:
				// Grow across the axis only.
				for i := 0; i < 3; i++ {
					var ax Vec3
					ax[i] = 1
					if math.Abs(ax.dot(it.Dir)) < 0.99 {
						q := p
						q[i] -= it.Size / 2
						grow(q, 0)
						q[i] += it.Size
						grow(q, 0)
					}
				}
				grow(p, 0)
			case WidthItem:
				for _, s := range []float64{-1, 1} {
					grow(Vec3{p[0] + s*it.Dir[0]*it.Size/2, p[1] + s*it.Dir[1]*it.Size/2, p[2] + s*it.Dir[2]*it.Size/2}, 0)
				}
			default:
				grow(p, 0)
			}
		}
	}
	if !seen {
		return Extent{Min: Vec3{0, 0, 0}, Max: Vec3{10, 10, 10}, Assumed: [3]bool{true, true, true}}
	}
	big := 0.0
	for i := 0; i < 3; i++ {
		big = math.Max(big, e.Max[i]-e.Min[i])
	}
	if big == 0 {
		big = 10
	}
	for i := 0; i < 3; i++ {
		if e.Max[i]-e.Min[i] >= big/50 {
			continue
		}
		e.Assumed[i] = true
		depth := big / 6
		side := 0.0 // -1: material below the points, +1 above, 0 both
		for _, it := range v.Items {
			if it.Kind == PlaneItem && math.Abs(math.Abs(it.Dir[i])-1) < 1e-6 {
				side = -math.Copysign(1, it.Dir[i]) // the outward normal points away from the material
				break
			}
		}
		switch side {
		case 1:
			e.Max[i] = e.Min[i] + depth
		case -1:
			e.Min[i] = e.Max[i] - depth
		default:
			mid := (e.Min[i] + e.Max[i]) / 2
			e.Min[i], e.Max[i] = mid-depth/2, mid+depth/2
		}
	}
	return e
}

// visible reports whether an item shows in a view, and how: "edge" (a
// plane or width seen edge-on), "end" (an axis seen end-on), "side" (an
// axis in or across the view), or "".
func visible(it Item, vw view) string {
	nd := math.Abs(it.Dir.dot(vw.D))
	switch it.Kind {
	case PlaneItem, WidthItem:
		if len(it.Points) > 0 && nd < 0.02 {
			return "edge"
		}
	case CylinderItem, ConeItem, ExtrusionItem:
		if len(it.Points) == 0 {
			return ""
		}
		if nd > 0.98 {
			return "end"
		}
		return "side"
	case SphereItem, SurfaceItem:
		if len(it.Points) > 0 {
			return "end"
		}
	}
	return ""
}

// LegendEntry says where an item is drawn.
type LegendEntry struct {
	Name, Describe string
	Datums         []string
	In             []string // view names
}

// Legend lists every item with the views that show it.
func Legend(v Views) []LegendEntry {
	out := make([]LegendEntry, 0, len(v.Items))
	for _, it := range v.Items {
		le := LegendEntry{Name: it.Name, Describe: it.Describe, Datums: it.Datums}
		for _, vw := range threeViews {
			if visible(it, vw) != "" {
				le.In = append(le.In, vw.Name)
			}
		}
		out = append(out, le)
	}
	return out
}

// Colours of the views: features in dark blue, centre lines in dark grey,
// the extent box in mid grey (a graphic, 3:1 on white suffices: WCAG 2.1,
// non-text contrast).
const (
	FeatureInk = "#1f3d7a"
	CentreInk  = "#404040"
	ExtentInk  = "#8c8c8c"
)

// The views' room: the most they take, and the margins and heading of each.
const maxW, maxH, mx, my, head = 900.0, 660.0, 56.0, 34.0, 22.0

func (e Extent) size() Vec3 {
	return Vec3{e.Max[0] - e.Min[0], e.Max[1] - e.Min[1], e.Max[2] - e.Min[2]}
}

// fitScale is the one scale of the three views, in pixels per part unit:
// the front and right views side by side fit in maxW, the top view above
// the front in maxH.
func fitScale(e Extent) float64 {
	size := e.size()
	return math.Min((maxW-4*mx)/(size[0]+size[1]), (maxH-4*my-2*head)/(size[1]+size[2]))
}

// ViewsSVG draws the top, front and right views at one scale, fitted into
// about 900 by 640 pixels, with room around each view for the names.
func ViewsSVG(v Views) string {
	e := ExtentOf(v)
	size := e.size()
	s := fitScale(e)
	// Third-angle layout: top above front, right beside front.
	frontY := head + my + size[1]*s + my + head + my
	ox := [3]float64{mx, mx, 3*mx + size[0]*s}
	oy := [3]float64{head + my, frontY, frontY}
	w := 4*mx + (size[0]+size[1])*s + 50 // and room for the right view's names
	h := frontY + size[2]*s + my
	var c canvas
	c.open("views", w, h, ` role="img" aria-label="Top, front and right views of the nominal geometry"`)
	c.title("Top, front and right views of the nominal geometry (third-angle arrangement; each view is labelled)")
	c.printf(`<g font-family="%s">`, FontFamily)
	for k, vw := range threeViews {
		pr := projector{vw: vw, ox: ox[k], oy: oy[k], s: s,
			u0: e.Min.dot(vw.U), umax: e.Max.dot(vw.U), v0: e.Min.dot(vw.V), v1: e.Max.dot(vw.V), edge: 8 / s,
			planeEdge: math.Max(8/s, math.Min(0.08*math.Max(size[0], math.Max(size[1], size[2])), 18/s)), placed: &[]Box{}, width: w}
		c.printf(`<g class="view">`)
		heading := fmt.Sprintf("%s looking along %s (%s right, %s up)", vw.Name, vw.Looking, vw.UName, vw.VName)
		c.printf(`<text x="%s" y="%s" font-size="13" fill="%s"><tspan font-weight="bold">%s</tspan>%s</text>`,
			num(ox[k]-mx+10), num(oy[k]-my-4), CellText, esc(vw.Name), esc(strings.TrimPrefix(heading, vw.Name)))
		// No name is written over the heading.
		*pr.placed = append(*pr.placed, Box{ox[k] - mx + 10, oy[k] - my - 17, TextWidth(heading, 13), 17})
		x0, y0 := pr.at(pr.u0, pr.v1)
		x1, y1 := pr.at(pr.umax, pr.v0)
		c.printf(`<rect x="%s" y="%s" width="%s" height="%s" fill="none" stroke="%s" stroke-dasharray="2 3"><title>extent of the nominal geometry</title></rect>`,
			num(x0), num(y0), num(x1-x0), num(y1-y0), ExtentInk)
		for _, it := range v.Items {
			pr.item(&c, it)
		}
		c.printf(`</g>`)
	}
	c.printf(`</g></svg>`)
	return c.String()
}

type projector struct {
	vw               view
	ox, oy, s        float64
	u0, umax, v0, v1 float64 // the extent in the view, in part units
	edge             float64 // how far lines run past the extent, in part units
	// planeEdge is how far planes run past it: further, so that a plane
	// whose only point is at a corner still shows as a line.
	planeEdge float64
	placed    *[]Box  // the labels written so far, kept apart
	width     float64 // the drawing's width, which labels stay inside
}

// at maps view coordinates (u right, v up) to the drawing.
func (p projector) at(u, v float64) (float64, float64) {
	return p.ox + (u-p.u0)*p.s, p.oy + (p.v1-v)*p.s
}

func (p projector) uv(q Vec3) (float64, float64) { return q.dot(p.vw.U), q.dot(p.vw.V) }

// clip returns the part of the line through (u, v) along (du, dv) inside
// the extent, grown by edge (Liang and Barsky's parametric clipping).
func (p projector) clip(u, v, du, dv float64) (ua, va, ub, vb float64, ok bool) {
	t0, t1 := math.Inf(-1), math.Inf(1)
	e := p.edge
	for _, c := range [4][2]float64{{-du, u - p.u0 + e}, {du, p.umax + e - u}, {-dv, v - p.v0 + e}, {dv, p.v1 + e - v}} {
		if c[0] == 0 {
			if c[1] < 0 {
				return 0, 0, 0, 0, false
			}
			continue
		}
		t := c[1] / c[0]
		if c[0] < 0 {
			t0 = math.Max(t0, t)
		} else {
			t1 = math.Min(t1, t)
		}
	}
	if t0 > t1 || math.IsInf(t0, 0) || math.IsInf(t1, 0) {
		return 0, 0, 0, 0, false
	}
	return u + t0*du, v + t0*dv, u + t1*du, v + t1*dv, true
}

// line draws the clipped line through a point along a direction (in view
// coordinates) and returns its ends in the drawing.
func (p projector) line(c *canvas, u, v, du, dv float64, attrs string) (x1, y1, x2, y2 float64, ok bool) {
	ua, va, ub, vb, ok := p.clip(u, v, du, dv)
	if !ok {
		return 0, 0, 0, 0, false
	}
	x1, y1 = p.at(ua, va)
	x2, y2 = p.at(ub, vb)
	c.printf(`<line x1="%s" y1="%s" x2="%s" y2="%s"%s/>`, num(x1), num(y1), num(x2), num(y2), attrs)
	return x1, y1, x2, y2, true
}

const centreDash = ` stroke-dasharray="10 3 2 3"`

// item draws one feature, grouped with its hover title.
func (p projector) item(c *canvas, it Item) {
	how := visible(it, p.vw)
	if how == "" {
		return
	}
	c.printf(`<g class="feature"><title>%s</title>`, esc(it.Describe))
	defer c.printf(`</g>`)
	du, dv := p.uv(it.Dir)
	if n := math.Hypot(du, dv); n > 0 {
		du, dv = du/n, dv/n
	}
	label := it.Name
	if len(it.Points) > 1 {
		label = fmt.Sprintf("%s (%d×)", it.Name, len(it.Points))
	}
	switch it.Kind {
	case PlaneItem, WidthItem:
		p.edge = p.planeEdge
		u, v := p.uv(it.Points[0])
		tu, tv := -dv, du // along the trace
		attrs := fmt.Sprintf(` stroke="%s" stroke-width="2"`, FeatureInk)
		if it.Kind == WidthItem {
			attrs = fmt.Sprintf(` stroke="%s" stroke-width="1"%s`, CentreInk, centreDash)
			for _, sgn := range []float64{-1, 1} {
				off := sgn * it.Size / 2
				face := fmt.Sprintf(` stroke="%s" stroke-width="1.5"`, FeatureInk)
				p.line(c, u+du*off, v+dv*off, tu, tv, face)
			}
		}
		x1, y1, x2, y2, ok := p.line(c, u, v, tu, tv, attrs)
		if !ok {
			return
		}
		// The name at the line's end, a little outside the material.
		lx, ly := x2, y2
		if y1 < y2 || (y1 == y2 && x1 > x2) {
			lx, ly = x1, y1
		}
		lx += du * 8
		ly -= dv * 8
		p.label(c, lx, ly, du, -dv, label, it.Datums)
	case CylinderItem, SphereItem, ConeItem, ExtrusionItem, SurfaceItem:
		r := it.Size / 2 * p.s
		for i, q := range it.Points {
			u, v := p.uv(q)
			x, y := p.at(u, v)
			switch {
			case how == "end" && (it.Kind == CylinderItem || it.Kind == SphereItem):
				if r <= 0 {
					r = 3
				}
				c.printf(`<circle cx="%s" cy="%s" r="%s" fill="none" stroke="%s" stroke-width="1.5"/>`, num(x), num(y), num(r), FeatureInk)
				c.printf(`<g stroke="%s" stroke-width="0.8"><line x1="%s" y1="%s" x2="%s" y2="%s"/><line x1="%s" y1="%s" x2="%s" y2="%s"/></g>`,
					CentreInk, num(x-r-4), num(y), num(x+r+4), num(y), num(x), num(y-r-4), num(x), num(y+r+4))
			case how == "end":
				c.printf(`<path d="M%s %sl4 4l-4 4l-4 -4z" fill="%s"/>`, num(x), num(y-4), FeatureInk)
			default:
				p.line(c, u, v, du, dv, fmt.Sprintf(` stroke="%s" stroke-width="1"%s`, CentreInk, centreDash))
				if it.Kind == CylinderItem && it.Size > 0 {
					out := fmt.Sprintf(` stroke="%s" stroke-width="1.5"`, FeatureInk)
					if it.Internal {
						out += ` stroke-dasharray="5 3"`
					}
					for _, sgn := range []float64{-1, 1} {
						off := sgn * it.Size / 2
						p.line(c, u-dv*off, v+du*off, du, dv, out)
					}
				}
				if it.Kind == ConeItem {
					c.printf(`<circle cx="%s" cy="%s" r="3" fill="%s"/>`, num(x), num(y), FeatureInk)
				}
			}
			if len(it.Points) > 1 && how == "end" {
				c.printf(`<text x="%s" y="%s" font-size="10" fill="%s">%d</text>`, num(x+max(r, 4)*0.75+2), num(y+max(r, 4)*0.75+10), CellText, i+1)
			}
		}
		u, v := p.uv(it.Points[0])
		x, y := p.at(u, v)
		if how == "end" {
			p.label(c, x+max(r, 4)*0.7+3, y-max(r, 4)*0.7-3, 1, -1, label, it.Datums)
		} else {
			// Along the centre line's upper end.
			_, _, ex, ey, ok := p.clipEnds(u, v, du, dv)
			if ok {
				p.label(c, ex+3, ey+12, 1, 1, label, it.Datums)
			} else {
				p.label(c, x+3, y-3, 1, -1, label, it.Datums)
			}
		}
	}
}

// clipEnds is clip in drawing coordinates, the upper end second.
func (p projector) clipEnds(u, v, du, dv float64) (x1, y1, x2, y2 float64, ok bool) {
	ua, va, ub, vb, ok := p.clip(u, v, du, dv)
	if !ok {
		return
	}
	x1, y1 = p.at(ua, va)
	x2, y2 = p.at(ub, vb)
	if y1 < y2 {
		x1, y1, x2, y2 = x2, y2, x1, y1
	}
	return x1, y1, x2, y2, true
}

// label writes a feature's name and its datum letters in small boxes; the
// text runs rightwards from (x, y) when dx ≥ 0, leftwards otherwise.
func (p projector) label(c *canvas, x, y, dx, dy float64, name string, datums []string) {
	const fs = 11.0
	anchor := "start"
	if dx < -0.3 {
		anchor = "end"
	}
	if dy > 0.3 {
		y += fs * 0.7
	}
	tw := TextWidth(name, fs)
	w := tw + 4 + datumBoxesWidth(datums, fs)
	left := x
	if anchor == "end" {
		left = x - w
	}
	// Keep the name and its letters inside the drawing.
	shift := 0.0
	if left < 2 {
		shift = 2 - left
	} else if left+w > p.width-2 {
		shift = p.width - 2 - left - w
	}
	x, left = x+shift, left+shift
	// Move the label down or up a line at a time until it clears the
	// labels already written.
	for _, off := range []float64{0, 13, -13, 26, -26, 39, -39, 52} {
		b := Box{left, y + off - fs, w, fs + 4}
		clear := true
		for _, q := range *p.placed {
			if b.X < q.X+q.W && q.X < b.X+b.W && b.Y < q.Y+q.H && q.Y < b.Y+b.H {
				clear = false
				break
			}
		}
		if clear {
			y += off
			*p.placed = append(*p.placed, b)
			break
		}
	}
	c.printf(`<text x="%s" y="%s" font-size="%s" fill="%s" text-anchor="%s">%s</text>`, num(x), num(y), num(fs), FeatureInk, anchor, esc(name))
	bx := x + tw + 4
	if anchor == "end" {
		bx = x - tw - 4 - datumBoxesWidth(datums, fs)
	}
	for _, d := range datums {
		bw := TextWidth(d, fs) + 6
		c.printf(`<rect x="%s" y="%s" width="%s" height="%s" fill="#fff" stroke="%s"/>`, num(bx), num(y-fs), num(bw), num(fs+4), Ink)
		c.printf(`<text x="%s" y="%s" font-size="%s" fill="%s">%s</text>`, num(bx+3), num(y), num(fs), Ink, esc(d))
		bx += bw + 2
	}
}

func datumBoxesWidth(ds []string, fs float64) float64 {
	w := 0.0
	for _, d := range ds {
		w += TextWidth(d, fs) + 8
	}
	return w
}

// ExtentNote says along which axes the views assume a depth the model does
// not give, or "" where it gives all three.
func ExtentNote(v Views) string {
	e := ExtentOf(v)
	var axes []string
	depth := 0.0
	for i, a := range e.Assumed {
		if a {
			axes = append(axes, string("xyz"[i]))
			depth = e.Max[i] - e.Min[i]
		}
	}
	switch len(axes) {
	case 0:
		return ""
	case 3:
		return "The model gives no point to place; the views are empty."
	}
	units := ""
	if v.Units != "" && v.Units != "unknown" {
		units = " " + v.Units
	}
	return fmt.Sprintf("The model places every point at one %s; the views draw a depth of %s%s along %s so that side views can be read.",
		strings.Join(axes, " and "), Number(math.Round(depth*1000)/1000), units, strings.Join(axes, " and "))
}
