package grammar

import (
	"strings"

	"github.com/alecthomas/participle/v2/lexer"
)

// fastParse builds the tree of one well-formed statement by plain recursive
// descent, scanning its tokens as it goes, without participle and without
// a token slice. Profiling put participle's reflective parser at almost a
// third of a whole check, and the token slices it needs at a good part of
// the rest, most of it spent on statements that are perfectly ordinary.
//
// The participle grammar (the tags in ast.go) stays the reference: this
// parser must produce exactly the tree participle produces (same nodes, same
// values, same source.Pos and EndPos) or nothing at all. It commits to an optional
// part of the grammar as soon as that part's first token is there and gives
// up ("not handled", nil) at the first token it does not expect, so it
// accepts only input that participle's greedy, ordered matching accepts the
// same way; everything else, every lexical and syntax error included, goes
// to lexStmt and participle as before. TestFastParserMatchesParticiple and
// FuzzFastParser hold the two parsers to the same trees.
//
// Tokens come from scanOne, the scanner lexStmt uses (through scanNext), with positions moved
// to the file as lexStmt moves them. Positions follow participle: a node's
// source.Pos is its first significant token, its EndPos the raw token (whitespace
// included) after its last token, which always starts where that last token
// ends, or the end of the statement.
func fastParse(name string, rs rawStmt) Stmt {
	if badText(rs) != nil {
		return nil
	}
	p := fastParser{text: rs.text, pos: lexer.Position{Filename: name, Offset: rs.offset, Line: rs.first, Column: 1}}
	p.scan()
	var st Stmt
	switch p.tok.Value {
	case "part":
		st = stmtOrNil(p.part())
	case "units":
		st = stmtOrNil(p.units())
	case "standard":
		st = stmtOrNil(p.standard())
	case "feature":
		st = stmtOrNil(p.feature())
	case "datum":
		st = stmtOrNil(p.datum())
	case "frame":
		st = stmtOrNil(p.frame())
	case "basic":
		st = stmtOrNil(p.basic())
	case "dim":
		st = stmtOrNil(p.dim())
	case "basis":
		st = stmtOrNil(p.basis())
	case "target":
		st = stmtOrNil(p.target())
	case "ref":
		st = stmtOrNil(p.ref())
	}
	// participle requires the whole statement to be used up.
	if p.failed || st == nil || p.tok.Type != lexer.EOF {
		return nil
	}
	return st
}

// stmtOrNil keeps a nil statement pointer from becoming a non-nil Stmt.
func stmtOrNil[T any, P interface {
	*T
	Stmt
}](s P) Stmt {
	if s == nil {
		return nil
	}
	return s
}

// maxRepeat is participle's MaxIterations: a repetition that reaches it is
// an error there, so it is left to participle here.
const maxRepeat = 1000000

// fastParser scans and parses one statement's text.
type fastParser struct {
	text   string
	i      int            // byte offset in text just after tok
	pos    lexer.Position // file position of text[i]
	tok    lexer.Token    // the next significant token, or EOF
	end    lexer.Position // file position just after the last token taken
	failed bool           // unexpected or unlexable input: not handled

	vectors []vectorNodes // the statement's vectors not yet handed out
}

// scan reads the next significant token into tok, skipping whitespace. A
// character no token rule matches ends the statement as not handled.
func (p *fastParser) scan() {
	for p.i < len(p.text) {
		// Spaces and tabs before a token on the same line, the commonest
		// whitespace: what scanNext and advance give for it, without them.
		if c := p.text[p.i]; c == ' ' || c == '\t' {
			j := p.i + 1
			for j < len(p.text) && (p.text[j] == ' ' || p.text[j] == '\t') {
				j++
			}
			if j == len(p.text) || !isRESpace(p.text[j]) && p.text[j] != '\v' {
				p.pos.Offset += j - p.i
				p.pos.Column += j - p.i
				p.i = j
				continue
			}
		}
		typ, e := scanNext(p.text, p.i)
		if e <= p.i {
			p.failed = true
			break
		}
		v := p.text[p.i:e]
		at := p.pos
		advance(&p.pos, v)
		p.i = e
		if typ != tokWhitespace {
			p.tok = lexer.Token{Type: typ, Value: v, Pos: at}
			return
		}
	}
	p.tok = lexer.EOFToken(p.pos)
}

// scanNext is scanOne with the rules that cannot match skipped: for a
// token that starts with an ASCII letter, digit, whitespace or one of
// ",):/", no rule before the ones tried here can match (they need '"', '(',
// '+', '-', '.' or a non-ASCII character first), so the first rule that
// matches is the same. Everything else goes through scanOne's full list.
// FuzzFastParser compares the two at every offset of its input.
func scanNext(s string, i int) (lexer.TokenType, int) {
	switch c := s[i]; {
	case isNameStart(c):
		if e := scanMember(s, i); e > i {
			return tokMember, e
		}
		if c == 'S' {
			if e := scanSDia(s, i); e > i {
				return tokSDia, e
			}
		}
		return tokIdent, scanIdent(s, i)
	case isDigit(c):
		if e := scanArea(s, i); e > i {
			return tokArea, e
		}
		return tokNumber, scanNumber(s, i)
	case c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\f' || c == '\v':
		return tokWhitespace, scanWhitespace(s, i)
	case c == ',' || c == ')' || c == ':' || c == '/':
		return tokPunct, i + 1
	}
	return scanOne(s, i)
}

// take consumes the next significant token and returns its text.
func (p *fastParser) take() string {
	v := p.tok.Value
	p.end = p.pos
	p.scan()
	return v
}

// is reports whether the next token has the given type.
func (p *fastParser) is(typ lexer.TokenType) bool { return p.tok.Type == typ }

// isWord reports whether the next token is the literal word (or
// punctuation) w, whatever its type, as participle's literals match.
func (p *fastParser) isWord(w string) bool { return p.tok.Value == w && p.tok.Type != lexer.EOF }

// expect consumes the literal w or marks the statement as not handled.
func (p *fastParser) expect(w string) bool {
	if !p.isWord(w) {
		p.failed = true
		return false
	}
	p.take()
	return true
}

// open starts a node at the next significant token.
func (p *fastParser) open() node { return node{Pos: p.tok.Pos} }

// close ends a node after the last token taken.
func (p *fastParser) close(n *node) { n.EndPos = p.end }

func (p *fastParser) fail() { p.failed = true }

// --- leaves ---------------------------------------------------------------
//
// Each leaf fills a node it is given, so that a statement's fixed nodes can
// come in one allocation (the *Nodes types below) instead of one each:
// after participle, allocation was the fast parser's next largest cost.

func (p *fastParser) isName() bool { return p.is(tokIdent) || p.is(tokMember) }

// name: @(Ident | Member)
func (p *fastParser) name(n *Name) *Name {
	if !p.isName() {
		p.fail()
		return nil
	}
	n.node = p.open()
	n.Value = p.take()
	p.close(&n.node)
	return n
}

func (p *fastParser) isWordTok() bool {
	switch p.tok.Type {
	case tokIdent, tokSymbol, tokDia, tokSDia:
		return true
	}
	return false
}

// word: @(Ident | Symbol | Dia | SDia)
func (p *fastParser) word(w *Word) *Word {
	if !p.isWordTok() {
		p.fail()
		return nil
	}
	w.node = p.open()
	w.Value = p.take()
	p.close(&w.node)
	return w
}

// number: @Number
func (p *fastParser) number(n *Number) *Number {
	if !p.is(tokNumber) {
		p.fail()
		return nil
	}
	n.node = p.open()
	n.Text = p.take()
	if !finiteLiteral(n.Text) {
		// participle's path reports the statement (outOfRange).
		p.fail()
	}
	p.close(&n.node)
	return n
}

// vectorNodes is a vector with its three numbers.
type vectorNodes struct {
	v       Vector
	x, y, z Number
}

// newVector hands out the next of a statement's vectors, allocated
// together: a statement has no more vectors than opening parentheses.
func (p *fastParser) newVector() *vectorNodes {
	if len(p.vectors) == 0 {
		p.vectors = make([]vectorNodes, max(1, p.countAhead('(')))
	}
	v := &p.vectors[0]
	p.vectors = p.vectors[1:]
	return v
}

// countAhead counts the byte c in the statement text not yet scanned, plus
// one for the current token.
func (p *fastParser) countAhead(c byte) int { return 1 + strings.Count(p.text[p.i:], string(c)) }

// vector: '(' @@ ',' @@ ',' @@ ')'
func (p *fastParser) vector() *Vector {
	b := p.newVector()
	v := &b.v
	v.node = p.open()
	if !p.expect("(") {
		return nil
	}
	if v.X = p.number(&b.x); v.X == nil || !p.expect(",") {
		return nil
	}
	if v.Y = p.number(&b.y); v.Y == nil || !p.expect(",") {
		return nil
	}
	if v.Z = p.number(&b.z); v.Z == nil || !p.expect(")") {
		return nil
	}
	p.close(&v.node)
	return v
}

func (p *fastParser) isDirection() bool { return p.is(tokDir) || p.isWord("(") }

// direction: @Dir | @@(Vector)
func (p *fastParser) direction(d *Direction) *Direction {
	d.node = p.open()
	switch {
	case p.is(tokDir):
		d.Axis = p.take()
	case p.isWord("("):
		if d.Vector = p.vector(); d.Vector == nil {
			return nil
		}
	default:
		p.fail()
		return nil
	}
	p.close(&d.node)
	return d
}

// refModifier: @Modifier
func (p *fastParser) refModifier(m *RefModifier) *RefModifier {
	m.node = p.open()
	m.Symbol = p.take()
	p.close(&m.node)
	return m
}

// sizeNodes is a size with the numbers it can hold.
type sizeNodes struct {
	s        Size
	nom, tol Number // the nominal; ± or the upper deviation or the limit
	lower    Number
	env      RefModifier
}

// size: Nominal 'deg'? ( PlusMinus @@ | @@ '/'? @@ | Range @@ )? Envelope?
func (p *fastParser) size(b *sizeNodes) *Size {
	s := &b.s
	s.node = p.open()
	if s.Nominal = p.number(&b.nom); s.Nominal == nil {
		return nil
	}
	if p.isWord("deg") {
		p.take()
		s.Deg = true
	}
	switch {
	case p.is(tokPlusMinus):
		p.take()
		if s.PlusMinus = p.number(&b.tol); s.PlusMinus == nil {
			return nil
		}
	case p.is(tokNumber):
		s.Upper = p.number(&b.tol)
		if p.isWord("/") {
			p.take()
			s.Slash = true
		}
		if s.Lower = p.number(&b.lower); s.Lower == nil {
			return nil
		}
	case p.is(tokRange):
		p.take()
		if s.Limit = p.number(&b.tol); s.Limit == nil {
			return nil
		}
	}
	if p.is(tokModifier) {
		s.Envelope = p.refModifier(&b.env)
	}
	p.close(&s.node)
	return s
}

// --- statements -----------------------------------------------------------

// part: 'part' @String
func (p *fastParser) part() *PartStmt {
	s := &PartStmt{node: p.open()}
	if !p.expect("part") || !p.is(tokString) {
		p.fail()
		return nil
	}
	s.Title = p.take()
	p.close(&s.node)
	return s
}

// headerWord: KEYWORD @@, a header statement of one word (units,
// standard, basis); n is the statement's node.
func (p *fastParser) headerWord(keyword string, n *node, w *Word) *Word {
	*n = p.open()
	if !p.isWord(keyword) {
		p.fail()
		return nil
	}
	p.take()
	if p.word(w) == nil {
		return nil
	}
	p.close(n)
	return w
}

type unitsNodes struct {
	s UnitsStmt
	w Word
}

// units: 'units' @@
func (p *fastParser) units() *UnitsStmt {
	b := &unitsNodes{}
	if b.s.Unit = p.headerWord("units", &b.s.node, &b.w); b.s.Unit == nil {
		return nil
	}
	return &b.s
}

type standardNodes struct {
	s StandardStmt
	w Word
}

// standard: 'standard' @@
func (p *fastParser) standard() *StandardStmt {
	b := &standardNodes{}
	if b.s.Standard = p.headerWord("standard", &b.s.node, &b.w); b.s.Standard == nil {
		return nil
	}
	return &b.s
}

type featureNodes struct {
	s     FeatureStmt
	name  Name
	kind  Word
	count Count
	n     Number
	size  sizeNodes
	geom  Geometry
	gw    GeomWord
	dir   Direction
	at    AtWord
}

// feature: 'feature' Name Kind Count? ('size' Size)? Geometry?
func (p *fastParser) feature() *FeatureStmt {
	b := &featureNodes{}
	s := &b.s
	s.node = p.open()
	if !p.expect("feature") {
		return nil
	}
	if s.Name = p.name(&b.name); s.Name == nil {
		return nil
	}
	if s.Kind = p.word(&b.kind); s.Kind == nil {
		return nil
	}
	if p.is(tokNumber) {
		c := &b.count
		c.node = p.open()
		c.N = p.number(&b.n)
		if !p.isWord("x") && !p.isWord("X") {
			p.fail()
			return nil
		}
		p.take()
		p.close(&c.node)
		s.Count = c
	}
	if p.isWord("size") {
		p.take()
		if s.Size = p.size(&b.size); s.Size == nil {
			return nil
		}
	}
	if p.isWord("thread") {
		t := &Thread{node: p.open()}
		p.take()
		if !p.is(tokString) {
			p.fail()
			return nil
		}
		t.Designation = p.take()
		p.close(&t.node)
		s.Thread = t
	}
	if p.isWord("cbore") {
		c := &Counterbore{node: p.open()}
		p.take()
		if c.Diameter = p.size(&sizeNodes{}); c.Diameter == nil || !p.expect("depth") {
			return nil
		}
		if c.Depth = p.size(&sizeNodes{}); c.Depth == nil {
			return nil
		}
		p.close(&c.node)
		s.Cbore = c
	}
	if p.isWord("csink") {
		c := &Countersink{node: p.open()}
		p.take()
		if c.Diameter = p.size(&sizeNodes{}); c.Diameter == nil || !p.expect("angle") {
			return nil
		}
		if c.Angle = p.size(&sizeNodes{}); c.Angle == nil {
			return nil
		}
		p.close(&c.node)
		s.Csink = c
	}
	if p.isGeomWord() {
		if s.Geometry = p.geometry(b); s.Geometry == nil {
			return nil
		}
	}
	p.close(&s.node)
	return s
}

func (p *fastParser) isGeomWord() bool {
	switch p.tok.Value {
	case "normal", "axis", "along", "at", "between":
		return true
	}
	return false
}

// geometry: GeomWord Direction? AtWord? Vector* Name*
func (p *fastParser) geometry(b *featureNodes) *Geometry {
	g := &b.geom
	g.node = p.open()
	w := &b.gw
	w.node = p.open()
	w.Value = p.take()
	p.close(&w.node)
	g.Word = w
	if p.isDirection() {
		if g.Dir = p.direction(&b.dir); g.Dir == nil {
			return nil
		}
	}
	if p.isWord("at") {
		a := &b.at
		a.node = p.open()
		a.Value = p.take()
		p.close(&a.node)
		g.At = a
	}
	if p.isWord("(") {
		g.Points = make([]*Vector, 0, p.countAhead('('))
	}
	for p.isWord("(") {
		if len(g.Points) == maxRepeat-1 {
			p.fail()
			return nil
		}
		v := p.vector()
		if v == nil {
			return nil
		}
		g.Points = append(g.Points, v)
	}
	for p.isName() {
		if len(g.Faces) == maxRepeat-1 {
			p.fail()
			return nil
		}
		g.Faces = append(g.Faces, p.name(&Name{}))
	}
	p.close(&g.node)
	return g
}

type datumNodes struct {
	s              DatumStmt
	letter, target Name
	placement      Word
}

// datum: 'datum' Name 'on' Name ('placed' Word)?
func (p *fastParser) datum() *DatumStmt {
	b := &datumNodes{}
	s := &b.s
	s.node = p.open()
	if !p.expect("datum") {
		return nil
	}
	if s.Letter = p.name(&b.letter); s.Letter == nil || !p.expect("on") {
		return nil
	}
	if s.Target = p.name(&b.target); s.Target == nil {
		return nil
	}
	if p.isWord("placed") {
		p.take()
		if s.Placement = p.word(&b.placement); s.Placement == nil {
			return nil
		}
	}
	p.close(&s.node)
	return s
}

type frameNodes struct {
	s      FrameStmt
	target Name
	char   Word
	tol    toleranceNodes
}

// frame: 'frame' Name ':' Word Tolerance Composite*
func (p *fastParser) frame() *FrameStmt {
	b := &frameNodes{}
	s := &b.s
	s.node = p.open()
	if !p.expect("frame") {
		return nil
	}
	if s.Target = p.name(&b.target); s.Target == nil || !p.expect(":") {
		return nil
	}
	if s.Characteristic = p.word(&b.char); s.Characteristic == nil {
		return nil
	}
	if s.Tolerance = p.tolerance(&b.tol); s.Tolerance == nil {
		return nil
	}
	for p.isWord("composite") {
		if len(s.Composites) == maxRepeat-1 {
			p.fail()
			return nil
		}
		cb := &compositeNodes{}
		c := &cb.c
		c.node = p.open()
		p.take()
		if c.Tolerance = p.tolerance(&cb.tol); c.Tolerance == nil {
			return nil
		}
		p.close(&c.node)
		s.Composites = append(s.Composites, c)
	}
	p.close(&s.node)
	return s
}

type compositeNodes struct {
	c   Composite
	tol toleranceNodes
}

type toleranceNodes struct {
	t     Tolerance
	zone  Word
	value Number
}

// tolerance: Word? Number Modifier* ('datums' DatumRef (',' DatumRef)*)?
func (p *fastParser) tolerance(b *toleranceNodes) *Tolerance {
	t := &b.t
	t.node = p.open()
	if p.isWordTok() {
		t.Zone = p.word(&b.zone)
	}
	if t.Value = p.number(&b.value); t.Value == nil {
		return nil
	}
	if p.isWord("/") {
		u := &PerUnit{node: p.open()}
		p.take()
		switch {
		case p.is(tokArea):
			u.Area = p.take()
		case p.is(tokNumber):
			u.Length = p.number(&Number{})
		default:
			p.fail()
			return nil
		}
		p.close(&u.node)
		t.PerUnit = u
	}
	for p.is(tokModifier) {
		if len(t.Modifiers) == maxRepeat-1 {
			p.fail()
			return nil
		}
		mb := &modifierNodes{}
		m := &mb.m
		m.node = p.open()
		m.Symbol = p.take()
		if p.is(tokNumber) {
			m.Value = p.number(&mb.n)
		}
		p.close(&m.node)
		t.Modifiers = append(t.Modifiers, m)
	}
	if p.isWord("along") {
		p.take()
		if t.Along = p.direction(&Direction{}); t.Along == nil {
			return nil
		}
	}
	if p.isWord("datums") {
		p.take()
		// No more references than commas ahead, plus one.
		refs := make([]DatumRef, p.countAhead(','))
		t.Datums = make([]*DatumRef, 0, len(refs))
		for {
			if len(t.Datums) == maxRepeat {
				p.fail()
				return nil
			}
			if len(refs) == 0 {
				refs = make([]DatumRef, 1)
			}
			r := p.datumRef(&refs[0])
			if r == nil {
				return nil
			}
			refs = refs[1:]
			t.Datums = append(t.Datums, r)
			if !p.isWord(",") {
				break
			}
			p.take()
		}
	}
	for p.isNote() {
		if len(t.Notes) == maxRepeat-1 {
			p.fail()
			return nil
		}
		n := &Note{node: p.open()}
		if p.isWord("between") {
			p.take()
			if n.From = p.name(&Name{}); n.From == nil {
				return nil
			}
			if n.To = p.name(&Name{}); n.To == nil {
				return nil
			}
		} else {
			n.Word = p.take()
		}
		p.close(&n.node)
		t.Notes = append(t.Notes, n)
	}
	p.close(&t.node)
	return t
}

// isNote reports whether the next token starts a Note.
func (p *fastParser) isNote() bool {
	if p.is(lexer.EOF) {
		return false
	}
	switch p.tok.Value {
	case "all-around", "all-over", "separate", "major-dia", "minor-dia", "pitch-dia", "between":
		return true
	}
	return false
}

type modifierNodes struct {
	m Modifier
	n Number
}

// datumRef: @Ident RefModifier*
func (p *fastParser) datumRef(r *DatumRef) *DatumRef {
	if !p.is(tokIdent) {
		p.fail()
		return nil
	}
	r.node = p.open()
	r.Name = p.take()
	for p.is(tokModifier) {
		if len(r.Modifiers) == maxRepeat-1 {
			p.fail()
			return nil
		}
		r.Modifiers = append(r.Modifiers, p.refModifier(&RefModifier{}))
	}
	for p.is(tokDash) || p.is(tokDir) && p.tok.Value[0] == '-' {
		if len(r.More) == maxRepeat-1 {
			p.fail()
			return nil
		}
		m := &RefMember{node: p.open()}
		m.Name = p.take()
		for p.is(tokModifier) {
			if len(m.Modifiers) == maxRepeat-1 {
				p.fail()
				return nil
			}
			m.Modifiers = append(m.Modifiers, p.refModifier(&RefModifier{}))
		}
		p.close(&m.node)
		r.More = append(r.More, m)
	}
	p.close(&r.node)
	return r
}

type basicNodes struct {
	s     BasicStmt
	value Number
	m     measureNodes
}

// measured points at the fields of a basic or reference distance or
// angle that follow its value.
type measured struct {
	deg      *bool
	from, to **Name
	along    **Direction
	about    **Name
}

type measureNodes struct {
	from, to Name
	along    Direction
	about    Name
}

// measure: 'deg'? 'from' Name 'to' Name ('along' Direction)? ('about'
// Name)?, what follows the value of a basic or a reference dimension.
func (p *fastParser) measure(m measured, b *measureNodes) bool {
	if p.isWord("deg") {
		p.take()
		*m.deg = true
	}
	if !p.expect("from") {
		return false
	}
	if *m.from = p.name(&b.from); *m.from == nil || !p.expect("to") {
		return false
	}
	if *m.to = p.name(&b.to); *m.to == nil {
		return false
	}
	if p.isWord("along") {
		p.take()
		if *m.along = p.direction(&b.along); *m.along == nil {
			return false
		}
	}
	if p.isWord("about") {
		p.take()
		if *m.about = p.name(&b.about); *m.about == nil {
			return false
		}
	}
	return true
}

type circleNodes struct {
	c            BoltCircle
	zone         Word
	value        Number
	pattern, axs Name
}

// basic: 'basic' ( BoltCircle | Number 'deg'? 'from' Name 'to' Name
// ('along' Direction)? ('about' Name)? )
func (p *fastParser) basic() *BasicStmt {
	b := &basicNodes{}
	s := &b.s
	s.node = p.open()
	if !p.expect("basic") {
		return nil
	}
	if p.isWordTok() {
		cb := &circleNodes{}
		c := &cb.c
		c.node = p.open()
		c.Zone = p.word(&cb.zone)
		if c.Value = p.number(&cb.value); c.Value == nil || !p.expect("through") {
			return nil
		}
		if c.Pattern = p.name(&cb.pattern); c.Pattern == nil || !p.expect("about") {
			return nil
		}
		if c.About = p.name(&cb.axs); c.About == nil {
			return nil
		}
		p.close(&c.node)
		s.Circle = c
		p.close(&s.node)
		return s
	}
	if s.Value = p.number(&b.value); s.Value == nil {
		return nil
	}
	if !p.measure(measured{&s.Deg, &s.From, &s.To, &s.Along, &s.About}, &b.m) {
		return nil
	}
	p.close(&s.node)
	return s
}

type dimNodes struct {
	s        DimStmt
	size     sizeNodes
	from, to Name
	along    Direction
}

// dim: 'dim' Size 'from' Name 'to' Name ('along' Direction)?
func (p *fastParser) dim() *DimStmt {
	b := &dimNodes{}
	s := &b.s
	s.node = p.open()
	if !p.expect("dim") {
		return nil
	}
	if s.Size = p.size(&b.size); s.Size == nil || !p.expect("from") {
		return nil
	}
	if s.From = p.name(&b.from); s.From == nil || !p.expect("to") {
		return nil
	}
	if s.To = p.name(&b.to); s.To == nil {
		return nil
	}
	if p.isWord("along") {
		p.take()
		if s.Along = p.direction(&b.along); s.Along == nil {
			return nil
		}
	}
	p.close(&s.node)
	return s
}

type basisNodes struct {
	s BasisStmt
	w Word
}

// basis: 'basis' @@
func (p *fastParser) basis() *BasisStmt {
	b := &basisNodes{}
	if b.s.Basis = p.headerWord("basis", &b.s.node, &b.w); b.s.Basis == nil {
		return nil
	}
	return &b.s
}

type targetNodes struct {
	s         TargetStmt
	label, on Name
	shape     Word
	normal    Direction
}

// target: 'target' Name Word TargetArea? 'on' Name ( 'at' Vector |
// 'from' Vector 'to' Vector ) ( 'normal' Direction )?
func (p *fastParser) target() *TargetStmt {
	b := &targetNodes{}
	s := &b.s
	s.node = p.open()
	if !p.expect("target") {
		return nil
	}
	if s.Label = p.name(&b.label); s.Label == nil {
		return nil
	}
	if s.Shape = p.word(&b.shape); s.Shape == nil {
		return nil
	}
	switch {
	case p.isWord("dia") || p.is(tokDia):
		a := &TargetArea{node: p.open()}
		a.Dia = p.take()
		if a.Value = p.number(&Number{}); a.Value == nil {
			return nil
		}
		p.close(&a.node)
		s.Area = a
	case p.is(tokArea):
		a := &TargetArea{node: p.open()}
		a.Rect = p.take()
		p.close(&a.node)
		s.Area = a
	}
	if !p.expect("on") {
		return nil
	}
	if s.On = p.name(&b.on); s.On == nil {
		return nil
	}
	switch {
	case p.isWord("at"):
		p.take()
		if s.At = p.vector(); s.At == nil {
			return nil
		}
	case p.isWord("from"):
		p.take()
		if s.From = p.vector(); s.From == nil || !p.expect("to") {
			return nil
		}
		if s.To = p.vector(); s.To == nil {
			return nil
		}
	default:
		p.fail()
		return nil
	}
	if p.isWord("normal") {
		p.take()
		if s.Normal = p.direction(&b.normal); s.Normal == nil {
			return nil
		}
	}
	p.close(&s.node)
	return s
}

type refNodes struct {
	s     RefStmt
	value Number
	of    Name
	m     measureNodes
}

// ref: 'ref' ( 'size' Number 'of' Name | Number 'deg'? 'from' Name 'to'
// Name ('along' Direction)? ('about' Name)? )
func (p *fastParser) ref() *RefStmt {
	b := &refNodes{}
	s := &b.s
	s.node = p.open()
	if !p.expect("ref") {
		return nil
	}
	if p.isWord("size") {
		p.take()
		if s.Size = p.number(&b.value); s.Size == nil || !p.expect("of") {
			return nil
		}
		if s.Of = p.name(&b.of); s.Of == nil {
			return nil
		}
		p.close(&s.node)
		return s
	}
	if s.Value = p.number(&b.value); s.Value == nil {
		return nil
	}
	if !p.measure(measured{&s.Deg, &s.From, &s.To, &s.Along, &s.About}, &b.m) {
		return nil
	}
	p.close(&s.node)
	return s
}
