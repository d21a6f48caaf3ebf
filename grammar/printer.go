package grammar

import (
	"bytes"
	"errors"
	"fmt"
	"strings"
	"unicode/utf8"
)

// The printer writes a parsed file in its canonical layout: one statement
// per line (continuations joined, each composite segment on its own line
// indented four spaces), ASCII spellings, single spaces, the name and value
// columns of a block aligned, comments where they were and blank lines kept
// (runs collapsed to one).
//
// Two things matter more than looks. Formatting must never change what the
// file means, so the tokens printed are the tokens parsed, only respelled
// where the notation gives two spellings of one thing; and an allow comment
// must keep applying to its statement, which is why comments never move
// across a statement or a blank line (see rules.Directives: a trailing
// comment applies to the statement whose lines it is on, an own-line one to
// the statement directly below it with only comment lines between).
//
// A block is a run of statements of the same form with no blank line
// between them (own-line comments do not end a block). The form is the
// keyword, and for basic dimensions also which of the two written forms
// it is: a bolt circle (basic dia 80 through ... about ...) is not aligned
// with the lengths and angles around it, whose values are shorter, so one
// odd line does not pad all the others, and a bolt-circle line between two
// runs of lengths ends the first. Aligned columns: the name of a feature,
// the letter of a datum (and its target when a placement follows), the
// value of a basic dimension and of a dim. Frame targets are not padded,
// so that the contract's example is its own canonical form. A trailing
// comment follows its code after one space: no column alignment, so that
// editing one line never rewrites its neighbours.
//
// Line ends are the file's: a file whose first line ends in CR LF is
// printed with CR LF throughout, any other with LF; a byte-order mark is
// kept. Formatting does not change how a file is saved, only its layout.

// indent is the indentation of a composite lower segment.
const indent = "    "

// Format returns the canonical layout of a parsed file. A file with syntax
// errors is refused: a file that does not parse is never rewritten.
func Format(f *File) ([]byte, error) {
	if f == nil {
		return nil, errors.New("no file to format")
	}
	if len(f.Errors) > 0 {
		return nil, fmt.Errorf("%s does not parse (%d syntax error(s), the first at %s: %s); it is not formatted",
			f.Name, len(f.Errors), f.Errors[0].Span.Start, f.Errors[0].Msg)
	}
	if len(f.Extents) != len(f.Stmts) {
		return nil, errors.New("internal: the statements and their line extents disagree")
	}
	for _, st := range f.Stmts {
		if _, bad := st.(*BadStmt); bad {
			return nil, fmt.Errorf("%s: a statement does not parse; the file is not formatted", st.Span().Start)
		}
	}
	p := newPrinter(f)
	out := p.print()
	if bytes.HasPrefix(f.Src, bom) {
		out = append(append([]byte{}, bom...), out...)
	}
	if firstLineCRLF(f.Src) {
		out = bytes.ReplaceAll(out, []byte("\n"), []byte("\r\n"))
	}
	return out, nil
}

var bom = []byte("\xef\xbb\xbf")

// firstLineCRLF reports whether the first line of src ends in CR LF.
func firstLineCRLF(src []byte) bool {
	i := bytes.IndexByte(src, '\n')
	return i > 0 && src[i-1] == '\r'
}

// outLine is one line of output.
type outLine struct {
	blank    bool
	stmt     int    // index of the statement whose first line this is, or -1
	fields   []cell // the statement's first line, for alignment
	code     string // the text of a line that is not aligned (comments, composites)
	trailing string // a trailing comment, or ""
}

// cell is one column of an aligned line.
type cell struct {
	text string
	pad  bool // padded to the widest cell of its column in the block
}

type printer struct {
	f        *File
	lines    []physLine
	own      map[int]string   // own-line comments by physical line
	trailing map[int][]string // trailing comments by physical line
	out      []outLine
}

func newPrinter(f *File) *printer {
	p := &printer{f: f, own: map[int]string{}, trailing: map[int][]string{}}
	p.lines = splitLines(bytes.TrimPrefix(f.Src, bom))
	for _, c := range f.Comments {
		text := strings.TrimRight(c.Text, " \t\r\f\v")
		if c.Trailing {
			p.trailing[c.Span.Start.Line] = append(p.trailing[c.Span.Start.Line], text)
		} else {
			p.own[c.Span.Start.Line] = text
		}
	}
	return p
}

// hasCode reports whether a physical line holds code (a continuation
// backslash alone counts: it belongs to its statement).
func (p *printer) hasCode(line int) bool {
	if line < 1 || line > len(p.lines) {
		return false
	}
	return strings.TrimSpace(p.lines[line-1].code) != ""
}

func (p *printer) blank() {
	if n := len(p.out); n == 0 || p.out[n-1].blank {
		return // no leading blank lines, no runs
	}
	p.out = append(p.out, outLine{blank: true, stmt: -1})
}

func (p *printer) comment(text, ind string) {
	p.out = append(p.out, outLine{stmt: -1, code: ind + text})
}

// gap prints the lines between statements: own-line comments and blank lines.
func (p *printer) gap(from, to int) {
	for l := from; l <= to; l++ {
		if c, ok := p.own[l]; ok {
			p.comment(c, "")
		} else if !p.hasCode(l) {
			p.blank()
		}
	}
}

func (p *printer) print() []byte {
	next := 1 // the first physical line not yet printed
	for i, st := range p.f.Stmts {
		e := p.f.Extents[i]
		p.gap(next, e.First-1)
		p.statement(i, st, e)
		next = e.Last + 1
	}
	p.gap(next, len(p.lines))
	for n := len(p.out); n > 0 && p.out[n-1].blank; n = len(p.out) {
		p.out = p.out[:n-1]
	}
	p.align()
	var b bytes.Buffer
	for _, l := range p.out {
		s := l.code
		if l.trailing != "" {
			s += " " + l.trailing
		}
		b.WriteString(strings.TrimRight(s, " "))
		b.WriteByte('\n')
	}
	return b.Bytes()
}

// statement prints one statement with the comments inside its extent.
// Each segment (a frame's upper part and each composite) takes the first
// trailing comment written on its lines; further trailing comments of the
// statement go on their own lines directly above it, where an allow
// comment still applies to the same statement.
func (p *printer) statement(i int, st Stmt, e Extent) {
	starts := []int{e.First}
	segs := [][]string{nil}
	if fr, ok := st.(*FrameStmt); ok {
		for _, c := range fr.Composites {
			starts = append(starts, max(e.First, c.Span().Start.Line))
			segs = append(segs, nil)
		}
	}
	segOf := func(line int) int {
		k := 0
		for j, s := range starts {
			if s <= line {
				k = j
			}
		}
		return k
	}
	var hoisted []string
	trail := make([]string, len(starts))
	after := make([][]string, len(starts)) // own-line comments after segment k
	for l := e.First; l <= e.Last; l++ {
		k := segOf(l)
		for _, c := range p.trailing[l] {
			if trail[k] == "" {
				trail[k] = c
			} else {
				hoisted = append(hoisted, c)
			}
		}
		if c, ok := p.own[l]; ok {
			after[k] = append(after[k], c)
		}
	}
	for _, c := range hoisted {
		p.comment(c, "")
	}
	first, rest := render(st)
	p.out = append(p.out, outLine{stmt: i, fields: first, trailing: trail[0]})
	for k := range starts {
		if k > 0 {
			p.out = append(p.out, outLine{stmt: -1, code: indent + rest[k-1], trailing: trail[k]})
		}
		ind := indent
		if k == len(starts)-1 {
			ind = "" // after the statement: reads as a comment between statements
		}
		for _, c := range after[k] {
			p.comment(c, ind)
		}
	}
}

// align pads the aligned columns of each block and renders the first lines.
func (p *printer) align() {
	kind := func(i int) string { return form(p.f.Stmts[i]) }
	for a := 0; a < len(p.out); {
		if p.out[a].stmt < 0 {
			a++
			continue
		}
		// the block: statements of a's form until a blank line or another form
		block := []int{a}
		b := a + 1
		for ; b < len(p.out); b++ {
			l := p.out[b]
			if l.blank || l.stmt >= 0 && kind(l.stmt) != kind(p.out[a].stmt) {
				break
			}
			if l.stmt >= 0 {
				block = append(block, b)
			}
		}
		var width []int
		for _, j := range block {
			for c, cl := range p.out[j].fields {
				for len(width) <= c {
					width = append(width, 0)
				}
				if cl.pad {
					width[c] = max(width[c], utf8.RuneCountInString(cl.text))
				}
			}
		}
		for _, j := range block {
			var s strings.Builder
			for c, cl := range p.out[j].fields {
				if c > 0 {
					s.WriteByte(' ')
				}
				s.WriteString(cl.text)
				if cl.pad {
					s.WriteString(strings.Repeat(" ", width[c]-utf8.RuneCountInString(cl.text)))
				}
			}
			p.out[j].code = strings.TrimRight(s.String(), " ")
		}
		a = b
	}
}

// form is what makes statements alike for alignment: the keyword, and
// for a basic dimension whether it is a bolt circle, for a reference one
// whether it is a size.
func form(st Stmt) string {
	if b, ok := st.(*BasicStmt); ok && b.Circle != nil {
		return "basic circle"
	}
	if r, ok := st.(*RefStmt); ok && r.Size != nil {
		return "ref size"
	}
	return st.Keyword()
}

// --- statements -------------------------------------------------------------

// render returns a statement's first line as cells and the text of its
// further lines (a frame's composite segments).
func render(st Stmt) (first []cell, rest []string) {
	fixed := func(s ...string) []cell {
		out := make([]cell, len(s))
		for i, t := range s {
			out[i] = cell{text: t}
		}
		return out
	}
	switch s := st.(type) {
	case *PartStmt:
		return fixed("part", s.Title), nil
	case *UnitsStmt:
		return fixed("units", s.Unit.Value), nil
	case *StandardStmt:
		return fixed("standard", s.Standard.Value), nil
	case *FeatureStmt:
		var w words
		w.add(s.Kind.Value)
		if s.Count != nil {
			w.add(s.Count.N.Text + "x")
		}
		if s.Size != nil {
			w.add("size", size(s.Size))
		}
		if s.Thread != nil {
			w.add("thread", s.Thread.Designation)
		}
		if c := s.Cbore; c != nil {
			w.add("cbore", size(c.Diameter), "depth", size(c.Depth))
		}
		if c := s.Csink; c != nil {
			w.add("csink", size(c.Diameter), "angle", size(c.Angle))
		}
		if g := s.Geometry; g != nil {
			w.add(g.Word.Value)
			if g.Dir != nil {
				w.add(direction(g.Dir))
			}
			if g.At != nil {
				w.add("at")
			}
			for _, pt := range g.Points {
				w.add(vector(pt))
			}
			for _, n := range g.Faces {
				w.add(n.Value)
			}
		}
		return []cell{{text: "feature"}, {text: s.Name.Value, pad: true}, {text: w.String()}}, nil
	case *DatumStmt:
		c := []cell{{text: "datum"}, {text: s.Letter.Value, pad: true}, {text: "on"}, {text: s.Target.Value}}
		if s.Placement != nil {
			c[3].pad = true
			c = append(c, cell{text: "placed " + s.Placement.Value})
		}
		return c, nil
	case *FrameStmt:
		head := "frame " + s.Target.Value + ":"
		first := fixed(head, CanonicalWord(s.Characteristic.Value)+" "+tolerance(s.Tolerance))
		for _, c := range s.Composites {
			rest = append(rest, "composite "+tolerance(c.Tolerance))
		}
		return first, rest
	case *BasicStmt:
		var w words
		var value string
		if c := s.Circle; c != nil {
			value = CanonicalWord(c.Zone.Value) + " " + c.Value.Text
			w.add("through", c.Pattern.Value, "about", c.About.Value)
		} else {
			value, w = measure(s.Value, s.Deg, s.From, s.To, s.Along, s.About)
		}
		return []cell{{text: "basic"}, {text: value, pad: true}, {text: w.String()}}, nil
	case *DimStmt:
		var w words
		w.add("from", s.From.Value, "to", s.To.Value)
		if s.Along != nil {
			w.add("along", direction(s.Along))
		}
		return []cell{{text: "dim"}, {text: size(s.Size), pad: true}, {text: w.String()}}, nil
	case *BasisStmt:
		return fixed("basis", s.Basis.Value), nil
	case *TargetStmt:
		var w words
		w.add(s.Shape.Value)
		if a := s.Area; a != nil {
			if a.Value != nil {
				w.add(CanonicalWord(a.Dia), a.Value.Text)
			} else {
				w.add(strings.ToLower(a.Rect))
			}
		}
		w.add("on", s.On.Value)
		if s.At != nil {
			w.add("at", vector(s.At))
		} else {
			w.add("from", vector(s.From), "to", vector(s.To))
		}
		if s.Normal != nil {
			w.add("normal", direction(s.Normal))
		}
		return []cell{{text: "target"}, {text: s.Label.Value, pad: true}, {text: w.String()}}, nil
	case *RefStmt:
		var w words
		var value string
		if s.Size != nil {
			value = "size " + s.Size.Text
			w.add("of", s.Of.Value)
		} else {
			value, w = measure(s.Value, s.Deg, s.From, s.To, s.Along, s.About)
		}
		return []cell{{text: "ref"}, {text: value, pad: true}, {text: w.String()}}, nil
	}
	// Format refuses files with bad statements, so this is unreachable; keep
	// the statement's words rather than lose them.
	if b, ok := st.(*BadStmt); ok {
		return fixed(strings.Join(strings.Fields(b.Text), " ")), nil
	}
	return fixed(st.Keyword()), nil
}

// measure writes a basic or reference distance or angle: its value, and
// the words after it.
func measure(v *Number, deg bool, from, to *Name, along *Direction, about *Name) (string, words) {
	var w words
	value := v.Text
	if deg {
		value += "deg"
	}
	w.add("from", from.Value, "to", to.Value)
	if along != nil {
		w.add("along", direction(along))
	}
	if about != nil {
		w.add("about", about.Value)
	}
	return value, w
}

// words joins tokens with single spaces.
type words struct{ parts []string }

func (w *words) add(s ...string) { w.parts = append(w.parts, s...) }

func (w *words) String() string { return strings.Join(w.parts, " ") }

func vector(v *Vector) string {
	return "(" + v.X.Text + ", " + v.Y.Text + ", " + v.Z.Text + ")"
}

func direction(d *Direction) string {
	if d.Vector != nil {
		return vector(d.Vector)
	}
	return d.Axis
}

func modifier(sym string) string { return "(" + ModifierLetter(sym) + ")" }

// size writes a size or a toleranced value: 12 +-0.05, 12 +0.1 -0,
// 11.95..12.05, each optionally followed by (E).
func size(s *Size) string {
	var w words
	nominal := s.Nominal.Text
	if s.Deg {
		nominal += "deg"
	}
	switch {
	case s.PlusMinus != nil:
		w.add(nominal, "+-"+s.PlusMinus.Text)
	case s.Upper != nil && s.Lower != nil:
		w.add(nominal, s.Upper.Text, s.Lower.Text)
	case s.Limit != nil:
		w.add(nominal + ".." + s.Limit.Text)
	default:
		w.add(nominal)
	}
	if s.Envelope != nil {
		w.add(modifier(s.Envelope.Symbol))
	}
	return w.String()
}

// tolerance writes one segment of a frame after its characteristic.
func tolerance(t *Tolerance) string {
	var w words
	if t.Zone != nil {
		w.add(CanonicalWord(t.Zone.Value))
	}
	value := t.Value.Text
	if u := t.PerUnit; u != nil {
		if u.Length != nil {
			value += "/" + u.Length.Text
		} else {
			value += "/" + strings.ToLower(u.Area)
		}
	}
	w.add(value)
	for _, m := range t.Modifiers {
		w.add(modifier(m.Symbol))
		if m.Value != nil {
			w.add(m.Value.Text)
		}
	}
	if t.Along != nil {
		w.add("along", direction(t.Along))
	}
	if len(t.Datums) > 0 {
		refs := make([]string, len(t.Datums))
		for i, d := range t.Datums {
			refs[i] = d.Name
			for _, m := range d.Modifiers {
				refs[i] += modifier(m.Symbol)
			}
			for _, p := range d.More {
				refs[i] += p.Name
				for _, m := range p.Modifiers {
					refs[i] += modifier(m.Symbol)
				}
			}
		}
		w.add("datums", strings.Join(refs, ", "))
	}
	for _, n := range t.Notes {
		if n.From != nil {
			w.add("between", n.From.Value, n.To.Value)
		} else {
			w.add(n.Word)
		}
	}
	return w.String()
}
