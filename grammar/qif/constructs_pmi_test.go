package qif

import (
	"fmt"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar/model"
)

func pointTarget(id int, label string, feature, zone int) string {
	return fmt.Sprintf("\n<DatumTarget id=\"%d\"><DatumTargetLabel>%s</DatumTargetLabel><FeatureNominalId>%d</FeatureNominalId><TargetZoneId>%d</TargetZoneId></DatumTarget>", id, label, feature, zone)
}

func pointZone(id int, p string) string {
	return fmt.Sprintf("\n<FeatureZonePoint id=\"%d\"><Point>%s</Point></FeatureZonePoint>", id, p)
}

var datumsDoc = qdoc{
	datums: `<DatumDefinition id="10"><DatumLabel>A</DatumLabel>` + ids("DatumTargetIds", 30, 31, 32) + `</DatumDefinition>` +
		datumOn(11, "B", 53) + datumOn(12, "C", 54, 55) + datumOn(13, "D", 54, 56),
	targets: pointTarget(30, "A1", 50, 35) + pointTarget(31, "A2", 50, 36) + pointTarget(32, "A3", 50, 37),
	drfs:    drf(20, ref{10, "", "PRIMARY"}, ref{11, "", "SECONDARY"}),
	fdefs:   planeDef(40) + `<LineFeatureDefinition id="41"/>`,
	fnoms: plane(50, 40, "base", "0 0 0", "0 0 -1") + plane(51, 40, "top", "0 0 10", "0 0 1") +
		`<LineFeatureNominal id="53"><FeatureDefinitionId>41</FeatureDefinitionId><Location>0 0 0</Location><Direction>1 0 0</Direction></LineFeatureNominal>` +
		plane(54, 40, "left_a", "0 0 0", "-1 0 0") + plane(55, 40, "left_b", "0 50 5", "-1 0 0") + plane(56, 40, "right", "80 0 0", "-1 0 0"),
	zones: pointZone(35, "10 10 0") + pointZone(36, "70 10 0") + pointZone(37, "40 60 2"),
	cdefs: orientation("Parallelism", 60, "0.1", 20, "PlanarZone"),
	cnoms: nominal("Parallelism", 70, 60, "", 51),
}

func compound(members ...ref) string {
	var b strings.Builder
	fmt.Fprintf(&b, "<CompoundDatum n=\"%d\">", len(members))
	for i, m := range members {
		fmt.Fprintf(&b, "<Datum>%s<SequenceNumber>%d</SequenceNumber></Datum>", simpleDatum(m.def, m.mat), i+1)
	}
	b.WriteString("</CompoundDatum>")
	return b.String()
}

func datumEntry(body, prec string) string {
	return "<Datum>" + body + "<Precedence><PrecedenceEnum>" + prec + "</PrecedenceEnum></Precedence></Datum>"
}

var drfsDoc = qdoc{
	datums: datumOn(10, "A", 50) + datumOn(11, "B", 51) + datumOn(12, "C", 52) + datumOn(13, "D", 53) + datumOn(14, "E", 54),
	drfs: `<DatumReferenceFrame id="20"><Datums n="3">` +
		datumEntry(simpleDatum(12, ""), "TERTIARY") + datumEntry(simpleDatum(10, ""), "PRIMARY") + datumEntry(simpleDatum(11, "MAXIMUM_RPR"), "SECONDARY") +
		`</Datums></DatumReferenceFrame>` +
		`<DatumReferenceFrame id="21"><Datums n="2">` + datumEntry(simpleDatum(10, ""), "PRIMARY") +
		datumEntry(compound(ref{11, "MAXIMUM", ""}, ref{13, "MAXIMUM", ""}), "SECONDARY") + `</Datums></DatumReferenceFrame>` +
		`<DatumReferenceFrame id="22"><Datums n="2">` + datumEntry(simpleDatum(10, ""), "PRIMARY") +
		datumEntry(compound(ref{11, "MAXIMUM", ""}, ref{13, "", ""}), "SECONDARY") + `</Datums></DatumReferenceFrame>` +
		drf(23, ref{10, "", "PRIMARY"}, ref{11, "", "SECONDARY"}, ref{12, "", "TERTIARY"}, ref{14, "", "QUATERNARY"}) +
		`<DatumReferenceFrame id="24"><Datums n="1"><Datum><SimpleDatum><DatumDefinitionId>10</DatumDefinitionId><MaterialModifier>NONE</MaterialModifier><ReferencedComponent>NOMINAL</ReferencedComponent><DatumTranslation><DatumTranslationAllowed>true</DatumTranslationAllowed></DatumTranslation></SimpleDatum><Precedence><PrecedenceEnum>PRIMARY</PrecedenceEnum></Precedence></Datum></Datums></DatumReferenceFrame>`,
	fdefs: planeDef(40) + cylDef(41, "INTERNAL", 10) + cylDef(42, "INTERNAL", 6),
	fnoms: plane(50, 40, "base", "0 0 0", "0 0 -1") + cyl(51, 41, "h1", "0 0 0", "0 0 1") + plane(52, 40, "side", "0 0 0", "-1 0 0") +
		cyl(53, 41, "h2", "0 0 30", "0 0 1") + plane(54, 40, "back", "0 0 0", "0 -1 0") +
		cyl(55, 42, "p1", "20 0 0", "0 0 1") + cyl(56, 42, "p2", "30 0 0", "0 0 1") + cyl(57, 42, "p3", "40 0 0", "0 0 1") +
		cyl(58, 42, "p4", "50 0 0", "0 0 1") + cyl(59, 42, "p5", "60 0 0", "0 0 1"),
	cdefs: position(60, "0.1", 20, "NONE", "DiametricalZone", "") + position(61, "0.1", 21, "NONE", "DiametricalZone", "") +
		position(62, "0.1", 22, "NONE", "DiametricalZone", "") + position(63, "0.1", 23, "NONE", "DiametricalZone", "") +
		position(64, "0.1", 24, "NONE", "DiametricalZone", ""),
	cnoms: nominal("Position", 70, 60, "", 55) + nominal("Position", 71, 61, "", 56) + nominal("Position", 72, 62, "", 57) +
		nominal("Position", 73, 63, "", 58) + nominal("Position", 74, 64, "", 59),
}

// The fourteen characteristics and the modifiers of their frames.
var framesDoc = qdoc{
	datums: datumOn(10, "A", 50) + datumOn(11, "B", 51),
	drfs:   drf(20, ref{10, "", "PRIMARY"}) + drf(21, ref{10, "", "PRIMARY"}, ref{11, "", "SECONDARY"}),
	fdefs:  planeDef(40) + cylDef(41, "INTERNAL", 10) + sizedDef("Sphere", 42, "EXTERNAL", "Diameter", 12) + `<OtherShapeFeatureDefinition id="43"><Description>freeform</Description></OtherShapeFeatureDefinition>` + cylDef(44, "EXTERNAL", 20),
	fnoms: plane(50, 40, "base", "0 0 0", "0 0 -1") + cyl(51, 41, "bore", "0 0 0", "0 0 1") +
		`<SphereFeatureNominal id="52"><FeatureDefinitionId>42</FeatureDefinitionId><Location>30 0 6</Location></SphereFeatureNominal>` +
		`<OtherShapeFeatureNominal id="53"><Name>skin</Name><FeatureDefinitionId>43</FeatureDefinitionId></OtherShapeFeatureNominal>` +
		cyl(54, 44, "shaft", "0 0 0", "0 0 1") + plane(55, 40, "top", "0 0 20", "0 0 1"),
	cdefs: `<PositionCharacteristicDefinition id="60"><FreeState>true</FreeState><SeparateZone>true</SeparateZone><ToleranceValue>0.3</ToleranceValue>` + frameDRF(21) +
		`<MaterialCondition>NONE</MaterialCondition><ZoneShape><SphericalZone/></ZoneShape><ProjectedToleranceZoneValue>12</ProjectedToleranceZoneValue></PositionCharacteristicDefinition>` +
		position(61, "0.2", 21, "LEAST", "DiametricalZone",
			`<MaximumToleranceValue>0.5</MaximumToleranceValue><SecondCompositeSegmentPositionDefinition>`+frameDRF(20)+`<ToleranceValue>0.05</ToleranceValue><MaterialCondition>MAXIMUM</MaterialCondition><ZoneShape><DiametricalZone/></ZoneShape></SecondCompositeSegmentPositionDefinition>`) +
		`<SurfaceProfileCharacteristicDefinition id="62"><ToleranceValue>0.4</ToleranceValue><OuterDisposition>0.1</OuterDisposition><SecondCompositeSegmentProfileDefinition>` + frameDRF(20) +
		`<ToleranceValue>0.1</ToleranceValue></SecondCompositeSegmentProfileDefinition>` + frameDRF(21) + `<Extent><ExtentEnum>ALL_AROUND</ExtentEnum></Extent></SurfaceProfileCharacteristicDefinition>` +
		`<FlatnessCharacteristicDefinition id="63"><ToleranceZonePerUnitArea><ToleranceValuePerUnit>0.01</ToleranceValuePerUnit><RectangularUnitArea><RectangularUnitAreaLength>25</RectangularUnitAreaLength><RectangularUnitAreaWidth>25</RectangularUnitAreaWidth></RectangularUnitArea></ToleranceZonePerUnitArea></FlatnessCharacteristicDefinition>` +
		`<ParallelismCharacteristicDefinition id="64"><ToleranceValue>0.05</ToleranceValue>` + frameDRF(20) + `<MaterialCondition>NONE</MaterialCondition><ZoneShape><PlanarZone/></ZoneShape><TangentPlane>true</TangentPlane></ParallelismCharacteristicDefinition>` +
		`<PositionCharacteristicDefinition id="65"><ToleranceValue>0.1</ToleranceValue>` + frameDRF(21) + `<MaterialCondition>NONE</MaterialCondition><ZoneShape><NonDiametricalZone><ZoneOrientationVector>1 0 0</ZoneOrientationVector></NonDiametricalZone></ZoneShape></PositionCharacteristicDefinition>` +
		`<CoaxialityCharacteristicDefinition id="66"><ToleranceValue>0.1</ToleranceValue>` + frameDRF(21) + `<ZoneShape><DiametricalZone/></ZoneShape></CoaxialityCharacteristicDefinition>` +
		`<CircularRunoutCharacteristicDefinition id="67"><ToleranceValue>0.02</ToleranceValue>` + frameDRF(21) + `</CircularRunoutCharacteristicDefinition>` +
		`<CylindricityCharacteristicDefinition id="68"><ToleranceValue>0.01</ToleranceValue></CylindricityCharacteristicDefinition>` +
		`<LineProfileCharacteristicDefinition id="69"><ToleranceValue>0.2</ToleranceValue></LineProfileCharacteristicDefinition>`,
	cnoms: nominal("Position", 70, 60, "", 52) + nominal("Position", 71, 61, "", 51) + nominal("SurfaceProfile", 72, 62, "", 53) +
		nominal("Flatness", 73, 63, "", 50) + nominal("Parallelism", 74, 64, "", 55) + nominal("Position", 75, 65, "", 51) +
		nominal("Coaxiality", 76, 66, "", 54) + nominal("CircularRunout", 77, 67, "", 54) + nominal("Cylindricity", 78, 68, "", 54) +
		nominal("LineProfile", 79, 69, "<Vector>1 0 0</Vector>", 53),
}

func frameOf(t *testing.T, res *Result, id ID) *model.Frame {
	t.Helper()
	for fr, x := range res.Origins.Frames {
		if x == id {
			return fr
		}
	}
	t.Fatalf("no frame from characteristic nominal %d", id)
	return nil
}

func modifiers(s *model.Segment) string {
	var out []string
	for _, m := range s.Modifiers {
		if m.HasValue {
			out = append(out, fmt.Sprintf("%s%g", m.Letter, m.Value))
		} else {
			out = append(out, m.Letter)
		}
	}
	return strings.Join(out, " ")
}

func refNames(s *model.Segment) string {
	var out []string
	for _, r := range s.Refs {
		out = append(out, r.Name+r.Material)
	}
	return strings.Join(out, " ")
}

func init() {
	constructs = append(constructs,
		construct{name: "datums", doc: datumsDoc, check: func(t *testing.T, res *Result, src string) {
			p := res.Part
			a, b, c, d := p.Datum("A"), p.Datum("B"), p.Datum("C"), p.Datum("D")
			if a.Broken || a.Target.Name != "base" || b.Broken || b.Target.Name != "line_53" || c.Broken || c.Target.Name != "left_a" || !d.Broken {
				t.Errorf("A %+v\nB %+v\nC %+v\nD %+v", a, b, c, d)
			}
			// A by three point targets on base, each a point feature of
			// its label at its zone's place.
			if len(a.Targets) != 3 || a.Targets[2].Label != "A3" || a.Targets[2].Shape != model.TargetPoint || a.Targets[2].Point != (model.Vec{40, 60, 2}) ||
				a.Targets[0].On.Name != "base" || feature(t, p, "A1").DatumTarget != a.Targets[0] {
				t.Errorf("A's targets %+v", a.Targets)
			}
			fr := p.Frames[0].Upper()
			if refNames(fr) != "A B" || !fr.Refs[1].Resolved() {
				t.Errorf("refs %s", refNames(fr))
			}
			wantNotes(t, res,
				`inconsistent: the zone of datum target A3 \(feature zone 37\) is 2 mm off the plane it names, feature nominal 50: the target is read as given`,
				`unsupported: datum C is on 2 features that share one plane: the model holds one, left_a`,
				`unsupported: datum D is left without its feature: it is on 2 features \(left_a, right\) that are neither a pattern nor one plane`)
		}},

		construct{name: "datum-reference-frames", doc: drfsDoc, check: func(t *testing.T, res *Result, src string) {
			for _, c := range []struct {
				id   ID
				refs string
			}{{70, "A BM C"}, {71, "A B-DM"}, {72, "A B-D"}, {73, "A B C"}, {74, "A"}} {
				if got := refNames(frameOf(t, res, c.id).Upper()); got != c.refs {
					t.Errorf("nominal %d: refs %q, want %q", c.id, got, c.refs)
				}
			}
			bd := frameOf(t, res, 71).Upper().Refs[1]
			if len(bd.Letters) != 2 || bd.Letters[1] != "D" || bd.Datums[1] == nil || bd.Span.Start != at(t, src, `<CompoundDatum n="2">`) {
				t.Errorf("common datum %+v", bd)
			}
			// A boundary on one member of a common datum: B(M)-D.
			if bd := frameOf(t, res, 72).Upper().Refs[1]; bd.Label() != "B(M)-D" {
				t.Errorf("common datum B(M)-D reads as %s", bd.Label())
			}
			wantNotes(t, res,
				`unsupported: datum B: the reciprocity requirement \(R\) is left out; read as MAXIMUM`,
				`unsupported: datum reference frame 23 has 4 datums: the model reads primary, secondary and tertiary`,
				`unsupported: the datum modifier <DatumTranslation> of datum A is not read`)
		}},

		construct{name: "frames", doc: framesDoc, check: func(t *testing.T, res *Result, src string) {
			for _, c := range []struct {
				id    ID
				char  model.Characteristic
				zone  string
				value float64
				mods  string
				refs  string
				lower string // the composite segment: value, modifiers and refs
			}{
				{70, "position", "sdia", 0.3, "F P12", "A B", ""},
				{71, "position", "dia", 0.2, "L", "A B", "0.05 M A"},
				{72, "surface-profile", "", 0.4, "U0.1", "A B", "0.1  A"},
				{73, "flatness", "", 0.01, "", "", ""},
				{74, "parallelism", "", 0.05, "T", "A", ""},
				{75, "position", "", 0.1, "", "A B", ""},
				{77, "circular-runout", "", 0.02, "", "A B", ""},
				{78, "cylindricity", "", 0.01, "", "", ""},
				{79, "line-profile", "", 0.2, "", "", ""},
			} {
				fr := frameOf(t, res, c.id)
				up := fr.Upper()
				if fr.Characteristic != c.char || up.Zone != c.zone || !near(up.Value, c.value) || modifiers(up) != c.mods || refNames(up) != c.refs {
					t.Errorf("nominal %d: %s %q %g [%s] [%s]; want %s %q %g [%s] [%s]", c.id, fr.Characteristic, up.Zone, up.Value, modifiers(up), refNames(up), c.char, c.zone, c.value, c.mods, c.refs)
				}
				lower := ""
				if len(fr.Segments) > 1 {
					s := fr.Segments[1]
					lower = fmt.Sprintf("%g %s %s", s.Value, modifiers(s), refNames(s))
					if !s.Composite || s.Span.Start.Line == 0 {
						t.Errorf("nominal %d: lower segment %+v", c.id, s)
					}
				}
				if lower != c.lower {
					t.Errorf("nominal %d: composite %q, want %q", c.id, lower, c.lower)
				}
			}
			if len(res.Part.Frames) != 9 {
				t.Errorf("%d frames", len(res.Part.Frames))
			}
			// A separate requirement, all around, a tolerance per unit
			// area and a zone's direction.
			if up := frameOf(t, res, 70).Upper(); !up.Separate || up.SeparateSpan.Start != at(t, src, "<SeparateZone>") {
				t.Errorf("separate requirement %+v", up)
			}
			if fr := frameOf(t, res, 72); fr.Extent != model.AllAround || fr.ExtentSpan.Start != at(t, src, "<ExtentEnum>ALL_AROUND") {
				t.Errorf("extent %q", fr.Extent)
			}
			if u := frameOf(t, res, 73).Upper().PerUnit; u == nil || !u.Area || u.Length != 25 || u.Width != 25 || u.Text != "25x25" {
				t.Errorf("per unit %+v", u)
			}
			if d := frameOf(t, res, 75).Upper().ZoneDir; d == nil || *d != (model.Vec{1, 0, 0}) {
				t.Errorf("zone direction %v", d)
			}
			wantNotes(t, res,
				`unsupported: a maximum tolerance of 0.5 \(MAX\)`,
				`unsupported: a Coaxiality characteristic nominal 76 is not read`)
		}},
	)
}

var sizesDoc = qdoc{
	fdefs: cylDef(40, "INTERNAL", 10) + widthDef(41, "INTERNAL", 8) + planeDef(42) + cylDef(43, "EXTERNAL", 20) + widthDef(44, "EXTERNAL", 30),
	fnoms: cyl(50, 40, "limits", "0 0 0", "0 0 1") + cyl(51, 40, "mean", "10 0 0", "0 0 1") + width(52, 41, "slot", "20 0 0", "1 0 0") +
		width(53, 44, "ref", "30 0 0", "1 0 0") + plane(54, 42, "face", "0 0 0", "0 0 1") + cyl(55, 40, "off", "40 0 0", "0 0 1") +
		cyl(56, 43, "shaft", "50 0 0", "0 0 1"),
	cdefs: `<DiameterCharacteristicDefinition id="60"><Tolerance><MaxValue>10.1</MaxValue><MinValue>10</MinValue><DefinedAsLimit>true</DefinedAsLimit></Tolerance></DiameterCharacteristicDefinition>` +
		deviations("Width", 61, "0.05", "-0.02") +
		`<WidthCharacteristicDefinition id="62"><DimensionType>REFERENCE_OR_AUXILIARY</DimensionType><NonTolerance>MEASURED</NonTolerance></WidthCharacteristicDefinition>` +
		deviations("Diameter", 63, "0.1", "-0.1") + deviations("Radius", 64, "0.1", "-0.1") +
		`<DiameterCharacteristicDefinition id="65"><EnvelopeRequirement>true</EnvelopeRequirement><Tolerance><MaxValue>0</MaxValue><MinValue>-0.02</MinValue><DefinedAsLimit>false</DefinedAsLimit></Tolerance></DiameterCharacteristicDefinition>`,
	cnoms: nominal("Diameter", 70, 60, target("10"), 50) + nominal("Diameter", 71, 60, "", 51) +
		nominal("Width", 72, 61, target("8"), 52) + nominal("Width", 73, 62, target("30"), 53) +
		nominal("Diameter", 74, 63, target("5"), 54) + nominal("Radius", 75, 64, target("5"), 50) +
		nominal("Diameter", 76, 63, `<TargetValue decimalPlaces="1">10.5</TargetValue>`, 55) + nominal("Diameter", 77, 63, target("10"), 50) +
		nominal("Diameter", 78, 65, target("20"), 56),
}

var dimsDoc = qdoc{
	units: `
      <PMIAngularUnit><SIUnitName>radian</SIUnitName><UnitName>degree</UnitName><UnitConversion><Factor>0.0174532925199433</Factor></UnitConversion></PMIAngularUnit>` + unitsMM,
	datums: datumOn(10, "A", 50),
	drfs:   drf(20, ref{10, "", "PRIMARY"}),
	fdefs:  planeDef(40) + cylDef(41, "INTERNAL", 6),
	fnoms: plane(50, 40, "base", "0 0 0", "0 0 -1") + plane(51, 40, "step1", "0 0 5", "0 0 1") + plane(52, 40, "step2", "20 0 5", "0 0 1") +
		plane(53, 40, "step3", "40 0 5", "0 0 1") + plane(54, 40, "lip1", "0 0 8", "0 0 1") + plane(55, 40, "lip2", "0 0 11", "0 0 1") +
		plane(56, 40, "ramp", "60 0 0", "0.5 0 0.866025403784439") + cyl(57, 41, "pin1", "10 10 0", "0 0 1") + cyl(58, 41, "pin2", "40 30 0", "0 0 1") +
		plane(59, 40, "odd", "0 0 17", "0 0 1"),
	cdefs: basicDef("DistanceBetween", 60) + deviations("DistanceBetween", 61, "0.1", "-0.1") +
		`<DistanceBetweenCharacteristicDefinition id="62"><DimensionType>REFERENCE_OR_AUXILIARY</DimensionType><NonTolerance>MEASURED</NonTolerance></DistanceBetweenCharacteristicDefinition>` +
		`<DistanceBetweenCharacteristicDefinition id="63"><DimensionType>BASIC_OR_TED</DimensionType><Tolerance><MaxValue>0.02</MaxValue><MinValue>-0.02</MinValue><DefinedAsLimit>false</DefinedAsLimit></Tolerance></DistanceBetweenCharacteristicDefinition>` +
		basicDef("AngleBetween", 64) + basicDef("DistanceFrom", 65) +
		`<AngleCharacteristicDefinition id="66"><Tolerance><MaxValue>0.5</MaxValue><MinValue>-0.5</MinValue><DefinedAsLimit>false</DefinedAsLimit></Tolerance></AngleCharacteristicDefinition>` +
		orientation("Angularity", 67, "0.1", 20, "PlanarZone"),
	cnoms: nominal("DistanceBetween", 70, 60, target("5")+`<FeatureNominalPairs n="1"><FeaturePair><FirstFeature>50</FirstFeature><SecondFeature>51</SecondFeature></FeaturePair></FeatureNominalPairs><AnalysisMode>THREEDIMENSIONAL</AnalysisMode>`, 50, 51) +
		nominal("DistanceBetween", 71, 61, target("5")+`<AnalysisMode>THREEDIMENSIONAL</AnalysisMode>`, 50, 52) +
		nominal("DistanceBetween", 72, 62, target("3")+`<AnalysisMode>THREEDIMENSIONAL</AnalysisMode>`, 54, 55) +
		nominal("DistanceBetween", 73, 63, target("3")+`<AnalysisMode>THREEDIMENSIONAL</AnalysisMode>`, 54, 55) +
		// One feature every other is at 5 from: base.
		nominal("DistanceBetween", 74, 60, target("5")+`<AnalysisMode>THREEDIMENSIONAL</AnalysisMode>`, 51, 52, 50, 53) +
		// Consecutive pairs at 3.
		nominal("DistanceBetween", 75, 60, target("3")+`<AnalysisMode>THREEDIMENSIONAL</AnalysisMode>`, 51, 54, 54, 55) +
		// Nothing the geometry bears out.
		nominal("DistanceBetween", 76, 60, target("4")+`<AnalysisMode>THREEDIMENSIONAL</AnalysisMode>`, 51, 54, 59) +
		nominal("AngleBetween", 77, 64, target("30")+`<AnalysisMode>THREEDIMENSIONAL</AnalysisMode>`, 50, 56) +
		nominal("DistanceFrom", 78, 65, target("30")+`<OriginReference><FeatureNominalId>57</FeatureNominalId><ReferencedComponent>NOMINAL</ReferencedComponent></OriginReference><AnalysisVector>1 0 0</AnalysisVector><AnalysisMode>THREEDIMENSIONAL</AnalysisMode>`, 58) +
		nominal("Angle", 79, 66, target("30"), 56) +
		nominal("Angularity", 80, 67, "<Angle>60</Angle>", 56),
}

func dimsOf(res *Result, id ID) []*model.Dimension {
	var out []*model.Dimension
	for _, d := range res.Part.Dims {
		if res.Origins.Dims[d] == id {
			out = append(out, d)
		}
	}
	return out
}

func dimText(d *model.Dimension) string {
	s := "dim"
	switch {
	case d.Basic:
		s = "basic"
	case d.Reference && d.SizeOf != nil:
		return fmt.Sprintf("ref size %g of %s", d.Value, d.SizeOf.Name)
	case d.Reference:
		s = "ref"
	}
	s += fmt.Sprintf(" %g", d.Value)
	if d.Angle {
		s += "deg"
	}
	if d.Tol != nil {
		s += fmt.Sprintf(" %+g/%+g", d.Tol.Upper, d.Tol.Lower)
	}
	s += " from " + d.From.Name + " to " + d.To.Name
	if d.Along != nil {
		s += fmt.Sprintf(" along %v", *d.Along)
	}
	return s
}

func init() {
	constructs = append(constructs,
		construct{name: "sizes", doc: sizesDoc, check: func(t *testing.T, res *Result, src string) {
			p := res.Part
			for _, c := range []struct {
				name               string
				nominal, max, min  float64
				toleranced, envelp bool
			}{
				{"limits", 10, 10.1, 10, true, false},
				{"mean", 10.05, 10.1, 10, true, false},
				{"slot", 8, 8.05, 7.98, true, false},
				{"ref", 30, 30, 30, false, false},
				{"off", 10.5, 10.6, 10.4, true, false},
				{"shaft", 20, 20, 19.98, true, true},
			} {
				s := feature(t, p, c.name).Size
				if s == nil || !near(s.Nominal, c.nominal) || !near(s.Max(), c.max) || !near(s.Min(), c.min) || s.Toleranced != c.toleranced || s.Envelope != c.envelp {
					t.Errorf("%s: size %+v, want %g (%g..%g) toleranced %v envelope %v", c.name, s, c.nominal, c.min, c.max, c.toleranced, c.envelp)
				}
			}
			if s := feature(t, p, "limits").Size; s.Span.Start != at(t, src, `<DiameterCharacteristicNominal id="70"`) {
				t.Errorf("size span %v", s.Span)
			}
			// A reference size is a reference dimension of the feature,
			// which keeps its definition's size.
			if ds := dimsOf(res, 73); len(ds) != 1 || dimText(ds[0]) != "ref size 30 of ref" {
				t.Errorf("the reference size: %v", ds)
			}
			wantNotes(t, res,
				`unsupported: Diameter nominal 74 is on face, a plane: a diameter is not its size; left out`,
				`unsupported: Radius nominal 75 \(5\) is not read`,
				`inconsistent: Diameter nominal 76 gives off the size 10.5, but its feature definition says 10 mm`,
				`inconsistent: Diameter nominal 77 is a second size on limits \(the first is nominal 70\): left out`)
		}},

		construct{name: "dimensions", doc: dimsDoc, check: func(t *testing.T, res *Result, src string) {
			for _, c := range []struct {
				id   ID
				want string
			}{
				{70, "basic 5 from base to step1"},
				{71, "dim 5 +0.1/-0.1 from base to step2"},
				{72, "ref 3 from lip1 to lip2"},
				{73, "basic 3 from lip1 to lip2"},
				{74, "basic 5 from base to step1|basic 5 from base to step2|basic 5 from base to step3"},
				{75, "basic 3 from step1 to lip1|basic 3 from lip1 to lip2"},
				{77, "basic 30deg from base to ramp"},
				{78, "basic 30 from pin1 to pin2 along [1 0 0]"},
				{80, "basic 60deg from base to ramp"},
			} {
				var got []string
				for _, d := range dimsOf(res, c.id) {
					got = append(got, dimText(d))
				}
				if strings.Join(got, "|") != c.want {
					t.Errorf("nominal %d: %q, want %q", c.id, strings.Join(got, "|"), c.want)
				}
			}
			d := dimsOf(res, 70)[0]
			if d.Span.Start != at(t, src, `<DistanceBetweenCharacteristicNominal id="70"`) || d.ValueSpan.Start != at(t, src, "<TargetValue>5<") ||
				d.From.Span.Start != at(t, src, "<FirstFeature>") {
				t.Errorf("spans %v %v %v", d.Span, d.ValueSpan, d.From.Span)
			}
			if len(dimsOf(res, 76)) != 0 {
				t.Errorf("unreadable dimensions are left out")
			}
			wantNotes(t, res,
				`inconsistent: DistanceBetween nominal 73 is basic but carries a tolerance \(0.02/-0.02\), as a display tolerance of a model dimension: read as basic`,
				`unsupported: DistanceBetween nominal 76 is on 3 features without FeatureNominalPairs, and the nominal geometry does not tell`,
				`unsupported: an angular size \(Angle\) nominal 79 is not read`)
		}},
	)
}

func display(ref int, texts ...string) string {
	var b strings.Builder
	fmt.Fprintf(&b, "\n<PMIDisplay><Texts n=\"%d\" fontIndex=\"0\" lineHeight=\"3\">", len(texts))
	for _, t := range texts {
		fmt.Fprintf(&b, "<Text><Data>%s</Data><XY>0 0</XY></Text>", t)
	}
	fmt.Fprintf(&b, "</Texts><Reference><Id>%d</Id></Reference></PMIDisplay>", ref)
	return b.String()
}

// The presentation (PMI display texts) is compared with the semantic value.
var displayDoc = qdoc{
	product: `<VisualizationSet><Fonts n="1"><Font index="0"><Name>plain</Name><Size>3</Size></Font></Fonts><PMIDisplaySet n="3">` +
		display(70, "{DIAMETER}", "10{PLUS_MINUS}0.1") + display(71, "{DIAMETER}", ".472IN") + display(72, "{DIAMETER}", "10.10{BR}10.00") +
		`</PMIDisplaySet></VisualizationSet><PartSet n="1"><Part id="30" label="Display test"/></PartSet><RootPart><Id>30</Id></RootPart>`,
	fdefs: cylDef(40, "INTERNAL", 10) + cylDef(41, "INTERNAL", 12),
	fnoms: cyl(50, 40, "a", "0 0 0", "0 0 1") + cyl(51, 41, "b", "20 0 0", "0 0 1") + cyl(52, 40, "c", "40 0 0", "0 0 1"),
	cdefs: deviations("Diameter", 60, "0.1", "-0.1") +
		`<DiameterCharacteristicDefinition id="61"><Tolerance><MaxValue>10.1</MaxValue><MinValue>10</MinValue><DefinedAsLimit>true</DefinedAsLimit></Tolerance></DiameterCharacteristicDefinition>`,
	cnoms: nominal("Diameter", 70, 60, target("10"), 50) + nominal("Diameter", 71, 60, `<TargetValue linearUnit="mm">12</TargetValue>`, 51) +
		nominal("Diameter", 72, 61, "", 52),
}

// Characteristics written on feature items (a plan's view) reach their
// features through the items.
var itemsDoc = qdoc{
	fdefs:  cylDef(40, "INTERNAL", 10),
	fnoms:  cyl(50, 40, "a", "0 0 0", "0 0 1"),
	fitems: `<CylinderFeatureItem id="55"><FeatureNominalId>50</FeatureNominalId><FeatureName>a</FeatureName><DeterminationMode><Set/></DeterminationMode></CylinderFeatureItem>`,
	cdefs:  deviations("Diameter", 60, "0.1", "-0.1"),
	cnoms:  `<DiameterCharacteristicNominal id="70"><CharacteristicDefinitionId>60</CharacteristicDefinitionId><TargetValue>10</TargetValue></DiameterCharacteristicNominal>`,
	citems: `<DiameterCharacteristicItem id="75">` + ids("FeatureItemIds", 55) + `<CharacteristicNominalId>70</CharacteristicNominalId></DiameterCharacteristicItem>`,
}

// Documents that contradict themselves (the schema's key references catch
// these; the reader reports them and goes on).
var danglingDoc = qdoc{
	datums: datumOn(10, "A", 50),
	drfs:   drf(20, ref{10, "", "PRIMARY"}) + drf(21, ref{11, "", "PRIMARY"}),
	fdefs:  planeDef(40),
	fnoms:  plane(50, 40, "base", "0 0 0", "0 0 -1") + plane(51, 99, "ghost", "0 0 1", "0 0 1") + cyl(52, 40, "odd", "0 0 0", "0 0 1"),
	cdefs:  flatness(60, "0.02") + flatness(61, "x0.02") + orientation("Parallelism", 62, "0.1", 21, "PlanarZone") + orientation("Parallelism", 63, "0.1", 22, "PlanarZone"),
	cnoms: nominal("Flatness", 70, 60, "", 50) + nominal("Flatness", 71, 61, "", 50) + nominal("Flatness", 72, 98, "", 50) +
		nominal("Parallelism", 73, 60, "", 50) + nominal("Parallelism", 74, 62, "", 50) + nominal("Parallelism", 75, 63, "", 50) +
		nominal("Flatness", 76, 60, "", 97),
}

func init() {
	constructs = append(constructs,
		construct{name: "display", doc: displayDoc, check: func(t *testing.T, res *Result, src string) {
			if h := res.Part.Headers; res.Part.Title != "Display test" || h[len(h)-1].Keyword != "part" {
				t.Errorf("title %q", res.Part.Title)
			}
			wantNotes(t, res,
				`inconsistent: Diameter nominal 71 is labelled mm, but its presentation "{DIAMETER} .472IN" writes inches`,
				`inconsistent: Diameter nominal 71 has the value 12, but its presentation "{DIAMETER} .472IN" does not show it`)
		}},
		construct{name: "items", doc: itemsDoc, check: func(t *testing.T, res *Result, src string) {
			if s := feature(t, res.Part, "a").Size; s == nil || !s.Toleranced {
				t.Errorf("size through the items: %+v", s)
			}
			wantNotes(t, res)
		}},
		construct{name: "dangling", doc: danglingDoc, invalid: true, check: func(t *testing.T, res *Result, src string) {
			if len(res.Part.Frames) != 1 || len(res.Part.Features) != 1 {
				t.Errorf("%d frames, %d features", len(res.Part.Frames), len(res.Part.Features))
			}
			wantNotes(t, res,
				`inconsistent: feature nominal 51 \(Plane\) is left out: its definition 99 is not in FeatureDefinitions`,
				`inconsistent: feature nominal 52 \(Cylinder\) is left out: it is a Cylinder nominal with a Plane definition \(40\)`,
				`inconsistent: <ToleranceValue> "x0.02" is not a finite number: left out`,
				`inconsistent: Flatness definition 61 has no readable tolerance value: Flatness nominal 71 is left out`,
				`inconsistent: characteristic nominal 72 names definition 98, which is not in CharacteristicDefinitions`,
				`inconsistent: the Parallelism nominal 73 names a Flatness definition \(60\): left out`,
				`inconsistent: datum reference frame 21 names datum definition 11, which is not in DatumDefinitions`,
				`unsupported: Parallelism nominal 74 is left out: its datum reference frame cannot be read`,
				`inconsistent: datum reference frame 22 is not in DatumReferenceFrames`,
				`unsupported: Parallelism nominal 75 is left out: its datum reference frame cannot be read`,
				`unsupported: Flatness nominal 76 is left out: 97 is no feature nominal`)
		}},
	)
}

// A basic distance shown rounded: 0.56 with two decimal places for faces
// 0.5625 apart reads as the model's 0.5625 (the written text is kept); 0.57
// with two decimals is no rounding of it and stays as written, and 0.56
// with three decimals (0.560) is not either.
var roundedDoc = qdoc{
	units: unitsMMInch,
	fdefs: planeDef(40),
	fnoms: plane(50, 40, "lower", "0 0 0", "0 0 -1") + plane(51, 40, "upper", "0 0 14.2875", "0 0 1"),
	cdefs: basicDef("DistanceBetween", 60),
	cnoms: nominal("DistanceBetween", 70, 60, `<TargetValue decimalPlaces="2">0.56</TargetValue><AnalysisMode>THREEDIMENSIONAL</AnalysisMode>`, 50, 51) +
		nominal("DistanceBetween", 71, 60, `<TargetValue decimalPlaces="2">0.57</TargetValue><AnalysisMode>THREEDIMENSIONAL</AnalysisMode>`, 50, 51) +
		nominal("DistanceBetween", 72, 60, `<TargetValue decimalPlaces="3">0.560</TargetValue><AnalysisMode>THREEDIMENSIONAL</AnalysisMode>`, 50, 51),
}

func init() {
	constructs = append(constructs, construct{name: "rounded", doc: roundedDoc, check: func(t *testing.T, res *Result, src string) {
		wantNotes(t, res)
		ds := res.Part.Dims
		if len(ds) != 3 {
			t.Fatalf("%d dimensions", len(ds))
		}
		if ds[0].Value != 0.5625 || ds[0].ValueText != "0.56" {
			t.Errorf("0.56 of 0.5625 read as %v (%q)", ds[0].Value, ds[0].ValueText)
		}
		if ds[1].Value != 0.57 || ds[2].Value != 0.56 {
			t.Errorf("0.57 and 0.560 read as %v and %v", ds[1].Value, ds[2].Value)
		}
	}})
}
