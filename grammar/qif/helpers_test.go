package qif

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// qdoc builds a small QIF 3 document of our own, section by section, in
// the order the schema requires. Empty sections are left out.
type qdoc struct {
	std     string // StandardsDefinitions' standards; default ASME Y14.5 2009 with id 1
	formal  string // FormalStandardId; default 1, "-" for none
	units   string // PrimaryUnits' children; default mm
	other   string // OtherUnits' children
	datums  string
	targets string
	drfs    string
	product string
	fdefs   string
	fnoms   string
	fitems  string
	zones   string
	cdefs   string
	cnoms   string
	citems  string
}

const asme2009 = `<Standard id="9999"><Organization><StandardsOrganizationEnum>ASME</StandardsOrganizationEnum></Organization><Designator>Y14.5</Designator><Year>2009</Year></Standard>`

const unitsMM = `
      <LinearUnit><SIUnitName>meter</SIUnitName><UnitName>mm</UnitName><UnitConversion><Factor>0.001</Factor></UnitConversion></LinearUnit>`

const unitsMMInch = unitsMM + `
      <PMILinearUnit><SIUnitName>meter</SIUnitName><UnitName>inch</UnitName><UnitConversion><Factor>0.0254</Factor></UnitConversion></PMILinearUnit>`

func section(name, body string) string {
	if body == "" {
		return ""
	}
	return fmt.Sprintf("  <%s n=\"1\">%s\n  </%s>\n", name, body, name)
}

func (q qdoc) String() string {
	var b strings.Builder
	b.WriteString(`<?xml version="1.0" encoding="UTF-8"?>
<QIFDocument xmlns="http://qifstandards.org/xsd/qif3" versionQIF="3.0.0" idMax="100000">
  <QPId>0b7e4c3a-1f2d-4e5a-8b9c-6d7e8f901234</QPId>
`)
	std := q.std
	if std == "" {
		std = asme2009
	}
	b.WriteString(section("StandardsDefinitions", std))
	units := q.units
	if units == "" {
		units = unitsMM
	}
	b.WriteString("  <FileUnits>\n    <PrimaryUnits>" + units + "\n    </PrimaryUnits>\n")
	if q.other != "" {
		b.WriteString("    <OtherUnits n=\"1\">" + q.other + "\n    </OtherUnits>\n")
	}
	b.WriteString("  </FileUnits>\n")
	b.WriteString(section("DatumDefinitions", q.datums))
	b.WriteString(section("DatumTargetDefinitions", q.targets))
	b.WriteString(section("DatumReferenceFrames", q.drfs))
	if q.product != "" {
		b.WriteString("  <Product>" + q.product + "\n  </Product>\n")
	}
	if q.fdefs != "" || q.fnoms != "" {
		b.WriteString("  <Features>\n")
		b.WriteString(section("FeatureDefinitions", q.fdefs))
		b.WriteString(section("FeatureNominals", q.fnoms))
		b.WriteString(section("FeatureItems", q.fitems))
		b.WriteString("  </Features>\n")
	}
	b.WriteString(section("FeatureZones", q.zones))
	if q.cdefs != "" || q.cnoms != "" {
		b.WriteString("  <Characteristics>\n")
		switch q.formal {
		case "":
			b.WriteString("    <FormalStandardId>9999</FormalStandardId>\n")
		case "-":
		default:
			b.WriteString("    <FormalStandardId>" + q.formal + "</FormalStandardId>\n")
		}
		b.WriteString(section("CharacteristicDefinitions", q.cdefs))
		b.WriteString(section("CharacteristicNominals", q.cnoms))
		b.WriteString(section("CharacteristicItems", q.citems))
		b.WriteString("  </Characteristics>\n")
	}
	b.WriteString("</QIFDocument>\n")
	return b.String()
}

// Fragments of QIF, written as the schema orders their children.

func planeDef(id int) string { return fmt.Sprintf("\n<PlaneFeatureDefinition id=\"%d\"/>", id) }

func sizedDef(typ string, id int, side, sizeName string, size float64) string {
	return fmt.Sprintf("\n<%sFeatureDefinition id=\"%d\"><InternalExternal>%s</InternalExternal><%s>%g</%s></%sFeatureDefinition>",
		typ, id, side, sizeName, size, sizeName, typ)
}

func cylDef(id int, side string, dia float64) string {
	return sizedDef("Cylinder", id, side, "Diameter", dia)
}

func widthDef(id int, side string, w float64) string {
	return fmt.Sprintf("\n<OppositeParallelPlanesFeatureDefinition id=\"%d\"><InternalExternal>%s</InternalExternal><Width>%g</Width><EndType><SlotEndEnum>OPEN</SlotEndEnum></EndType></OppositeParallelPlanesFeatureDefinition>", id, side, w)
}

func named(name string) string {
	if name == "" {
		return ""
	}
	return "<Name>" + name + "</Name>"
}

func plane(id, def int, name, loc, normal string) string {
	return fmt.Sprintf("\n<PlaneFeatureNominal id=\"%d\">%s<FeatureDefinitionId>%d</FeatureDefinitionId><Location>%s</Location><Normal>%s</Normal></PlaneFeatureNominal>",
		id, named(name), def, loc, normal)
}

func axial(typ string, id, def int, name, point, dir string) string {
	return fmt.Sprintf("\n<%sFeatureNominal id=\"%d\">%s<FeatureDefinitionId>%d</FeatureDefinitionId><Axis><AxisPoint>%s</AxisPoint><Direction>%s</Direction></Axis></%sFeatureNominal>",
		typ, id, named(name), def, point, dir, typ)
}

func cyl(id, def int, name, point, dir string) string {
	return axial("Cylinder", id, def, name, point, dir)
}

func width(id, def int, name, point, normal string) string {
	return fmt.Sprintf("\n<OppositeParallelPlanesFeatureNominal id=\"%d\">%s<FeatureDefinitionId>%d</FeatureDefinitionId><CenterPlane><Point>%s</Point><Normal>%s</Normal></CenterPlane></OppositeParallelPlanesFeatureNominal>",
		id, named(name), def, point, normal)
}

func ids(tag string, list ...int) string {
	var b strings.Builder
	fmt.Fprintf(&b, "<%s n=\"%d\">", tag, len(list))
	for _, x := range list {
		fmt.Fprintf(&b, "<Id>%d</Id>", x)
	}
	fmt.Fprintf(&b, "</%s>", tag)
	return b.String()
}

func datumOn(id int, label string, feats ...int) string {
	return fmt.Sprintf("\n<DatumDefinition id=\"%d\"><DatumLabel>%s</DatumLabel>%s</DatumDefinition>", id, label, ids("FeatureNominalIds", feats...))
}

// ref is one datum of a datum reference frame: a definition id, its
// material modifier and its precedence.
type ref struct {
	def  int
	mat  string
	prec string
}

func simpleDatum(def int, mat string) string {
	if mat == "" {
		mat = "NONE"
	}
	return fmt.Sprintf("<SimpleDatum><DatumDefinitionId>%d</DatumDefinitionId><MaterialModifier>%s</MaterialModifier><ReferencedComponent>NOMINAL</ReferencedComponent></SimpleDatum>", def, mat)
}

func drf(id int, refs ...ref) string {
	var b strings.Builder
	fmt.Fprintf(&b, "\n<DatumReferenceFrame id=\"%d\"><Datums n=\"%d\">", id, len(refs))
	for _, r := range refs {
		fmt.Fprintf(&b, "<Datum>%s<Precedence><PrecedenceEnum>%s</PrecedenceEnum></Precedence></Datum>", simpleDatum(r.def, r.mat), r.prec)
	}
	b.WriteString("</Datums></DatumReferenceFrame>")
	return b.String()
}

func frameDRF(drfID int) string {
	if drfID == 0 {
		return ""
	}
	return fmt.Sprintf("<DatumReferenceFrameId>%d</DatumReferenceFrameId>", drfID)
}

// position is a position definition; extra goes after ZoneShape.
func position(id int, tol string, drfID int, mat, zone, extra string) string {
	return fmt.Sprintf("\n<PositionCharacteristicDefinition id=\"%d\"><ToleranceValue>%s</ToleranceValue>%s<MaterialCondition>%s</MaterialCondition><ZoneShape><%s/></ZoneShape>%s</PositionCharacteristicDefinition>",
		id, tol, frameDRF(drfID), mat, zone, extra)
}

func orientation(typ string, id int, tol string, drfID int, zone string) string {
	return fmt.Sprintf("\n<%sCharacteristicDefinition id=\"%d\"><ToleranceValue>%s</ToleranceValue>%s<MaterialCondition>NONE</MaterialCondition><ZoneShape><%s/></ZoneShape></%sCharacteristicDefinition>",
		typ, id, tol, frameDRF(drfID), zone, typ)
}

func flatness(id int, tol string) string {
	return fmt.Sprintf("\n<FlatnessCharacteristicDefinition id=\"%d\"><ToleranceValue>%s</ToleranceValue></FlatnessCharacteristicDefinition>", id, tol)
}

func profile(id int, tol string, drfID int, extra string) string {
	return fmt.Sprintf("\n<SurfaceProfileCharacteristicDefinition id=\"%d\"><ToleranceValue>%s</ToleranceValue>%s%s</SurfaceProfileCharacteristicDefinition>", id, tol, extra, frameDRF(drfID))
}

func deviations(typ string, id int, max, min string) string {
	return fmt.Sprintf("\n<%sCharacteristicDefinition id=\"%d\"><Tolerance><MaxValue>%s</MaxValue><MinValue>%s</MinValue><DefinedAsLimit>false</DefinedAsLimit></Tolerance></%sCharacteristicDefinition>",
		typ, id, max, min, typ)
}

func basicDef(typ string, id int) string {
	return fmt.Sprintf("\n<%sCharacteristicDefinition id=\"%d\"><DimensionType>BASIC_OR_TED</DimensionType><NonTolerance>MEASURED</NonTolerance></%sCharacteristicDefinition>", typ, id, typ)
}

func nominal(typ string, id, def int, extra string, feats ...int) string {
	return fmt.Sprintf("\n<%sCharacteristicNominal id=\"%d\"><CharacteristicDefinitionId>%d</CharacteristicDefinitionId>%s%s</%sCharacteristicNominal>",
		typ, id, def, ids("FeatureNominalIds", feats...), extra, typ)
}

func target(v string) string { return "<TargetValue>" + v + "</TargetValue>" }

// read reads a document that must be accepted.
func read(t *testing.T, src string) *Result {
	t.Helper()
	res, err := ReadFile(source.NewFile("t.qif", []byte(src)))
	if err != nil {
		t.Fatalf("refused: %v\n%s", err, src)
	}
	return res
}

// wantNotes checks that a note matching each pattern was made, and no other
// note of the kinds listed (in the order of the patterns does not matter).
func wantNotes(t *testing.T, res *Result, patterns ...string) {
	t.Helper()
	used := make([]bool, len(res.Part.Problems))
	for _, p := range patterns {
		re := regexp.MustCompile(p)
		found := false
		for i, n := range res.Part.Problems {
			if !used[i] && re.MatchString(kindName(n.Kind)+": "+n.Message) {
				used[i], found = true, true
				break
			}
		}
		if !found {
			t.Errorf("no note matches %q", p)
		}
	}
	for i, n := range res.Part.Problems {
		if !used[i] {
			t.Errorf("unexpected note %s", n)
		}
	}
}

func feature(t *testing.T, p *model.Part, name string) *model.Feature {
	t.Helper()
	f := p.Feature(name)
	if f == nil {
		var names []string
		for _, f := range p.Features {
			names = append(names, f.Name)
		}
		t.Fatalf("no feature %q; features: %v", name, names)
	}
	return f
}

// at returns the position of the first occurrence of sub in src.
func at(t *testing.T, src, sub string) source.Pos {
	t.Helper()
	i := strings.Index(src, sub)
	if i < 0 {
		t.Fatalf("%q not in the document", sub)
	}
	return source.NewFile("", []byte(src)).Position(i)
}

func near(a, b float64) bool { return a-b < 1e-9 && b-a < 1e-9 }

func nearVec(a, b model.Vec) bool { return near(a[0], b[0]) && near(a[1], b[1]) && near(a[2], b[2]) }

// validate runs xmllint over files against the repository's copy of the
// QIF 3.0 schema; it skips where xmllint is missing.
func validate(t *testing.T, files []string) {
	t.Helper()
	xmllint, err := exec.LookPath("xmllint")
	if err != nil {
		t.Skip("xmllint is not installed (Debian: apt-get install libxml2-utils); schema validation skipped")
	}
	schema := filepath.Join("..", "..", "testdata", "qif", "xsd", "QIFApplications", "QIFDocument.xsd")
	if _, err := os.Stat(schema); err != nil {
		t.Fatalf("the schema copy is missing: %v", err)
	}
	out, err := exec.Command(xmllint, append([]string{"--noout", "--schema", schema}, files...)...).CombinedOutput()
	if err != nil {
		t.Fatalf("xmllint: %v\n%s", err, out)
	}
}

// kindName names a problem's kind as the notes of these tests are written.
func kindName(k model.ProblemKind) string {
	switch k {
	case model.Unsupported:
		return "unsupported"
	case model.Inconsistent:
		return "inconsistent"
	case model.Syntax:
		return "syntax"
	}
	return "geometry"
}
