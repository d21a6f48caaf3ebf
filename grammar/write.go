package grammar

import (
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"

	"github.com/alecthomas/participle/v2/lexer"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// This file writes a part model as the notation's tree, whatever reader
// built the part, so that the printer (Format) can lay it out: an importer
// reads another format into the model and writes the model here. It knows
// nothing of the other format; the caller's Notes add what it wants said
// about each statement (where it came from).

// Notes are the comments a caller adds to a part written in the notation.
// Each text is one comment without its '#'; an Above text "" is a blank
// line. A text that would read as an allow directive is not written as
// one.
type Notes struct {
	// Head are comment lines above the header.
	Head []string
	// Above gives the lines above an element (a *model.Feature,
	// *model.Datum, *model.DatumTarget, *model.Frame or *model.Dimension);
	// After its trailing comment. Either may be nil.
	Above func(el any) []string
	After func(el any) string
	// Tail are comment lines after the last statement.
	Tail []string
}

// identRE is a name the notation reads as one name (the lexer's Ident).
var identRE = regexp.MustCompile(`^[A-Za-z_][A-Za-z0-9_-]*$`)

// memberRE is a pattern member's name (NAME.N, the lexer's Member).
var memberRE = regexp.MustCompile(`^[A-Za-z_][A-Za-z0-9_-]*\.[0-9]+$`)

// FromModel writes a part as a file of the notation: the header, the
// features, the datums, the frames and the dimensions, each kind in a
// block, in the model's order. Values are the model's, written with as
// many digits as they need (a value's written text where it reads as the
// same number); a feature's points with the decimals its Member.Decimals
// give where that is exact. An element whose names the notation cannot
// write (a name that is not a name) or a feature recovered from a line
// that did not parse is written as a comment instead, so nothing is
// dropped silently. The file has no source of its own: Format prints it.
func FromModel(p *model.Part, n Notes) *File {
	w := &modelWriter{f: &File{Name: p.Source.Name}, n: n}
	for _, h := range n.Head {
		w.comment(h)
	}
	var head []Stmt
	if p.Title != "" {
		head = append(head, &PartStmt{Title: strconv.QuoteToGraphic(p.Title)})
	}
	if p.Units != model.UnitsUnknown {
		head = append(head, &UnitsStmt{Unit: &Word{Value: p.Units.String()}})
	}
	if p.Standard != model.StandardUnknown {
		head = append(head, &StandardStmt{Standard: &Word{Value: p.Standard.String()}})
	}
	if p.Basis == model.ModelBasis || hasHeader(p, "basis") {
		head = append(head, &BasisStmt{Basis: &Word{Value: p.Basis.String()}})
	}
	w.block()
	for _, st := range head {
		w.stmt(st, nil)
	}
	w.block()
	for _, ft := range p.Features {
		if ft.DatumTarget != nil {
			continue // a datum target's point or line: its target statement declares it
		}
		w.element(ft, featureStmt(ft))
	}
	w.block()
	for _, d := range p.Datums {
		w.element(d, datumStmt(d))
	}
	w.block()
	for _, t := range p.Targets {
		w.element(t, targetStmt(t))
	}
	w.block()
	for _, fr := range p.Frames {
		w.element(fr, frameStmt(fr))
	}
	w.block()
	for _, d := range p.Dims {
		w.element(d, dimStmt(d))
	}
	if len(n.Tail) > 0 {
		w.block()
		for _, t := range n.Tail {
			w.comment(t)
		}
	}
	w.finish()
	return w.f
}

// modelWriter lays statements and comments out on numbered lines, as if
// they had been read from a file, so that the printer sees the blank lines
// and comments where they belong.
type modelWriter struct {
	f     *File
	n     Notes
	lines []string
	// gap is true when the next statement starts a new block.
	gap bool
}

func (w *modelWriter) line() int { return len(w.lines) + 1 }

func (w *modelWriter) block() {
	if len(w.lines) > 0 {
		w.gap = true
	}
}

func (w *modelWriter) flushGap() {
	if w.gap {
		w.lines = append(w.lines, "")
		w.gap = false
	}
}

// commentText makes a text one comment line that is no allow directive.
func commentText(t string) string {
	t = strings.Join(strings.Fields(t), " ")
	if strings.HasPrefix(strings.ToLower(t), "datumlint") {
		t = "(" + t + ")"
	}
	if t == "" {
		return "#"
	}
	return "# " + t
}

func (w *modelWriter) comment(t string) {
	w.flushGap()
	if t == "" {
		w.lines = append(w.lines, "")
		return
	}
	c := commentText(t)
	l := w.line()
	w.f.Comments = append(w.f.Comments, &Comment{Span: spanOn(l, 1, len([]rune(c))), Text: c})
	w.lines = append(w.lines, c)
}

// element writes a model element's statement with the caller's notes; a
// nil statement (one the notation cannot write) becomes a comment.
func (w *modelWriter) element(el any, st Stmt) {
	w.flushGap()
	if w.n.Above != nil {
		for _, t := range w.n.Above(el) {
			w.comment(t)
		}
	}
	after := ""
	if w.n.After != nil {
		after = w.n.After(el)
	}
	if st == nil {
		what := "it has a name the notation cannot write"
		if ft, ok := el.(*model.Feature); ok && ft.Broken {
			what = "it was not read"
		}
		w.comment(fmt.Sprintf("not written: %s, %s", describeElement(el), what) + strings.TrimPrefix(" ("+after+")", " ()"))
		return
	}
	w.stmt(st, &after)
}

// describeElement names an element for a comment that stands in for it.
func describeElement(el any) string {
	switch x := el.(type) {
	case *model.Feature:
		return fmt.Sprintf("feature %q (%s)", x.Name, x.Kind)
	case *model.Datum:
		return fmt.Sprintf("datum %q on %q", x.Letter, x.Target.Name)
	case *model.DatumTarget:
		return fmt.Sprintf("datum target %q on %q", x.Label, x.On.Name)
	case *model.Frame:
		return fmt.Sprintf("a %s frame on %q", x.Characteristic, x.Target.Name)
	case *model.Dimension:
		return fmt.Sprintf("a dimension from %q to %q", x.From.Name, x.To.Name)
	}
	return "an element"
}

// stmt places a statement on the next line (a frame's composite segments
// on the lines after it) with its trailing comment.
func (w *modelWriter) stmt(st Stmt, after *string) {
	w.flushGap()
	first := w.line()
	setLine(st, first)
	w.lines = append(w.lines, "x")
	last := first
	if fr, ok := st.(*FrameStmt); ok {
		for _, c := range fr.Composites {
			last++
			c.Pos, c.EndPos = lexer.Position{Line: last, Column: 5}, lexer.Position{Line: last, Column: 6}
			w.lines = append(w.lines, "    x")
		}
	}
	if after != nil && strings.TrimSpace(*after) != "" {
		c := commentText(*after)
		w.f.Comments = append(w.f.Comments, &Comment{Span: spanOn(first, 3, len([]rune(c))), Text: c, Trailing: true})
		w.lines[first-1] += " " + c
	}
	w.f.Stmts = append(w.f.Stmts, st)
	w.f.Extents = append(w.f.Extents, Extent{First: first, Last: last})
}

func (w *modelWriter) finish() {
	w.f.Src = []byte(strings.Join(w.lines, "\n") + "\n")
}

func spanOn(line, col, n int) (sp source.Span) {
	sp.Start.Line, sp.Start.Col = line, col
	sp.End.Line, sp.End.Col = line, col+n
	return sp
}

// setLine gives a statement's node its line (the printer reads a frame's
// composite lines; the rest reads the extents).
func setLine(st Stmt, line int) {
	pos := lexer.Position{Line: line, Column: 1}
	switch s := st.(type) {
	case *PartStmt:
		s.Pos, s.EndPos = pos, pos
	case *UnitsStmt:
		s.Pos, s.EndPos = pos, pos
	case *StandardStmt:
		s.Pos, s.EndPos = pos, pos
	case *FeatureStmt:
		s.Pos, s.EndPos = pos, pos
	case *DatumStmt:
		s.Pos, s.EndPos = pos, pos
	case *FrameStmt:
		s.Pos, s.EndPos = pos, pos
	case *BasicStmt:
		s.Pos, s.EndPos = pos, pos
	case *DimStmt:
		s.Pos, s.EndPos = pos, pos
	case *BasisStmt:
		s.Pos, s.EndPos = pos, pos
	case *TargetStmt:
		s.Pos, s.EndPos = pos, pos
	case *RefStmt:
		s.Pos, s.EndPos = pos, pos
	}
}

func hasHeader(p *model.Part, kw string) bool {
	for _, h := range p.Headers {
		if h.Keyword == kw {
			return true
		}
	}
	return false
}

// --- values -----------------------------------------------------------------

// num writes a value with the digits it needs.
func numNode(x float64) *Number {
	if x == 0 {
		x = 0 // no "-0"
	}
	t := strconv.FormatFloat(x, 'f', -1, 64)
	if len(t) > 20 {
		t = strconv.FormatFloat(x, 'g', -1, 64) // 1e-12, not 0.000000000001
	}
	return &Number{Text: t}
}

// numText writes a value as written where that text reads as the same
// number, else as num does.
func numTextNode(x float64, text string) *Number {
	if t := strings.TrimSpace(text); t != "" {
		if v, err := strconv.ParseFloat(t, 64); err == nil && v == x && numberRE.MatchString(t) {
			return &Number{Text: t}
		}
	}
	return numNode(x)
}

// numberRE is a number the lexer reads as one token.
var numberRE = regexp.MustCompile(`^[+-]?(?:\d+\.\d+|\.\d+|\d+)(?:[eE][+-]?\d+)?$`)

// numDecimals writes a coordinate with the decimals the model says it was
// written with, where that writes the same number; else as num does.
func numDecimalsNode(x float64, decimals int) *Number {
	if decimals >= 0 && decimals < 20 {
		t := strconv.FormatFloat(x, 'f', decimals, 64)
		if v, err := strconv.ParseFloat(t, 64); err == nil && v == x {
			return &Number{Text: t}
		}
	}
	return numNode(x)
}

// signed writes a deviation with its sign: +0.05, -0.1, +0.
func signedNode(x float64) *Number {
	n := numNode(x)
	if !strings.HasPrefix(n.Text, "-") {
		n.Text = "+" + n.Text
	}
	return n
}

var axisWords = []struct {
	v    model.Vec
	word string
}{{model.Vec{1, 0, 0}, "+x"}, {model.Vec{-1, 0, 0}, "-x"}, {model.Vec{0, 1, 0}, "+y"}, {model.Vec{0, -1, 0}, "-y"}, {model.Vec{0, 0, 1}, "+z"}, {model.Vec{0, 0, -1}, "-z"}}

// directionNode writes a unit direction as an axis word where it is one
// exactly, else as a vector: with the decimals the direction was written
// with where that gives the same direction back (a drafter's (0, 0.5,
// 0.866025), read as a unit vector, is written as it was), else with the
// digits the unit vector needs.
func directionNode(v model.Vec, decimals [3]int) *Direction {
	for _, a := range axisWords {
		if v == a.v {
			return &Direction{Axis: a.word}
		}
	}
	round := func(v model.Vec, d [3]int) (model.Vec, bool) {
		var r model.Vec
		for i := range r {
			r[i], _ = strconv.ParseFloat(strconv.FormatFloat(v[i], 'f', d[i], 64), 64)
		}
		return r, r.Norm() > 0 && r.Unit() == v
	}
	if decimals[0] >= 0 && decimals[1] >= 0 && decimals[2] >= 0 && decimals[0] < 20 && decimals[1] < 20 && decimals[2] < 20 {
		if r, ok := round(v, decimals); ok {
			return &Direction{Vector: vectorNode(r, decimals)}
		}
	}
	// A direction written without decimals known: the simplest vector that
	// reads as it, (1, 0, 1) before 0.7071067811865476, so that written
	// and read again it is the same unit vector.
	small := math.Inf(1)
	for _, x := range v {
		if x != 0 {
			small = math.Min(small, math.Abs(x))
		}
	}
	for _, base := range []model.Vec{v.Scale(1 / small), v} {
		for d := 0; d <= 17; d++ {
			if r, ok := round(base, [3]int{d, d, d}); ok {
				return &Direction{Vector: vectorNode(r, [3]int{d, d, d})}
			}
		}
	}
	return &Direction{Vector: vectorNode(v, [3]int{-1, -1, -1})}
}

func vectorNode(v model.Vec, decimals [3]int) *Vector {
	return &Vector{X: numDecimalsNode(v[0], decimals[0]), Y: numDecimalsNode(v[1], decimals[1]), Z: numDecimalsNode(v[2], decimals[2])}
}

func finite(xs ...float64) bool {
	for _, x := range xs {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

// --- statements ---------------------------------------------------------

func nameNode(s string) *Name { return &Name{Value: s} }

func validName(s string) bool { return identRE.MatchString(s) }

func validTarget(t model.Target) bool {
	return identRE.MatchString(t.Name) || memberRE.MatchString(t.Name)
}

var geometryWord = map[model.Kind]string{
	model.Plane: "normal", model.Slot: "normal", model.Tab: "normal", model.Hole: "axis", model.Pin: "axis",
	model.Cone: "axis", model.Extrusion: "along", model.Socket: "at", model.Ball: "at", model.Surface: "at",
	model.Point: "at", model.Line: "along", model.Circle: "axis",
}

func featureStmt(ft *model.Feature) Stmt {
	if ft.Broken || ft.Kind == model.KindUnknown || !validName(ft.Name) || strings.Contains(ft.Name, ".") {
		return nil
	}
	s := &FeatureStmt{Name: nameNode(ft.Name), Kind: &Word{Value: ft.Kind.String()}}
	if ft.Pattern {
		s.Count = &Count{N: &Number{Text: strconv.Itoa(len(ft.Members))}}
	}
	if sz := ft.Size; sz != nil && ft.Kind.TakesSize() && finite(sz.Nominal, sz.Upper, sz.Lower) {
		s.Size = sizeNode(sz, false)
	}
	if ft.Thread != "" {
		s.Thread = &Thread{Designation: strconv.QuoteToGraphic(ft.Thread)}
	}
	if c := ft.Counterbore; c != nil && c.Diameter != nil && c.Depth != nil {
		s.Cbore = &Counterbore{Diameter: sizeNode(c.Diameter, false), Depth: sizeNode(c.Depth, false)}
	}
	if c := ft.Countersink; c != nil && c.Diameter != nil && c.Angle != nil {
		s.Csink = &Countersink{Diameter: sizeNode(c.Diameter, false), Angle: sizeNode(c.Angle, true)}
	}
	if a, b := ft.Faces[0], ft.Faces[1]; a != nil && b != nil && validTarget(*a) && validTarget(*b) {
		s.Geometry = &Geometry{Word: &GeomWord{Value: "between"}, Faces: []*Name{nameNode(a.Name), nameNode(b.Name)}}
		return s // a width between two faces takes its place from them
	}
	if !ft.HasGeometry {
		return s // the notation reads a feature without geometry as one of unknown place
	}
	g := &Geometry{Word: &GeomWord{Value: geometryWord[ft.Kind]}}
	if g.Word.Value != "at" {
		if ft.Dir.Norm() == 0 || !finite(ft.Dir[0], ft.Dir[1], ft.Dir[2]) {
			return s
		}
		g.Dir = directionNode(ft.Dir, ft.DirDecimals)
		g.At = &AtWord{Value: "at"}
	}
	for _, m := range ft.Members {
		if !finite(m.Point[0], m.Point[1], m.Point[2]) {
			return s
		}
		g.Points = append(g.Points, vectorNode(m.Point, m.Decimals))
	}
	s.Geometry = g
	return s
}

// size writes a size or a dimension's tolerance.
func sizeNode(sz *model.Size, deg bool) *Size {
	s := &Size{Nominal: numTextNode(sz.Nominal, ""), Deg: deg}
	switch {
	case !sz.Toleranced:
	case sz.Upper == -sz.Lower && sz.Upper > 0:
		s.PlusMinus = numNode(sz.Upper)
	default:
		s.Upper, s.Lower = signedNode(sz.Upper), signedNode(sz.Lower)
		if sz.Lower == 0 {
			s.Lower.Text = "-0" // as drafters write it: +0.05 -0
		}
	}
	if sz.Envelope {
		s.Envelope = &RefModifier{Symbol: "(E)"}
	}
	return s
}

func datumStmt(d *model.Datum) Stmt {
	if d.Broken || !validName(d.Letter) || !validTarget(d.Target) {
		return nil
	}
	s := &DatumStmt{Letter: nameNode(d.Letter), Target: nameNode(d.Target.Name)}
	if d.Placement != "" {
		s.Placement = &Word{Value: d.Placement}
	}
	return s
}

func targetStmt(t *model.DatumTarget) Stmt {
	if t.Broken || !validName(t.Label) || !validTarget(t.On) || t.Shape == model.TargetShapeUnknown ||
		!finite(t.Point[0], t.Point[1], t.Point[2], t.End[0], t.End[1], t.End[2]) {
		return nil
	}
	none := [3]int{-1, -1, -1}
	s := &TargetStmt{Label: nameNode(t.Label), Shape: &Word{Value: t.Shape.String()}, On: nameNode(t.On.Name)}
	if t.Feature != nil && len(t.Feature.Members) > 0 {
		none = t.Feature.Members[0].Decimals
	}
	if t.Shape == model.TargetArea {
		switch {
		case t.Dia > 0:
			s.Area = &TargetArea{Dia: "dia", Value: numNode(t.Dia)}
		default:
			s.Area = &TargetArea{Rect: numNode(t.Width).Text + "x" + numNode(t.Height).Text}
		}
	}
	if t.Shape == model.TargetLine {
		s.From, s.To = vectorNode(t.Point, none), vectorNode(t.End, [3]int{-1, -1, -1})
	} else {
		s.At = vectorNode(t.Point, none)
	}
	if t.Normal.Norm() > 0 {
		s.Normal = directionNode(t.Normal, [3]int{-1, -1, -1})
	}
	return s
}

func frameStmt(fr *model.Frame) Stmt {
	if !validTarget(fr.Target) || fr.Characteristic.Category() == model.CategoryUnknown || len(fr.Segments) == 0 {
		return nil
	}
	s := &FrameStmt{Target: nameNode(fr.Target.Name), Characteristic: &Word{Value: string(fr.Characteristic)}}
	for i, seg := range fr.Segments {
		t := toleranceNode(seg)
		if t == nil {
			return nil
		}
		if i == 0 {
			switch fr.Extent {
			case model.AllAround, model.AllOver:
				t.Notes = append(t.Notes, &Note{Word: fr.Extent})
			case model.Between:
				a, b := fr.Between[0], fr.Between[1]
				if a == nil || b == nil || !validTarget(*a) || !validTarget(*b) {
					return nil
				}
				t.Notes = append(t.Notes, &Note{From: nameNode(a.Name), To: nameNode(b.Name)})
			}
			if fr.ThreadDiameter != "" {
				t.Notes = append(t.Notes, &Note{Word: fr.ThreadDiameter})
			}
			s.Tolerance = t
		} else {
			s.Composites = append(s.Composites, &Composite{Tolerance: t})
		}
	}
	return s
}

func toleranceNode(seg *model.Segment) *Tolerance {
	if !finite(seg.Value) {
		return nil
	}
	t := &Tolerance{Value: numTextNode(seg.Value, seg.ValueText)}
	switch {
	case seg.Zone != "":
		t.Zone = &Word{Value: seg.Zone}
	case seg.Named != "":
		t.Zone = &Word{Value: string(seg.Named)} // a characteristic written on a composite line
	}
	if u := seg.PerUnit; u != nil {
		switch {
		case !finite(u.Length, u.Width):
			return nil
		case u.Area:
			t.PerUnit = &PerUnit{Area: numNode(u.Length).Text + "x" + numNode(u.Width).Text}
		default:
			t.PerUnit = &PerUnit{Length: numNode(u.Length)}
		}
	}
	if seg.ZoneDir != nil {
		t.Along = directionNode(*seg.ZoneDir, [3]int{-1, -1, -1})
	}
	for _, m := range seg.Modifiers {
		mod := &Modifier{Symbol: "(" + m.Letter + ")"}
		if m.HasValue {
			mod.Value = numNode(m.Value)
		}
		t.Modifiers = append(t.Modifiers, mod)
	}
	for _, r := range seg.Refs {
		ref := datumRefNode(r)
		if ref == nil {
			return nil
		}
		t.Datums = append(t.Datums, ref)
	}
	if seg.Separate {
		t.Notes = append(t.Notes, &Note{Word: "separate"})
	}
	return t
}

// datumRefNode writes a datum reference: A, A-B(M), or H(M)-J(M) where the
// letters of a common datum have boundaries of their own.
func datumRefNode(r *model.DatumRef) *DatumRef {
	mat := func(m string) []*RefModifier {
		if m == "" {
			return nil
		}
		return []*RefModifier{{Symbol: "(" + m + ")"}}
	}
	if len(r.Letters) == 0 {
		return nil
	}
	for _, l := range r.Letters {
		if !identRE.MatchString(l) || strings.Contains(l, "-") {
			return nil
		}
	}
	own := r.Material == "" && len(r.Materials) == len(r.Letters)
	if own {
		same := true
		for _, m := range r.Materials {
			same = same && m == r.Materials[0]
		}
		own = !same || r.Materials[0] != ""
		if same {
			own = false // one boundary for the whole reference, or none
		}
	}
	if !own {
		m := r.Material
		if m == "" && len(r.Materials) > 0 {
			m = r.Materials[0]
		}
		return &DatumRef{Name: strings.Join(r.Letters, "-"), Modifiers: mat(m)}
	}
	ref := &DatumRef{Name: r.Letters[0], Modifiers: mat(r.Materials[0])}
	for i, l := range r.Letters[1:] {
		ref.More = append(ref.More, &RefMember{Name: "-" + l, Modifiers: mat(r.Materials[i+1])})
	}
	return ref
}

func dimStmt(d *model.Dimension) Stmt {
	if d.Reference {
		return refStmt(d)
	}
	if c := d.Circle; c != nil {
		if !validTarget(c.Pattern) || !validTarget(c.About) || !finite(c.Diameter) {
			return nil
		}
		return &BasicStmt{Circle: &BoltCircle{Zone: &Word{Value: "dia"}, Value: numTextNode(c.Diameter, d.ValueText),
			Pattern: nameNode(c.Pattern.Name), About: nameNode(c.About.Name)}}
	}
	if !validTarget(d.From) || !validTarget(d.To) || !finite(d.Value) {
		return nil
	}
	var along *Direction
	if d.Along != nil && !d.Angle {
		along = directionNode(*d.Along, [3]int{-1, -1, -1})
	}
	if !d.Basic && d.Tol != nil {
		tol := *d.Tol
		tol.Nominal = d.Value
		return &DimStmt{Size: sizeNode(&tol, d.Angle), From: nameNode(d.From.Name), To: nameNode(d.To.Name), Along: along}
	}
	s := &BasicStmt{Value: numTextNode(d.Value, d.ValueText), Deg: d.Angle, From: nameNode(d.From.Name), To: nameNode(d.To.Name), Along: along}
	if d.About != nil {
		if !validTarget(*d.About) {
			return nil
		}
		s.About = nameNode(d.About.Name)
	}
	return s
}

// refStmt writes a reference dimension: a size of a feature, or a
// distance or an angle.
func refStmt(d *model.Dimension) Stmt {
	if !finite(d.Value) {
		return nil
	}
	if d.SizeOf != nil {
		if !validTarget(*d.SizeOf) {
			return nil
		}
		return &RefStmt{Size: numTextNode(d.Value, d.ValueText), Of: nameNode(d.SizeOf.Name)}
	}
	if !validTarget(d.From) || !validTarget(d.To) {
		return nil
	}
	s := &RefStmt{Value: numTextNode(d.Value, d.ValueText), Deg: d.Angle, From: nameNode(d.From.Name), To: nameNode(d.To.Name)}
	if d.Along != nil && !d.Angle {
		s.Along = directionNode(*d.Along, [3]int{-1, -1, -1})
	}
	if d.About != nil {
		if !validTarget(*d.About) {
			return nil
		}
		s.About = nameNode(d.About.Name)
	}
	return s
}
