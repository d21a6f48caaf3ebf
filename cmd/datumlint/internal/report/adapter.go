package report

import (
	"fmt"
	"math"
	"path/filepath"
	"regexp"
	"sort"
	"strings"

	"github.com/datumlint/datumlint/cmd/datumlint/internal/report/draw"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/dof"
	"github.com/datumlint/datumlint/rules/kinematics"
	"github.com/datumlint/datumlint/rules/material"
	"github.com/datumlint/datumlint/rules/setup"
)

// This file is the only one that reads the part model, the rules and the
// engines: it turns one checked file into a Page of plain data. When the
// model changes, this is the file to adjust.
//
// It uses: model.Part (Title, Units, Standard, Features, Datums, Frames,
// Dims, Headers, DatumsOn), model.Feature (Name, Kind, Size, Dir, Members,
// Pattern, HasGeometry, Broken, Span), model.Frame, model.Segment,
// model.Modifier, model.DatumRef, model.Datum (with their spans),
// source.File (Offset, LineBytes), rules.Diagnostic, rules.Lookup,
// kinematics.Result.Segment and kinematics.Segment (DRF.Steps, DRF.Free,
// Zone.Free, Resolved, Problem), dof.Motion, rules/material, and
// rules/setup (Result.Frames, Result.Of, Setup, Reference, Element).

// File is one checked file, as the report command has it.
type File struct {
	Path string
	// Root is the path on the command line the file was found under (a
	// folder, or the file itself); WriteSite mirrors folders below it.
	Root     string
	Source   []byte
	Part     *model.Part
	Findings []rules.Diagnostic
	// Kinematics is the part's kinematic result, the one `datumlint dof`
	// reads; nil means kinematics.Analyze(Part).
	Kinematics *kinematics.Result
}

// Build turns a checked file into a page.
func Build(f File) *Page {
	part := f.Part
	if part == nil {
		part = &model.Part{}
	}
	src := source.NewFile(f.Path, f.Source)
	kin := f.Kinematics
	if kin == nil {
		kin = kinematics.Analyze(part)
	}
	stem := strings.TrimSuffix(filepath.Base(f.Path), filepath.Ext(f.Path))
	p := &Page{
		Path:     f.Path,
		Title:    part.Title,
		Units:    part.Units.String(),
		Standard: part.Standard.String(),
	}
	if p.Title == "" {
		p.Title = stem
	}
	if part.Units == model.UnitsUnknown {
		p.Units = "not stated"
	}
	if part.Standard == model.StandardUnknown {
		p.Standard = "not stated"
	}
	setups := setup.Analyze(part, kin)
	p.Setups = setupsOf(setups)
	ids := map[string]string{}
	for _, s := range p.Setups {
		ids[s.Label] = s.ID
	}
	for _, fr := range part.Frames {
		e := FrameEntry{Frame: frameOf(src, fr)}
		for i, seg := range fr.Segments {
			e.DOF = append(e.DOF, dofOfSegment(kin.Segment(fr, i), fr, i))
			id := ""
			if s := setups.Of(seg.Refs); s != nil {
				id = ids[s.Label()]
			}
			e.SetupIDs = append(e.SetupIDs, id)
		}
		p.Frames = append(p.Frames, e)
	}
	for _, d := range part.Datums {
		p.Datums = append(p.Datums, draw.DatumSymbol{Letter: d.Letter, Target: d.Target.Name,
			Line: d.Span.Start.Line, Statement: statementText(src, d.Span)})
	}
	p.Materials = materials(part, src, setups)
	p.Views = viewsOf(part)
	frameSpans := make([]source.Span, len(part.Frames))
	for i, fr := range part.Frames {
		frameSpans[i] = fr.Span
	}
	p.addFindings(src, statementSpans(part), frameSpans, f.Findings)
	return p
}

// written returns the text of a span as written, or fallback where the
// span is empty.
func written(src *source.File, sp source.Span, fallback string) string {
	if sp.IsZero() || sp.End.Line != sp.Start.Line {
		return fallback
	}
	a, b := src.Offset(sp.Start), src.Offset(sp.End)
	if a >= b || b > len(src.Src) {
		return fallback
	}
	return string(src.Src[a:b])
}

// toleranceText is a segment's tolerance value as written, or the value
// where the reader kept no text: a QIF document's value span covers its
// <ToleranceValue> element, whose text is not the number.
func toleranceText(s *model.Segment) string {
	v := s.ValueText
	if v == "" {
		v = draw.Number(s.Value)
	}
	return v + perUnitText(s.PerUnit)
}

// perUnitText is a tolerance's unit length or area after its slash
// ("/25", "/25x25"), as written where the reader kept it; "" for a
// tolerance on the whole feature.
func perUnitText(u *model.PerUnit) string {
	switch {
	case u == nil:
		return ""
	case u.Text != "":
		return "/" + u.Text
	case u.Area:
		return "/" + draw.Number(u.Length) + "x" + draw.Number(u.Width)
	default:
		return "/" + draw.Number(u.Length)
	}
}

var trailingNumber = regexp.MustCompile(`[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$`)

// statementText is a statement as written on its lines: comments and
// continuation marks dropped, spaces collapsed.
func statementText(src *source.File, sp source.Span) string {
	if sp.IsZero() {
		return ""
	}
	var parts []string
	for n := sp.Start.Line; n <= sp.End.Line && n <= src.Lines(); n++ {
		line := string(src.LineBytes(n))
		if i := strings.IndexByte(line, '#'); i >= 0 {
			line = line[:i]
		}
		line = strings.TrimSuffix(strings.TrimSpace(line), `\`)
		if f := strings.Fields(line); len(f) > 0 {
			parts = append(parts, strings.Join(f, " "))
		}
	}
	return strings.Join(parts, " ")
}

var characteristics = map[model.Characteristic]draw.Characteristic{
	"straightness": draw.Straightness, "flatness": draw.Flatness, "circularity": draw.Circularity,
	"cylindricity": draw.Cylindricity, "line-profile": draw.LineProfile, "surface-profile": draw.SurfaceProfile,
	"angularity": draw.Angularity, "perpendicularity": draw.Perpendicularity, "parallelism": draw.Parallelism,
	"position": draw.Position, "concentricity": draw.Concentricity, "symmetry": draw.Symmetry,
	"circular-runout": draw.CircularRunout, "total-runout": draw.TotalRunout,
}

func frameOf(src *source.File, fr *model.Frame) draw.Frame {
	out := draw.Frame{Line: fr.Span.Start.Line, Target: fr.Target.Name,
		Characteristic: characteristics[fr.Characteristic], Statement: statementText(src, fr.Span)}
	for _, s := range fr.Segments {
		seg := draw.Segment{Value: toleranceText(s)}
		switch s.Zone {
		case "dia":
			seg.Zone = draw.Diameter
		case "sdia":
			seg.Zone = draw.SphericalDiameter
		}
		for _, m := range s.Modifiers {
			dm := draw.Modifier{Letter: m.Letter}
			if m.HasValue {
				dm.Value = trailingNumber.FindString(written(src, m.Span, ""))
				if dm.Value == "" {
					dm.Value = draw.Number(m.Value)
				}
			}
			seg.Modifiers = append(seg.Modifiers, dm)
		}
		for _, r := range s.Refs {
			// A common datum's boundary modifier is drawn beside each of
			// its letters (ASME Y14.5-2018, common datum features at MMB,
			// from memory).
			var ref draw.DatumRef
			for i, l := range r.Letters {
				mat, _ := r.Boundary(i)
				ref.Letters = append(ref.Letters, draw.DatumLetter{Letter: l, Material: mat})
			}
			seg.Datums = append(seg.Datums, ref)
		}
		out.Segments = append(out.Segments, seg)
	}
	return out
}

// dofOfSegment turns the engine's analysis into the chart's data.
func dofOfSegment(a *kinematics.Segment, fr *model.Frame, i int) draw.DOF {
	out := draw.DOF{Orientation: fr.Characteristic.Category() == model.Orientation}
	if fr.Characteristic.Category() == model.Form {
		out.Note = "A form tolerance takes no datums: its zone floats, and the zone row only says which motions would change it (ASME Y14.5-2018, form tolerances)."
	}
	switch {
	case len(fr.Segments) == 1:
		out.Label = fmt.Sprintf("line %d", fr.Span.Start.Line)
	case i == 0:
		out.Label = fmt.Sprintf("upper segment, line %d", fr.Span.Start.Line)
	default:
		out.Label = fmt.Sprintf("composite segment, line %d", fr.Segments[i].Span.Start.Line)
	}
	if a == nil || !a.Resolved {
		out.Problem = "the frame's references could not be resolved"
		if a != nil && a.Problem != "" {
			out.Problem = a.Problem
		}
		return out
	}
	steps := a.DRF.Steps()
	for k, r := range fr.Segments[i].Refs {
		st := draw.DOFStep{Ref: r.Label()}
		if k < len(steps) {
			st.Removes = steps[k].Constrains
			st.Removed = motions(steps[k].Removed)
		}
		out.Steps = append(out.Steps, st)
	}
	out.Free = motions(a.DRF.Free())
	out.ZoneFree = motions(a.Zone.Free)
	return out
}

func motions(ms []dof.Motion) []draw.Motion {
	out := make([]draw.Motion, len(ms))
	for i, m := range ms {
		out[i] = draw.Motion{Name: m.Name, Column: column(m.Twist)}
	}
	return out
}

// column sorts a motion into the chart: a rotation by the direction of
// its axis (wherever the axis passes), a translation by its direction;
// -1 where that direction is not one of the part's axes.
func column(t dof.Twist) int {
	axis := func(v dof.Vec) int {
		n := math.Sqrt(v[0]*v[0] + v[1]*v[1] + v[2]*v[2])
		if n == 0 {
			return -1
		}
		for i := 0; i < 3; i++ {
			if math.Abs(v[i])/n > 1-1e-9 {
				return i
			}
		}
		return -1
	}
	if w := axis(t.W); w >= 0 {
		return draw.RX + w
	} else if t.W != (dof.Vec{}) {
		return -1
	}
	return axis(t.V)
}

// materials works out a figure for every tolerance at MMC or LMC on a
// feature of size, and for every datum feature of size referenced at MMB
// or LMB (once per letter, boundary and higher-precedence datums), whose
// boundary is the one its simulator in the set-up is built to.
func materials(part *model.Part, src *source.File, setups *setup.Result) []MaterialEntry {
	var out []MaterialEntry
	units := part.Units.String()
	if part.Units == model.UnitsUnknown {
		units = ""
	}
	seen := map[string]bool{}
	for _, fr := range part.Frames {
		for _, seg := range fr.Segments {
			c := material.RFS
			if _, ok := seg.Modifier("M"); ok {
				c = material.MMC
			} else if _, ok := seg.Modifier("L"); ok {
				c = material.LMC
			}
			if c != material.RFS && fr.Target.Resolved() {
				if s, ok := material.SizeOf(fr.Target.Feature); ok {
					if f, err := material.Compute(s, seg.Value, c); err == nil {
						title := fmt.Sprintf("%s: %s %s at %s, line %d", fr.Target.Name, fr.Characteristic,
							toleranceText(seg), c, seg.Span.Start.Line)
						out = append(out, MaterialEntry{Line: seg.Span.Start.Line, Figure: draw.MaterialFigure{
							Title: title, Units: units, Internal: s.Internal, Condition: c.String(),
							MMC: f.MMC, LMC: f.LMC, Tolerance: f.Tolerance, Virtual: f.Virtual,
							Resultant: f.Resultant, Bonus: f.Bonus}})
					}
				}
			}
			su := setups.Of(seg.Refs)
			if su == nil {
				continue
			}
			var higher []string
			for _, r := range su.References {
				for _, e := range r.Elements {
					key := fmt.Sprintf("%s|%s|%v", e.Letter, strings.Join(higher, ","), e.Boundary)
					if e.Boundary == material.RFS || !e.SizeKnown || !e.HasLimits || seen[key] {
						continue
					}
					seen[key] = true
					b := e.Boundary.Boundary()
					after := "as primary"
					if len(higher) > 0 {
						after = "after " + strings.Join(higher, ", ")
					}
					m := MaterialEntry{Line: seg.Span.Start.Line, Figure: draw.MaterialFigure{
						Title: fmt.Sprintf("datum %s on %s at %s %s, line %d", e.Letter, e.Feature, b, after, seg.Span.Start.Line),
						Units: units, Internal: e.Limits.Internal, Condition: e.Boundary.String(), MMC: e.Limits.MMC(), LMC: e.Limits.LMC(),
						Datum: true, Boundary: e.Size}}
					if e.From == "" {
						m.Notes = append(m.Notes, fmt.Sprintf("No tolerance relates %s to the datums before it, so its %s is its %s.", e.Feature, b, e.Boundary))
					} else {
						m.Notes = append(m.Notes, fmt.Sprintf("The %s is the virtual condition from %s.", b, e.From))
					}
					if e.Ambiguous {
						m.Notes = append(m.Notes, "Several tolerances give different boundaries; state the boundary's value on the drawing. The one furthest outside the material is shown.")
					}
					out = append(out, m)
				}
				higher = append(higher, r.Name)
			}
		}
	}
	return out
}

// setupsOf lists the inspection set-up of every distinct datum reference
// frame, in the order the frames first use them.
func setupsOf(res *setup.Result) []SetupEntry {
	all, uses := res.Frames()
	out := make([]SetupEntry, 0, len(all))
	for i, s := range all {
		e := SetupEntry{ID: fmt.Sprintf("setup-%d", i+1), Label: s.Label(), Problem: s.Problem,
			Figure: draw.Setup{Label: s.Label()}}
		for _, u := range uses[s] {
			line := u.Frame.Segments[u.Segment].Span.Start.Line
			what := fmt.Sprintf("line %d: %s %s", line, u.Frame.Target.Name, u.Frame.Characteristic)
			if u.Segment > 0 {
				what += " (composite segment)"
			}
			e.Uses = append(e.Uses, SetupUse{FrameLine: u.Frame.Span.Start.Line, Text: what})
		}
		for _, r := range s.References {
			row := SetupRow{Ref: r.Ref, Precedence: r.PrecedenceWord(), Boundary: r.BoundaryWord(), Kind: r.Kind(),
				Describe: r.Describe(), Constrains: r.Constrains, Points: r.Contact.Points, Contact: r.Contact.Text,
				Adjustable: r.Adjustable()}
			sim := draw.Simulator{Ref: r.Ref, Precedence: r.PrecedenceWord(), Shape: simShapes[r.Shape], Kind: r.Kind(),
				Adjustable: r.Adjustable(), Fixed: r.Fixed(), Points: r.Contact.Points, Constrains: r.Constrains}
			for k, el := range r.Elements {
				if k == 0 {
					sim.Internal, sim.Members = el.Internal, el.Members
				}
				if el.SizeKnown {
					size := sizeText(el)
					row.Sizes = append(row.Sizes, fmt.Sprintf("%s on %s: %s", el.Letter, el.Feature, size))
					if k == 0 {
						sim.Size = size
					}
					if el.From != "" {
						row.Sizes[len(row.Sizes)-1] += ", the virtual condition from " + el.From
					} else {
						row.Sizes[len(row.Sizes)-1] += fmt.Sprintf(", its %s (no tolerance relates it to the datums before it)", el.Boundary)
					}
					if el.Ambiguous {
						row.Sizes[len(row.Sizes)-1] += "; several tolerances give different boundaries: state it on the drawing"
					}
				} else if el.Fixed && !el.HasLimits && sizedShape(el) {
					row.Sizes = append(row.Sizes, fmt.Sprintf("%s on %s: not worked out (the feature has no readable size)", el.Letter, el.Feature))
				}
			}
			for _, rel := range r.Relations {
				row.Relations = append(row.Relations, rel.Text())
			}
			sim.Relations = row.Relations
			e.Rows = append(e.Rows, row)
			e.Figure.Simulators = append(e.Figure.Simulators, sim)
		}
		out = append(out, e)
	}
	return out
}

var simShapes = map[setup.Shape]draw.SimShape{
	setup.Plane: draw.SimPlane, setup.Width: draw.SimWidth, setup.Cylinder: draw.SimCylinder,
	setup.Sphere: draw.SimSphere, setup.Cone: draw.SimCone, setup.Extrusion: draw.SimExtrusion,
	setup.Surface: draw.SimSurface,
}

func sizedShape(e setup.Element) bool {
	return e.Shape == setup.Width || e.Shape == setup.Cylinder || e.Shape == setup.Sphere
}

// sizeText writes a fixed simulator's size with its sign: ⌀ for a
// cylinder, S⌀ for a sphere, nothing for a width.
func sizeText(e setup.Element) string {
	switch e.Shape {
	case setup.Cylinder:
		return "⌀" + draw.Number(e.Size)
	case setup.Sphere:
		return "S⌀" + draw.Number(e.Size)
	}
	return draw.Number(e.Size)
}

var itemKinds = map[model.Kind]draw.ItemKind{
	model.Plane: draw.PlaneItem, model.Slot: draw.WidthItem, model.Tab: draw.WidthItem,
	model.Hole: draw.CylinderItem, model.Pin: draw.CylinderItem, model.Socket: draw.SphereItem,
	model.Ball: draw.SphereItem, model.Cone: draw.ConeItem, model.Extrusion: draw.ExtrusionItem,
	model.Surface: draw.SurfaceItem,
}

// viewsOf lists the features with readable geometry for the views.
func viewsOf(part *model.Part) draw.Views {
	v := draw.Views{Units: part.Units.String()}
	for _, f := range part.Features {
		kind, ok := itemKinds[f.Kind]
		if !ok || f.Broken || !(f.HasGeometry || f.Kind == model.Surface && len(f.Members) > 0) {
			continue
		}
		it := draw.Item{Name: f.Name, Kind: kind, Internal: f.Kind.Internal(), Dir: draw.Vec3(f.Dir)}
		for _, m := range f.Members {
			it.Points = append(it.Points, draw.Vec3(m.Point))
		}
		if f.Kind == model.Surface && !f.HasGeometry {
			it.Points = nil
		}
		if f.Size != nil {
			it.Size = math.Abs(f.Size.Nominal)
		}
		for _, d := range part.DatumsOn(f) {
			it.Datums = append(it.Datums, d.Letter)
		}
		it.Describe = describeFeature(f, it.Datums)
		v.Items = append(v.Items, it)
	}
	return v
}

func describeFeature(f *model.Feature, datums []string) string {
	var b strings.Builder
	b.WriteString(f.Name + ": " + f.Kind.String())
	if f.Pattern {
		fmt.Fprintf(&b, " pattern of %d", len(f.Members))
	}
	if f.Size != nil {
		sign := ""
		if f.Kind.IsCylinder() {
			sign = "⌀"
		} else if f.Kind.IsSphere() {
			sign = "S⌀"
		}
		fmt.Fprintf(&b, " %s%s (%s to %s)", sign, draw.Number(f.Size.Nominal), draw.Number(f.Size.Min()), draw.Number(f.Size.Max()))
	}
	word := map[model.Kind]string{model.Plane: "normal", model.Slot: "normal", model.Tab: "normal",
		model.Hole: "axis", model.Pin: "axis", model.Cone: "axis", model.Extrusion: "along"}[f.Kind]
	if word != "" {
		fmt.Fprintf(&b, ", %s %s", word, dirText(f.Dir))
	}
	if len(f.Members) > 0 && f.HasGeometry {
		pts := make([]string, len(f.Members))
		for i, m := range f.Members {
			pts[i] = vecText(m.Point)
		}
		b.WriteString(" at " + strings.Join(pts, " "))
	}
	if len(datums) > 0 {
		b.WriteString("; datum " + strings.Join(datums, ", "))
	}
	return b.String()
}

// dirText writes a direction as the notation's axis word where it is one.
func dirText(v model.Vec) string {
	for i, axis := range []string{"x", "y", "z"} {
		if math.Abs(v[i]) == 1 {
			if v[i] > 0 {
				return "+" + axis
			}
			return "−" + axis
		}
	}
	return vecText(v)
}

func vecText(v model.Vec) string {
	return fmt.Sprintf("(%s, %s, %s)", draw.Number(v[0]), draw.Number(v[1]), draw.Number(v[2]))
}

// statementSpans lists the spans of the statements the model knows, so
// that a finding can be shown beside the whole statement it is on.
func statementSpans(part *model.Part) []source.Span {
	var out []source.Span
	for _, h := range part.Headers {
		out = append(out, h.Span)
	}
	for _, f := range part.Features {
		out = append(out, f.Span)
	}
	for _, f := range part.Duplicates {
		out = append(out, f.Span)
	}
	for _, d := range part.Datums {
		out = append(out, d.Span)
	}
	for _, fr := range part.Frames {
		out = append(out, fr.Span)
	}
	for _, d := range part.Dims {
		out = append(out, d.Span)
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Start.Before(out[j].Start) })
	return out
}

// addFindings adds the findings, each with its statement's lines.
// frames are the spans of p.Frames' statements.
func (p *Page) addFindings(src *source.File, stmts, frames []source.Span, ds []rules.Diagnostic) {
	ds = append([]rules.Diagnostic(nil), ds...)
	rules.Sort(ds)
	for _, d := range ds {
		f := Finding{Line: d.Span.Start.Line, Col: d.Span.Start.Col, Rule: d.Rule, Severity: d.Severity.String(),
			Message: d.Message, Suppressed: d.Suppressed, Justification: d.Justification}
		if r := rules.Lookup(d.Rule); r != nil {
			f.Summary, f.Rationale, f.Source = r.Summary, r.Rationale, r.Source
		}
		for _, rel := range d.Related {
			f.Related = append(f.Related, fmt.Sprintf("line %d: %s", rel.Span.Start.Line, rel.Message))
		}
		for _, fx := range d.Fixes {
			f.Fixes = append(f.Fixes, fx.Message)
		}
		first, last := d.Span.Start.Line, max(d.Span.End.Line, d.Span.Start.Line)
		if d.Span.End.Col == 1 && last > first {
			last-- // an end at the start of a line ends the line before
		}
		for _, sp := range stmts {
			if sp.Start.Line <= first && first <= sp.End.Line {
				first, last = min(first, sp.Start.Line), max(last, sp.End.Line)
				break
			}
		}
		for n := first; n <= last && n <= src.Lines(); n++ {
			f.Lines = append(f.Lines, markLine(string(src.LineBytes(n)), n, d.Span))
		}
		f.ID = fmt.Sprintf("finding-%d", len(p.Findings)+1)
		if d.Suppressed {
			f.ID = fmt.Sprintf("suppressed-%d", len(p.Suppressed)+1)
		}
		for i, sp := range frames {
			if sp.Start.Line <= d.Span.Start.Line && d.Span.Start.Line <= sp.End.Line {
				f.FrameLine = sp.Start.Line
				if !d.Suppressed {
					if p.Frames[i].Findings == 0 {
						p.Frames[i].FindingID = f.ID
					}
					p.Frames[i].Findings++
				}
				break
			}
		}
		if d.Suppressed {
			p.Suppressed = append(p.Suppressed, f)
			continue
		}
		switch d.Severity {
		case rules.Error:
			p.Counts.Error++
		case rules.Warning:
			p.Counts.Warning++
		case rules.Info:
			p.Counts.Info++
		}
		p.Findings = append(p.Findings, f)
	}
}

// markLine splits a source line around the part of a span on it.
func markLine(line string, n int, sp source.Span) SourceLine {
	out := SourceLine{N: n}
	r := []rune(line)
	a, b := 0, 0
	switch {
	case n < sp.Start.Line || n > sp.End.Line:
		out.Before = line
		return out
	case n == sp.Start.Line:
		a = sp.Start.Col - 1
	}
	if n == sp.End.Line {
		b = sp.End.Col - 1
	} else {
		b = len(r)
	}
	a, b = min(max(a, 0), len(r)), min(max(b, 0), len(r))
	if b < a {
		b = a
	}
	out.Before, out.Marked, out.After = string(r[:a]), string(r[a:b]), string(r[b:])
	return out
}
