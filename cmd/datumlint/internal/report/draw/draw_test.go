package draw

import (
	"encoding/xml"
	"flag"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the golden SVG files in testdata")

func ref(letters ...string) DatumRef {
	var r DatumRef
	for _, l := range letters {
		dl := DatumLetter{Letter: strings.TrimRight(l, "ML()")}
		if i := strings.IndexByte(l, '('); i > 0 {
			dl.Letter, dl.Material = l[:i], l[i+1:i+2]
		}
		r.Letters = append(r.Letters, dl)
	}
	return r
}

func refs(names ...string) []DatumRef {
	var out []DatumRef
	for _, n := range names {
		out = append(out, ref(strings.Split(n, "-")...))
	}
	return out
}

// goldenFrames are representative frames: every characteristic symbol,
// both zone signs, every modifier, common datums with boundaries, and
// composite frames of two and three rows.
var goldenFrames = map[string]Frame{
	"flatness": {Line: 3, Target: "base", Characteristic: Flatness,
		Segments: []Segment{{Value: "0.02"}}, Statement: "frame base: flatness 0.02"},
	"position-mmc": {Line: 19, Target: "bore", Characteristic: Position,
		Segments:  []Segment{{Zone: Diameter, Value: "0.1", Modifiers: []Modifier{{Letter: "M"}}, Datums: refs("A", "B", "C")}},
		Statement: "frame bore: position dia 0.1 (M) datums A, B, C"},
	"composite-position": {Line: 20, Target: "bolts", Characteristic: Position,
		Segments: []Segment{
			{Zone: Diameter, Value: "0.4", Modifiers: []Modifier{{Letter: "M"}}, Datums: refs("A", "B", "C")},
			{Zone: Diameter, Value: "0.1", Modifiers: []Modifier{{Letter: "M"}}, Datums: refs("A")},
		}},
	"composite-three": {Line: 30, Target: "pins", Characteristic: SurfaceProfile,
		Segments: []Segment{
			{Value: "0.8", Datums: refs("A", "B", "C")},
			{Value: "0.3", Datums: refs("A", "B")},
			{Value: "0.1", Datums: refs("A")},
		}},
	"projected": {Line: 7, Target: "stud_hole", Characteristic: Perpendicularity,
		Segments: []Segment{{Zone: Diameter, Value: "0.02", Modifiers: []Modifier{{Letter: "M"}, {Letter: "P", Value: "12"}}, Datums: refs("A")}}},
	"unequal-profile": {Line: 8, Target: "skin", Characteristic: SurfaceProfile,
		Segments: []Segment{{Value: "0.2", Modifiers: []Modifier{{Letter: "U", Value: "0.05"}}, Datums: refs("A", "B")}}},
	"sphere-common-mmb": {Line: 9, Target: "ball", Characteristic: Position,
		Segments: []Segment{{Zone: SphericalDiameter, Value: "0.3", Datums: refs("A(M)-B(M)", "C(L)")}}},
	"total-runout": {Line: 10, Target: "journal", Characteristic: TotalRunout,
		Segments: []Segment{{Value: "0.05", Datums: refs("A-B")}}},
	"free-tangent-envelope": {Line: 11, Target: "flange", Characteristic: Flatness,
		Segments: []Segment{{Value: "0.1", Modifiers: []Modifier{{Letter: "F"}, {Letter: "T"}, {Letter: "E"}}}}},
	"lmc-two-letter": {Line: 12, Target: "web", Characteristic: Position,
		Segments: []Segment{{Value: "0.25", Modifiers: []Modifier{{Letter: "L"}}, Datums: refs("AA", "AB(M)")}}},
	"unknown": {Line: 13, Target: "x", Characteristic: UnknownCharacteristic, Segments: []Segment{{Value: "0.1"}}},
}

func init() {
	// One frame per remaining symbol, so that every path is under a golden file.
	for _, c := range []Characteristic{Straightness, Circularity, Cylindricity, LineProfile, Angularity,
		Parallelism, Concentricity, Symmetry, CircularRunout} {
		name := "symbol-" + strings.ReplaceAll(c.String(), " ", "-")
		seg := Segment{Value: "0.05"}
		if c >= Angularity {
			seg.Datums = refs("A")
		}
		goldenFrames[name] = Frame{Line: 40 + int(c), Target: "f", Characteristic: c, Segments: []Segment{seg}}
	}
}

// golden compares got with testdata/name.svg, or rewrites it with -update.
func golden(t *testing.T, name, got string) {
	t.Helper()
	wellFormed(t, got)
	path := filepath.Join("testdata", name+".svg")
	if *update {
		if err := os.WriteFile(path, []byte(got+"\n"), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test -update to write it)", err)
	}
	if w := strings.TrimSuffix(string(want), "\n"); w != got {
		i := 0
		for i < len(w) && i < len(got) && w[i] == got[i] {
			i++
		}
		from := max(i-80, 0)
		t.Errorf("%s differs from the drawing at byte %d (look at it, then run go test -update):\ngot  …%.240s\nwant …%.240s",
			path, i, got[from:], w[from:])
	}
}

// wellFormed fails unless s is one well-formed XML element.
func wellFormed(t *testing.T, s string) {
	t.Helper()
	d := xml.NewDecoder(strings.NewReader(s))
	depth, roots := 0, 0
	for {
		tok, err := d.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("not well-formed XML: %v\n%s", err, s)
		}
		switch tok.(type) {
		case xml.StartElement:
			if depth == 0 {
				roots++
			}
			depth++
		case xml.EndElement:
			depth--
		}
	}
	if roots != 1 || depth != 0 {
		t.Fatalf("%d root elements, depth %d at the end", roots, depth)
	}
}

func TestFrameGolden(t *testing.T) {
	for name, f := range goldenFrames {
		t.Run(name, func(t *testing.T) {
			golden(t, "frame-"+name, FrameSVG(f))
		})
	}
}

func TestFrameCarriesLineAndTitle(t *testing.T) {
	f := goldenFrames["position-mmc"]
	svg := FrameSVG(f)
	if !strings.HasPrefix(svg, `<svg xmlns="http://www.w3.org/2000/svg" class="fcf" `) || !strings.Contains(svg[:200], ` data-line="19"`) {
		t.Errorf("the outermost element does not carry data-line: %.200s", svg)
	}
	if !strings.Contains(svg, "<title>frame bore: position dia 0.1 (M) datums A, B, C</title>") {
		t.Error("no title with the statement")
	}
	// Without a statement the title says the frame in words.
	f.Statement = ""
	if svg := FrameSVG(f); !strings.Contains(svg, "<title>bore: position, diameter 0.1 at MMC, datums A, B, C</title>") {
		t.Errorf("title from Describe missing: %s", svg)
	}
	// Text is text: selectable, in the generic stack.
	if !strings.Contains(svg, `font-family="`+FontFamily+`"`) || !strings.Contains(svg, ">0.1</text>") {
		t.Error("the value is not text in the font stack")
	}
	if !strings.HasSuffix(FontFamily, "sans-serif") {
		t.Error("the font stack does not end in a generic family")
	}
}

func TestEverySymbolIsAPath(t *testing.T) {
	seen := map[string]Characteristic{}
	for c := Straightness; c <= TotalRunout; c++ {
		stroke, _ := symbolPaths(c, 0, 0, 10)
		if stroke == "" {
			t.Errorf("%v has no path", c)
		}
		if other, dup := seen[stroke]; dup {
			t.Errorf("%v draws the same as %v", c, other)
		}
		seen[stroke] = c
	}
	if s, _ := symbolPaths(UnknownCharacteristic, 0, 0, 10); s != "" {
		t.Error("an unknown characteristic has a symbol")
	}
	_, fill := symbolPaths(CircularRunout, 0, 0, 10)
	_, fill2 := symbolPaths(TotalRunout, 0, 0, 10)
	if strings.Count(fill, "M") != 1 || strings.Count(fill2, "M") != 2 {
		t.Errorf("runout arrowheads: circular %q, total %q", fill, fill2)
	}
}

func TestWidthsGrowWithText(t *testing.T) {
	base := Frame{Characteristic: Position, Segments: []Segment{{Zone: Diameter, Value: "0.1", Datums: refs("A")}}}
	w0 := LayoutFrame(base).Rows[0].Tolerance.W
	longer := base
	longer.Segments = []Segment{{Zone: Diameter, Value: "0.125", Datums: refs("A")}}
	if w := LayoutFrame(longer).Rows[0].Tolerance.W; w <= w0 {
		t.Errorf("0.125 is %g wide, 0.1 %g", w, w0)
	}
	mod := base
	mod.Segments = []Segment{{Zone: Diameter, Value: "0.1", Modifiers: []Modifier{{Letter: "M"}}, Datums: refs("A")}}
	wm := LayoutFrame(mod).Rows[0].Tolerance.W
	if wm <= w0 {
		t.Errorf("a modifier adds no width: %g vs %g", wm, w0)
	}
	proj := base
	proj.Segments = []Segment{{Zone: Diameter, Value: "0.1", Modifiers: []Modifier{{Letter: "M"}, {Letter: "P", Value: "12"}}, Datums: refs("A")}}
	if w := LayoutFrame(proj).Rows[0].Tolerance.W; w <= wm+circledWidth(FontSize) {
		t.Errorf("(P) 12 adds too little: %g vs %g", w, wm)
	}
	noZone := base
	noZone.Segments = []Segment{{Value: "0.1", Datums: refs("A")}}
	if w := LayoutFrame(noZone).Rows[0].Tolerance.W; w >= w0 {
		t.Errorf("the diameter sign takes no room: %g vs %g", w, w0)
	}
	one := LayoutFrame(base).Rows[0].Datums[0].W
	two := LayoutFrame(Frame{Segments: []Segment{{Value: "0.1", Datums: refs("A-B")}}}).Rows[0].Datums[0].W
	mmb := LayoutFrame(Frame{Segments: []Segment{{Value: "0.1", Datums: refs("A(M)-B(M)")}}}).Rows[0].Datums[0].W
	if !(one < two && two < mmb) {
		t.Errorf("datum compartments A %g, A-B %g, A(M)-B(M) %g: each should be wider", one, two, mmb)
	}
	// Every compartment holds its text.
	for name, f := range goldenFrames {
		l := LayoutFrame(f)
		for i, s := range f.Segments {
			if l.Rows[i].Tolerance.W < toleranceWidth(s)+2*pad {
				t.Errorf("%s row %d: the tolerance text overflows", name, i)
			}
			for k, d := range s.Datums {
				if l.Rows[i].Datums[k].W < datumWidth(d)+2*pad {
					t.Errorf("%s row %d: datum %d overflows", name, i, k)
				}
			}
		}
	}
}

func TestCompartmentsInOrder(t *testing.T) {
	for name, f := range goldenFrames {
		l := LayoutFrame(f)
		if l.Symbol.X != margin || l.Symbol.H != RowHeight*float64(len(f.Segments)) {
			t.Errorf("%s: the symbol compartment %+v does not span the %d rows", name, l.Symbol, len(f.Segments))
		}
		for i, r := range l.Rows {
			if r.Tolerance.X != l.Symbol.X+l.Symbol.W {
				t.Errorf("%s row %d: the tolerance does not follow the symbol", name, i)
			}
			if r.Tolerance.Y != margin+RowHeight*float64(i) {
				t.Errorf("%s row %d at y %g", name, i, r.Tolerance.Y)
			}
			x := r.Tolerance.X + r.Tolerance.W
			for k, d := range r.Datums {
				if d.X != x {
					t.Errorf("%s row %d: datum %d at %g, want %g (right after the one before)", name, i, k, d.X, x)
				}
				x += d.W
				if x > l.Width {
					t.Errorf("%s: datum %d beyond the frame's width", name, k)
				}
			}
		}
		// Columns line up across the rows of a composite frame.
		for i := 1; i < len(l.Rows); i++ {
			if l.Rows[i].Tolerance.W != l.Rows[0].Tolerance.W {
				t.Errorf("%s: tolerance columns differ", name)
			}
			for k := range l.Rows[i].Datums {
				if k < len(l.Rows[0].Datums) && l.Rows[i].Datums[k].X != l.Rows[0].Datums[k].X {
					t.Errorf("%s: datum column %d does not line up", name, k)
				}
			}
		}
	}
}

func TestDescribe(t *testing.T) {
	for name, want := range map[string]string{
		"composite-position": "bolts: position, diameter 0.4 at MMC, datums A, B, C; composite segment: diameter 0.1 at MMC, datums A",
		"sphere-common-mmb":  "ball: position, spherical diameter 0.3, datums A-B at MMB, C at LMB",
		"projected":          "stud_hole: perpendicularity, diameter 0.02 at MMC projected zone 12, datums A",
		"flatness":           "base: flatness, 0.02, no datums",
	} {
		if got := Describe(goldenFrames[name]); got != want {
			t.Errorf("%s: %q, want %q", name, got, want)
		}
	}
}

func TestDatumSymbolGolden(t *testing.T) {
	svg := DatumSymbolSVG(DatumSymbol{Letter: "A", Target: "base", Line: 10, Statement: "datum A on base"})
	golden(t, "datum-A", svg)
	if !strings.Contains(svg, `data-datum-line="10"`) || strings.Contains(svg, ` data-line=`) {
		t.Error("a datum symbol must carry data-datum-line, not a frame's data-line")
	}
	wide := DatumSymbolSVG(DatumSymbol{Letter: "AB", Target: "web", Line: 11})
	golden(t, "datum-AB", wide)
}

func TestNumber(t *testing.T) {
	for _, c := range []struct {
		x    float64
		want string
	}{{25.05 + 0.15, "25.2"}, {0.1 + 0.2, "0.3"}, {-0.0, "0"}, {12, "12"}, {1e-10, "0"}} {
		if got := Number(c.x); got != c.want {
			t.Errorf("Number(%v) = %q, want %q", c.x, got, c.want)
		}
	}
}

func TestEscapesText(t *testing.T) {
	f := Frame{Line: 1, Target: `a<b>&"c"`, Characteristic: Flatness, Segments: []Segment{{Value: "<0.1>"}}, Statement: `x & <y>`}
	svg := FrameSVG(f)
	wellFormed(t, svg)
	if strings.Contains(svg, "<0.1>") || strings.Contains(svg, "<y>") {
		t.Error("text is not escaped")
	}
}
