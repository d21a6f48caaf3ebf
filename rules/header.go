package rules

import (
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
	Summary:  "a `part`, `units` or `standard` statement written twice, or after the first feature",
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
	Summary:  "nominal geometry that cannot be built: a width between faces that are not two parallel planes",
	Severity: Error,
	Rationale: `A width (slot or tab) is two opposed parallel faces; its mid-plane, the datum or the axis
of its tolerance zone, exists only if the faces are parallel planes. A width given 'between'
two features that are not parallel planes describes nothing a gauge could establish.`,
	Source: "ASME Y14.5-2018, definitions (feature of size: two opposed parallel surfaces); ISO 14405-1:2016, features of linear size",
	Bad:    "feature top plane normal +z at (0, 0, 10)\nfeature side plane normal +x at (0, 0, 0)\nfeature web tab size 10 +-0.1 between top side",
	Good:   "feature top plane normal +z at (0, 0, 10)\nfeature bottom plane normal -z at (0, 0, 0)\nfeature web tab size 10 +-0.1 between top bottom",
	Run: func(p *Pass) {
		for _, e := range p.Part.Problems {
			if e.Kind == model.Geometry {
				p.Report(e.Span, "%s", e.Message)
			}
		}
	},
})
