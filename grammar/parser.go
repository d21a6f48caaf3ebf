package grammar

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"sync"
	"unicode/utf8"

	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"

	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/grammar/spell"
)

// build returns a parser for one statement kind, built on first use: the
// fast path (fastparse.go) handles every well-formed statement, so a run
// over clean files never needs participle, and a one-file check in a
// pre-commit hook should not pay for building it.
func build[T any]() func() *participle.Parser[T] {
	return sync.OnceValue(func() *participle.Parser[T] {
		return participle.MustBuild[T](
			participle.Lexer(lexerDef),
			participle.Elide("Whitespace"),
			participle.UseLookahead(2),
		)
	})
}

// One parser per statement kind: the first word chooses, which keeps
// error messages about the statement the drafter meant to write.
var (
	partParser     = build[PartStmt]()
	unitsParser    = build[UnitsStmt]()
	standardParser = build[StandardStmt]()
	featureParser  = build[FeatureStmt]()
	datumParser    = build[DatumStmt]()
	frameParser    = build[FrameStmt]()
	basicParser    = build[BasicStmt]()
	dimParser      = build[DimStmt]()
	basisParser    = build[BasisStmt]()
	targetParser   = build[TargetStmt]()
	refParser      = build[RefStmt]()
)

// MaxStmtBytes is the longest statement that the error path (participle)
// reads; a well-formed statement of any length takes the fast path.
const MaxStmtBytes = 256 << 10

// Keywords lists the words a statement may start with.
var Keywords = []string{"part", "units", "standard", "basis", "feature", "target", "datum", "frame", "basic", "dim", "ref"}

// Parse reads a whole .callouts file. It never fails: every statement that
// does not parse becomes a BadStmt with a SyntaxError, and the rest of the
// file is still read, so one typo does not hide the findings of the others.
func Parse(name string, src []byte) *File {
	f := &File{Name: name, Src: src}
	body := bytes.TrimPrefix(src, []byte("\xef\xbb\xbf")) // a byte-order mark is not content
	if looksBinary(body) {
		f.Binary = true
		f.Errors = append(f.Errors, &SyntaxError{
			Span: source.Span{Start: source.Pos{Line: 1, Col: 1}, End: source.Pos{Line: 1, Col: 2}},
			Msg:  "this file holds binary data (a NUL byte), not callout text; check that the right file was named",
		})
		return f
	}
	lines := splitLines(body)
	for _, ln := range lines {
		if ln.comment != "" {
			f.Comments = append(f.Comments, &Comment{
				Span:     source.Span{Start: source.Pos{Line: ln.num, Col: ln.cmtCol}, End: source.Pos{Line: ln.num, Col: ln.cmtCol + utf8.RuneCountInString(ln.comment)}},
				Text:     ln.comment,
				Trailing: strings.TrimSpace(ln.code) != "",
			})
		}
	}
	raws := splitStatements(lines)
	f.Stmts = make([]Stmt, 0, len(raws))
	f.Extents = make([]Extent, 0, len(raws))
	for _, rs := range raws {
		st := parseStmt(name, rs)
		f.Stmts = append(f.Stmts, st)
		f.Extents = append(f.Extents, Extent{rs.first, rs.last})
		if b, ok := st.(*BadStmt); ok {
			f.Errors = append(f.Errors, b.Err)
		} else {
			f.Errors = append(f.Errors, checkStmt(st)...)
		}
	}
	return f
}

func looksBinary(b []byte) bool {
	n := len(b)
	if n > 8000 {
		n = 8000
	}
	return bytes.IndexByte(b[:n], 0) >= 0
}

// token is a significant token with its absolute span.
type token struct {
	lexer.Token
	span source.Span
}

// lexStmt lexes one statement and moves its tokens to file positions.
func lexStmt(name string, rs rawStmt) (all []lexer.Token, sig []token, eof lexer.Token, err *SyntaxError) {
	if bad := badText(rs); bad != nil {
		return nil, nil, eof, bad
	}
	// scanTokens applies lexerDef's rules, hand-coded (scan.go); its slice
	// is moved to file positions in place rather than copied.
	all, eof, e := scanTokens(name, rs.text)
	if e != nil {
		var pe interface{ Position() lexer.Position }
		pos, at := source.Pos{Line: rs.first, Col: 1}, 0
		if errors.As(e, &pe) {
			p := pe.Position()
			pos, at = source.Pos{Line: rs.first + p.Line - 1, Col: p.Column}, p.Offset
		}
		rest := rs.text[min(len(rs.text), max(0, at)):]
		r, _ := utf8.DecodeRuneInString(rest)
		return nil, nil, eof, &SyntaxError{
			Span: source.Span{Start: pos, End: source.Pos{Line: pos.Line, Col: pos.Col + 1}},
			Msg:  unexpectedChar(r, rest),
		}
	}
	sig = make([]token, 0, len(all)/2+1)
	toFile := func(t *lexer.Token) {
		t.Pos.Line += rs.first - 1
		t.Pos.Offset += rs.offset
		t.Pos.Filename = name
	}
	toFile(&eof)
	for i := range all {
		t := &all[i]
		toFile(t)
		if t.Type != tokWhitespace {
			end := t.Pos
			end.Advance(t.Value)
			sig = append(sig, token{*t, source.Span{Start: source.Pos{Line: t.Pos.Line, Col: t.Pos.Column}, End: source.Pos{Line: end.Line, Col: end.Column}}})
		}
	}
	return all, sig, eof, nil
}

// badText finds bytes that are not text: invalid UTF-8 and control
// characters, which would otherwise surface as puzzling lexer errors.
func badText(rs rawStmt) *SyntaxError {
	line, col := rs.first, 1
	for i := 0; i < len(rs.text); {
		if c := rs.text[i]; c >= 0x20 && c < utf8.RuneSelf {
			i++ // printable ASCII, the whole of most files
			col++
			continue
		}
		r, w := utf8.DecodeRuneInString(rs.text[i:])
		switch {
		case r == '\n':
			line, col = line+1, 1
			i += w
			continue
		case r == utf8.RuneError && w == 1:
			return &SyntaxError{Span: source.Span{Start: source.Pos{Line: line, Col: col}, End: source.Pos{Line: line, Col: col + 1}},
				Msg: fmt.Sprintf("invalid UTF-8 byte 0x%02x: save the file as UTF-8 (ASCII is always enough)", rs.text[i])}
		case r < 0x20 && r != '\t' && r != '\r' && r != '\f' && r != '\v':
			return &SyntaxError{Span: source.Span{Start: source.Pos{Line: line, Col: col}, End: source.Pos{Line: line, Col: col + 1}},
				Msg: fmt.Sprintf("control character U+%04X in the text: remove it", r)}
		}
		i += w
		col++
	}
	return nil
}

func parseStmt(name string, rs rawStmt) Stmt {
	// Well-formed statements take the hand-written parser (fastparse.go);
	// anything it does not handle, errors included, goes to participle.
	if st := fastParse(name, rs); st != nil {
		return st
	}
	if len(rs.text) > MaxStmtBytes {
		// The fallback parser's memory grows with the statement; no real
		// statement comes near this, so say so instead of trying.
		return bad(rs, nil, &SyntaxError{Span: source.Span{Start: source.Pos{Line: rs.first, Col: 1}, End: source.Pos{Line: rs.first, Col: 2}},
			Msg: fmt.Sprintf("this statement is %d bytes long and does not parse; statements over %d bytes are not read further: check the line for text that does not belong to it", len(rs.text), MaxStmtBytes)})
	}
	all, sig, eof, lerr := lexStmt(name, rs)
	if lerr != nil {
		return bad(rs, sig, lerr)
	}
	if len(sig) == 0 { // cannot happen: blank lines are not statements
		return bad(rs, sig, &SyntaxError{Span: source.Span{Start: source.Pos{Line: rs.first, Col: 1}, End: source.Pos{Line: rs.first, Col: 1}}, Msg: "empty statement"})
	}
	first := sig[0]
	var (
		st  Stmt
		err error
	)
	pl := func() *lexer.PeekingLexer {
		p, _ := lexer.Upgrade(&sliceLexer{toks: all, eof: eof}, tokWhitespace)
		return p
	}
	switch first.Value {
	case "part":
		st, err = run(partParser(), pl())
	case "units":
		st, err = run(unitsParser(), pl())
	case "standard":
		st, err = run(standardParser(), pl())
	case "feature":
		st, err = run(featureParser(), pl())
	case "datum":
		st, err = run(datumParser(), pl())
	case "frame":
		st, err = run(frameParser(), pl())
	case "basic":
		st, err = run(basicParser(), pl())
	case "dim":
		st, err = run(dimParser(), pl())
	case "basis":
		st, err = run(basisParser(), pl())
	case "target":
		st, err = run(targetParser(), pl())
	case "ref":
		st, err = run(refParser(), pl())
	case "composite":
		return bad(rs, sig, &SyntaxError{Span: first.span,
			Msg: "a 'composite' line is the lower segment of a frame: put it directly under the 'frame' line it belongs to"})
	default:
		msg := fmt.Sprintf("unknown statement %s: a statement starts with %s", describe(first.Token), strings.Join(Keywords, ", "))
		meant := spell.Nearest(first.Value, Keywords)
		if meant != "" {
			msg = fmt.Sprintf("unknown statement %s; did you mean '%s'?", describe(first.Token), meant)
		}
		b := bad(rs, sig, &SyntaxError{Span: first.span, Msg: msg})
		b.Meant = meant
		return b
	}
	if err != nil {
		return bad(rs, sig, friendly(err, sig, eof))
	}
	if e := outOfRange(sig); e != nil {
		return bad(rs, sig, e)
	}
	return st
}

// outOfRange reports the first number of a statement that is no finite
// float64 (1e999): such a statement does not parse, so that nothing is read
// from it as a zero (a zero tolerance, a dimension of 0) and found wrong a
// second time, and the names in it are kept as for any statement that does
// not parse.
func outOfRange(sig []token) *SyntaxError {
	for _, t := range sig {
		if t.Type == tokNumber && !finiteLiteral(t.Value) {
			return &SyntaxError{Span: t.span, Msg: fmt.Sprintf("the number %s is out of range", t.Value)}
		}
	}
	return nil
}

// finiteLiteral reports whether a number literal is a finite float64. Only a
// literal with an exponent or of more than 300 digits can fail, so most
// are passed without parsing.
func finiteLiteral(text string) bool {
	if len(text) <= 300 && strings.IndexAny(text, "eE") < 0 {
		return true
	}
	v, err := strconv.ParseFloat(text, 64)
	return err == nil && !math.IsInf(v, 0) && !math.IsNaN(v)
}

func run[T any](p *participle.Parser[T], pl *lexer.PeekingLexer) (Stmt, error) {
	v, err := p.ParseFromLexer(pl)
	if err != nil {
		return nil, err
	}
	if s, ok := any(v).(Stmt); ok {
		return s, nil
	}
	return nil, fmt.Errorf("internal: %T is not a statement", v)
}

func bad(rs rawStmt, sig []token, err *SyntaxError) *BadStmt {
	b := &BadStmt{Text: rs.text, Err: err}
	b.Pos = lexer.Position{Line: rs.first, Column: 1}
	b.EndPos = lexer.Position{Line: rs.last, Column: 1 + utf8.RuneCountInString(lastLine(rs.text))}
	if len(sig) > 0 {
		b.Word = sig[0].Value
		if len(sig) > 1 && (sig[1].Type == tokIdent) {
			b.Name = sig[1].Value
		}
		for _, t := range sig[1:] {
			if t.Type == tokIdent {
				b.Words = append(b.Words, t.Value)
			}
		}
	}
	return b
}

func lastLine(s string) string {
	if i := strings.LastIndexByte(s, '\n'); i >= 0 {
		return s[i+1:]
	}
	return s
}

// describe names a token for a message.
func describe(t lexer.Token) string {
	if t.EOF() {
		return "the end of the statement"
	}
	return "'" + t.Value + "'"
}

// unexpectedChar says what a character that starts no token probably meant.
func unexpectedChar(r rune, rest string) string {
	word := rest
	if i := strings.IndexAny(word, " \t\n,)"); i >= 0 {
		word = word[:i]
	}
	switch {
	case r == '"':
		return "a string is not closed: end the part's name with a double quote"
	case r == '°':
		return "write angles with deg, e.g. 30deg, not with the degree sign"
	case (r == '+' || r == '-') && len(word) > 1 && word[1] >= 'a' && word[1] <= 'z':
		return fmt.Sprintf("unknown direction '%s': use +x, -x, +y, -y, +z, -z or a vector such as (0, 0, 1)", word)
	case r == '-':
		return "a lone '-' has no meaning: write a common datum without spaces, e.g. A-B, and a negative number as -3.5"
	}
	return fmt.Sprintf("unexpected character %q: it has no meaning in the callout notation", r)
}
