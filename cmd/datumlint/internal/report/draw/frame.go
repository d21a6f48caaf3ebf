package draw

import (
	"fmt"
	"strings"
)

// Proportions of a frame, in SVG pixels: the compartments are as high as
// the symbol compartment is wide (ASME Y14.5-2018, feature control frame
// proportions, from memory: the frame's height is twice the letter height).
const (
	RowHeight = 34.0
	FontSize  = 18.0
	pad       = 8.0 // text from a compartment's side
	gap       = 3.0 // between a value and its modifiers
	margin    = 1.0 // room for the outer stroke
)

// Box is a rectangle in a drawing's coordinates.
type Box struct{ X, Y, W, H float64 }

// RowLayout places one segment's compartments.
type RowLayout struct {
	Tolerance Box
	Datums    []Box
}

// FrameLayout places a frame's compartments: the symbol compartment spans
// every row; each row has its tolerance compartment and its datum
// compartments, aligned in columns across the rows.
type FrameLayout struct {
	Width, Height float64
	Symbol        Box
	Rows          []RowLayout
}

// toleranceWidth is the width of a segment's tolerance text.
func toleranceWidth(s Segment) float64 {
	w := TextWidth(s.Value, FontSize)
	switch s.Zone {
	case Diameter:
		w += diameterWidth(FontSize) + 1
	case SphericalDiameter:
		w += TextWidth("S", FontSize) + diameterWidth(FontSize) + 1
	}
	for _, m := range s.Modifiers {
		w += gap + circledWidth(FontSize)
		if m.Value != "" {
			w += gap + TextWidth(m.Value, FontSize)
		}
	}
	return w
}

// datumWidth is the width of a datum compartment's text.
func datumWidth(r DatumRef) float64 {
	w := 0.0
	for i, l := range r.Letters {
		if i > 0 {
			w += TextWidth("-", FontSize) + 2
		}
		w += TextWidth(l.Letter, FontSize)
		if l.Material != "" {
			w += gap + circledWidth(FontSize)
		}
	}
	return w
}

// LayoutFrame sizes and places a frame's compartments.
func LayoutFrame(f Frame) FrameLayout {
	segs := f.Segments
	if len(segs) == 0 {
		segs = []Segment{{}}
	}
	tolW := RowHeight
	var datW []float64
	for _, s := range segs {
		tolW = max(tolW, toleranceWidth(s)+2*pad)
		for k, d := range s.Datums {
			w := max(RowHeight, datumWidth(d)+2*pad)
			if k < len(datW) {
				datW[k] = max(datW[k], w)
			} else {
				datW = append(datW, w)
			}
		}
	}
	l := FrameLayout{Symbol: Box{margin, margin, RowHeight, RowHeight * float64(len(segs))}}
	for i, s := range segs {
		y := margin + RowHeight*float64(i)
		x := margin + RowHeight
		row := RowLayout{Tolerance: Box{x, y, tolW, RowHeight}}
		x += tolW
		for k := range s.Datums {
			row.Datums = append(row.Datums, Box{x, y, datW[k], RowHeight})
			x += datW[k]
		}
		l.Width = max(l.Width, x+margin)
		l.Rows = append(l.Rows, row)
	}
	l.Height = l.Symbol.H + 2*margin
	return l
}

// FrameSVG draws a feature control frame. Its outermost element carries
// data-line with the frame's line, and a <title> with the frame as text.
func FrameSVG(f Frame) string {
	l := LayoutFrame(f)
	var c canvas
	label := Describe(f)
	c.open("fcf", l.Width, l.Height, fmt.Sprintf(` data-line="%d" role="img" aria-label="%s"`, f.Line, esc(label)))
	title := f.Statement
	if title == "" {
		title = label
	}
	c.title(title)
	c.printf(`<g fill="none" stroke="%s" stroke-width="1.2">`, Ink)
	c.rect(l.Symbol.X, l.Symbol.Y, l.Symbol.W, l.Symbol.H)
	for _, r := range l.Rows {
		c.rect(r.Tolerance.X, r.Tolerance.Y, r.Tolerance.W, r.Tolerance.H)
		for _, d := range r.Datums {
			c.rect(d.X, d.Y, d.W, d.H)
		}
	}
	c.printf(`</g>`)
	sym := l.Symbol
	c.printf(`<g font-family="%s" fill="%s">`, FontFamily, Ink)
	writeSymbol(&c, f.Characteristic, sym.X+sym.W/2, sym.Y+sym.H/2, RowHeight*0.36)
	for i, r := range l.Rows {
		if i >= len(f.Segments) {
			break
		}
		s := f.Segments[i]
		cy := r.Tolerance.Y + RowHeight/2
		base := cy + FontSize*0.36
		x := r.Tolerance.X + pad
		switch s.Zone {
		case Diameter:
			x += diameterSign(&c, x, cy, FontSize) + 1
		case SphericalDiameter:
			c.text(x, base, FontSize, "start", "S")
			x += TextWidth("S", FontSize)
			x += diameterSign(&c, x, cy, FontSize) + 1
		}
		c.text(x, base, FontSize, "start", s.Value)
		x += TextWidth(s.Value, FontSize)
		for _, m := range s.Modifiers {
			x += gap
			x += circled(&c, m.Letter, x, cy, FontSize)
			if m.Value != "" {
				x += gap
				c.text(x, base, FontSize, "start", m.Value)
				x += TextWidth(m.Value, FontSize)
			}
		}
		for k, d := range s.Datums {
			b := r.Datums[k]
			// Centre the compartment's text.
			x := b.X + (b.W-datumWidth(d))/2
			for j, dl := range d.Letters {
				if j > 0 {
					c.text(x+1, base, FontSize, "start", "-")
					x += TextWidth("-", FontSize) + 2
				}
				c.text(x, base, FontSize, "start", dl.Letter)
				x += TextWidth(dl.Letter, FontSize)
				if dl.Material != "" {
					x += gap
					x += circled(&c, dl.Material, x, cy, FontSize)
				}
			}
		}
	}
	c.printf(`</g></svg>`)
	return c.String()
}

var modifierWords = map[string]string{
	"M": "at MMC", "L": "at LMC", "F": "free state", "T": "tangent plane",
	"P": "projected zone", "U": "unequally disposed", "E": "envelope",
}

// Describe says a frame in words, for readers who cannot see the drawing:
// "position, diameter 0.1 at MMC, datums A, B, C".
func Describe(f Frame) string {
	var parts []string
	for i, s := range f.Segments {
		var b strings.Builder
		if i == 0 {
			b.WriteString(f.Characteristic.String() + ", ")
		} else {
			b.WriteString("composite segment: ")
		}
		switch s.Zone {
		case Diameter:
			b.WriteString("diameter ")
		case SphericalDiameter:
			b.WriteString("spherical diameter ")
		}
		b.WriteString(s.Value)
		for _, m := range s.Modifiers {
			w, ok := modifierWords[m.Letter]
			if !ok {
				w = "(" + m.Letter + ")"
			}
			b.WriteString(" " + w)
			if m.Value != "" {
				b.WriteString(" " + m.Value)
			}
		}
		if len(s.Datums) == 0 {
			b.WriteString(", no datums")
		} else {
			b.WriteString(", datums ")
			refs := make([]string, len(s.Datums))
			for k, d := range s.Datums {
				refs[k] = refText(d)
			}
			b.WriteString(strings.Join(refs, ", "))
		}
		parts = append(parts, b.String())
	}
	if f.Target != "" {
		return f.Target + ": " + strings.Join(parts, "; ")
	}
	return strings.Join(parts, "; ")
}

// refText writes a datum reference as "A", "A-B", "B at MMB" or "A-B at
// MMB" (one boundary for every letter), or "A at MMB-B" where they differ.
func refText(d DatumRef) string {
	ls := make([]string, len(d.Letters))
	same := true
	for i, l := range d.Letters {
		ls[i] = l.Letter
		same = same && l.Material == d.Letters[0].Material
	}
	if same && len(d.Letters) > 0 {
		return strings.Join(ls, "-") + boundaryWords(d.Letters[0].Material)
	}
	for i, l := range d.Letters {
		ls[i] += boundaryWords(l.Material)
	}
	return strings.Join(ls, "-")
}

func boundaryWords(m string) string {
	switch m {
	case "M":
		return " at MMB"
	case "L":
		return " at LMB"
	}
	return ""
}
