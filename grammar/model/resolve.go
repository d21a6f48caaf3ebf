package model

import (
	"fmt"
	"github.com/datumlint/datumlint/grammar/source"
	"math"
	"strconv"
	"strings"

	"github.com/datumlint/datumlint/grammar"
)

type resolver struct {
	p *Part
}

func (r *resolver) errorf(sp Span, format string, args ...any) {
	r.p.Errors = append(r.p.Errors, &grammar.SyntaxError{Span: sp, Msg: fmt.Sprintf(format, args...)})
}

// num converts a literal, reporting one that is not a finite number.
func (r *resolver) num(n *grammar.Number) float64 {
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

func (r *resolver) vec(v *grammar.Vector) Vec {
	return Vec{r.num(v.X), r.num(v.Y), r.num(v.Z)}
}

var axisDirs = map[string]Vec{
	"+x": {1, 0, 0}, "-x": {-1, 0, 0},
	"+y": {0, 1, 0}, "-y": {0, -1, 0},
	"+z": {0, 0, 1}, "-z": {0, 0, -1},
}

func (r *resolver) dir(d *grammar.Direction) (Vec, bool) {
	if d == nil {
		return Vec{}, false
	}
	if d.Vector == nil {
		v, ok := axisDirs[strings.ToLower(d.Axis)]
		return v, ok
	}
	v := r.vec(d.Vector)
	if v.Norm() == 0 || math.IsInf(v.Norm(), 0) {
		r.errorf(d.Span(), "a direction vector must not be zero")
		return Vec{}, false
	}
	return v.Unit(), true
}

// Resolve builds the part model of a parsed file. It never fails; what it
// cannot make sense of is recorded in Part.Errors and left out.
func Resolve(f *grammar.File) *Part {
	p := &Part{File: f, byName: map[string]*Feature{}, byLetter: map[string]*Datum{}}
	r := &resolver{p: p}
	if len(f.Stmts) > 0 {
		p.FirstStmt = firstLineSpan(f, 0)
	}
	// Pass 1: headers and feature declarations, so that references may
	// come before declarations.
	for _, st := range f.Stmts {
		switch s := st.(type) {
		case *grammar.PartStmt:
			t, err := strconv.Unquote(s.Title)
			if err != nil {
				t = strings.Trim(s.Title, `"`)
			}
			p.Title = t
			p.Headers = append(p.Headers, HeaderLine{"part", t, s.Span()})
		case *grammar.UnitsStmt:
			w := s.Unit.Value
			switch w {
			case "mm":
				p.Units = MM
			case "in", "inch":
				p.Units = Inch
			default:
				r.errorf(s.Unit.Span(), "unknown units '%s': write 'units mm' or 'units in'", w)
			}
			p.Headers = append(p.Headers, HeaderLine{"units", w, s.Span()})
		case *grammar.StandardStmt:
			w := s.Standard.Value
			switch w {
			case "asme-2018":
				p.Standard = ASME2018
			case "asme-2009":
				p.Standard = ASME2009
			case "iso":
				p.Standard = ISO
			default:
				msg := "unknown standard '%s': write asme-2018, asme-2009 or iso"
				if sg := grammar.Suggest(w, StandardWords); sg != "" {
					msg = "unknown standard '%s'; did you mean '" + sg + "'?"
				}
				r.errorf(s.Standard.Span(), msg, w)
			}
			p.Headers = append(p.Headers, HeaderLine{"standard", w, s.Span()})
		case *grammar.FeatureStmt:
			r.declare(r.feature(s))
		case *grammar.BadStmt:
			if s.Word == "feature" && s.Name != "" {
				r.declare(&Feature{Name: s.Name, Span: s.Span(), NameSpan: s.Span(), Broken: true})
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
		case *grammar.DatumStmt:
			r.datum(s)
		case *grammar.BadStmt:
			if s.Word == "datum" && s.Name != "" {
				d := &Datum{Letter: s.Name, Span: s.Span(), LetterSpan: s.Span(), Broken: true}
				p.Datums = append(p.Datums, d)
				if p.byLetter[d.Letter] == nil {
					p.byLetter[d.Letter] = d
				}
			}
		}
	}
	for _, st := range f.Stmts {
		switch s := st.(type) {
		case *grammar.FrameStmt:
			r.frame(s)
		case *grammar.BasicStmt:
			r.basic(s)
		case *grammar.DimStmt:
			r.dim(s)
		}
	}
	r.extent()
	return p
}

func firstLineSpan(f *grammar.File, i int) Span {
	sp := f.Stmts[i].Span()
	if sp.End.Line != sp.Start.Line {
		sp.End = source.Pos{Line: sp.Start.Line, Col: sp.Start.Col + 1}
	}
	return sp
}

func (r *resolver) declare(ft *Feature) {
	if ft == nil {
		return
	}
	if prev, ok := r.p.byName[ft.Name]; ok && !prev.Broken {
		r.p.Duplicates = append(r.p.Duplicates, ft)
		return
	} else if ok && prev.Broken && !ft.Broken {
		// a good declaration after a broken one: keep the good one
		for i, f := range r.p.Features {
			if f == prev {
				r.p.Features[i] = ft
			}
		}
		r.p.byName[ft.Name] = ft
		return
	} else if ok {
		return
	}
	r.p.byName[ft.Name] = ft
	r.p.Features = append(r.p.Features, ft)
}

// geometry forms allowed per kind (the contract's geometry table).
var geometryWords = map[Kind][]string{
	Plane:     {"normal"},
	Slot:      {"normal", "between"},
	Tab:       {"normal", "between"},
	Hole:      {"axis"},
	Pin:       {"axis"},
	Socket:    {"at"},
	Ball:      {"at"},
	Cone:      {"axis"},
	Extrusion: {"along"},
	Surface:   {"at"},
}

var geometryExample = map[Kind]string{
	Plane:     "normal +z at (0, 0, 0)",
	Slot:      "normal +x at (0, 0, 0) or between FACE1 FACE2",
	Tab:       "normal +x at (0, 0, 0) or between FACE1 FACE2",
	Hole:      "axis +z at (0, 0, 0)",
	Pin:       "axis +z at (0, 0, 0)",
	Socket:    "at (0, 0, 0)",
	Ball:      "at (0, 0, 0)",
	Cone:      "axis +z at (0, 0, 0) (the apex)",
	Extrusion: "along +z at (0, 0, 0)",
	Surface:   "at (0, 0, 0), or nothing",
}

func (r *resolver) feature(s *grammar.FeatureStmt) *Feature {
	ft := &Feature{Name: s.Name.Value, NameSpan: s.Name.Span(), Span: s.Span(), Stmt: s}
	if strings.Contains(ft.Name, ".") {
		r.errorf(s.Name.Span(), "a feature name cannot contain '.': '%s' reads as a pattern member", ft.Name)
	}
	ft.Kind = ParseKind(s.Kind.Value)
	if ft.Kind == KindUnknown {
		msg := fmt.Sprintf("unknown feature kind '%s': use one of %s", s.Kind.Value, strings.Join(KindWords, ", "))
		if sg := grammar.Suggest(s.Kind.Value, KindWords); sg != "" {
			msg = fmt.Sprintf("unknown feature kind '%s'; did you mean '%s'?", s.Kind.Value, sg)
		}
		r.errorf(s.Kind.Span(), "%s", msg)
		ft.Broken = true
		return ft
	}
	if s.Size != nil {
		if !ft.Kind.IsFOS() {
			r.errorf(s.Size.Span(), "a %s is not a feature of size and takes no size; remove 'size ...' (or declare it as a slot, tab, hole, pin, socket or ball)", ft.Kind)
		} else {
			ft.Size = r.size(s.Size)
			if s.Size.Deg {
				r.errorf(s.Size.Span(), "a feature's size is a length, not an angle")
			}
		}
	}
	count := 0
	if s.Count != nil {
		c := r.num(s.Count.N)
		if c != math.Trunc(c) || c < 1 {
			r.errorf(s.Count.Span(), "a pattern count is a whole number of at least 1, e.g. 4x")
		} else {
			count = int(c)
		}
	}
	g := s.Geometry
	if g == nil {
		if ft.Kind != Surface {
			e := s.Span().End
			r.errorf(Span{Start: e, End: source.Pos{Line: e.Line, Col: e.Col + 1}}, "a %s needs its geometry: %s", ft.Kind, geometryExample[ft.Kind])
		}
		ft.Members = []*Member{{Feature: ft, Index: 1}}
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
		ft.Members = []*Member{{Feature: ft, Index: 1}}
		return ft
	}
	if d, ok := r.dir(g.Dir); ok {
		ft.Dir = d
	}
	for i, pt := range g.Points {
		ft.Members = append(ft.Members, &Member{Feature: ft, Index: i + 1, Point: r.vec(pt)})
	}
	switch {
	case g.Word.Value == "between":
		if len(g.Faces) == 2 {
			for i, n := range g.Faces {
				ft.Faces[i] = r.target(n)
			}
		}
		ft.Members = []*Member{{Feature: ft, Index: 1}}
		if count > 1 {
			r.errorf(s.Count.Span(), "a width given 'between' two faces is a single feature; remove %dx", count)
		}
		return ft // geometry derived in pass 2
	case count > 0 && count != len(ft.Members):
		r.errorf(s.Count.Span(), "the pattern count says %d but %d points follow; give one point per member", count, len(ft.Members))
	case count == 0 && len(ft.Members) > 1:
		r.errorf(g.Points[1].Span(), "%d points make a pattern: declare it with %dx after the kind, e.g. feature %s %s %dx ...", len(ft.Members), len(ft.Members), ft.Name, ft.Kind, len(ft.Members))
	}
	ft.Pattern = count > 1 || len(ft.Members) > 1
	ft.HasGeometry = len(ft.Members) > 0 && (ft.Dir.Norm() > 0 || g.Dir == nil)
	if len(ft.Members) == 0 {
		ft.Members = []*Member{{Feature: ft, Index: 1}}
	}
	return ft
}

func (r *resolver) size(s *grammar.Size) *Size {
	out := &Size{Nominal: r.num(s.Nominal), Span: s.Span(), Envelope: s.Envelope != nil}
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
func (r *resolver) between(ft *Feature) {
	if ft.Faces[0] == nil || ft.Faces[1] == nil {
		return
	}
	a, b := ft.Faces[0].Feature, ft.Faces[1].Feature
	if a == nil || b == nil || a.Broken || b.Broken {
		return
	}
	for _, fc := range []*Target{ft.Faces[0], ft.Faces[1]} {
		if fc.Feature.Kind != Plane || fc.Member != nil {
			r.p.GeometryErrors = append(r.p.GeometryErrors, &grammar.SyntaxError{Span: fc.Span,
				Msg: fmt.Sprintf("'between' takes two plane features; %s is a %s", fc.Name, fc.Feature.Kind)})
			return
		}
	}
	if a == b {
		r.p.GeometryErrors = append(r.p.GeometryErrors, &grammar.SyntaxError{Span: ft.Faces[1].Span,
			Msg: "'between' names the same plane twice: name the two opposed faces"})
		return
	}
	if !a.HasGeometry || !b.HasGeometry {
		return
	}
	if !Parallel(a.Dir, b.Dir, 1e-6) {
		r.p.GeometryErrors = append(r.p.GeometryErrors, &grammar.SyntaxError{Span: ft.Faces[1].Span,
			Msg: fmt.Sprintf("the faces %s and %s are not parallel (%.4g degrees apart), so they do not form a width", a.Name, b.Name, AngleBetweenLines(a.Dir, b.Dir))})
		return
	}
	ft.Dir = a.Dir
	ft.Members[0].Point = a.Point().Add(b.Point()).Scale(0.5)
	ft.HasGeometry = true
	a.FaceOf, b.FaceOf = ft, ft
}

// target resolves a name: a feature, or a member written NAME.N.
func (r *resolver) target(n *grammar.Name) *Target {
	t := &Target{Name: n.Value, Span: n.Span()}
	r.p.Refs = append(r.p.Refs, t)
	if ft := r.p.byName[n.Value]; ft != nil {
		t.Feature = ft
		return t
	}
	if i := strings.LastIndexByte(n.Value, '.'); i > 0 {
		base, idx := n.Value[:i], n.Value[i+1:]
		ft := r.p.byName[base]
		k, err := strconv.Atoi(idx)
		switch {
		case ft == nil:
			t.Problem = fmt.Sprintf("no feature is named '%s'", base)
		case ft.Broken:
			t.Feature = ft
		case !ft.Pattern:
			t.Problem = fmt.Sprintf("%s is a single %s, not a pattern: write '%s'", base, ft.Kind, base)
		case err != nil || k < 1 || k > len(ft.Members):
			t.Problem = fmt.Sprintf("%s has %d members, %s.1 to %s.%d", base, len(ft.Members), base, base, len(ft.Members))
		default:
			t.Feature, t.Member = ft, ft.Members[k-1]
		}
		return t
	}
	names := make([]string, 0, len(r.p.Features))
	for _, f := range r.p.Features {
		names = append(names, f.Name)
	}
	t.Problem = fmt.Sprintf("no feature is named '%s'", n.Value)
	if sg := grammar.Suggest(n.Value, names); sg != "" && len(n.Value) > 2 {
		t.Problem += fmt.Sprintf("; did you mean '%s'?", sg)
	}
	return t
}

func (r *resolver) datum(s *grammar.DatumStmt) {
	d := &Datum{Letter: s.Letter.Value, LetterSpan: s.Letter.Span(), Span: s.Span(), Stmt: s}
	d.Target = *r.target(s.Target)
	if s.Placement != nil {
		d.Placement, d.PlacementSpan = s.Placement.Value, s.Placement.Span()
		known := false
		for _, w := range PlacementWords {
			known = known || w == d.Placement
		}
		if !known {
			msg := fmt.Sprintf("unknown placement '%s': use one of %s", d.Placement, strings.Join(PlacementWords, ", "))
			if sg := grammar.Suggest(d.Placement, PlacementWords); sg != "" {
				msg = fmt.Sprintf("unknown placement '%s'; did you mean '%s'?", d.Placement, sg)
			}
			r.errorf(s.Placement.Span(), "%s", msg)
			d.Placement = ""
		}
	}
	r.p.Datums = append(r.p.Datums, d)
	if prev := r.p.byLetter[d.Letter]; prev == nil || prev.Broken {
		r.p.byLetter[d.Letter] = d
	}
}

func (r *resolver) frame(s *grammar.FrameStmt) {
	fr := &Frame{Span: s.Span(), Stmt: s, CharSpan: s.Characteristic.Span()}
	fr.Target = *r.target(s.Target)
	c := grammar.CanonicalWord(s.Characteristic.Value)
	fr.Characteristic = Characteristic(c)
	if fr.Characteristic.Category() == CategoryUnknown {
		msg := fmt.Sprintf("unknown characteristic '%s': use one of %s", c, strings.Join(grammar.CharacteristicWords, ", "))
		if sg := grammar.Suggest(c, grammar.CharacteristicWords); sg != "" {
			msg = fmt.Sprintf("unknown characteristic '%s'; did you mean '%s'?", c, sg)
		}
		r.errorf(s.Characteristic.Span(), "%s", msg)
	}
	fr.Segments = append(fr.Segments, r.segment(s.Tolerance, false))
	for _, cp := range s.Composites {
		seg := r.segment(cp.Tolerance, true)
		seg.Span = cp.Span()
		fr.Segments = append(fr.Segments, seg)
	}
	r.p.Frames = append(r.p.Frames, fr)
}

func (r *resolver) segment(t *grammar.Tolerance, composite bool) *Segment {
	seg := &Segment{Composite: composite, Span: t.Span(), Tree: t, ValueSpan: t.Value.Span(), Value: r.num(t.Value)}
	if t.Zone != nil {
		seg.Zone, seg.ZoneSpan = grammar.CanonicalWord(t.Zone.Value), t.Zone.Span()
		switch {
		case seg.Zone == "dia" || seg.Zone == "sdia":
		case composite && Characteristic(seg.Zone).Category() != CategoryUnknown:
			// A characteristic named on a composite line (the notation has
			// none there): kept so that composite-invalid can compare it
			// with the frame's.
			seg.Named, seg.NamedSpan = Characteristic(seg.Zone), seg.ZoneSpan
			seg.Zone, seg.ZoneSpan = "", Span{}
		default:
			r.errorf(seg.ZoneSpan, "unknown zone '%s' before the tolerance value: write dia (cylindrical), sdia (spherical) or nothing (two parallel planes or lines)", t.Zone.Value)
			seg.Zone = ""
		}
	}
	for _, m := range t.Modifiers {
		mod := Modifier{Letter: grammar.ModifierLetter(m.Symbol), Span: m.Span()}
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
		ref := &DatumRef{Name: d.Name, Span: d.Span()}
		for _, l := range strings.Split(d.Name, "-") {
			if l == "" {
				r.errorf(d.Span(), "'%s' is not a datum reference: a common datum joins two letters, e.g. A-B", d.Name)
				continue
			}
			ref.Letters = append(ref.Letters, l)
			ref.Datums = append(ref.Datums, r.p.byLetter[l])
		}
		for _, m := range d.Modifiers {
			// Only (M) and (L) are material boundaries; any other letter is
			// a syntax finding already (grammar/check.go).
			if l := grammar.ModifierLetter(m.Symbol); l == "M" || l == "L" {
				ref.Material, ref.MatSpan = l, m.Span()
			}
		}
		// The ref's own span ends at the letters; the modifier is separate.
		ref.Span = Span{Start: d.Span().Start, End: source.Pos{Line: d.Span().Start.Line, Col: d.Span().Start.Col + len([]rune(d.Name))}}
		seg.Refs = append(seg.Refs, ref)
	}
	return seg
}

func (r *resolver) basic(s *grammar.BasicStmt) {
	d := &Dimension{Basic: true, Span: s.Span(), Stmt: s}
	if s.Circle != nil {
		d.Value, d.ValueSpan = r.num(s.Circle.Value), s.Circle.Value.Span()
		if z := grammar.CanonicalWord(s.Circle.Zone.Value); z != "dia" {
			r.errorf(s.Circle.Zone.Span(), "a bolt circle is given by its diameter: basic dia 80 through PATTERN about AXIS-FEATURE")
		}
		d.Circle = &BoltCircle{Diameter: d.Value, Pattern: *r.target(s.Circle.Pattern), About: *r.target(s.Circle.About)}
		r.p.Dims = append(r.p.Dims, d)
		return
	}
	d.Value, d.ValueSpan, d.Angle = r.num(s.Value), s.Value.Span(), s.Deg
	d.From, d.To = *r.target(s.From), *r.target(s.To)
	if s.Along != nil {
		if v, ok := r.dir(s.Along); ok {
			d.Along = &v
		}
		if d.Angle {
			r.errorf(s.Along.Span(), "'along' measures a length; an angle takes no 'along'")
		}
	}
	if s.About != nil {
		if !d.Angle {
			r.errorf(s.About.Span(), "'about' belongs to an angle about an axis, e.g. basic 45deg from bolts.1 to C about hub")
		}
		d.About = r.target(s.About)
	}
	r.p.Dims = append(r.p.Dims, d)
}

func (r *resolver) dim(s *grammar.DimStmt) {
	d := &Dimension{Span: s.Span(), Stmt: s, Tol: r.size(s.Size), ValueSpan: s.Size.Span(), Angle: s.Size.Deg}
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

// extent computes the part's extent (Part.Center and Part.Scale).
func (r *resolver) extent() { r.p.measureExtent() }
