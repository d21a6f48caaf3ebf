package draw

import "fmt"

// DatumSymbolSVG draws a datum feature symbol: the letter in a square
// frame, a leader, and a filled triangle standing on a line that stands
// for the feature (ASME Y14.5-2018, datum feature symbol; ISO 5459:2011,
// the triangle may be filled or open; proportions from memory). The
// outermost element carries data-datum-line with the datum's line.
func DatumSymbolSVG(d DatumSymbol) string {
	box := max(RowHeight, TextWidth(d.Letter, FontSize)+2*pad)
	const leader, tri, base = 14.0, 11.0, 8.0
	w := max(box, 2*tri+2*base) + 2*margin
	h := box + leader + tri + 6 + 2*margin
	var c canvas
	label := fmt.Sprintf("datum feature symbol %s on %s", d.Letter, d.Target)
	c.open("datum-symbol", w, h, fmt.Sprintf(` data-datum-line="%d" role="img" aria-label="%s"`, d.Line, esc(label)))
	title := d.Statement
	if title == "" {
		title = label
	}
	c.title(title)
	cx := w / 2
	x0 := cx - box/2
	c.printf(`<g fill="none" stroke="%s" stroke-width="1.2">`, Ink)
	c.rect(x0, margin, box, box)
	c.line(cx, margin+box, cx, margin+box+leader)
	// The line standing for the feature's surface, with short hatches on
	// the material side.
	y := margin + box + leader + tri
	c.line(cx-tri-base, y, cx+tri+base, y)
	for x := cx - tri - base + 2; x < cx+tri+base; x += 5 {
		c.line(x, y, x-4, y+5)
	}
	c.printf(`</g>`)
	c.printf(`<path d="M%s %sL%s %sL%s %sZ" fill="%s"/>`,
		num(cx), num(margin+box+leader), num(cx-tri*0.65), num(y), num(cx+tri*0.65), num(y), Ink)
	c.printf(`<g font-family="%s" fill="%s">`, FontFamily, Ink)
	c.text(cx, margin+box/2+FontSize*0.36, FontSize, "middle", d.Letter)
	c.printf(`</g></svg>`)
	return c.String()
}
