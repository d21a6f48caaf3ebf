package draw

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// FontFamily is the text face of every drawing: faces that ship with the
// common systems, then the generic family every browser has.
const FontFamily = "Arial, Helvetica, Liberation Sans, DejaVu Sans, sans-serif"

// Ink is the colour of lines and text: black on white passes any contrast
// test (WCAG 2.1, contrast minimum).
const Ink = "#000"

// canvas accumulates SVG markup.
type canvas struct{ b strings.Builder }

func (c *canvas) printf(format string, args ...any) { fmt.Fprintf(&c.b, format, args...) }
func (c *canvas) String() string                    { return c.b.String() }

// open writes an outermost svg element of the given size. attrs are extra
// attributes, already escaped.
func (c *canvas) open(class string, w, h float64, attrs string) {
	c.printf(`<svg xmlns="http://www.w3.org/2000/svg" class="%s" width="%s" height="%s" viewBox="0 0 %s %s"%s>`,
		class, num(w), num(h), num(w), num(h), attrs)
}

func (c *canvas) title(s string) { c.printf("<title>%s</title>", esc(s)) }

// text writes a text element; anchor is "start", "middle" or "end".
func (c *canvas) text(x, y, size float64, anchor, s string) {
	a := ""
	if anchor != "start" && anchor != "" {
		a = ` text-anchor="` + anchor + `"`
	}
	c.printf(`<text x="%s" y="%s" font-size="%s"%s>%s</text>`, num(x), num(y), num(size), a, esc(s))
}

func (c *canvas) line(x1, y1, x2, y2 float64) {
	c.printf(`<line x1="%s" y1="%s" x2="%s" y2="%s"/>`, num(x1), num(y1), num(x2), num(y2))
}

func (c *canvas) rect(x, y, w, h float64) {
	c.printf(`<rect x="%s" y="%s" width="%s" height="%s"/>`, num(x), num(y), num(w), num(h))
}

func (c *canvas) circle(x, y, r float64) {
	c.printf(`<circle cx="%s" cy="%s" r="%s"/>`, num(x), num(y), num(r))
}

// num prints a coordinate with at most two decimals, so that golden files
// do not change with rounding noise.
func num(x float64) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return "0"
	}
	x = math.Round(x*100) / 100
	if x == 0 {
		x = 0 // no "-0"
	}
	return strconv.FormatFloat(x, 'f', -1, 64)
}

// esc escapes text for an XML attribute or element.
func esc(s string) string {
	var b strings.Builder
	for _, r := range s {
		switch r {
		case '<':
			b.WriteString("&lt;")
		case '>':
			b.WriteString("&gt;")
		case '&':
			b.WriteString("&amp;")
		case '"':
			b.WriteString("&#34;")
		case '\'':
			b.WriteString("&#39;")
		default:
			if r < 0x20 && r != '\t' && r != '\n' {
				b.WriteRune('\uFFFD') // not allowed in XML 1.0
				continue
			}
			b.WriteRune(r)
		}
	}
	return b.String()
}

// Number prints a value for a reader: at most nine decimals, so that
// 25.05 + 0.15 prints 25.2 and not 25.200000000000003.
func Number(x float64) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return "?"
	}
	x = math.Round(x*1e9) / 1e9
	if x == 0 {
		x = 0
	}
	return strconv.FormatFloat(x, 'f', -1, 64)
}
