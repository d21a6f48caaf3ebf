package qif

import (
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// The NIST PMI test models (public test data, testdata/qif/nist), read as
// their XML says: the facts below were read off the files by hand.

func readNIST(t *testing.T, name string) (*Result, string) {
	t.Helper()
	return readPath(t, filepath.Join("..", "..", "testdata", "qif", "nist", name+".qif"))
}

func readPath(t *testing.T, path string) (*Result, string) {
	t.Helper()
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	res, err := ReadFile(source.NewFile(path, src))
	if err != nil {
		t.Fatal(err)
	}
	return res, string(src)
}

// frameText writes a frame as the notation would, for comparing.
func frameText(fr *model.Frame) string {
	var segs []string
	for _, s := range fr.Segments {
		seg := strings.TrimSpace(strings.Join([]string{s.Zone, trimFloat(s.Value), modifiers(s)}, " "))
		if u := s.PerUnit; u != nil {
			seg += "/" + u.Text
		}
		if d := s.ZoneDir; d != nil {
			seg += fmt.Sprintf(" along %v", *d)
		}
		if len(s.Refs) > 0 {
			seg += " datums " + strings.ReplaceAll(refNames(s), " ", ", ")
		}
		if s.Separate {
			seg += " separate"
		}
		if fr.Extent != "" && s == fr.Upper() {
			seg += " " + fr.Extent
		}
		segs = append(segs, strings.Join(strings.Fields(seg), " "))
	}
	return fr.Target.Name + ": " + string(fr.Characteristic) + " " + strings.Join(segs, " | composite ")
}

func trimFloat(x float64) string { return strconv.FormatFloat(x, 'f', -1, 64) }

func datumsText(p *model.Part) string {
	var out []string
	for _, d := range p.Datums {
		on := d.Target.Name
		if d.Broken {
			on = "(left out)"
		}
		out = append(out, d.Letter+" "+on)
	}
	return strings.Join(out, ", ")
}

func kindsText(p *model.Part) string {
	count := map[string]int{}
	for _, f := range p.Features {
		k := f.Kind.String()
		if f.Pattern {
			k += " pattern"
		}
		count[k]++
	}
	var out []string
	for k, n := range count {
		out = append(out, fmt.Sprintf("%d %s", n, k))
	}
	sort.Strings(out)
	return strings.Join(out, ", ")
}

// noteWant is how many notes of a kind match a pattern.
type noteWant struct {
	kind    model.ProblemKind
	pattern string
	n       int
}

func wantNoteCounts(t *testing.T, res *Result, want []noteWant) {
	t.Helper()
	for _, w := range want {
		re := regexp.MustCompile(w.pattern)
		n := 0
		for _, x := range res.Part.Problems {
			if x.Kind == w.kind && re.MatchString(x.Message) {
				n++
			}
		}
		if n != w.n {
			t.Errorf("%d %s notes matching %q, want %d", n, kindName(w.kind), w.pattern, w.n)
		}
	}
}

// facts are what a model's part must be.
type facts struct {
	units    model.Units
	standard model.Standard
	datums   string
	kinds    string
	frames   []string
	notes    int
}

func (w facts) check(t *testing.T, res *Result) {
	t.Helper()
	p := res.Part
	if p.Units != w.units || p.Standard != w.standard {
		t.Errorf("units %v standard %v, want %v %v", p.Units, p.Standard, w.units, w.standard)
	}
	if got := datumsText(p); got != w.datums {
		t.Errorf("datums %s\nwant   %s", got, w.datums)
	}
	if got := kindsText(p); got != w.kinds {
		t.Errorf("features %s\nwant     %s", got, w.kinds)
	}
	wantFrames(t, p, w.frames...)
	if len(res.Part.Problems) != w.notes {
		t.Errorf("%d notes, want %d", len(res.Part.Problems), w.notes)
		for _, n := range res.Part.Problems {
			t.Log(n)
		}
	}
}

func wantFrames(t *testing.T, p *model.Part, want ...string) {
	t.Helper()
	var got []string
	for _, fr := range p.Frames {
		got = append(got, frameText(fr))
	}
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("frames:\n%s\nwant:\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
}

// CTC 01: a plate in mm; datums A (the top face), B and C (two holes);
// position of two slot widths without a diameter symbol, surface profiles
// (one all around the hexagonal boss, nominal 2173), perpendicularity and
// flatness; sizes of six holes; an angular size on a tapered slot; two
// line features (edges that carry notes).
func TestNISTCTC01(t *testing.T) {
	res, _ := readNIST(t, "nist_ctc_01_asme1_ap242")
	p := res.Part
	facts{units: model.MM, standard: model.ASME2009, notes: 2,
		datums: "A plane_2154, B hole_2156, C hole_2157",
		kinds:  "2 line, 2 plane, 2 slot, 3 surface, 7 hole",
		frames: []string{
			"slot_2159: position 0.75 datums A, B, C",
			"slot_2161: position 0.75 datums A, B, C",
			"surface_2166: surface-profile 1.25 datums A, B, C",
			"surface_2173: surface-profile 0.5 datums A all-around",
			"plane_2162: perpendicularity 1.5 datums A",
			"plane_2154: flatness 0.2"},
	}.check(t, res)
	if p.Title != "NIST Test Case 1" {
		t.Errorf("title %q", p.Title)
	}
	if s := feature(t, p, "hole_2156").Size; s.Max() != 35 || !near(s.Min(), 34.8) {
		t.Errorf("datum B's size %+v", s)
	}
	if len(p.Dims) != 0 || p.Basis != model.ModelBasis {
		t.Errorf("%d dimensions, basis %v: the model carries no dimensions, and its nominal geometry is basic", len(p.Dims), p.Basis)
	}
	if e := feature(t, p, "line_2184"); e.Kind != model.Line || e.Dir.Norm() != 1 {
		t.Errorf("edge 2184: %v along %v", e.Kind, e.Dir)
	}
	wantNoteCounts(t, res, []noteWant{
		{Unsupported, `angular size \(Angle\) nominal 1491`, 1},
		{Unsupported, `two opposed angled planes`, 1},
	})
}

// CTC 03: geometry in mm, sizes labelled inch, geometric tolerances
// labelled mm (the unit-label note); six datums; patterns of 2 and 4 holes
// at MMC with datums at MMB; flatness per unit area; a basic angle of -1 on
// the angularity; one toleranced distance over four faces from datum D; a
// reference width.
func TestNISTCTC03(t *testing.T) {
	res, _ := readNIST(t, "nist_ctc_03_asme1_ap242")
	p := res.Part
	facts{units: model.MM, standard: model.ASME2009, notes: 2,
		datums: "B hole_3051, A plane_3050, C hole_3048, D plane_3052, E plane_3053, F hole_3066",
		kinds:  "1 slot, 2 hole pattern, 5 hole, 7 plane",
		frames: []string{
			"hole_3051: perpendicularity dia 0.01 datums A",
			"hole_3048: position dia 0.02 datums A, B",
			"holes_3054: position dia 0.05 M datums A, BM, CM",
			"holes_3057: position dia 0.05 M datums D, B, C",
			"hole_3062: position dia 0.06 datums D, B, C",
			"hole_3064: position dia 0.08 datums D, B, C",
			"hole_3064: position 0.03 datums D, B, C",
			"plane_3053: surface-profile 0.06 datums A, B, C",
			"plane_3053: flatness 0.005/0.25x0.25",
			"plane_3053: angularity 0.04 datums A",
			"plane_3050: surface-profile 0.01",
			"plane_3052: surface-profile 0.03 datums A, B, C",
			"hole_3066: perpendicularity dia 0.01 datums E"},
	}.check(t, res)
	if s := feature(t, p, "holes_3057").Size; !near(s.Nominal, 0.625*25.4) || !near(s.Upper, 0.005*25.4) {
		t.Errorf("the 4-hole pattern's size %+v (0.625 +-0.005 inch)", s)
	}
	if len(p.Dims) != 5 {
		t.Errorf("%d dimensions, want 5 (0.82 inch from D to each of four faces, a reference width)", len(p.Dims))
	}
	for _, d := range p.Dims {
		switch {
		case d.Reference:
			if d.SizeOf == nil || d.SizeOf.Name != "slot_3072" || !near(d.Value, 0.75*25.4) {
				t.Errorf("reference size %+v", d)
			}
		case d.Basic || d.From.Name != "plane_3052" || !near(d.Value, 0.82*25.4):
			t.Errorf("dimension %s", dimText(d))
		}
	}
	wantNoteCounts(t, res, []noteWant{
		{Inconsistent, `geometric tolerances are labelled mm \(13 values\) and the sizes and dimensions inch \(25 values\)`, 1},
		{Inconsistent, `angularity's angle -1`, 1},
	})
}

// FTC 06: geometry in mm, PMI in inches (the model is in inches); ten
// datums, four by datum targets (G, H on cones; J, K by two line targets
// each, whose zones lie one on each plane of a V while the file names one
// plane for both); composite profiles; position of balls in a spherical
// zone; positions of the two slots without a diameter symbol; many
// dimensions over several faces; fillet radii, reference sizes and
// dimensions, lines and circular edges.
func TestNISTFTC06(t *testing.T) {
	res, src := readNIST(t, "nist_ftc_06_asme1_ap242")
	p := res.Part
	facts{units: model.Inch, standard: model.ASME2009, notes: 27,
		datums: "A plane_3566, B tab_3568, C plane_3569, D plane_3575, E plane_3576, F holes_3571, H cone_3636, G cone_3637, J plane_3618, K plane_3621",
		kinds:  "1 ball pattern, 1 socket, 1 tab, 2 cone, 2 hole, 2 slot, 27 plane, 30 surface, 4 circle, 6 hole pattern, 8 line",
		frames: []string{
			"plane_3566: flatness 0.01",
			"plane_3575: surface-profile 0.02 datums A, B, C",
			"plane_3575: flatness 0.01",
			"holes_3571: position dia 0.015 datums E, A, B",
			"holes_3578: position dia 0.015 datums C, A, B",
			"balls_3581: position sdia 0.025 datums D, B, C",
			"holes_3584: position dia 0.025 M datums C, A, B",
			"holes_3587: position dia 0.02 M datums F",
			"surface_3611: surface-profile 0.05 datums D, B, C | composite 0.01 datums D",
			"surface_3617: surface-profile 0.05 datums D, B, C | composite 0.01 datums D",
			"holes_3594: position dia 0.025 M datums A, B, C",
			"holes_3603: position dia 0.025 M datums A, B, C",
			"tab_3568: perpendicularity 0.012 datums A",
			"plane_3569: perpendicularity 0.012 datums A, B",
			"plane_3576: surface-profile 0.02 datums A, B, C",
			"plane_3576: flatness 0.01",
			"plane_3612: surface-profile 0.04 datums A, B, C",
			"hole_3592: position dia 0.015 datums D, H",
			"hole_3598: position dia 0.015 datums D, G",
			"slot_3600: position 0.025 datums D, C, J",
			"slot_3601: position 0.025 datums D, C, K",
			"surface_3623: surface-profile 0.05 datums D, B, C | composite 0.01 datums D",
			"surface_3620: surface-profile 0.05 datums D, B, C | composite 0.01 datums D",
		},
	}.check(t, res)
	if a := feature(t, p, "cone_3636").Point(); a.Sub(model.Vec{-3, 5.6, -6.25}).Norm() > 1e-6 {
		t.Errorf("the apex of cone 3636 at %v (19.05 mm at the locating point, 9.46 degrees half angle: 57.15 mm above it)", a)
	}
	refs, sizes := 0, 0
	for _, d := range p.Dims {
		switch {
		case d.Reference && d.SizeOf != nil:
			sizes++
		case d.Reference:
			refs++
		}
	}
	if len(p.Dims) != 16 || refs != 2 || sizes != 2 {
		t.Errorf("%d dimensions (%d reference distances, %d reference sizes), want 16: 4 from D, 2 pairs of 0.56, 4 counterbore depths of 0.31, 2 from a boss top to a circular edge, the reference 1.106 between J's and K's target lines, the reference diameters of the two rings", len(p.Dims), refs, sizes)
	}
	// J and K by two line targets each; G and H by a target with no zone,
	// that is the whole cone.
	for _, l := range []string{"J", "K"} {
		d := p.Datum(l)
		if len(d.Targets) != 2 || d.Targets[0].Shape != model.TargetLine {
			t.Errorf("datum %s: targets %+v", l, d.Targets)
		}
	}
	if j1 := feature(t, p, "J1").DatumTarget; j1 == nil || j1.On.Name != "plane_3619" {
		t.Errorf("J1 lies on 3619, whatever the file names: %+v", j1)
	}
	if len(p.Datum("G").Targets) != 0 {
		t.Errorf("G's target has no zone: the whole cone")
	}
	wantNoteCounts(t, res, []noteWant{
		{Unsupported, `datum target [GH]1 has no target zone: read as the whole of its feature`, 2},
		{Inconsistent, `zone of datum target (K2|J1) .* lies on feature nominal (3622|3619): the target is read there`, 2},
		{Unsupported, `has no opposed points: read as a surface`, 20},
		{Unsupported, `Radius nominal \d+ .* is not read`, 3},
	})
	// Findings point into the file: every span is a start tag.
	f := source.NewFile("", []byte(src))
	for _, n := range res.Part.Problems {
		off := f.Offset(n.Span.Start)
		if off >= len(src) || src[off] != '<' {
			t.Errorf("note at %s is not at a start tag: %s", n.Span.Start, n)
		}
	}
}

// TestTestdataIsValidQIF validates every QIF file of the repository's test
// data against the QIF 3.0 schema, so that test data stays valid QIF.
func TestTestdataIsValidQIF(t *testing.T) {
	var files []string
	root := filepath.Join("..", "..", "testdata")
	err := filepath.WalkDir(root, func(path string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() && strings.EqualFold(filepath.Ext(path), ".qif") {
			files = append(files, path)
		}
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	if len(files) < 4 {
		t.Fatalf("only %d QIF files under testdata: %v", len(files), files)
	}
	validate(t, files)
}
