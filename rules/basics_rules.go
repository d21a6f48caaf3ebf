package rules

import (
	"fmt"
	"math"
	"strings"
	"unicode/utf8"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/rules/basics"
)

// This file holds the basic-dimension rules, built on the engine in
// rules/basics and on the kinematic analysis of each frame
// (rules/kinematics).

// BasicMissing reports a frame whose zone's place is not fixed by basic
// dimensions.
var BasicMissing = Register(&Rule{
	ID:       "basic-missing",
	Summary:  "a located or oriented feature whose nominal place relative to a frame's datums is not fixed by basic dimensions (implied 0 and 90 degrees count)",
	Severity: Error,
	Rationale: `Position and located profile put the tolerance zone at the true position, and angularity
orients it at the true angle; both are given by basic dimensions from the frame's datums. Where
a distance or an angle that the datums fix is not written (and not implied: features that line
up, coaxial features, and 0 or 90 degree angles are), the zone has no defined place and
inspectors will each pick one. For a pattern, each member must also be placed relative to the
others; a composite lower segment asks only for that and its orientation. datumlint decides
it by the rank of the linearised basic relations, so chains, bolt circles and angles about an
axis all count, and names the quantity and the dimension to add with its model value.`,
	Source: "ASME Y14.5-2018, basic dimensions, true position and implied basic zero and 90 degree dimensions; ISO 1101:2017 and ISO 5458:2018, theoretically exact dimensions",
	Bad: `feature base plane normal -z at (0, 0, 0)
feature rear plane normal -y at (0, 0, 0)
feature left plane normal -x at (0, 0, 0)
feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)
datum A on base
datum B on rear
datum C on left
frame bore: position dia 0.1 (M) datums A, B, C
basic 40 from rear to bore`,
	Good: `feature base plane normal -z at (0, 0, 0)
feature rear plane normal -y at (0, 0, 0)
feature left plane normal -x at (0, 0, 0)
feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)
datum A on base
datum B on rear
datum C on left
frame bore: position dia 0.1 (M) datums A, B, C
basic 60 from left to bore
basic 40 from rear to bore`,
	Fix:     "insert one basic line per missing quantity, with the model's value, beside the feature's other basic lines or after its frames",
	FixSafe: true,
	Run: func(p *Pass) {
		// One finding per frame, naming every missing quantity: the frame
		// is one annotation to fix, and one line of the drawing.
		for _, fr := range p.Part.Frames {
			if fr.Target.Feature != nil && p.facts.brokenMentions()[fr.Target.Feature.Name] {
				continue // a dimension to it may be in a line that did not parse
			}
			seen := map[string]bool{}
			var msgs, adds []string
			for i, seg := range fr.Segments {
				ms, ok := p.Basics().Missing(fr, i)
				if !ok {
					continue
				}
				for _, m := range ms {
					msg := missingMessage(seg, m)
					if !seen[msg] {
						seen[msg] = true
						msgs = append(msgs, msg)
					}
					if m.Suggest != "" && !seen["add:"+m.Suggest] {
						seen["add:"+m.Suggest] = true
						adds = append(adds, m.Suggest)
					}
				}
			}
			if len(msgs) == 0 {
				continue
			}
			d := Diagnostic{Span: fr.CharSpan, Message: msgs[0]}
			if len(msgs) > 1 {
				d.Message = fmt.Sprintf("%s; and %s", msgs[0], strings.Join(msgs[1:], "; and "))
			}
			if fix, ok := insertBasics(p, fr, adds); ok {
				d.Fixes = []Fix{fix}
			}
			p.ReportDiagnostic(d)
		}
	},
})

// insertBasics is basic-missing's fix: one edit per missing quantity,
// each inserting the `basic` line that the message suggests (the engine
// writes it with the model's nominal value, in the file's units). The
// lines go below the last basic dimension to or from the frame's feature,
// or else below the last frame on it, so that they stay beside what they
// complete; the file's line ends are kept. The fix is safe: a basic
// dimension equal to the model adds no requirement the model does not
// already have (ASME Y14.41-2019, model values are basic).
func insertBasics(p *Pass, fr *model.Frame, adds []string) (Fix, bool) {
	ft := fr.Target.Feature
	if ft == nil || len(adds) == 0 {
		return Fix{}, false
	}
	anchor := fr.Span.End.Line
	for _, f := range p.Part.FramesOn(ft) {
		anchor = max(anchor, f.Span.End.Line)
	}
	last := 0
	for _, d := range p.Part.Dims {
		on := d.From.Feature == ft || d.To.Feature == ft
		if d.Circle != nil {
			on = on || d.Circle.Pattern.Feature == ft
		}
		if d.Basic && on {
			last = max(last, d.Span.End.Line)
		}
	}
	if last > 0 {
		anchor = last
	}
	file, eol := p.Part.Source, p.facts.lineEnd()
	at := source.Pos{Line: anchor + 1, Col: 1}
	before, after := "", eol
	if anchor >= file.Lines() {
		// The last line has no line end: end it first.
		at = source.Pos{Line: anchor, Col: utf8.RuneCount(file.LineBytes(anchor)) + 1}
		before, after = eol, ""
	}
	fix := Fix{Safe: true, Message: fmt.Sprintf("insert `%s`", adds[0])}
	if len(adds) > 1 {
		fix.Message = fmt.Sprintf("insert the %d basic dimensions: `%s`", len(adds), strings.Join(adds, "`, `"))
	}
	for _, a := range adds {
		fix.Edits = append(fix.Edits, Edit{Span: source.Span{Start: at, End: at}, NewText: before + a + after})
	}
	return fix, true
}

func basicRefName(seg *model.Segment, k int) string {
	if k < 0 || k >= len(seg.Refs) {
		return "the datums"
	}
	return "datum " + seg.Refs[k].Name
}

func missingMessage(seg *model.Segment, m basics.Missing) string {
	who := basics.Name(m.Member)
	rel := basicRefName(seg, m.Ref)
	if m.Other != nil {
		rel = basics.Name(m.Other)
	}
	var msg string
	switch m.Kind {
	case basics.Location:
		msg = fmt.Sprintf("%s's location along %s relative to %s has no basic dimension", who, basics.DirName(m.Dir), rel)
	case basics.Angle:
		msg = fmt.Sprintf("%s's angle to %s needs a basic angle", who, strings.TrimPrefix(rel, "the "))
	case basics.Circle:
		msg = fmt.Sprintf("the distance of %s's members from the axis of %s has no basic dimension", m.Member.Feature.Name, basics.Name(m.Hub))
	case basics.Clocking:
		msg = fmt.Sprintf("%s's angle about the axis of %s relative to %s needs a basic angle", who, basics.Name(m.Hub), rel)
	}
	if m.Suggest != "" {
		msg += fmt.Sprintf(": add `%s`", m.Suggest)
	}
	return msg
}

// BasicMismatch reports a dimension that disagrees with the model.
var BasicMismatch = Register(&Rule{
	ID:       "basic-mismatch",
	Summary:  "a basic or toleranced dimension whose value disagrees with the nominal geometry",
	Severity: Error,
	Rationale: `A basic dimension is the theoretically exact value the model has; a dimension that says
something else puts the tolerance zone somewhere the part is not, and the drawing and the model
then disagree about the part. Lengths are compared within about a millionth of the part's size,
angles as the angle or its supplement (lines have no sense). A bolt circle's diameter must pass
through every member, and a width given between two faces must have their distance as its size.
Two chains of basic dimensions that define one quantity differently always contain a link that
disagrees with the model, and it is reported on that line. A reference dimension is checked the
same way (a reference size against the feature's nominal size), though it locates and
tolerances nothing (extension).`,
	Source: "ASME Y14.5-2018, basic dimensions (theoretically exact); ASME Y14.41-2019, agreement of annotation and model; ISO 1101:2017, theoretically exact dimensions",
	Bad: `feature left plane normal -x at (0, 0, 0)
feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)
basic 62 from left to bore`,
	Good: `feature left plane normal -x at (0, 0, 0)
feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)
basic 60 from left to bore`,
	Run: func(p *Pass) {
		for _, m := range p.Basics().Engine().Mismatches() {
			p.Report(m.Dim.ValueSpan, "%s", mismatchMessage(m))
		}
		tol := p.Part.Tolerance()
		for _, d := range p.Part.Dims {
			if d.SizeOf == nil || !d.SizeOf.Known() {
				continue
			}
			f := d.SizeOf.Feature
			switch {
			case !f.Kind.TakesSize():
				p.Report(d.SizeOf.Span, "%s is a %s, which has no size: a reference size belongs to a feature of size or a circle", f.Name, f.Kind)
			case f.Size != nil && math.Abs(f.Size.Nominal-d.Value) > tol:
				p.Report(d.ValueSpan, "the nominal size of %s is %s, not %s", f.Name, basics.Num(f.Size.Nominal), basics.Num(d.Value))
			}
		}
		for _, f := range p.Part.Features {
			a, b := f.Faces[0], f.Faces[1]
			if a == nil || b == nil || !a.Resolved() || !b.Resolved() || !f.HasGeometry || f.Size == nil || f.Broken {
				continue
			}
			gap := math.Abs(f.Dir.Unit().Dot(b.Feature.Point().Sub(a.Feature.Point())))
			if math.Abs(gap-f.Size.Nominal) > tol {
				p.Report(f.Size.Span, "the faces %s and %s are %s apart in the model, so the width's nominal size is %s, not %s", a.Name, b.Name, basics.Num(gap), basics.Num(gap), basics.Num(f.Size.Nominal))
			}
		}
	},
})

func mismatchMessage(m basics.Mismatch) string {
	d := m.Dim
	if m.Problem != "" {
		return m.Problem
	}
	if d.Circle != nil {
		return fmt.Sprintf("%s lies on a circle of diameter %s about %s in the model, not %s", basics.Name(m.Member), basics.Num(m.Nominal), d.Circle.About.Name, basics.Num(d.Value))
	}
	if d.Angle {
		about := ""
		if d.About != nil {
			about = " about the axis of " + d.About.Name
		}
		if basics.NumAngle(m.Nominal) == basics.NumAngle(180-m.Nominal) {
			return fmt.Sprintf("the nominal angle%s between %s and %s is %sdeg, not %sdeg", about, d.From.Name, d.To.Name, basics.NumAngle(m.Nominal), basics.Num(d.Value))
		}
		return fmt.Sprintf("the nominal angle%s between %s and %s is %sdeg (or %sdeg), not %sdeg", about, d.From.Name, d.To.Name, basics.NumAngle(m.Nominal), basics.NumAngle(180-m.Nominal), basics.Num(d.Value))
	}
	along := ""
	if d.Along != nil {
		along = " along " + basics.DirName(*d.Along)
	}
	from, to, every := d.From.Name, d.To.Name, ""
	if m.Member != nil {
		// A dimension on a pattern's name holds for every member.
		if d.To.Member == nil && d.To.Feature == m.Member.Feature {
			to = basics.Name(m.Member)
		} else {
			from = basics.Name(m.Member)
		}
		every = fmt.Sprintf(" (a dimension to the pattern %s applies to each member)", m.Member.Feature.Name)
	}
	return fmt.Sprintf("the nominal distance from %s to %s%s is %s, not %s%s", from, to, along, basics.Num(m.Nominal), basics.Num(d.Value), every)
}

// BasicToleranced reports a toleranced dimension locating a feature whose
// place is a basic one.
var BasicToleranced = Register(&Rule{
	ID:       "basic-toleranced",
	Summary:  "a feature under position or located profile that is also located by a `dim` (toleranced) dimension",
	Severity: Error,
	Rationale: `Position and located profile already say how far the feature may be from its true position,
which basic dimensions define. A toleranced location dimension to the same feature adds a
second, conflicting tolerance on the same location (and the tolerance stack of a chain of
them): the standards require the location to be basic. A toleranced dimension from a datum
feature to a feature that nothing else locates (no frame, no datum) measures from the datum as
its origin and locates that other feature, so it is not reported against the datum feature,
even where the datum feature is itself under a located profile (common practice; extension).`,
	Source: "ASME Y14.5-2018, position: true position established by basic dimensions; ISO 5458:2018 and ISO 1101:2017, theoretically exact dimensions",
	Bad: `feature rear plane normal -y at (0, 0, 0)
feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)
frame bore: position dia 0.1 datums A, B, C
dim 40 +-0.1 from rear to bore`,
	Good: `feature rear plane normal -y at (0, 0, 0)
feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)
frame bore: position dia 0.1 datums A, B, C
basic 40 from rear to bore`,
	Run: func(p *Pass) {
		for _, t := range p.Basics().Toleranced() {
			d := t.Dim
			val := basics.Num(d.Value)
			if d.Angle {
				val += "deg"
			}
			along := ""
			if d.Along != nil {
				along = " along " + basics.AlongName(*d.Along)
			}
			p.Report(d.ValueSpan, "%s is under %s; its location must be basic: write `basic %s from %s to %s%s`", t.Feature.Name, t.Char, val, d.From.Name, d.To.Name, along)
		}
	},
})
