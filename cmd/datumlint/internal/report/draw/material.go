package draw

import (
	"fmt"
	"math"
)

// MaterialFigure holds the boundaries of one feature of size under a
// tolerance at MMC or LMC, or of one datum feature referenced at MMB or
// LMB; the report works them out (rules/material) and this draws them on
// a size scale.
type MaterialFigure struct {
	Title     string
	Units     string
	Internal  bool
	Condition string // "MMC" or "LMC"
	MMC, LMC  float64
	// A tolerance at MMC or LMC:
	Tolerance, Virtual, Resultant, Bonus float64
	// A datum reference at MMB or LMB: Boundary is the simulator's size.
	Datum    bool
	Boundary float64
}

type mark struct {
	v     float64
	label string
	row   int // 0, 1 above the scale; 2, 3 below
	dash  bool
}

// MaterialSVG draws the figure: the size scale, the size tolerance between
// MMC and LMC, and the virtual and resultant conditions (or the datum
// boundary) as marks, each labelled with its name and value.
func MaterialSVG(f MaterialFigure) string {
	marks := []mark{{v: f.MMC, label: "MMC " + Number(f.MMC), row: 0}, {v: f.LMC, label: "LMC " + Number(f.LMC), row: 1}}
	if f.Datum {
		b := "MMB "
		if f.Condition == "LMC" {
			b = "LMB "
		}
		marks = append(marks, mark{v: f.Boundary, label: b + Number(f.Boundary), row: 2, dash: true})
	} else {
		marks = append(marks,
			mark{v: f.Virtual, label: "virtual condition " + Number(f.Virtual), row: 2, dash: true},
			mark{v: f.Resultant, label: "resultant condition " + Number(f.Resultant), row: 3, dash: true})
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, m := range marks {
		lo, hi = math.Min(lo, m.v), math.Max(hi, m.v)
	}
	span := hi - lo
	if !(span > 0) {
		span = math.Max(math.Abs(hi), 1) * 0.1
	}
	const w, fs, rowH = 560.0, 12.0, 17.0
	left, right := 20.0, w-20.0
	scale := func(v float64) float64 { return left + 40 + (v-lo)/span*(right-left-80) }
	axisY := 2*rowH + 22
	h := axisY + 2*rowH + 26
	var c canvas
	c.open("material", w, h, fmt.Sprintf(` role="img" aria-label="%s"`, esc(f.Title)))
	c.title(f.Title)
	// The size tolerance band.
	x1, x2 := scale(math.Min(f.MMC, f.LMC)), scale(math.Max(f.MMC, f.LMC))
	c.printf(`<rect x="%s" y="%s" width="%s" height="10" fill="%s" stroke="%s"/>`, num(x1), num(axisY-5), num(math.Max(x2-x1, 1)), LightCell, Ink)
	c.printf(`<g stroke="%s" stroke-width="1.2">`, Ink)
	c.line(left, axisY, right, axisY)
	for _, m := range marks {
		x := scale(m.v)
		y := labelY(m.row, axisY, rowH)
		dash := ""
		if m.dash {
			dash = ` stroke-dasharray="4 3"`
		}
		top, bot := y+4, axisY-7
		if m.row >= 2 {
			top, bot = axisY+7, y-fs
		}
		c.printf(`<line x1="%s" y1="%s" x2="%s" y2="%s"%s/>`, num(x), num(top), num(x), num(bot), dash)
		c.line(x, axisY-7, x, axisY+7)
	}
	c.printf(`</g><g font-family="%s" fill="%s">`, FontFamily, CellText)
	for _, m := range marks {
		x := scale(m.v)
		tw := TextWidth(m.label, fs)
		anchor := "middle"
		switch {
		case x-tw/2 < 2:
			x, anchor = 2, "start"
		case x+tw/2 > w-2:
			x, anchor = w-2, "end"
		}
		c.text(x, labelY(m.row, axisY, rowH), fs, anchor, m.label)
	}
	units := f.Units
	if units != "" {
		units = " (" + units + ")"
	}
	bonus := "size tolerance" + units
	if !f.Datum {
		bonus = fmt.Sprintf("size tolerance: bonus 0 to %s%s", Number(f.Bonus), units)
	}
	c.text(w/2, h-6, fs, "middle", bonus)
	c.printf(`</g></svg>`)
	return c.String()
}

// labelY is the baseline of a label row: rows 0 and 1 above the scale,
// rows 2 and 3 below it.
func labelY(row int, axisY, rowH float64) float64 {
	switch row {
	case 0:
		return axisY - 12 - rowH
	case 1:
		return axisY - 12
	case 2:
		return axisY + 22
	}
	return axisY + 22 + rowH
}
