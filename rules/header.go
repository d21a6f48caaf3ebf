package rules

import (
	"strconv"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// Syntax reports what does not parse, and values the notation does not
// know (a kind, a characteristic, a unit).
var Syntax = Register(&Rule{
	ID:       "syntax",
	Summary:  "a line that does not parse",
	Severity: Error,
	Rationale: `A statement that does not follow the callout notation cannot be checked, and a reader of
the drawing would have to guess what it means. Each bad statement is reported on its own, with
the position of the first thing that is wrong and what was expected there; the rest of the
file is still checked.`,
	Source: "the datumlint callout notation, version 0 (docs/notation.md)",
	Bad:    "feature bore hole size 25 +0.05 -0 axis at (60, 40, 0)",
	Good:   "feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)",
	Run: func(p *Pass) {
		for _, e := range p.Part.Problems {
			if e.Kind == model.Syntax {
				p.Report(e.Span, "%s", e.Message)
			}
		}
	},
})

// HeaderMissing reports a file that does not say its units or standard.
var HeaderMissing = Register(&Rule{
	ID:       "header-missing",
	Summary:  "no `units` or no `standard` statement",
	Severity: Error,
	Rationale: `Every value in the file is read in its units, and which rules apply depends on the
governing standard: the envelope principle is the default in ASME Y14.5, independency in ISO
8015; concentricity and symmetry exist in ASME Y14.5-2009 and ISO 1101 but not in ASME
Y14.5-2018. A drawing states both in its title block; the callout file must too.`,
	Source: "ASME Y14.5-2018, drawing requirements (units and the standard referenced on the drawing); ISO 8015:2011, invocation principle",
	Bad:    "part \"Bracket BR-7\"\nunits mm",
	Good:   "part \"Bracket BR-7\"\nunits mm\nstandard asme-2018",
	Run: func(p *Pass) {
		if p.Part.NotText {
			return // not a callouts file at all: its syntax finding says so, once
		}
		has := map[string]bool{}
		for _, h := range p.Part.Headers {
			has[h.Keyword] = true
		}
		var miss []string
		if !has["units"] {
			miss = append(miss, "`units mm` (or `units in`)")
		}
		if !has["standard"] {
			miss = append(miss, "`standard asme-2018` (or asme-2009, iso)")
		}
		if len(miss) == 0 {
			return
		}
		sp := p.Part.FirstStatement()
		what := "units"
		switch {
		case !has["units"] && !has["standard"]:
			what = "units nor its standard"
		case !has["standard"]:
			what = "standard"
		}
		verb := "does not declare its"
		if !has["units"] && !has["standard"] {
			verb = "declares neither its"
		}
		p.Report(sp, "the file %s %s: add %s at the top", verb, what, strings.Join(miss, " and "))
	},
})

// HeaderDuplicate reports a header written twice or after a feature.
var HeaderDuplicate = Register(&Rule{
	ID:       "header-duplicate",
	Summary:  "a `part`, `units`, `standard` or `basis` statement written twice, or after the first feature",
	Severity: Error,
	Rationale: `The header states once, before any feature, what the whole file is read in. A second
'units' or 'standard' line leaves a reader unsure which one governs the lines above it.`,
	Source: "the datumlint callout notation, version 0 (header: each at most once, before any feature)",
	Bad:    "units mm\nstandard asme-2018\nunits in",
	Good:   "units mm\nstandard asme-2018",
	Run: func(p *Pass) {
		seen := map[string]source.Span{}
		var firstFeature source.Span
		for _, st := range p.Part.Statements {
			if st.Keyword == "feature" {
				firstFeature = st.Span
				break
			}
		}
		for _, h := range p.Part.Headers {
			if first, ok := seen[h.Keyword]; ok {
				p.ReportRelated(h.Span, []Related{{first, "'" + h.Keyword + "' is first declared here"}},
					"'%s' is already declared on line %d; keep one", h.Keyword, first.Start.Line)
				continue
			}
			seen[h.Keyword] = h.Span
			if !firstFeature.IsZero() && h.Span.Start.Line > firstFeature.Start.Line {
				p.ReportRelated(h.Span, []Related{{firstFeature, "the first feature"}},
					"'%s' comes after the first feature (line %d); move the header to the top of the file", h.Keyword, firstFeature.Start.Line)
			}
		}
	},
})

// GeometryInvalid reports nominal geometry that cannot be what was meant.
var GeometryInvalid = Register(&Rule{
	ID:       "geometry-invalid",
	Summary:  "nominal geometry that cannot be built: a width between faces that are not two parallel planes, a datum target off its feature, a counterbore or countersink that does not fit its hole",
	Severity: Error,
	Rationale: `A width (slot or tab) is two opposed parallel faces; its mid-plane, the datum or the axis
of its tolerance zone, exists only if the faces are parallel planes. A width given 'between'
two features that are not parallel planes describes nothing a gauge could establish.

A datum target is a place on its datum feature: a point, a line or an area where the
simulator touches the part. One that is not on the feature's nominal surface touches
nothing, and one on a surface whose normal the model does not give (a free-form surface) must
say along which direction it touches. A counterbore or a countersink is wider than its
hole, a counterbore has a depth and a countersink an included angle between 0 and 180
degrees (extension).`,
	Source: "ASME Y14.5-2018, definitions (feature of size: two opposed parallel surfaces) and datum targets; ISO 14405-1:2016, features of linear size; ISO 5459:2011, datum targets",
	Bad:    "feature top plane normal +z at (0, 0, 10)\nfeature side plane normal +x at (0, 0, 0)\nfeature web tab size 10 +-0.1 between top side",
	Good:   "feature top plane normal +z at (0, 0, 10)\nfeature bottom plane normal -z at (0, 0, 0)\nfeature web tab size 10 +-0.1 between top bottom",
	Run: func(p *Pass) {
		for _, e := range p.Part.Problems {
			if e.Kind == model.Geometry {
				p.Report(e.Span, "%s", e.Message)
			}
		}
		for _, t := range p.Part.Targets {
			targetGeometry(p, t)
		}
		for _, f := range p.Part.Features {
			holeGeometry(p, f)
		}
	},
})

// targetGeometry reports a datum target off its feature's nominal surface,
// or one with no normal to be touched along.
func targetGeometry(p *Pass, t *model.DatumTarget) {
	if t.Broken || !t.On.Known() || !t.On.Feature.HasGeometry {
		return
	}
	ends := []model.Vec{t.Point}
	if t.Shape == model.TargetLine {
		ends = append(ends, t.End)
	}
	for _, e := range ends {
		if d, ok := t.On.DistanceFrom(e); ok && d > p.Part.Tolerance() {
			p.Report(t.Span, "datum target %s is not on %s: %s is %s from its nominal surface; put the target on the feature it touches", t.Label, t.On.Name, vecText(e), numText(d))
			return
		}
	}
	if _, ok := t.On.NormalAt(t.Point); !ok && t.Normal.Norm() == 0 {
		p.Report(t.Span, "datum target %s is on the %s %s, whose normal at the target the model does not give: write the direction it is touched along, e.g. `normal +z`", t.Label, t.On.Feature.Kind, t.On.Name)
	}
}

// holeGeometry reports a counterbore or countersink that does not fit its
// hole.
func holeGeometry(p *Pass, f *model.Feature) {
	if f.Broken {
		return
	}
	hole := 0.0
	if f.Size != nil {
		hole = f.Size.Max()
	}
	if c := f.Counterbore; c != nil {
		switch {
		case c.Diameter.Nominal <= hole:
			p.Report(c.Diameter.Span, "the counterbore of %s is %s across, not wider than the hole (%s at its largest): give the counterbore's diameter", f.Name, numText(c.Diameter.Nominal), numText(hole))
		case c.Depth.Nominal <= 0:
			p.Report(c.Depth.Span, "the counterbore of %s has no depth (%s): give its depth", f.Name, numText(c.Depth.Nominal))
		}
	}
	if c := f.Countersink; c != nil {
		switch {
		case c.Diameter.Nominal <= hole:
			p.Report(c.Diameter.Span, "the countersink of %s is %s across at the surface, not wider than the hole (%s at its largest): give the countersink's diameter", f.Name, numText(c.Diameter.Nominal), numText(hole))
		case c.Angle.Nominal <= 0 || c.Angle.Nominal >= 180:
			p.Report(c.Angle.Span, "a countersink's included angle lies between 0 and 180 degrees, found %sdeg", numText(c.Angle.Nominal))
		}
	}
}

func numText(x float64) string { return strconv.FormatFloat(x, 'g', 6, 64) }

func vecText(v model.Vec) string {
	return "(" + numText(v[0]) + ", " + numText(v[1]) + ", " + numText(v[2]) + ")"
}
