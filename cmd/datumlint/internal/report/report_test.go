package report

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/cmd/datumlint/internal/report/draw"
	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/qif"
	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/dof"
)

const examples = "../../../../testdata/examples"

// build checks a file as `datumlint check` does and builds its page.
func build(t *testing.T, path string) (*Page, *model.Part, []rules.Diagnostic) {
	t.Helper()
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	name := "testdata/examples/" + filepath.Base(path)
	part := grammar.Read(name, src)
	ds := rules.Check(part, nil)
	return Build(File{Path: name, Source: src, Part: part, Findings: ds}), part, ds
}

func render(t *testing.T, p *Page) string {
	t.Helper()
	var b bytes.Buffer
	if err := p.WriteHTML(&b); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

func examplePaths(t *testing.T) []string {
	paths, err := filepath.Glob(filepath.Join(examples, "*.callouts"))
	if err != nil || len(paths) == 0 {
		t.Fatalf("no examples: %v", err)
	}
	return paths
}

var dataLine = regexp.MustCompile(`<svg [^>]*class="fcf" [^>]*data-line="(\d+)"`)

// Every frame is drawn with its line, every finding's message is on the
// page, and nothing is loaded from anywhere.
func TestPageShowsEveryFrameAndFinding(t *testing.T) {
	for _, path := range examplePaths(t) {
		t.Run(filepath.Base(path), func(t *testing.T) {
			p, part, ds := build(t, path)
			html := render(t, p)
			var lines []int
			for _, m := range dataLine.FindAllStringSubmatch(html, -1) {
				n, _ := strconv.Atoi(m[1])
				lines = append(lines, n)
			}
			if len(lines) != len(part.Frames) {
				t.Errorf("%d frames drawn, the part has %d", len(lines), len(part.Frames))
			}
			for i, fr := range part.Frames {
				if i < len(lines) && lines[i] != fr.Span.Start.Line {
					t.Errorf("frame %d drawn with data-line %d, its statement is on line %d", i, lines[i], fr.Span.Start.Line)
				}
			}
			for _, d := range ds {
				if !strings.Contains(html, escaped(d.Message)) {
					t.Errorf("the page lacks the message %q", d.Message)
				}
			}
			if !strings.Contains(html, escaped(Caution)) {
				t.Error("the page lacks the caution")
			}
			if !strings.Contains(html, escaped(part.Title)) {
				t.Errorf("the page lacks the part's name %q", part.Title)
			}
			selfContained(t, html)
		})
	}
}

// escaped escapes text as the page does in element content: only &, <
// and >, so that a message reads in the source as `datumlint check` prints
// it.
func escaped(s string) string {
	return strings.NewReplacer("&", "&amp;", "<", "&lt;", ">", "&gt;").Replace(s)
}

// selfContained fails on a script or on a reference to anything outside
// the page.
func selfContained(t *testing.T, html string) {
	t.Helper()
	if strings.Contains(strings.ToLower(html), "<script") {
		t.Error("the page has a script")
	}
	ref := regexp.MustCompile(`(?i)(src|href|xlink:href)\s*=\s*"([^"#][^"]*)"|url\(\s*['"]?([^'")#][^'")]*)`)
	for _, m := range ref.FindAllStringSubmatch(html, -1) {
		t.Errorf("the page refers outside itself: %s", m[0])
	}
	if strings.Contains(html, "@import") {
		t.Error("the style sheet imports another")
	}
}

func TestCountsBySeverity(t *testing.T) {
	p, _, ds := build(t, filepath.Join(examples, "gearbox-cover.callouts"))
	var want Counts
	for _, d := range ds {
		if d.Suppressed {
			continue
		}
		switch d.Severity {
		case rules.Error:
			want.Error++
		case rules.Warning:
			want.Warning++
		case rules.Info:
			want.Info++
		}
	}
	if want.Total() == 0 {
		t.Fatal("the gearbox cover is meant to have findings")
	}
	if p.Counts != want {
		t.Errorf("counts %+v, want %+v", p.Counts, want)
	}
	html := render(t, p)
	if !strings.Contains(html, plural(want.Error, "error", "errors")) {
		t.Errorf("the page does not say %q", plural(want.Error, "error", "errors"))
	}
}

func plural(n int, one, many string) string {
	return funcs["plural"].(func(int, string, string) string)(n, one, many)
}

// A finding is shown beside its whole statement, its span marked, with
// the rule's rationale folded under it.
func TestFindingBesideItsStatement(t *testing.T) {
	src := "part \"Test\"\nunits mm\nstandard asme-2018\nfeature base plane normal -z at (0, 0, 0)\n" +
		"feature bore hole size 10 +0.1 -0 axis +z at (5, 5, 0)\ndatum A on base\n" +
		"frame bore: position dia 0.1 (M) \\\n    datums A, Q\n"
	part := grammar.Read("t.callouts", []byte(src))
	ds := rules.Check(part, nil)
	p := Build(File{Path: "t.callouts", Source: []byte(src), Part: part, Findings: ds})
	var undefined *Finding
	for i := range p.Findings {
		if p.Findings[i].Rule == "datum-undefined" {
			undefined = &p.Findings[i]
		}
	}
	if undefined == nil {
		t.Fatalf("no datum-undefined finding among %+v", p.Findings)
	}
	if len(undefined.Lines) != 2 || undefined.Lines[0].N != 7 || undefined.Lines[1].N != 8 {
		t.Fatalf("statement lines %+v, want lines 7 and 8", undefined.Lines)
	}
	if undefined.Lines[1].Marked != "Q" {
		t.Errorf("marked %q, want Q", undefined.Lines[1].Marked)
	}
	if undefined.Rationale == "" || undefined.FrameLine != 7 {
		t.Errorf("rationale %q, frame line %d", undefined.Rationale, undefined.FrameLine)
	}
	if p.Frames[0].FindingID == "" || p.Frames[0].Findings == 0 {
		t.Errorf("the frame does not link to its findings: %+v", p.Frames[0])
	}
	html := render(t, p)
	if !strings.Contains(html, "<mark>Q</mark>") || !strings.Contains(html, "<details><summary>Why this matters (datum-undefined)") {
		t.Error("the finding's span or rationale is not on the page")
	}
}

func TestIndexListsEveryPart(t *testing.T) {
	var entries []IndexEntry
	for _, path := range examplePaths(t) {
		p, _, _ := build(t, path)
		entries = append(entries, p.Entry(strings.TrimSuffix(filepath.Base(path), ".callouts")+".html"))
	}
	var b bytes.Buffer
	if err := WriteIndex(&b, entries); err != nil {
		t.Fatal(err)
	}
	html := b.String()
	for _, e := range entries {
		if !strings.Contains(html, `<a href="`+e.Href+`">`+escaped(e.Title)+`</a>`) {
			t.Errorf("the index lacks a link to %s", e.Href)
		}
	}
	if !strings.Contains(html, escaped(Caution)) {
		t.Error("the index lacks the caution")
	}
	// Relative links are expected in the index; nothing else may point out.
	if strings.Contains(strings.ToLower(html), "<script") || regexp.MustCompile(`(?i)https?:|//`).MatchString(html) {
		t.Error("the index has a script or a web address")
	}
}

// relLuminance and contrast follow WCAG 2.1, definitions of relative
// luminance and contrast ratio.
func relLuminance(hex string) float64 {
	v, _ := strconv.ParseUint(strings.TrimPrefix(hex, "#"), 16, 32)
	if len(hex) == 4 {
		r, g, b := (v>>8)&0xf, (v>>4)&0xf, v&0xf
		v = r*0x110000 + g*0x1100 + b*0x11
	}
	ch := func(c uint64) float64 {
		s := float64(c) / 255
		if s <= 0.04045 {
			return s / 12.92
		}
		return math.Pow((s+0.055)/1.055, 2.4)
	}
	return 0.2126*ch(v>>16&0xff) + 0.7152*ch(v>>8&0xff) + 0.0722*ch(v&0xff)
}

func contrast(a, b string) float64 {
	la, lb := relLuminance(a), relLuminance(b)
	if la < lb {
		la, lb = lb, la
	}
	return (la + 0.05) / (lb + 0.05)
}

func TestContrastOfAKnownPair(t *testing.T) {
	// Black on white is 21:1 and #777 on white about 4.48:1 (WCAG 2.1,
	// understanding contrast minimum, from memory).
	if c := contrast("#000", "#fff"); c < 20.99 || c > 21.01 {
		t.Errorf("black on white %.3f", c)
	}
	if c := contrast("#777777", "#ffffff"); c < 4.4 || c > 4.5 {
		t.Errorf("#777 on white %.3f", c)
	}
}

// Every colour pair the style sheet uses passes WCAG 2.1 AA for text
// (4.5:1), and so do the drawings' text colours; the views' grey extent
// line is a graphic and needs 3:1 (non-text contrast).
func TestColoursPassAA(t *testing.T) {
	for _, c := range palette {
		if r := contrast(c.Fg, c.Bg); r < 4.5 {
			t.Errorf("%s: %s on %s is %.2f:1", c.Name, c.Fg, c.Bg, r)
		}
	}
	// Muted text and links also sit on the code and head backgrounds.
	for _, fg := range []string{"#4d4d4d", "#0b4f8a"} {
		for _, bg := range []string{"#f2f2f2", "#e8edf3", "#fff4d6"} {
			if r := contrast(fg, bg); r < 4.5 {
				t.Errorf("%s on %s is %.2f:1", fg, bg, r)
			}
		}
	}
	for _, p := range [][2]string{
		{"#ffffff", draw.DarkCell}, {draw.CellText, draw.LightCell}, {draw.CellText, draw.ZoneCell},
		{draw.CellText, "#ffffff"}, {draw.FeatureInk, "#ffffff"},
	} {
		if r := contrast(p[0], p[1]); r < 4.5 {
			t.Errorf("drawing text %s on %s is %.2f:1", p[0], p[1], r)
		}
	}
	for _, g := range []string{draw.ExtentInk, draw.CentreInk, draw.LightText, "#595959"} {
		if r := contrast(g, "#ffffff"); r < 3 {
			t.Errorf("graphic %s on white is %.2f:1", g, r)
		}
	}
}

// The style sheet names no colour of its own: every colour comes from the
// palette the contrast test checks.
func TestStyleSheetUsesOnlyThePalette(t *testing.T) {
	if m := regexp.MustCompile(`#[0-9a-fA-F]{3,6}\b|rgb\(|hsl\(`).FindString(styleSheet); m != "" {
		t.Errorf("style.css names the colour %s; add it to the palette instead", m)
	}
}

// Every rule test file, good or bad, builds a page that draws each of its
// frames and shows each finding: a broken file is still reported.
func TestEveryRuleTestFileBuilds(t *testing.T) {
	paths, _ := filepath.Glob("../../../../rules/testdata/*.callouts")
	if len(paths) == 0 {
		t.Fatal("no rule test files")
	}
	for _, path := range paths {
		src, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		part := grammar.Read(path, src)
		ds := rules.Check(part, nil)
		p := Build(File{Path: path, Source: src, Part: part, Findings: ds})
		html := render(t, p)
		if n := len(dataLine.FindAllString(html, -1)); n != len(part.Frames) {
			t.Errorf("%s: %d frames drawn of %d", path, n, len(part.Frames))
		}
		for _, d := range ds {
			if !strings.Contains(html, escaped(d.Message)) {
				t.Errorf("%s: the page lacks %q", path, d.Message)
			}
		}
		selfContained(t, html)
	}
}

// A datum feature of size referenced at MMB gets its boundary from the
// tolerance relating it to the datum before it.
func TestDatumAtMMBFigure(t *testing.T) {
	src := `part "Bracket"
units mm
standard asme-2018
feature base plane normal -z at (0, 0, 0)
feature pilot hole size 12 +0.05 -0 axis +z at (30, 30, 0)
feature tab_face plane normal -x at (0, 0, 0)
feature holes hole 2x size 6 +0.1 -0 axis +z at (10, 30, 0) (50, 30, 0)
datum A on base
datum B on pilot
datum C on tab_face
frame base: flatness 0.02
frame pilot: perpendicularity dia 0.03 (M) datums A
frame tab_face: perpendicularity 0.1 datums A, B
frame holes: position dia 0.2 (M) datums A, B(M), C
basic 20 from pilot to holes.1
basic 30 from tab_face to pilot
`
	part := grammar.Read("b.callouts", []byte(src))
	p := Build(File{Path: "b.callouts", Source: []byte(src), Part: part, Findings: rules.Check(part, nil)})
	var datum, pilot, holes *MaterialEntry
	for i := range p.Materials {
		m := &p.Materials[i]
		switch {
		case m.Figure.Datum:
			datum = m
		case strings.HasPrefix(m.Figure.Title, "pilot"):
			pilot = m
		case strings.HasPrefix(m.Figure.Title, "holes"):
			holes = m
		}
	}
	if datum == nil || pilot == nil || holes == nil {
		t.Fatalf("figures %+v", p.Materials)
	}
	// MMB = 12 − 0.03 (worked by hand: the pilot's MMC less its
	// perpendicularity at MMC to A).
	if !near(datum.Figure.Boundary, 11.97) || !strings.Contains(datum.Notes[0], "perpendicularity dia 0.03 (M) to A, line 12") {
		t.Errorf("datum B at MMB: %+v", datum)
	}
	if !near(pilot.Figure.Virtual, 11.97) || !near(holes.Figure.Virtual, 5.8) || !near(holes.Figure.Resultant, 6.4) {
		t.Errorf("pilot VC %g, holes VC %g RC %g", pilot.Figure.Virtual, holes.Figure.Virtual, holes.Figure.Resultant)
	}
	html := render(t, p)
	if !strings.Contains(html, "MMB 11.97") {
		t.Error("the figure does not show the boundary")
	}
}

func near(a, b float64) bool { return math.Abs(a-b) < 1e-9 }

// The charts carry the numbers of `datumlint dof`: for the contract's
// mounting plate (docs/notation.md's complete example), the bore's
// position to A, B, C has A removing 3, B 2 and C 1, and nothing free.
func TestChartsCarryTheContractsNumbers(t *testing.T) {
	p, _, _ := build(t, filepath.Join(examples, "mounting-plate.callouts"))
	var bore *FrameEntry
	for i := range p.Frames {
		if p.Frames[i].Frame.Target == "bore" {
			bore = &p.Frames[i]
		}
	}
	if bore == nil || len(bore.DOF) != 1 {
		t.Fatalf("no chart for the bore: %+v", bore)
	}
	d := bore.DOF[0]
	var got []string
	for _, s := range d.Steps {
		got = append(got, s.Ref+"="+strconv.Itoa(s.Removes))
	}
	if strings.Join(got, " ") != "A=3 B=2 C=1" || len(d.Free) != 0 || len(d.ZoneFree) != 0 {
		t.Errorf("bore: %v, free %v, zone %v", got, d.Free, d.ZoneFree)
	}
	// Each removed motion of the plate's axis-aligned datums has its column.
	for _, s := range d.Steps {
		for _, m := range s.Removed {
			if m.Column < 0 {
				t.Errorf("%s: %q in no column", s.Ref, m.Name)
			}
		}
	}
}

func TestMotionColumns(t *testing.T) {
	for _, c := range []struct {
		tw   dof.Twist
		want int
	}{
		{dof.Twist{V: dof.Vec{1, 0, 0}}, draw.TX},
		{dof.Twist{V: dof.Vec{0, 0, -2}}, draw.TZ},
		{dof.Twist{W: dof.Vec{0, 0, 1}, V: dof.Vec{40, -60, 0}}, draw.RZ}, // about z through (60, 40, 0)
		{dof.Twist{W: dof.Vec{0, 1, 0}}, draw.RY},
		{dof.Twist{V: dof.Vec{0.6, 0.8, 0}}, -1},
		{dof.Twist{W: dof.Vec{1, 1, 0}}, -1},
	} {
		if got := column(c.tw); got != c.want {
			t.Errorf("column(%+v) = %d, want %d", c.tw, got, c.want)
		}
	}
}

// The pump flange's page has an inspection set-up per distinct datum
// reference frame, in first use: A; A, B(M); A, B(M), C(M). The bore's
// simulator at MMB is a fixed pin of its MMC less the perpendicularity at
// MMC to A (25 − 0.05 = 24.95), the keyway's a block of its MMC less its
// position at MMC to A and B (6 − 0.1 = 5.9); each frame links to its
// set-up, and each set-up is drawn.
func TestSetupSection(t *testing.T) {
	p, part, _ := build(t, filepath.Join(examples, "pump-flange.callouts"))
	var labels []string
	for _, s := range p.Setups {
		labels = append(labels, s.Label)
	}
	if got := strings.Join(labels, " | "); got != "A | A, B(M) | A, B(M), C(M)" {
		t.Fatalf("set-ups %q", got)
	}
	last := p.Setups[2]
	if len(last.Rows) != 3 || len(last.Figure.Simulators) != 3 {
		t.Fatalf("rows %+v", last.Rows)
	}
	b, c := last.Rows[1], last.Rows[2]
	if b.Kind != "fixed-size cylinder" || len(b.Sizes) != 1 || !strings.HasPrefix(b.Sizes[0], "B on bore: ⌀24.95, the virtual condition from perpendicularity") {
		t.Errorf("B(M): %+v", b)
	}
	if c.Kind != "fixed-size width" || len(c.Sizes) != 1 || !strings.HasPrefix(c.Sizes[0], "C on key: 5.9, the virtual condition from position 0.1 (M) to A, B") {
		t.Errorf("C(M): %+v", c)
	}
	if last.Rows[0].Points != 3 || b.Points != 0 || b.Constrains != 2 || c.Constrains != 1 {
		t.Errorf("contact and counts: %+v", last.Rows)
	}
	html := render(t, p)
	for _, s := range p.Setups {
		if !strings.Contains(html, `<figure class="setup" id="`+s.ID+`">`) || !strings.Contains(html, `data-setup="`+s.Label+`"`) {
			t.Errorf("set-up %s (%s) is not drawn", s.ID, s.Label)
		}
	}
	// Each frame with datums links to its set-up; the flatness has none.
	for i, fr := range part.Frames {
		id := p.Frames[i].SetupIDs[0]
		if (id == "") != (len(fr.Upper().Refs) == 0) {
			t.Errorf("frame on line %d: set-up %q", fr.Span.Start.Line, id)
		}
		if id != "" && !strings.Contains(html, `href="#`+id+`"`) {
			t.Errorf("frame on line %d does not link to %s", fr.Span.Start.Line, id)
		}
	}
	// The datum's material figure has the same boundary as its simulator.
	found := false
	for _, m := range p.Materials {
		if m.Figure.Datum && strings.HasPrefix(m.Figure.Title, "datum B on bore at MMB after A") {
			found = near(m.Figure.Boundary, 24.95)
		}
	}
	if !found {
		t.Errorf("no material figure for B at MMB with 24.95: %+v", p.Materials)
	}
}

// A set-up that cannot be worked out says why, and one the page lists
// for a frame without datums is none.
func TestSetupProblem(t *testing.T) {
	p, _, _ := build(t, filepath.Join(examples, "gearbox-cover.callouts"))
	var bad *SetupEntry
	for i := range p.Setups {
		if p.Setups[i].Label == "A, B, E" {
			bad = &p.Setups[i]
		}
	}
	if bad == nil || bad.Problem != "datum E is not declared" || len(bad.Rows) != 0 {
		t.Fatalf("set-up A, B, E: %+v", bad)
	}
	if html := render(t, p); !strings.Contains(html, "Not worked out: datum E is not declared.") {
		t.Error("the page does not say why A, B, E was not worked out")
	}
}

// A QIF document's frames are drawn with their tolerance values: the value
// spans of a QIF part cover XML elements, not the number, so a compartment
// must show the model's value, never the element's start tag.
func TestQIFFramesShowTheirValues(t *testing.T) {
	path := filepath.Join(examples, "bearing-flange.qif")
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	part := qif.Read(path, src)
	if len(part.Frames) == 0 {
		t.Fatal("the QIF example has no frames")
	}
	ds := rules.Check(part, nil)
	p := Build(File{Path: path, Source: src, Part: part, Findings: ds})
	html := render(t, p)
	if strings.Contains(html, "ToleranceValue") {
		t.Error("the page shows a QIF element's tag where a tolerance value belongs")
	}
	for _, fr := range part.Frames {
		svg := regexp.MustCompile(`<svg [^>]*class="fcf" [^>]*data-line="` + strconv.Itoa(fr.Span.Start.Line) + `".*?</svg>`).FindString(html)
		if svg == "" {
			t.Errorf("line %d: the frame is not drawn", fr.Span.Start.Line)
			continue
		}
		for _, seg := range fr.Segments {
			if want := ">" + draw.Number(seg.Value) + "</text>"; !strings.Contains(svg, want) {
				t.Errorf("line %d: the frame's compartment does not show the tolerance %s: %s", fr.Span.Start.Line, draw.Number(seg.Value), svg)
			}
		}
	}
}

// A tolerance per unit length or area is drawn as the frame states it,
// value and unit in one compartment (ASME Y14.5-2018, per-unit
// straightness and flatness, from memory): the value alone would read as
// a tolerance on the whole feature.
func TestPerUnitToleranceDrawn(t *testing.T) {
	src := []byte(`part "Per unit"
units mm
standard asme-2018
feature edge1 pin size 6 +-0.1 axis +x at (0, 5, 5)
feature base  plane normal -z at (0, 0, 0)
frame edge1: straightness dia 0.01/25
frame base: flatness 0.005/25x25
`)
	part := grammar.Read("per-unit.callouts", src)
	p := Build(File{Path: "per-unit.callouts", Source: src, Part: part, Findings: rules.Check(part, nil)})
	html := render(t, p)
	for line, want := range map[int]string{6: "0.01/25", 7: "0.005/25x25"} {
		svg := regexp.MustCompile(`<svg [^>]*class="fcf" [^>]*data-line="` + strconv.Itoa(line) + `".*?</svg>`).FindString(html)
		if !strings.Contains(svg, ">"+want+"</text>") {
			t.Errorf("line %d: the frame does not show %s: %s", line, want, svg)
		}
	}
}
