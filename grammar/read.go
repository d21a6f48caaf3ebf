package grammar

import (
	"bytes"
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/grammar/spell"
)

// This file is the notation's reader: it turns a parsed file into the
// part model, looking up every name, converting numbers and directions,
// deriving widths given between two faces, and recording what the rules
// need of the file as written (its statements, the written text and
// precision of values, its suppressions, what did not parse).

// Read parses and resolves a .callouts file: the notation's reader.
func Read(name string, src []byte) *model.Part { return Resolve(Parse(name, src)) }

type resolver struct {
	p *model.Part
}

func (r *resolver) errorf(sp source.Span, format string, args ...any) {
	r.p.Problemf(model.Syntax, sp, format, args...)
}

func (r *resolver) geometryf(sp source.Span, format string, args ...any) {
	r.p.Problemf(model.Geometry, sp, format, args...)
}

// num converts a literal, reporting one that is not a finite number.
func (r *resolver) num(n *Number) float64 {
	if n == nil {
		return 0
	}
	v, err := strconv.ParseFloat(n.Text, 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		r.errorf(n.Span(), "the number %s is out of range", n.Text)
		return 0
	}
	return v
}

func (r *resolver) vec(v *Vector) model.Vec {
	return model.Vec{r.num(v.X), r.num(v.Y), r.num(v.Z)}
}

// decimals is the number of decimals written in each component of a
// vector; -1 for a component in exponent form.
func decimals(v *Vector) [3]int {
	out := [3]int{-1, -1, -1}
	if v == nil {
		return out
	}
	for i, n := range []*Number{v.X, v.Y, v.Z} {
		out[i] = numberDecimals(n)
	}
	return out
}

func numberDecimals(n *Number) int {
	if n == nil || strings.ContainsAny(n.Text, "eE") {
		return -1
	}
	if i := strings.IndexByte(n.Text, '.'); i >= 0 {
		return len(n.Text) - i - 1
	}
	return 0
}

func numberText(n *Number) string {
	if n == nil {
		return ""
	}
	return strings.TrimSpace(n.Text)
}

var axisDirs = map[string]model.Vec{
	"+x": {1, 0, 0}, "-x": {-1, 0, 0},
	"+y": {0, 1, 0}, "-y": {0, -1, 0},
	"+z": {0, 0, 1}, "-z": {0, 0, -1},
}

func (r *resolver) dir(d *Direction) (model.Vec, bool) {
	if d == nil {
		return model.Vec{}, false
	}
	if d.Vector == nil {
		v, ok := axisDirs[strings.ToLower(d.Axis)]
		return v, ok
	}
	v := r.vec(d.Vector)
	if v.Norm() == 0 || math.IsInf(v.Norm(), 0) {
		r.errorf(d.Span(), "a direction vector must not be zero")
		return model.Vec{}, false
	}
	return v.Unit(), true
}

// Resolve builds the part model of a parsed file. It never fails; what it
// cannot make sense of is recorded in Part.Problems and left out.
func Resolve(f *File) *model.Part {
	p := model.NewPart(source.NewFile(f.Name, f.Src))
	r := &resolver{p: p}
	p.NotText = f.Binary
	for _, e := range f.Errors {
		p.Problemf(model.Syntax, e.Span, "%s", e.Msg)
	}
	p.Statements = make([]model.Statement, len(f.Stmts))
	for i, st := range f.Stmts {
		ms := model.Statement{Keyword: st.Keyword(), Span: st.Span(), First: f.Extents[i].First, Last: f.Extents[i].Last, Parsed: true}
		if bs, ok := st.(*BadStmt); ok {
			ms.Parsed, ms.Name, ms.Words = false, bs.Name, bs.Words
		}
		p.Statements[i] = ms
	}
	trailingComments(f, p.Statements)
	p.Suppressions = directives(f)
	// Pass 1: headers and feature declarations, so that references may
	// come before declarations.
	for _, st := range f.Stmts {
		switch s := st.(type) {
		case *PartStmt:
			t, err := strconv.Unquote(s.Title)
			if err != nil {
				t = strings.Trim(s.Title, `"`)
			}
			p.Title = t
			p.Headers = append(p.Headers, model.HeaderLine{Keyword: "part", Value: t, Span: s.Span()})
		case *UnitsStmt:
			w := s.Unit.Value
			switch w {
			case "mm":
				p.Units = model.MM
			case "in", "inch":
				p.Units = model.Inch
			default:
				r.errorf(s.Unit.Span(), "unknown units '%s': write 'units mm' or 'units in'", w)
			}
			p.Headers = append(p.Headers, model.HeaderLine{Keyword: "units", Value: w, Span: s.Span()})
		case *StandardStmt:
			w := s.Standard.Value
			switch w {
			case "asme-2018":
				p.Standard = model.ASME2018
			case "asme-2009":
				p.Standard = model.ASME2009
			case "iso":
				p.Standard = model.ISO
			default:
				r.unknownWord(s.Standard.Span(), "standard", w, "write asme-2018, asme-2009 or iso", model.StandardWords)
			}
			p.Headers = append(p.Headers, model.HeaderLine{Keyword: "standard", Value: w, Span: s.Span()})
		case *BasisStmt:
			w := s.Basis.Value
			switch w {
			case "model":
				p.Basis = model.ModelBasis
			case "drawing":
				p.Basis = model.DrawingBasis
			default:
				r.unknownWord(s.Basis.Span(), "basis", w, "write 'basis model' (every nominal location and angle of the model is basic) or 'basis drawing'", model.BasisWords)
			}
			p.Headers = append(p.Headers, model.HeaderLine{Keyword: "basis", Value: w, Span: s.Span()})
		case *FeatureStmt:
			p.Declare(r.feature(s))
		case *TargetStmt:
			p.Declare(r.targetFeature(s))
		case *BadStmt:
			if s.Declares("feature") || s.Declares("target") {
				p.Declare(&model.Feature{Name: s.Name, Span: s.Span(), NameSpan: s.Span(), Broken: true})
			}
		}
	}
	// Pass 2: geometry that refers to other features, datums, frames and
	// dimensions.
	for _, ft := range p.Features {
		r.between(ft)
	}
	for _, d := range p.Duplicates {
		r.between(d)
	}
	for _, st := range f.Stmts {
		switch s := st.(type) {
		case *DatumStmt:
			r.datum(s)
		case *BadStmt:
			if s.Declares("datum") {
				p.AddDatum(&model.Datum{Letter: s.Name, Span: s.Span(), LetterSpan: s.Span(), Broken: true})
			}
		}
	}
	for _, st := range f.Stmts {
		switch s := st.(type) {
		case *TargetStmt:
			r.datumTarget(s)
		case *FrameStmt:
			r.frame(s)
		case *BasicStmt:
			r.basic(s)
		case *DimStmt:
			r.dim(s)
		case *RefStmt:
			r.ref(s)
		}
	}
	p.Finish()
	return p
}

// unknownWord reports a word that is none of words: the nearest one
// suggested, or else the hint.
func (r *resolver) unknownWord(sp source.Span, what, w, hint string, words []string) {
	if sg := spell.Nearest(w, words); sg != "" {
		r.errorf(sp, "unknown %s '%s'; did you mean '%s'?", what, w, sg)
		return
	}
	r.errorf(sp, "unknown %s '%s': %s", what, w, hint)
}

// geometry forms allowed per kind (the contract's geometry table).
var geometryWords = map[model.Kind][]string{
	model.Point:     {"at"},
	model.Line:      {"along"},
	model.Circle:    {"axis"},
	model.Plane:     {"normal"},
	model.Slot:      {"normal", "between"},
	model.Tab:       {"normal", "between"},
	model.Hole:      {"axis"},
	model.Pin:       {"axis"},
	model.Socket:    {"at"},
	model.Ball:      {"at"},
	model.Cone:      {"axis"},
	model.Extrusion: {"along"},
	model.Surface:   {"at"},
}

var geometryExample = map[model.Kind]string{
	model.Point:     "at (0, 0, 0)",
	model.Line:      "along +z at (0, 0, 0)",
	model.Circle:    "axis +z at (0, 0, 0) (its centre)",
	model.Plane:     "normal +z at (0, 0, 0)",
	model.Slot:      "normal +x at (0, 0, 0) or between FACE1 FACE2",
	model.Tab:       "normal +x at (0, 0, 0) or between FACE1 FACE2",
	model.Hole:      "axis +z at (0, 0, 0)",
	model.Pin:       "axis +z at (0, 0, 0)",
	model.Socket:    "at (0, 0, 0)",
	model.Ball:      "at (0, 0, 0)",
	model.Cone:      "axis +z at (0, 0, 0) (the apex)",
	model.Extrusion: "along +z at (0, 0, 0)",
	model.Surface:   "at (0, 0, 0), or nothing",
}

func (r *resolver) feature(s *FeatureStmt) *model.Feature {
	ft := &model.Feature{Name: s.Name.Value, NameSpan: s.Name.Span(), Span: s.Span(), DirDecimals: [3]int{-1, -1, -1}}
	if strings.Contains(ft.Name, ".") {
		r.errorf(s.Name.Span(), "a feature name cannot contain '.': '%s' reads as a pattern member", ft.Name)
	}
	ft.Kind = model.ParseKind(s.Kind.Value)
	if ft.Kind == model.KindUnknown {
		msg := fmt.Sprintf("unknown feature kind '%s': use one of %s", s.Kind.Value, strings.Join(model.KindWords, ", "))
		if sg := spell.Nearest(s.Kind.Value, model.KindWords); sg != "" {
			msg = fmt.Sprintf("unknown feature kind '%s'; did you mean '%s'?", s.Kind.Value, sg)
		}
		r.errorf(s.Kind.Span(), "%s", msg)
		ft.Broken = true
		return ft
	}
	if s.Size != nil {
		if !ft.Kind.TakesSize() {
			r.errorf(s.Size.Span(), "a %s is not a feature of size and takes no size; remove 'size ...' (or declare it as a slot, tab, hole, pin, socket or ball)", ft.Kind)
		} else {
			ft.Size = r.size(s.Size)
			if s.Size.Deg {
				r.errorf(s.Size.Span(), "a feature's size is a length, not an angle")
			}
		}
	}
	r.holeForms(s, ft)
	count := 0
	if s.Count != nil {
		c := r.num(s.Count.N)
		switch {
		case c != math.Trunc(c) || c < 1:
			r.errorf(s.Count.Span(), "a pattern count is a whole number of at least 1, e.g. 4x")
		case c > math.MaxInt32:
			// No file gives that many points, and int(c) would not keep
			// the value: any count this large disagrees with the points.
			count = math.MaxInt32
		default:
			count = int(c)
		}
	}
	g := s.Geometry
	if g == nil {
		if ft.Kind != model.Surface {
			e := s.Span().End
			r.errorf(source.Span{Start: e, End: source.Pos{Line: e.Line, Col: e.Col + 1}}, "a %s needs its geometry: %s", ft.Kind, geometryExample[ft.Kind])
		}
		ft.Members = []*model.Member{unwritten(ft)}
		return ft
	}
	ok := false
	for _, w := range geometryWords[ft.Kind] {
		if w == g.Word.Value {
			ok = true
		}
	}
	if !ok {
		r.errorf(g.Word.Span(), "a %s is not given with '%s': write %s", ft.Kind, g.Word.Value, geometryExample[ft.Kind])
		ft.Members = []*model.Member{unwritten(ft)}
		return ft
	}
	if d, ok := r.dir(g.Dir); ok {
		ft.Dir = d
		if g.Dir.Vector != nil {
			ft.DirDecimals = decimals(g.Dir.Vector)
		}
	}
	if len(g.Points) > 0 {
		// The members in one allocation, and their pointers in another.
		ms := make([]model.Member, len(g.Points))
		ft.Members = make([]*model.Member, len(g.Points))
		for i, pt := range g.Points {
			ms[i] = model.Member{Feature: ft, Index: i + 1, Point: r.vec(pt), Decimals: decimals(pt), Span: pt.Span()}
			ft.Members[i] = &ms[i]
		}
	}
	switch {
	case g.Word.Value == "between":
		if len(g.Faces) == 2 {
			for i, n := range g.Faces {
				ft.Faces[i] = r.target(n)
			}
		}
		ft.Members = []*model.Member{unwritten(ft)}
		if count > 1 {
			r.errorf(s.Count.Span(), "a width given 'between' two faces is a single feature; remove %sx", numberText(s.Count.N))
		}
		return ft // geometry derived in pass 2
	case count > 0 && count != len(ft.Members):
		r.errorf(s.Count.Span(), "the pattern count says %s but %d points follow; give one point per member", numberText(s.Count.N), len(ft.Members))
	case count == 0 && len(ft.Members) > 1:
		r.errorf(g.Points[1].Span(), "%d points make a pattern: declare it with %dx after the kind, e.g. feature %s %s %dx ...", len(ft.Members), len(ft.Members), ft.Name, ft.Kind, len(ft.Members))
	}
	ft.Pattern = count > 1 || len(ft.Members) > 1
	ft.HasGeometry = len(ft.Members) > 0 && (ft.Dir.Norm() > 0 || g.Dir == nil)
	if len(ft.Members) == 0 {
		ft.Members = []*model.Member{unwritten(ft)}
	}
	return ft
}

// holeForms reads a feature's thread, counterbore and countersink.
func (r *resolver) holeForms(s *FeatureStmt, ft *model.Feature) {
	if s.Thread != nil {
		if !ft.Kind.IsCylinder() {
			r.errorf(s.Thread.Span(), "a screw thread is a hole's or a pin's; a %s takes no 'thread'", ft.Kind)
		} else if t, err := strconv.Unquote(s.Thread.Designation); err != nil || strings.TrimSpace(t) == "" {
			r.errorf(s.Thread.Span(), "write the thread's designation in double quotes, e.g. thread \"M8x1.25-6H\"")
		} else {
			ft.Thread, ft.ThreadSpan = t, s.Thread.Span()
		}
	}
	if c := s.Cbore; c != nil {
		if ft.Kind != model.Hole {
			r.errorf(c.Span(), "a counterbore is a hole's; a %s takes no 'cbore'", ft.Kind)
		} else {
			ft.Counterbore = &model.Counterbore{Diameter: r.size(c.Diameter), Depth: r.size(c.Depth), Span: c.Span()}
			r.lengthOnly(c.Diameter, "a counterbore's diameter")
			r.lengthOnly(c.Depth, "a counterbore's depth")
		}
	}
	if c := s.Csink; c != nil {
		if ft.Kind != model.Hole {
			r.errorf(c.Span(), "a countersink is a hole's; a %s takes no 'csink'", ft.Kind)
		} else {
			ft.Countersink = &model.Countersink{Diameter: r.size(c.Diameter), Angle: r.size(c.Angle), Span: c.Span()}
			r.lengthOnly(c.Diameter, "a countersink's diameter")
			if !c.Angle.Deg {
				r.errorf(c.Angle.Span(), "a countersink's angle is an angle: write it with deg, e.g. angle 90deg")
			}
		}
	}
}

// lengthOnly reports a length written as an angle.
func (r *resolver) lengthOnly(s *Size, what string) {
	if s.Deg {
		r.errorf(s.Span(), "%s is a length, not an angle", what)
	}
}

// targetLabelRE is a datum target's label: its datum's letter and a number.
var targetLabelRE = regexp.MustCompile(`^([A-Z]{1,2})([0-9]+)$`)

// targetFeature declares the point or line feature a datum target stands
// for, so that dimensions may name it.
func (r *resolver) targetFeature(s *TargetStmt) *model.Feature {
	ft := &model.Feature{Name: s.Label.Value, NameSpan: s.Label.Span(), Span: s.Span(), DirDecimals: [3]int{-1, -1, -1}, HasGeometry: true, Kind: model.Point}
	pt := s.At
	if s.From != nil {
		pt = s.From
		ft.Kind = model.Line
		ft.Dir = r.vec(s.To).Sub(r.vec(s.From)).Unit()
	}
	ft.Members = []*model.Member{{Feature: ft, Index: 1, Point: r.vec(pt), Decimals: decimals(pt), Span: pt.Span()}}
	return ft
}

// datumTarget reads a datum target (its feature is declared in pass 1).
func (r *resolver) datumTarget(s *TargetStmt) {
	t := &model.DatumTarget{Label: s.Label.Value, LabelSpan: s.Label.Span(), Span: s.Span()}
	t.Feature = r.p.Feature(t.Label)
	if t.Feature == nil || t.Feature.Span != s.Span() {
		return // the label is declared twice: name-duplicate reports it
	}
	t.Feature.DatumTarget = t
	if m := targetLabelRE.FindStringSubmatch(t.Label); m != nil {
		t.Letter = m[1]
	} else {
		r.errorf(s.Label.Span(), "'%s' is not a datum target's name: name a target by its datum's letter and a number, e.g. A1, A2", t.Label)
		t.Broken = true
	}
	t.Shape = model.ParseTargetShape(s.Shape.Value)
	switch {
	case t.Shape == model.TargetShapeUnknown:
		msg := fmt.Sprintf("unknown datum target '%s': write point, line or area", s.Shape.Value)
		if sg := spell.Nearest(s.Shape.Value, model.TargetShapeWords); sg != "" {
			msg = fmt.Sprintf("unknown datum target '%s'; did you mean '%s'?", s.Shape.Value, sg)
		}
		r.errorf(s.Shape.Span(), "%s", msg)
		t.Broken = true
	case t.Shape == model.TargetArea && s.Area == nil:
		r.errorf(s.Shape.Span(), "an area target gives its size: area dia 8 (circular) or area 10x20 (rectangular)")
	case t.Shape != model.TargetArea && s.Area != nil:
		r.errorf(s.Area.Span(), "only an area target has a size; a %s target is written without one", t.Shape)
	case t.Shape == model.TargetLine && s.From == nil:
		r.errorf(s.At.Span(), "a line target runs between two points: write from (x, y, z) to (x, y, z)")
		t.Broken = true
	case t.Shape != model.TargetLine && s.From != nil:
		r.errorf(s.From.Span(), "a %s target is at one point: write at (x, y, z)", t.Shape)
		t.Broken = true
	}
	if a := s.Area; a != nil {
		if a.Value != nil {
			t.Dia = r.num(a.Value)
		} else {
			t.Width, t.Height = r.area(a.Rect, a.Span())
		}
	}
	if s.From != nil {
		t.Point, t.End = r.vec(s.From), r.vec(s.To)
		if t.Point.Sub(t.End).Norm() == 0 {
			r.errorf(s.To.Span(), "a line target runs between two different points")
			t.Broken = true
		}
	} else {
		t.Point = r.vec(s.At)
		t.End = t.Point
	}
	if s.Normal != nil {
		if n, ok := r.dir(s.Normal); ok {
			t.Normal = n
		}
	}
	t.On = *r.target(s.On)
	r.p.AddTarget(t)
}

// area reads WxH: two positive lengths.
func (r *resolver) area(text string, sp source.Span) (w, h float64) {
	a, b, _ := strings.Cut(strings.ToLower(text), "x")
	w, errW := strconv.ParseFloat(a, 64)
	h, errH := strconv.ParseFloat(b, 64)
	if errW != nil || errH != nil || math.IsInf(w, 0) || math.IsInf(h, 0) {
		r.errorf(sp, "the area %s is out of range", text)
		return 0, 0
	}
	return w, h
}

// trailingComments gives each statement the trailing comments on its
// lines (comments and statements are both in file order).
func trailingComments(f *File, sts []model.Statement) {
	k := 0
	for _, c := range f.Comments {
		if !c.Trailing {
			continue
		}
		l := c.Span.Start.Line
		for k < len(sts) && sts[k].Last < l {
			k++
		}
		if k < len(sts) && sts[k].First <= l {
			sts[k].Comments = append(sts[k].Comments, c.Span)
		}
	}
}

// datumsSpan covers a tolerance's datum references and the word 'datums'
// before them (the tree does not keep the keyword: it is the last
// 'datums' between the segment's start and its first reference).
func (r *resolver) datumsSpan(t *Tolerance) source.Span {
	src := r.p.Source
	first, last := t.Datums[0].Span(), t.Datums[len(t.Datums)-1].Span()
	from, to := src.Offset(t.Span().Start), src.Offset(first.Start)
	sp := source.Span{Start: first.Start, End: last.End}
	if i := bytes.LastIndex(src.Src[from:to], []byte("datums")); i >= 0 {
		sp.Start = src.Position(from + i)
	}
	return sp
}

// unwritten is the one member of a feature whose point was not written
// (a width between two faces gets its point in pass 2).
func unwritten(ft *model.Feature) *model.Member {
	return &model.Member{Feature: ft, Index: 1, Decimals: [3]int{-1, -1, -1}}
}

// text returns the source text of a span on one line.
func (r *resolver) text(sp source.Span) string {
	src := r.p.Source
	return strings.TrimSpace(string(src.Src[src.Offset(sp.Start):src.Offset(sp.End)]))
}

func (r *resolver) size(s *Size) *model.Size {
	out := &model.Size{Nominal: r.num(s.Nominal), Span: s.Span(), Envelope: s.Envelope != nil, Text: r.text(s.Span())}
	if s.Envelope != nil {
		out.EnvelopeSpan = s.Envelope.Span()
	}
	switch {
	case s.PlusMinus != nil:
		t := math.Abs(r.num(s.PlusMinus))
		out.Upper, out.Lower, out.Toleranced = t, -t, true
	case s.Upper != nil:
		u, l := r.num(s.Upper), r.num(s.Lower)
		if u < l {
			r.errorf(s.Upper.Span(), "the upper deviation %s is below the lower deviation %s: write the upper one first", s.Upper.Text, s.Lower.Text)
			u, l = l, u
		}
		out.Upper, out.Lower, out.Toleranced = u, l, true
	case s.Limit != nil:
		lo, hi := out.Nominal, r.num(s.Limit)
		if hi < lo {
			r.errorf(s.Limit.Span(), "the limits %s..%s are reversed: write the smaller limit first", s.Nominal.Text, s.Limit.Text)
			lo, hi = hi, lo
		}
		// A limit dimension has no nominal; take the mean as the nominal.
		out.Nominal = (lo + hi) / 2
		out.Upper, out.Lower, out.Toleranced = (hi-lo)/2, -(hi-lo)/2, true
	}
	return out
}

// between derives a width's mid-plane from its two faces.
func (r *resolver) between(ft *model.Feature) {
	if ft.Faces[0] == nil || ft.Faces[1] == nil {
		return
	}
	a, b := ft.Faces[0].Feature, ft.Faces[1].Feature
	if a == nil || b == nil || a.Broken || b.Broken {
		return
	}
	for _, fc := range []*model.Target{ft.Faces[0], ft.Faces[1]} {
		if fc.Feature.Kind != model.Plane || fc.Member != nil {
			r.geometryf(fc.Span, "%s", fmt.Sprintf("'between' takes two plane features; %s is a %s", fc.Name, fc.Feature.Kind))
			return
		}
	}
	if a == b {
		r.geometryf(ft.Faces[1].Span, "%s", "'between' names the same plane twice: name the two opposed faces")
		return
	}
	if !a.HasGeometry || !b.HasGeometry {
		return
	}
	if !model.Parallel(a.Dir, b.Dir, 1e-6) {
		r.geometryf(ft.Faces[1].Span, "%s", fmt.Sprintf("the faces %s and %s are not parallel (%.4g degrees apart), so they do not form a width", a.Name, b.Name, model.AngleBetweenLines(a.Dir, b.Dir)))
		return
	}
	ft.Dir = a.Dir
	ft.Members[0].Point = a.Point().Add(b.Point()).Scale(0.5)
	ft.HasGeometry = true
	a.FaceOf, b.FaceOf = ft, ft
}

// target resolves a name: a feature, or a member written NAME.N.
func (r *resolver) target(n *Name) *model.Target { return r.p.Lookup(n.Value, n.Span()) }

func (r *resolver) datum(s *DatumStmt) {
	d := &model.Datum{Letter: s.Letter.Value, LetterSpan: s.Letter.Span(), Span: s.Span()}
	d.Target = *r.target(s.Target)
	if s.Placement != nil {
		d.Placement, d.PlacementSpan = s.Placement.Value, s.Placement.Span()
		known := false
		for _, w := range model.PlacementWords {
			known = known || w == d.Placement
		}
		if !known {
			msg := fmt.Sprintf("unknown placement '%s': use one of %s", d.Placement, strings.Join(model.PlacementWords, ", "))
			if sg := spell.Nearest(d.Placement, model.PlacementWords); sg != "" {
				msg = fmt.Sprintf("unknown placement '%s'; did you mean '%s'?", d.Placement, sg)
			}
			r.errorf(s.Placement.Span(), "%s", msg)
			d.Placement = ""
		}
	}
	r.p.AddDatum(d)
}

func (r *resolver) frame(s *FrameStmt) {
	fr := &model.Frame{Span: s.Span(), CharSpan: s.Characteristic.Span()}
	fr.Target = *r.target(s.Target)
	c := CanonicalWord(s.Characteristic.Value)
	fr.Characteristic = model.Characteristic(c)
	if fr.Characteristic.Category() == model.CategoryUnknown {
		msg := fmt.Sprintf("unknown characteristic '%s': use one of %s", c, strings.Join(CharacteristicWords, ", "))
		if sg := spell.Nearest(c, CharacteristicWords); sg != "" {
			msg = fmt.Sprintf("unknown characteristic '%s'; did you mean '%s'?", c, sg)
		} else if strings.EqualFold(c, "profile") {
			msg = "'profile' alone names no characteristic: write surface-profile (profile of a surface) or line-profile (profile of a line)"
		}
		r.errorf(s.Characteristic.Span(), "%s", msg)
	}
	fr.Segments = append(fr.Segments, r.segment(s.Tolerance, false))
	r.notes(fr, fr.Segments[0], s.Tolerance)
	for _, cp := range s.Composites {
		seg := r.segment(cp.Tolerance, true)
		seg.Span = cp.Span()
		fr.Segments = append(fr.Segments, seg)
		r.notes(fr, seg, cp.Tolerance)
	}
	r.p.Frames = append(r.p.Frames, fr)
}

func (r *resolver) segment(t *Tolerance, composite bool) *model.Segment {
	seg := &model.Segment{Composite: composite, Span: t.Span(), ValueSpan: t.Value.Span(), Value: r.num(t.Value), ValueText: numberText(t.Value)}
	if t.Zone != nil {
		seg.ZoneText = t.Zone.Value
		seg.Zone, seg.ZoneSpan = CanonicalWord(t.Zone.Value), t.Zone.Span()
		switch {
		case seg.Zone == "dia" || seg.Zone == "sdia":
		case composite && model.Characteristic(seg.Zone).Category() != model.CategoryUnknown:
			// A characteristic named on a composite line (the notation has
			// none there): kept so that composite-invalid can compare it
			// with the frame's.
			seg.Named, seg.NamedSpan = model.Characteristic(seg.Zone), seg.ZoneSpan
			seg.Zone, seg.ZoneSpan = "", source.Span{}
		default:
			r.errorf(seg.ZoneSpan, "unknown zone '%s' before the tolerance value: write dia (cylindrical), sdia (spherical) or nothing (two parallel planes or lines)", t.Zone.Value)
			seg.Zone = ""
		}
	}
	if u := t.PerUnit; u != nil {
		seg.PerUnit = &model.PerUnit{Span: u.Span(), Text: strings.TrimPrefix(r.text(u.Span()), "/")}
		if u.Length != nil {
			seg.PerUnit.Length = r.num(u.Length)
		} else {
			seg.PerUnit.Length, seg.PerUnit.Width = r.area(u.Area, u.Span())
			seg.PerUnit.Area = true
		}
		seg.PerUnit.Text = strings.TrimSpace(seg.PerUnit.Text)
	}
	if t.Along != nil {
		if v, ok := r.dir(t.Along); ok {
			seg.ZoneDir, seg.ZoneDirSpan = &v, t.Along.Span()
		}
	}
	for _, m := range t.Modifiers {
		mod := model.Modifier{Letter: ModifierLetter(m.Symbol), Span: m.Span()}
		if m.Value != nil {
			mod.Value, mod.HasValue = r.num(m.Value), true
			mod.Span = mod.Span.Join(m.Value.Span())
		}
		seg.Modifiers = append(seg.Modifiers, mod)
	}
	if len(t.Datums) > 3 {
		// A datum reference frame has a primary, a secondary and a
		// tertiary at most (ASME Y14.5-2018, datum reference frame; the
		// notation: "at most three").
		r.errorf(t.Datums[3].Span(), "a frame references at most three datums (primary, secondary, tertiary); '%s' is a fourth", t.Datums[3].Name)
	}
	for _, d := range t.Datums {
		seg.Refs = append(seg.Refs, r.datumRef(d))
	}
	if len(t.Datums) > 0 {
		seg.DatumsSpan = r.datumsSpan(t)
	}
	return seg
}

// datumRef reads one datum reference: its letters, each with its datum and
// material boundary.
func (r *resolver) datumRef(d *DatumRef) *model.DatumRef {
	ref := &model.DatumRef{Span: d.Span()}
	// material returns the last (M) or (L) of ms; any other letter is a
	// syntax finding already (grammar/check.go).
	material := func(ms []*RefModifier) (string, source.Span) {
		l, sp := "", source.Span{}
		for _, m := range ms {
			if ml := ModifierLetter(m.Symbol); ml == "M" || ml == "L" {
				l, sp = ml, m.Span()
			}
		}
		return l, sp
	}
	// Every letter's slices in one allocation each.
	n := strings.Count(d.Name, "-") + 1
	for _, m := range d.More {
		n += strings.Count(strings.TrimPrefix(m.Name, "-"), "-") + 1
	}
	ref.Letters, ref.Datums = make([]string, 0, n), make([]*model.Datum, 0, n)
	ref.Materials, ref.MatSpans = make([]string, 0, n), make([]source.Span, 0, n)
	part := func(name string, ms []*RefModifier) {
		mat, sp := material(ms)
		for l := range strings.SplitSeq(name, "-") {
			if l == "" {
				r.errorf(d.Span(), "'%s' is not a datum reference: a common datum joins two letters, e.g. A-B", d.Name)
				continue
			}
			ref.Letters = append(ref.Letters, l)
			ref.Datums = append(ref.Datums, r.p.Datum(l))
			ref.Materials = append(ref.Materials, mat)
			ref.MatSpans = append(ref.MatSpans, sp)
		}
	}
	part(d.Name, d.Modifiers)
	names := []string{d.Name}
	for _, m := range d.More {
		part(strings.TrimPrefix(m.Name, "-"), m.Modifiers)
		names = append(names, strings.TrimPrefix(m.Name, "-"))
	}
	ref.Name = strings.Join(names, "-")
	if len(d.More) == 0 {
		ref.Material, ref.MatSpan = material(d.Modifiers)
		// The ref's own span ends at the letters; the modifier is separate.
		ref.Span = source.Span{Start: d.Span().Start, End: source.Pos{Line: d.Span().Start.Line, Col: d.Span().Start.Col + len([]rune(d.Name))}}
	}
	ref.FullSpan = d.Span()
	return ref
}

// notes reads the notes of a frame's segment: a separate requirement on
// the segment, and, on the upper segment only, the extent of a profile and
// the diameter of a screw thread, which are the whole frame's.
func (r *resolver) notes(fr *model.Frame, seg *model.Segment, t *Tolerance) {
	for _, n := range t.Notes {
		word := n.Word
		if n.From != nil {
			word = model.Between
		}
		switch word {
		case "separate":
			seg.Separate, seg.SeparateSpan = true, n.Span()
			continue
		}
		if seg.Composite {
			r.errorf(n.Span(), "'%s' is the whole frame's: write it on the frame's first line, not on a composite line", word)
			continue
		}
		switch word {
		case model.AllAround, model.AllOver, model.Between:
			fr.Extent, fr.ExtentSpan = word, n.Span()
			if n.From != nil {
				fr.Between = [2]*model.Target{r.target(n.From), r.target(n.To)}
			}
		default:
			fr.ThreadDiameter, fr.ThreadDiameterSpan = word, n.Span()
		}
	}
}

func (r *resolver) basic(s *BasicStmt) {
	d := &model.Dimension{Basic: true, Span: s.Span()}
	if s.Circle != nil {
		d.Value, d.ValueSpan, d.ValueText = r.num(s.Circle.Value), s.Circle.Value.Span(), numberText(s.Circle.Value)
		if z := CanonicalWord(s.Circle.Zone.Value); z != "dia" {
			r.errorf(s.Circle.Zone.Span(), "a bolt circle is given by its diameter: basic dia 80 through PATTERN about AXIS-FEATURE")
		}
		d.Circle = &model.BoltCircle{Diameter: d.Value, Pattern: *r.target(s.Circle.Pattern), About: *r.target(s.Circle.About)}
		r.p.Dims = append(r.p.Dims, d)
		return
	}
	d.Value, d.ValueSpan, d.ValueText, d.Angle = r.num(s.Value), s.Value.Span(), numberText(s.Value), s.Deg
	r.measure(d, s.From, s.To, s.Along, s.About, "basic")
	r.p.Dims = append(r.p.Dims, d)
}

// measure reads what a basic or reference distance or angle is measured
// between, and along or about what.
func (r *resolver) measure(d *model.Dimension, from, to *Name, along *Direction, about *Name, keyword string) {
	d.From, d.To = *r.target(from), *r.target(to)
	if along != nil {
		if v, ok := r.dir(along); ok {
			d.Along = &v
		}
		if d.Angle {
			r.errorf(along.Span(), "'along' measures a length; an angle takes no 'along'")
		}
	}
	if about != nil {
		if !d.Angle {
			r.errorf(about.Span(), "'about' belongs to an angle about an axis, e.g. %s 45deg from bolts.1 to C about hub", keyword)
		}
		d.About = r.target(about)
	}
}

func (r *resolver) dim(s *DimStmt) {
	d := &model.Dimension{Span: s.Span(), Tol: r.size(s.Size), ValueSpan: s.Size.Span(), ValueText: numberText(s.Size.Nominal), Angle: s.Size.Deg}
	d.Value = d.Tol.Nominal
	d.From, d.To = *r.target(s.From), *r.target(s.To)
	if !d.Tol.Toleranced {
		r.errorf(s.Size.Span(), "a 'dim' line is a toleranced dimension: give its tolerance, e.g. dim 40 +-0.1 (or write 'basic 40' for a basic one)")
	}
	if s.Along != nil {
		if v, ok := r.dir(s.Along); ok {
			d.Along = &v
		}
	}
	r.p.Dims = append(r.p.Dims, d)
}

func (r *resolver) ref(s *RefStmt) {
	d := &model.Dimension{Reference: true, Span: s.Span()}
	if s.Size != nil {
		d.Value, d.ValueSpan, d.ValueText = r.num(s.Size), s.Size.Span(), numberText(s.Size)
		d.SizeOf = r.target(s.Of)
		r.p.Dims = append(r.p.Dims, d)
		return
	}
	d.Value, d.ValueSpan, d.ValueText, d.Angle = r.num(s.Value), s.Value.Span(), numberText(s.Value), s.Deg
	r.measure(d, s.From, s.To, s.Along, s.About, "ref")
	r.p.Dims = append(r.p.Dims, d)
}
