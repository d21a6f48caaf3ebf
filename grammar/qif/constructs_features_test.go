package qif

import (
	"math"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar/model"
)

const (
	sweep90  = `<Sweep><DirBeg>1 0 0</DirBeg><DomainAngle>0 1.5707963267949</DomainAngle></Sweep>`
	sweep270 = `<Sweep><DirBeg>1 0 0</DirBeg><DomainAngle>0 4.71238898038469</DomainAngle></Sweep>`
)

func latLong(lat0, lat1, lon0, lon1 string) string {
	return `<LatitudeLongitudeSweep><DirMeridianPrime>1 0 0</DirMeridianPrime><DomainLatitude>` + lat0 + " " + lat1 +
		`</DomainLatitude><DomainLongitude>` + lon0 + " " + lon1 + `</DomainLongitude><DirNorthPole>0 0 1</DirNorthPole></LatitudeLongitudeSweep>`
}

// Every feature nominal type the reader maps, with internal and external.
var kinds = qdoc{
	fdefs: planeDef(1) + widthDef(2, "EXTERNAL", 12) + cylDef(3, "EXTERNAL", 10) +
		sizedDef("Sphere", 4, "EXTERNAL", "Diameter", 20) + sizedDef("SphericalSegment", 5, "INTERNAL", "Diameter", 16) +
		`<ConeFeatureDefinition id="6"><InternalExternal>INTERNAL</InternalExternal><Diameter>10</Diameter><HalfAngle>0.5</HalfAngle></ConeFeatureDefinition>` +
		`<ConeFeatureDefinition id="7"><InternalExternal>EXTERNAL</InternalExternal><Diameter>0</Diameter><FullAngle>1.2</FullAngle></ConeFeatureDefinition>` +
		sizedDef("CylindricalSegment", 8, "INTERNAL", "Diameter", 6) +
		`<ElongatedCylinderFeatureDefinition id="9"><InternalExternal>INTERNAL</InternalExternal><Diameter>8</Diameter><Length>30</Length></ElongatedCylinderFeatureDefinition>` +
		`<ExtrudedCrossSectionFeatureDefinition id="10"><InternalExternal>EXTERNAL</InternalExternal><Length>20</Length></ExtrudedCrossSectionFeatureDefinition>` +
		`<OtherShapeFeatureDefinition id="11"><Description>blend</Description></OtherShapeFeatureDefinition>` +
		`<TorusFeatureDefinition id="12"><InternalExternal>EXTERNAL</InternalExternal><MinorDiameter>2</MinorDiameter><MajorDiameter>20</MajorDiameter></TorusFeatureDefinition>` +
		`<OppositeAngledPlanesFeatureDefinition id="13"><InternalExternal>INTERNAL</InternalExternal><Width>10</Width><EndType><SlotEndEnum>OPEN</SlotEndEnum></EndType><TaperAngle>0.5</TaperAngle></OppositeAngledPlanesFeatureDefinition>` +
		`<LineFeatureDefinition id="14"/>` + sizedDef("Circle", 15, "INTERNAL", "Diameter", 4) + `<PointFeatureDefinition id="16"/>` +
		cylDef(17, "NOT_APPLICABLE", 5),
	fnoms: plane(100, 1, "", "0 0 0", "0 0 2") +
		width(101, 2, "", "10 0 0", "1 0 0") +
		cyl(102, 3, "", "0 10 0", "0 0 -1") +
		`<SphereFeatureNominal id="103"><FeatureDefinitionId>4</FeatureDefinitionId><Location>1 2 3</Location></SphereFeatureNominal>` +
		`<SphericalSegmentFeatureNominal id="104"><FeatureDefinitionId>5</FeatureDefinitionId><Location>4 5 6</Location>` + latLong("-0.1", "1.5707963267949", "0", "6.28318530717959") + `</SphericalSegmentFeatureNominal>` +
		`<SphericalSegmentFeatureNominal id="105"><FeatureDefinitionId>5</FeatureDefinitionId><Location>7 8 9</Location>` + latLong("0", "0.5", "0", "1") + `</SphericalSegmentFeatureNominal>` +
		axial("Cone", 106, 6, "", "0 0 10", "0 0 -1") +
		axial("Cone", 107, 7, "", "5 5 5", "1 0 0") +
		`<CylindricalSegmentFeatureNominal id="108"><FeatureDefinitionId>8</FeatureDefinitionId><Axis><AxisPoint>0 20 0</AxisPoint><Direction>0 0 1</Direction></Axis>` + sweep90 + `</CylindricalSegmentFeatureNominal>` +
		`<CylindricalSegmentFeatureNominal id="109"><FeatureDefinitionId>8</FeatureDefinitionId><Axis><AxisPoint>0 30 0</AxisPoint><Direction>0 0 1</Direction></Axis>` + sweep270 + `</CylindricalSegmentFeatureNominal>` +
		`<ElongatedCylinderFeatureNominal id="110"><FeatureDefinitionId>9</FeatureDefinitionId><CenterPlane><Point>40 0 0</Point><Normal>0 1 0</Normal></CenterPlane><DepthVector>0 0 -1</DepthVector></ElongatedCylinderFeatureNominal>` +
		`<ExtrudedCrossSectionFeatureNominal id="111"><FeatureDefinitionId>10</FeatureDefinitionId><Direction>0 0 3</Direction>` + ids("CrossSectionReferenceFeatureId", 114) + `</ExtrudedCrossSectionFeatureNominal>` +
		`<OtherShapeFeatureNominal id="112"><FeatureDefinitionId>11</FeatureDefinitionId></OtherShapeFeatureNominal>` +
		`<TorusFeatureNominal id="113"><FeatureDefinitionId>12</FeatureDefinitionId><Location>0 0 -5</Location><AxisVector>0 0 1</AxisVector></TorusFeatureNominal>` +
		`<LineFeatureNominal id="114"><FeatureDefinitionId>14</FeatureDefinitionId><Location>0 0 0</Location><Direction>1 0 0</Direction></LineFeatureNominal>` +
		`<CircleFeatureNominal id="115"><FeatureDefinitionId>15</FeatureDefinitionId><Location>0 0 0</Location><Normal>0 0 1</Normal></CircleFeatureNominal>` +
		`<PointFeatureNominal id="116"><FeatureDefinitionId>16</FeatureDefinitionId><Location>1 1 1</Location></PointFeatureNominal>` +
		`<OppositeAngledPlanesFeatureNominal id="117"><FeatureDefinitionId>13</FeatureDefinitionId><CenterPlane><Point>50 0 0</Point><Normal>1 0 0</Normal></CenterPlane></OppositeAngledPlanesFeatureNominal>` +
		cyl(118, 17, "", "0 0 0", "0 0 1"),
}

func init() {
	constructs = append(constructs,
		construct{name: "feature-kinds", doc: kinds, check: func(t *testing.T, res *Result, src string) {
			p := res.Part
			for _, c := range []struct {
				name  string
				kind  model.Kind
				point model.Vec
				dir   model.Vec
				size  float64 // 0: no size
				geom  bool
			}{
				{"plane_100", model.Plane, model.Vec{0, 0, 0}, model.Vec{0, 0, 1}, 0, true},
				{"tab_101", model.Tab, model.Vec{10, 0, 0}, model.Vec{1, 0, 0}, 12, true},
				{"pin_102", model.Pin, model.Vec{0, 10, 0}, model.Vec{0, 0, -1}, 10, true},
				{"ball_103", model.Ball, model.Vec{1, 2, 3}, model.Vec{}, 20, true},
				{"socket_104", model.Socket, model.Vec{4, 5, 6}, model.Vec{}, 16, true},
				{"surface_105", model.Surface, model.Vec{7, 8, 9}, model.Vec{}, 0, true},
				// The apex: 5 / tan(0.5 rad) beyond the locating point, against the axis.
				{"cone_106", model.Cone, model.Vec{0, 0, 10 + 5/math.Tan(0.5)}, model.Vec{0, 0, -1}, 0, true},
				// A cone whose locating point is its apex (Diameter 0).
				{"cone_107", model.Cone, model.Vec{5, 5, 5}, model.Vec{1, 0, 0}, 0, true},
				{"surface_108", model.Surface, model.Vec{0, 20, 0}, model.Vec{}, 0, true},
				{"hole_109", model.Hole, model.Vec{0, 30, 0}, model.Vec{0, 0, 1}, 6, true},
				{"slot_110", model.Slot, model.Vec{40, 0, 0}, model.Vec{0, 1, 0}, 8, true},
				{"extrusion_111", model.Extrusion, model.Vec{}, model.Vec{0, 0, 1}, 0, false},
				{"surface_112", model.Surface, model.Vec{}, model.Vec{}, 0, false},
				{"surface_113", model.Surface, model.Vec{0, 0, -5}, model.Vec{}, 0, true},
				{"surface_117", model.Surface, model.Vec{50, 0, 0}, model.Vec{}, 0, true},
				// Elements of the geometry: a line, a circle with its
				// definition's diameter, a point.
				{"line_114", model.Line, model.Vec{0, 0, 0}, model.Vec{1, 0, 0}, 0, true},
				{"circle_115", model.Circle, model.Vec{0, 0, 0}, model.Vec{0, 0, 1}, 4, true},
				{"point_116", model.Point, model.Vec{1, 1, 1}, model.Vec{}, 0, true},
			} {
				f := feature(t, p, c.name)
				if f.Kind != c.kind || !nearVec(f.Point(), c.point) || !nearVec(f.Dir, c.dir) || f.HasGeometry != c.geom {
					t.Errorf("%s: %v at %v dir %v geometry %v; want %v at %v dir %v geometry %v", c.name, f.Kind, f.Point(), f.Dir, f.HasGeometry, c.kind, c.point, c.dir, c.geom)
				}
				if c.size == 0 && f.Size != nil || c.size != 0 && (f.Size == nil || !near(f.Size.Nominal, c.size) || f.Size.Toleranced) {
					t.Errorf("%s: size %+v, want %g untoleranced", c.name, f.Size, c.size)
				}
			}
			if len(p.Features) != 18 {
				t.Errorf("%d features, want 18 (the cylinder of no side left out)", len(p.Features))
			}
			wantNotes(t, res,
				`unsupported: feature nominal 105 is a spherical segment of 0.038 of a sphere, which has no opposed points: read as a surface`,
				`unsupported: feature nominal 108 is a cylindrical segment of 90 degrees, which has no opposed points`,
				`unsupported: feature nominal 111: an extruded shape's location is its cross section`,
				`unsupported: feature nominal 117 is two opposed angled planes \(a tapered width\): read as a surface`,
				`inconsistent: feature nominal 118 \(Cylinder\) is left out: its definition does not say whether it is internal or external \("NOT_APPLICABLE"\)`)
		}},

		// Names: a QIF name where it is a valid notation name used once.
		construct{name: "feature-names", doc: qdoc{
			fdefs: planeDef(1),
			fnoms: plane(5, 1, "top face", "0 0 1", "0 0 1") + plane(6, 1, "side", "0 0 0", "1 0 0") +
				plane(7, 1, "twice", "0 0 0", "0 1 0") + plane(8, 1, "twice", "0 0 0", "0 -1 0") +
				plane(9, 1, "plane_10", "0 0 0", "-1 0 0") + plane(10, 1, "", "0 0 0", "0 0 -1") + plane(11, 1, "2nd", "0 0 2", "0 0 1"),
		}, check: func(t *testing.T, res *Result, src string) {
			var got []string
			for _, f := range res.Part.Features {
				got = append(got, f.Name)
			}
			want := "plane_5 side plane_7 plane_8 plane_10 plane_10_2 plane_11"
			if strings.Join(got, " ") != want {
				t.Errorf("names %v, want %s", got, want)
			}
			wantNotes(t, res)
		}},
	)
}

// Four like holes under one size and one position are one pattern; a datum
// on one of them is on that member.
var patterns = qdoc{
	datums: datumOn(10, "A", 50) + datumOn(11, "B", 52),
	drfs:   drf(20, ref{10, "", "PRIMARY"}, ref{11, "MAXIMUM", "SECONDARY"}),
	fdefs:  planeDef(40) + cylDef(41, "INTERNAL", 6) + cylDef(42, "INTERNAL", 9),
	fnoms: plane(50, 40, "base", "0 0 0", "0 0 -1") +
		cyl(51, 41, "", "10 10 0", "0 0 1") + cyl(52, 41, "", "40 10 0", "0 0 -1") + cyl(53, 41, "", "40 40 0", "0 0 1") + cyl(54, 41, "", "10 40 0", "0 0 1") +
		cyl(55, 42, "", "25 25 0", "0 0 1"),
	cdefs: deviations("Diameter", 60, "0.1", "-0.1") + position(61, "0.2", 20, "MAXIMUM", "DiametricalZone", "") +
		orientation("Perpendicularity", 62, "0.05", 0, "DiametricalZone"),
	cnoms: nominal("Diameter", 70, 60, target("6"), 51, 52, 53, 54) +
		nominal("Position", 71, 61, "", 51, 52, 53, 54) +
		nominal("Position", 72, 61, "", 51, 55) +
		nominal("Perpendicularity", 73, 62, "", 51, 53),
}

func init() {
	constructs = append(constructs, construct{name: "patterns", doc: patterns, invalid: false, check: func(t *testing.T, res *Result, src string) {
		p := res.Part
		holes := feature(t, p, "holes_51")
		if !holes.Pattern || len(holes.Members) != 4 || holes.Kind != model.Hole || !nearVec(holes.Members[2].Point, model.Vec{40, 40, 0}) ||
			holes.Size == nil || !near(holes.Size.Upper, 0.1) || !holes.HasGeometry {
			t.Fatalf("pattern %+v", holes)
		}
		if got := res.Origins.Features[holes]; len(got) != 4 || got[3] != 54 {
			t.Errorf("origins %v", got)
		}
		b := p.Datum("B")
		if b.Target.Feature != holes || b.Target.Member != holes.Members[1] || b.Target.Name != "holes_51.2" {
			t.Errorf("datum B on %+v", b.Target)
		}
		fr := p.FramesOn(holes)
		var whole, members int
		for _, f := range fr {
			switch {
			case f.Target.Member == nil:
				whole++
			default:
				members++
			}
		}
		// 71 on the whole pattern; 72 on member 1 (with hole_55 apart); 73 on members 1 and 3.
		if whole != 1 || members != 3 || len(p.FramesOn(feature(t, p, "hole_55"))) != 1 {
			t.Errorf("%d frames on the pattern, %d on members", whole, members)
		}
		// The frame's datum reference frame is shared: the boundary is
		// placed on the characteristic's own element.
		if r := fr[0].Upper().Refs[1]; r.Material != "M" || r.MatSpan.Start != fr[0].Span.Start {
			t.Errorf("B(M): %+v", r)
		}
		wantNotes(t, res,
			`unsupported: Position nominal 72 applies to 2 features together that are not a pattern of like features: the model holds one frame per feature`,
			`unsupported: Perpendicularity nominal 73 applies to 2 features together`)
	}})

	// A QIF group gives the pattern and its name.
	group := withDoc(patterns, func(q *qdoc) {
		q.fdefs += `<GroupFeatureDefinition id="43"/>`
		q.fnoms += `<GroupFeatureNominal id="56"><Name>bolts</Name><FeatureDefinitionId>43</FeatureDefinitionId>` + ids("FeatureNominalIds", 51, 52, 53, 54) + `</GroupFeatureNominal>`
		q.cnoms = nominal("Position", 71, 61, "", 56)
		q.cdefs = position(61, "0.2", 20, "MAXIMUM", "DiametricalZone", "")
	})
	constructs = append(constructs, construct{name: "group", doc: group, check: func(t *testing.T, res *Result, src string) {
		bolts := feature(t, res.Part, "bolts")
		if !bolts.Pattern || len(bolts.Members) != 4 || len(res.Part.FramesOn(bolts)) != 1 || res.Part.FramesOn(bolts)[0].Target.Member != nil {
			t.Errorf("group %+v", bolts)
		}
		wantNotes(t, res)
	}})
}
