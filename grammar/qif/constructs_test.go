package qif

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// construct is a small QIF document of our own for one construct, with what
// the reader must make of it. Schema-valid ones are validated by
// TestConstructsAreValidQIF; invalid ones (dangling references, numbers
// that are not numbers) are marked so.
type construct struct {
	name    string
	doc     qdoc
	invalid bool
	check   func(t *testing.T, res *Result, src string)
}

// A plate: datum A (the underside), B and C (two edges), a hole located to
// them, and a slot.
var plate = qdoc{
	datums: datumOn(10, "A", 50) + datumOn(11, "B", 51) + datumOn(12, "C", 52),
	drfs: drf(20, ref{10, "", "PRIMARY"}) +
		drf(21, ref{10, "", "PRIMARY"}, ref{11, "", "SECONDARY"}, ref{12, "", "TERTIARY"}),
	fdefs: planeDef(40) + cylDef(41, "INTERNAL", 8) + widthDef(42, "INTERNAL", 10),
	fnoms: plane(50, 40, "underside", "0 0 0", "0 0 -1") +
		plane(51, 40, "rear", "0 0 5", "0 -1 0") +
		plane(52, 40, "left", "0 0 5", "-1 0 0") +
		cyl(53, 41, "bore", "30 20 0", "0 0 1") +
		width(54, 42, "Nominal 54", "60 20 5", "1 0 0"),
	cdefs: flatness(60, "0.02") +
		orientation("Perpendicularity", 61, "0.05", 20, "PlanarZone") +
		position(62, "0.1", 21, "MAXIMUM", "DiametricalZone", "") +
		position(63, "0.2", 21, "NONE", "NonDiametricalZone", "") +
		deviations("Diameter", 64, "0.05", "0"),
	cnoms: nominal("Flatness", 70, 60, "", 50) +
		nominal("Perpendicularity", 71, 61, "", 51) +
		nominal("Position", 72, 62, "", 53) +
		nominal("Position", 73, 63, "", 54) +
		nominal("Diameter", 74, 64, target("8"), 53),
}

func withDoc(q qdoc, edit func(*qdoc)) qdoc {
	edit(&q)
	return q
}

var constructs = []construct{
	{name: "plate", doc: plate, check: func(t *testing.T, res *Result, src string) {
		wantNotes(t, res)
		p := res.Part
		if p.Units != model.MM || p.Standard != model.ASME2009 {
			t.Errorf("units %v standard %v", p.Units, p.Standard)
		}
		u := feature(t, p, "underside")
		if u.Kind != model.Plane || !nearVec(u.Dir, model.Vec{0, 0, -1}) || !u.HasGeometry {
			t.Errorf("underside %+v", u)
		}
		if u.NameSpan.Start != at(t, src, "<Name>underside") || u.Span.Start != at(t, src, `<PlaneFeatureNominal id="50"`) {
			t.Errorf("underside spans %v %v", u.NameSpan, u.Span)
		}
		bore := feature(t, p, "bore")
		if bore.Kind != model.Hole || !nearVec(bore.Point(), model.Vec{30, 20, 0}) || bore.Size == nil ||
			!near(bore.Size.Min(), 8) || !near(bore.Size.Max(), 8.05) || !bore.Size.Toleranced {
			t.Errorf("bore %+v size %+v", bore, bore.Size)
		}
		slot := feature(t, p, "slot_54")
		if slot.Kind != model.Slot || !near(slot.Size.Nominal, 10) || slot.Size.Toleranced || !nearVec(slot.Dir, model.Vec{1, 0, 0}) {
			t.Errorf("slot %+v size %+v", slot, slot.Size)
		}
		if len(p.Datums) != 3 || p.Datum("A").Target.Feature != u || p.Datum("B").Target.Name != "rear" {
			t.Fatalf("datums %+v", p.Datums)
		}
		a := p.Datum("A")
		if a.LetterSpan.Start != at(t, src, "<DatumLabel>A") || a.Span.Start != at(t, src, `<DatumDefinition id="10"`) ||
			a.Target.Span.Start != at(t, src, "<Id>50</Id></FeatureNominalIds></DatumDefinition>") {
			t.Errorf("datum A spans %v %v %v", a.LetterSpan, a.Span, a.Target.Span)
		}
		if len(p.Frames) != 4 {
			t.Fatalf("%d frames", len(p.Frames))
		}
		pos := p.FramesOn(bore)[0]
		up := pos.Upper()
		if pos.Characteristic != "position" || up.Zone != "dia" || !near(up.Value, 0.1) || len(up.Modifiers) != 1 || up.Modifiers[0].Letter != "M" {
			t.Errorf("bore's position %+v %+v", pos, up)
		}
		if len(up.Refs) != 3 || up.Refs[0].Name != "A" || up.Refs[2].Name != "C" || !up.Refs[2].Resolved() {
			t.Errorf("refs %+v", up.Refs)
		}
		if pos.Span.Start != at(t, src, `<PositionCharacteristicNominal id="72"`) ||
			up.ValueSpan.Start != at(t, src, "<ToleranceValue>0.1<") ||
			up.ZoneSpan.Start != at(t, src, "<DiametricalZone/>") ||
			up.Modifiers[0].Span.Start != at(t, src, "<MaterialCondition>MAXIMUM") ||
			// The datum reference frame serves several characteristics,
			// so a frame's references are placed on its own element.
			up.Refs[1].Span.Start != pos.Span.Start {
			t.Errorf("frame spans %v value %v zone %v mod %v ref %v", pos.Span, up.ValueSpan, up.ZoneSpan, up.Modifiers[0].Span, up.Refs[1].Span)
		}
		if z := p.FramesOn(slot)[0].Upper().Zone; z != "" {
			t.Errorf("slot's zone %q", z)
		}
		if p.FramesOn(u)[0].Characteristic != "flatness" || len(p.FramesOn(u)[0].Upper().Refs) != 0 {
			t.Errorf("flatness %+v", p.FramesOn(u)[0])
		}
		if res.Origins.Frames[pos] != 72 || res.Origins.Datums[a] != 10 || res.Origins.Features[bore][0] != 53 {
			t.Errorf("origins %v", res.Origins)
		}
		if len(p.Refs) != 3+4 || p.Headers[0].Keyword != "basis" || p.Headers[1].Keyword != "standard" || p.Headers[2].Keyword != "units" || p.Basis != model.ModelBasis {
			t.Errorf("refs %d headers %+v", len(p.Refs), p.Headers)
		}
	}},

	// Geometry in mm, PMI in inches: the model is in inches; a value
	// labelled mm is converted.
	{name: "units-pmi-inch", doc: withDoc(plate, func(q *qdoc) {
		q.units = unitsMMInch
		q.cnoms = strings.Replace(q.cnoms, target("8"), `<TargetValue linearUnit="mm">8</TargetValue>`, 1)
	}), check: func(t *testing.T, res *Result, src string) {
		p := res.Part
		bore := feature(t, p, "bore")
		if p.Units != model.Inch || !nearVec(bore.Point(), model.Vec{30 / 25.4, 20 / 25.4, 0}) {
			t.Errorf("units %v bore at %v", p.Units, bore.Point())
		}
		if !near(bore.Size.Nominal, 8/25.4) || !near(bore.Size.Upper, 0.05) || !near(p.FramesOn(bore)[0].Upper().Value, 0.1) {
			t.Errorf("bore size %+v", bore.Size)
		}
		wantNotes(t, res)
	}},

	{name: "unit-label-unknown", doc: withDoc(plate, func(q *qdoc) {
		q.cdefs = strings.Replace(q.cdefs, "<ToleranceValue>0.1<", `<ToleranceValue linearUnit="furlong">0.1<`, 1)
	}), invalid: true, check: func(t *testing.T, res *Result, src string) {
		if len(res.Part.Frames) != 3 {
			t.Errorf("%d frames, want the one in furlongs left out", len(res.Part.Frames))
		}
		wantNotes(t, res, `inconsistent: the unit "furlong" is not defined in FileUnits and is not one the reader knows: the value is left out`)
	}},

	{name: "unit-label-common", doc: withDoc(plate, func(q *qdoc) {
		q.cdefs = strings.Replace(q.cdefs, "<ToleranceValue>0.1<", `<ToleranceValue linearUnit="inch">0.004<`, 1)
	}), invalid: true, check: func(t *testing.T, res *Result, src string) {
		v := res.Part.FramesOn(feature(t, res.Part, "bore"))[0].Upper().Value
		if !near(v, 0.1016) {
			t.Errorf("0.004 inch read as %g mm", v)
		}
		wantNotes(t, res, `inconsistent: the unit "inch" is not defined in FileUnits: read as the inch of common use`)
	}},

	{name: "unit-name-factor", doc: withDoc(plate, func(q *qdoc) {
		q.units = strings.Replace(unitsMM, "<Factor>0.001<", "<Factor>0.0254<", 1)
	}), check: func(t *testing.T, res *Result, src string) {
		if res.Part.Units != model.Inch {
			t.Errorf("units %v: the factor decides", res.Part.Units)
		}
		wantNotes(t, res, `inconsistent: the unit named "mm" converts to SI with the factor 0.0254, which is not the factor of mm`)
	}},

	{name: "scale-coefficient", doc: withDoc(plate, func(q *qdoc) {
		q.product = `<Header><ScaleCoefficient>2</ScaleCoefficient></Header><RootPart><Id>1</Id></RootPart>`
	}), invalid: true, check: func(t *testing.T, res *Result, src string) {
		bore := feature(t, res.Part, "bore")
		if !nearVec(bore.Point(), model.Vec{15, 10, 0}) || !near(bore.Size.Nominal, 8) {
			t.Errorf("bore at %v size %v: geometry is divided by the scale, PMI is not", bore.Point(), bore.Size.Nominal)
		}
	}},

	{name: "no-linear-unit", doc: withDoc(plate, func(q *qdoc) {
		q.units = `<MassUnit><SIUnitName>kilogram</SIUnitName><UnitName>kg</UnitName></MassUnit>`
	}), check: func(t *testing.T, res *Result, src string) {
		if res.Part.Units != model.UnitsUnknown || len(res.Part.Headers) != 2 {
			t.Errorf("units %v headers %+v", res.Part.Units, res.Part.Headers)
		}
		wantNotes(t, res, `inconsistent: the document gives no linear unit`)
	}},

	{name: "standard-2018", doc: withDoc(plate, func(q *qdoc) {
		q.std = strings.Replace(asme2009, "2009", "2018", 1)
	}), check: func(t *testing.T, res *Result, src string) {
		if res.Part.Standard != model.ASME2018 {
			t.Errorf("standard %v", res.Part.Standard)
		}
	}},
	{name: "standard-iso", doc: withDoc(plate, func(q *qdoc) {
		q.std = `<Standard id="9999"><Organization><StandardsOrganizationEnum>ISO</StandardsOrganizationEnum></Organization><Designator>1101</Designator></Standard>`
	}), check: func(t *testing.T, res *Result, src string) {
		if res.Part.Standard != model.ISO {
			t.Errorf("standard %v", res.Part.Standard)
		}
	}},
	{name: "standard-1994", doc: withDoc(plate, func(q *qdoc) {
		q.std = `<Standard id="9999"><Organization><StandardsOrganizationEnum>ASME</StandardsOrganizationEnum></Organization><Designator>Y14.5M-1994</Designator></Standard>`
	}), check: func(t *testing.T, res *Result, src string) {
		if res.Part.Standard != model.StandardUnknown || len(res.Part.Headers) != 2 {
			t.Errorf("standard %v", res.Part.Standard)
		}
		wantNotes(t, res, `unsupported: the governing standard ASME Y14.5M-1994: the 1994 edition is not one datumlint checks`)
	}},
	{name: "standard-no-formal-id", doc: withDoc(plate, func(q *qdoc) { q.formal = "-" }), invalid: true, check: func(t *testing.T, res *Result, src string) {
		if res.Part.Standard != model.ASME2009 {
			t.Errorf("standard %v", res.Part.Standard)
		}
		wantNotes(t, res, `unsupported: Characteristics name no FormalStandardId: read under the only standard defined, ASME Y14.5`)
	}},
	{name: "standard-dangling", doc: withDoc(plate, func(q *qdoc) { q.formal = "99" }), invalid: true, check: func(t *testing.T, res *Result, src string) {
		wantNotes(t, res, `inconsistent: FormalStandardId 99 names no standard`)
	}},
}

func TestConstructs(t *testing.T) {
	for _, c := range constructs {
		t.Run(c.name, func(t *testing.T) {
			src := c.doc.String()
			c.check(t, read(t, src), src)
		})
	}
}

// TestConstructsAreValidQIF keeps the construct documents valid QIF 3.0, so
// that the reader is tested on what the standard allows.
func TestConstructsAreValidQIF(t *testing.T) {
	dir := t.TempDir()
	var files []string
	for _, c := range constructs {
		if c.invalid {
			continue
		}
		f := filepath.Join(dir, c.name+".qif")
		if err := os.WriteFile(f, []byte(c.doc.String()), 0o644); err != nil {
			t.Fatal(err)
		}
		files = append(files, f)
	}
	validate(t, files)
}

var _ = fmt.Sprint
var _ = math.Pi
var _ = source.Pos{}
