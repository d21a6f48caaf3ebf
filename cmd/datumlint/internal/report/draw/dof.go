package draw

import (
	"fmt"
	"strings"
)

// The six motions of a rigid part, in the order the chart's columns show
// them: translations along and rotations about the part's axes.
const (
	TX = iota
	TY
	TZ
	RX
	RY
	RZ
)

// MotionColumns are the columns' headings.
var MotionColumns = [6]string{"tx", "ty", "tz", "rx", "ry", "rz"}

var motionWords = [6]string{"translation x", "translation y", "translation z", "rotation x", "rotation y", "rotation z"}

// Motion is one motion of a basis, with the name `datumlint dof` prints
// for it. Column is the chart column it belongs to (TX … RZ: a translation
// along an axis, or a rotation about an axis parallel to it, wherever that
// axis passes), or -1 for a motion along or about an oblique direction.
type Motion struct {
	Name   string
	Column int
}

// DOFStep is what one datum reference does, in precedence order.
type DOFStep struct {
	Ref     string // as drawn: "A", "A-B", "B(M)"
	Removes int    // degrees of freedom this reference newly removes
	Removed []Motion
}

// DOF is the analysis of one frame segment.
type DOF struct {
	Label    string // "upper segment", "composite segment, line 21"
	Steps    []DOFStep
	Free     []Motion // what the frame leaves free
	ZoneFree []Motion // the free motions that move (or turn) the zone
	// Orientation is set for orientation tolerances: the zone row speaks
	// of free rotations that turn the zone.
	Orientation bool
	// Problem says why the segment was not analysed; the chart then shows
	// only this.
	Problem string
	// Note is said under the chart ("" for none).
	Note string
}

// ZoneWord is "moves" or "turns".
func (d DOF) ZoneWord() string {
	if d.Orientation {
		return "turns"
	}
	return "moves"
}

// Cell states of the chart, each with its own text so that no state is
// told by colour alone.
const (
	cellFree    = iota // still free: "free"
	cellRemoved        // removed by this row's reference: its letter, dark
	cellFixed          // removed by an earlier reference: that letter, light
	cellMoves          // free and moves the zone: "moves" or "turns", outlined
)

// DOFCell is one cell of the chart.
type DOFCell struct {
	State int
	Text  string
}

// DOFRow is one row of the chart.
type DOFRow struct {
	Label string
	Cells []DOFCell // six, then one "other" cell when the chart has one
	Count string
}

// DOFChart lays the analysis out as rows: one per datum reference (the
// state after it), one for what stays free, one for the zone.
func DOFChart(d DOF) (rows []DOFRow, other bool) {
	for _, m := range append(append(allRemoved(d), d.Free...), d.ZoneFree...) {
		if m.Column < 0 || m.Column > 5 {
			other = true
		}
	}
	ncol := 6
	if other {
		ncol = 7
	}
	col := func(m Motion) int {
		if m.Column < 0 || m.Column > 5 {
			return 6
		}
		return m.Column
	}
	by := make([]string, ncol) // the reference that removed each column's motion
	for _, st := range d.Steps {
		row := DOFRow{Label: st.Ref, Cells: make([]DOFCell, ncol), Count: fmt.Sprintf("removes %d", st.Removes)}
		for _, m := range st.Removed {
			by[col(m)] = st.Ref
		}
		for j := range row.Cells {
			row.Cells[j] = stateOf(by[j], st.Ref, st.Removed, j, col)
		}
		rows = append(rows, row)
	}
	free := DOFRow{Label: "free", Cells: make([]DOFCell, ncol), Count: fmt.Sprintf("%d free", len(d.Free))}
	zone := DOFRow{Label: "zone", Cells: make([]DOFCell, ncol), Count: fmt.Sprintf("%d %s zone", len(d.ZoneFree), d.ZoneWord())}
	moves := make([]int, ncol)
	for _, m := range d.ZoneFree {
		moves[col(m)]++
	}
	frees := make([]int, ncol)
	for _, m := range d.Free {
		frees[col(m)]++
	}
	for j := 0; j < ncol; j++ {
		switch {
		case frees[j] > 0 || moves[j] > 0:
			free.Cells[j] = DOFCell{cellFree, "free"}
			if moves[j] > 0 {
				zone.Cells[j] = DOFCell{cellMoves, d.ZoneWord()}
			} else {
				zone.Cells[j] = DOFCell{cellFree, "free"}
			}
		case by[j] != "":
			free.Cells[j] = DOFCell{cellFixed, by[j]}
			zone.Cells[j] = DOFCell{cellFixed, by[j]}
		default:
			// Neither removed nor listed free: only the oblique column can
			// be empty like this (no oblique motion in this row).
			free.Cells[j] = DOFCell{cellFixed, "–"}
			zone.Cells[j] = DOFCell{cellFixed, "–"}
		}
	}
	return append(rows, free, zone), other
}

func allRemoved(d DOF) []Motion {
	var out []Motion
	for _, s := range d.Steps {
		out = append(out, s.Removed...)
	}
	return out
}

func stateOf(by, ref string, removed []Motion, j int, col func(Motion) int) DOFCell {
	for _, m := range removed {
		if col(m) == j {
			return DOFCell{cellRemoved, ref}
		}
	}
	if by != "" {
		return DOFCell{cellFixed, by}
	}
	return DOFCell{cellFree, "free"}
}

// Chart colours: dark cells with white text, light grey cells with dark
// text, white cells with dark text; each pair passes WCAG 2.1 AA (4.5:1),
// which the report's tests check.
const (
	DarkCell  = "#262626"
	LightCell = "#e3e3e3"
	ZoneCell  = "#ffe49a"
	CellText  = "#1a1a1a"
)

// DOFSVG draws the chart of one segment's analysis.
func DOFSVG(d DOF) string {
	const cellW, cellH, head = 48.0, 24.0, 20.0
	fs := 12.0
	var c canvas
	if d.Problem != "" {
		msg := "not analysed: " + d.Problem
		w := TextWidth(msg, fs) + 2*pad + 2*margin
		c.open("dof", w, cellH+2*margin, ` role="img"`)
		c.title(d.Label + ": " + msg)
		c.printf(`<rect x="%s" y="%s" width="%s" height="%s" fill="#fff" stroke="%s"/>`, num(margin), num(margin), num(w-2*margin), num(cellH), Ink)
		c.printf(`<g font-family="%s" fill="%s">`, FontFamily, CellText)
		c.text(margin+pad, margin+cellH/2+fs*0.36, fs, "start", msg)
		c.printf(`</g></svg>`)
		return c.String()
	}
	rows, other := DOFChart(d)
	labelW := 56.0
	for _, r := range rows {
		labelW = max(labelW, TextWidth(r.Label, fs)+2*pad)
	}
	countW := 0.0
	for _, r := range rows {
		countW = max(countW, TextWidth(r.Count, fs)+2*pad)
	}
	ncol := 6
	if other {
		ncol = 7
	}
	w := labelW + float64(ncol)*cellW + countW + 2*margin
	h := head + float64(len(rows))*cellH + 2*margin
	c.open("dof", w, h, fmt.Sprintf(` role="img" aria-label="%s"`, esc(DescribeDOF(d))))
	c.title(DescribeDOF(d))
	c.printf(`<g font-family="%s">`, FontFamily)
	x0 := margin + labelW
	for j := 0; j < ncol; j++ {
		hd := "oblique"
		if j < 6 {
			hd = MotionColumns[j]
		}
		c.printf(`<text x="%s" y="%s" font-size="%s" text-anchor="middle" font-weight="bold" fill="%s"><title>%s</title>%s</text>`,
			num(x0+float64(j)*cellW+cellW/2), num(margin+head-6), num(fs), CellText, esc(columnWord(j)), esc(hd))
	}
	for i, r := range rows {
		y := margin + head + float64(i)*cellH
		weight := ""
		if i >= len(rows)-2 {
			weight = ` font-style="italic"`
		}
		c.printf(`<text x="%s" y="%s" font-size="%s" fill="%s"%s>%s</text>`, num(margin+pad/2), num(y+cellH/2+fs*0.36), num(fs), CellText, weight, esc(r.Label))
		for j, cell := range r.Cells {
			x := x0 + float64(j)*cellW
			fill, text, stroke, sw := "#fff", CellText, "#595959", "1"
			switch cell.State {
			case cellRemoved:
				fill, text = DarkCell, "#fff"
			case cellFixed:
				fill = LightCell
			case cellMoves:
				fill, stroke, sw = ZoneCell, Ink, "2.5"
			}
			c.printf(`<rect x="%s" y="%s" width="%s" height="%s" fill="%s" stroke="%s" stroke-width="%s"/>`,
				num(x), num(y), num(cellW), num(cellH), fill, stroke, sw)
			bold := ""
			if cell.State == cellRemoved || cell.State == cellMoves {
				bold = ` font-weight="bold"`
			}
			c.printf(`<text x="%s" y="%s" font-size="%s" text-anchor="middle" fill="%s"%s>%s</text>`,
				num(x+cellW/2), num(y+cellH/2+fs*0.36), num(fs), text, bold, esc(cell.Text))
		}
		c.printf(`<text x="%s" y="%s" font-size="%s" fill="%s">%s</text>`,
			num(x0+float64(ncol)*cellW+pad), num(y+cellH/2+fs*0.36), num(fs), CellText, esc(r.Count))
	}
	c.printf(`</g></svg>`)
	return c.String()
}

func columnWord(j int) string {
	if j < 6 {
		return motionWords[j]
	}
	return "a motion along or about an oblique direction"
}

// DescribeDOF says the analysis in words, as `datumlint dof` does.
func DescribeDOF(d DOF) string {
	var b strings.Builder
	b.WriteString(d.Label)
	if d.Problem != "" {
		return b.String() + ": not analysed: " + d.Problem
	}
	b.WriteString(": ")
	for _, s := range d.Steps {
		fmt.Fprintf(&b, "%s removes %d (%s); ", s.Ref, s.Removes, MotionNames(s.Removed))
	}
	fmt.Fprintf(&b, "%d free (%s); %d %s the zone (%s)", len(d.Free), MotionNames(d.Free), len(d.ZoneFree), d.ZoneWord(), MotionNames(d.ZoneFree))
	return b.String()
}

// MotionNames lists motions by name, "; " between them (a name may hold
// commas: "translation (0.6, 0.8, 0)"), or "none".
func MotionNames(ms []Motion) string {
	if len(ms) == 0 {
		return "none"
	}
	out := make([]string, len(ms))
	for i, m := range ms {
		out[i] = m.Name
	}
	return strings.Join(out, "; ")
}
