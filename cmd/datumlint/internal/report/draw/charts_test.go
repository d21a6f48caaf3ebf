package draw

import (
	"regexp"
	"strings"
	"testing"
)

// The mounting plate's bore, position to A, B, C: A (a plane, normal z)
// removes tz, rx, ry; B removes ty, rz; C removes tx (the numbers of
// `datumlint dof` on testdata/examples/mounting-plate.callouts).
var plateDOF = DOF{
	Label: "line 19",
	Steps: []DOFStep{
		{Ref: "A", Removes: 3, Removed: []Motion{{"translation z", TZ}, {"rotation x", RX}, {"rotation y", RY}}},
		{Ref: "B", Removes: 2, Removed: []Motion{{"translation y", TY}, {"rotation z", RZ}}},
		{Ref: "C", Removes: 1, Removed: []Motion{{"translation x", TX}}},
	},
}

// A frame to A alone on a hole off the origin: tx, ty and rz stay free and
// the zone moves with tx and ty.
var looseDOF = DOF{
	Label:    "line 5",
	Steps:    []DOFStep{{Ref: "A", Removes: 3, Removed: []Motion{{"translation z", TZ}, {"rotation x", RX}, {"rotation y", RY}}}},
	Free:     []Motion{{"translation x", TX}, {"translation y", TY}, {"rotation z", RZ}},
	ZoneFree: []Motion{{"translation x", TX}, {"translation y", TY}},
}

func texts(r DOFRow) string {
	out := make([]string, len(r.Cells))
	for i, c := range r.Cells {
		out[i] = c.Text
	}
	return strings.Join(out, " ")
}

func TestDOFChartRows(t *testing.T) {
	rows, other := DOFChart(plateDOF)
	if other || len(rows) != 5 {
		t.Fatalf("%d rows, oblique column %v", len(rows), other)
	}
	want := []string{
		"free free A A A free",
		"free B A A A B",
		"C B A A A B",
		"C B A A A B",
		"C B A A A B",
	}
	for i, w := range want {
		if got := texts(rows[i]); got != w {
			t.Errorf("row %d (%s): %q, want %q", i, rows[i].Label, got, w)
		}
	}
	// Removed here is dark; removed before is light.
	if rows[1].Cells[TY].State != cellRemoved || rows[1].Cells[TZ].State != cellFixed {
		t.Errorf("row B states %+v", rows[1].Cells)
	}
	if rows[0].Count != "removes 3" || rows[3].Count != "0 free" || rows[4].Count != "0 moves zone" {
		t.Errorf("counts %q %q %q", rows[0].Count, rows[3].Count, rows[4].Count)
	}

	rows, _ = DOFChart(looseDOF)
	if got := texts(rows[2]); got != "moves moves A A A free" {
		t.Errorf("zone row %q", got)
	}
	if rows[2].Cells[TX].State != cellMoves || rows[2].Cells[RZ].State != cellFree {
		t.Errorf("zone states %+v", rows[2].Cells)
	}
	o := looseDOF
	o.Orientation = true
	o.ZoneFree = []Motion{{"rotation z", RZ}}
	rows, _ = DOFChart(o)
	if got := texts(rows[2]); got != "free free A A A turns" {
		t.Errorf("orientation zone row %q", got)
	}
}

func TestDOFChartObliqueColumn(t *testing.T) {
	d := DOF{Label: "x", Steps: []DOFStep{{Ref: "A", Removes: 1, Removed: []Motion{{"translation (0.6, 0.8, 0)", -1}}}},
		Free: []Motion{{"translation z", TZ}}}
	rows, other := DOFChart(d)
	if !other || len(rows[0].Cells) != 7 || rows[0].Cells[6].Text != "A" {
		t.Fatalf("oblique motion not in its column: %v %+v", other, rows[0].Cells)
	}
	if svg := DOFSVG(d); !strings.Contains(svg, ">oblique</text>") {
		t.Error("no oblique heading")
	}
}

func TestDOFGolden(t *testing.T) {
	golden(t, "dof-plate", DOFSVG(plateDOF))
	golden(t, "dof-loose", DOFSVG(looseDOF))
	golden(t, "dof-problem", DOFSVG(DOF{Label: "line 25", Problem: "datum E is not declared"}))
	svg := DOFSVG(looseDOF)
	for _, want := range []string{">tx<", ">rz<", ">free<", ">moves<", ">removes 3<", "2 moves zone"} {
		if !strings.Contains(svg, want) {
			t.Errorf("chart lacks %q", want)
		}
	}
}

func TestMaterialGolden(t *testing.T) {
	f := MaterialFigure{Title: "bore: position 0.1 at MMC, line 19", Units: "mm", Internal: true, Condition: "MMC",
		MMC: 25, LMC: 25.05, Tolerance: 0.1, Virtual: 24.9, Resultant: 25.2, Bonus: 0.05}
	svg := MaterialSVG(f)
	golden(t, "material-bore", svg)
	for _, want := range []string{"MMC 25<", "LMC 25.05<", "virtual condition 24.9<", "resultant condition 25.2<", "bonus 0 to 0.05 (mm)"} {
		if !strings.Contains(svg, want) {
			t.Errorf("figure lacks %q", want)
		}
	}
	d := MaterialFigure{Title: "datum B", Internal: true, Condition: "MMC", MMC: 10, LMC: 10.1, Datum: true, Boundary: 9.95}
	svg = MaterialSVG(d)
	golden(t, "material-datum", svg)
	if !strings.Contains(svg, "MMB 9.95<") || strings.Contains(svg, "virtual condition") {
		t.Error("a datum figure shows its boundary, not a virtual condition")
	}
	// A zero size tolerance and zero tolerance: nothing to spread, still a figure.
	wellFormed(t, MaterialSVG(MaterialFigure{Condition: "MMC", MMC: 5, LMC: 5, Virtual: 5, Resultant: 5}))
}

// A plate of our own: a base at z = 0 facing -z, a rear face, a bore and
// a slot.
var plate = Views{Units: "mm", Items: []Item{
	{Name: "base", Kind: PlaneItem, Dir: Vec3{0, 0, -1}, Points: []Vec3{{0, 0, 0}}, Datums: []string{"A"}, Describe: "base: plane"},
	{Name: "rear", Kind: PlaneItem, Dir: Vec3{0, -1, 0}, Points: []Vec3{{0, 0, 0}}, Datums: []string{"B"}, Describe: "rear: plane"},
	{Name: "bore", Kind: CylinderItem, Internal: true, Dir: Vec3{0, 0, 1}, Points: []Vec3{{60, 40, 0}}, Size: 25, Describe: "bore: hole"},
	{Name: "bolts", Kind: CylinderItem, Internal: true, Dir: Vec3{0, 0, 1}, Points: []Vec3{{15, 15, 0}, {105, 15, 0}}, Size: 8.4, Describe: "bolts"},
}}

func TestExtentAssumesDepthOnTheMaterialSide(t *testing.T) {
	e := ExtentOf(plate)
	if !e.Assumed[2] || e.Assumed[0] || e.Assumed[1] {
		t.Fatalf("assumed %v", e.Assumed)
	}
	// The base faces -z, so the material is above it: the depth goes up.
	if e.Min[2] != 0 || e.Max[2] != 109.2/6 {
		t.Errorf("z extent %g..%g: want 0 up to a sixth of the x extent", e.Min[2], e.Max[2])
	}
	// The radii grow the box across the axes.
	if e.Max[1] != 52.5 || e.Max[0] != 109.2 || e.Min[0] != 0 {
		t.Errorf("extent %v..%v", e.Min, e.Max)
	}
	// A ball grows it every way, so nothing is assumed.
	balls := Views{Items: []Item{{Kind: SphereItem, Points: []Vec3{{0, 0, 0}, {10, 10, 0}}, Size: 6}}}
	if e := ExtentOf(balls); e.Assumed[2] || e.Min[2] != -3 || e.Max[2] != 3 {
		t.Errorf("balls' extent %v..%v, assumed %v", e.Min, e.Max, e.Assumed)
	}
	if n := ExtentNote(plate); !strings.Contains(n, "along z") || !strings.Contains(n, "mm") {
		t.Errorf("note %q", n)
	}
	if ExtentNote(Views{Items: []Item{{Kind: SphereItem, Points: []Vec3{{0, 0, 0}, {10, 10, 10}}}}}) != "" {
		t.Error("a note where the model gives all three extents")
	}
}

func TestLegendSaysWhereEachIsDrawn(t *testing.T) {
	got := map[string]string{}
	for _, le := range Legend(plate) {
		got[le.Name] = strings.Join(le.In, ",")
	}
	want := map[string]string{"base": "Front,Right", "rear": "Top,Right", "bore": "Top,Front,Right", "bolts": "Top,Front,Right"}
	for k, w := range want {
		if got[k] != w {
			t.Errorf("%s drawn in %q, want %q", k, got[k], w)
		}
	}
}

func TestViewsGolden(t *testing.T) {
	svg := ViewsSVG(plate)
	golden(t, "views-plate", svg)
	for _, want := range []string{"<title>bore: hole</title>", ">bolts (2×)<", ">Top</tspan>", ">Front</tspan>", ">Right</tspan>", ">A</text>"} {
		if !strings.Contains(svg, want) {
			t.Errorf("views lack %q", want)
		}
	}
	// The bore is a circle in the top view and a centre line in the other two.
	if n := strings.Count(svg, `r="`+num(12.5*fitScale(ExtentOf(plate)))+`"`); n < 1 {
		t.Errorf("the bore's circle at scale is missing")
	}
	wellFormed(t, ViewsSVG(Views{}))
}

// Names of features drawn in one place are moved apart, not written over
// each other or over a view's heading.
func TestViewLabelsKeepApart(t *testing.T) {
	v := Views{Items: []Item{
		{Name: "first", Kind: CylinderItem, Dir: Vec3{0, 0, 1}, Points: []Vec3{{10, 10, 0}}, Size: 4},
		{Name: "second", Kind: CylinderItem, Dir: Vec3{0, 0, 1}, Points: []Vec3{{10, 10, 0}}, Size: 4},
		{Name: "third", Kind: CylinderItem, Dir: Vec3{0, 0, 1}, Points: []Vec3{{10, 10, 0}}, Size: 4},
		{Name: "far", Kind: SphereItem, Points: []Vec3{{60, 40, 30}}, Size: 4},
	}}
	svg := ViewsSVG(v)
	// The top view is drawn first: the first label of each name is its own.
	ys := map[string]string{}
	for _, name := range []string{"first", "second", "third"} {
		i := strings.Index(svg, ">"+name+"</text>")
		j := strings.LastIndex(svg[:i], ` y="`)
		ys[name] = svg[j+4 : j+4+strings.IndexByte(svg[j+4:], '"')]
	}
	if ys["first"] == ys["second"] || ys["second"] == ys["third"] || ys["first"] == ys["third"] {
		t.Errorf("labels on one line: %v", ys)
	}
}

// A name at the drawing's edge is moved inside it, datum letters and all.
func TestViewLabelsStayInside(t *testing.T) {
	v := Views{Items: []Item{
		{Name: "a_long_face_name", Kind: PlaneItem, Dir: Vec3{-1, 0, 0}, Points: []Vec3{{0, 0, 0}}, Datums: []string{"C"}},
		{Name: "far", Kind: SphereItem, Points: []Vec3{{80, 50, 20}}, Size: 4},
	}}
	svg := ViewsSVG(v)
	for _, m := range regexpAll(`<(?:text|rect) x="(-?[\d.]+)"`, svg) {
		if strings.HasPrefix(m, "-") {
			t.Errorf("an element starts left of the drawing at x %s", m)
		}
	}
}

func regexpAll(pattern, s string) []string {
	var out []string
	for _, m := range regexp.MustCompile(pattern).FindAllStringSubmatch(s, -1) {
		out = append(out, m[1])
	}
	return out
}
