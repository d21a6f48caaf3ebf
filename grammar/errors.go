package grammar

import (
	"errors"
	"fmt"
	"strings"

	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"

	"github.com/datumlint/datumlint/grammar/source"
)

// friendly turns a parser error into a message a drafter understands: what
// was expected after the word before the error, with an example.
func friendly(err error, sig []token, eof lexer.Token) *SyntaxError {
	var pe participle.Error
	if !errors.As(err, &pe) {
		return &SyntaxError{Span: sig[0].span, Msg: err.Error()}
	}
	off := pe.Position().Offset
	i := len(sig) // index of the unexpected token; len(sig) means end of statement
	for k, t := range sig {
		if t.Pos.Offset >= off {
			i = k
			break
		}
	}
	var span source.Span
	var got string
	if i < len(sig) {
		span, got = sig[i].span, describe(sig[i].Token)
	} else {
		last := sig[len(sig)-1].span.End
		span, got = source.Span{Start: last, End: source.Pos{Line: last.Line, Col: last.Col + 1}}, "the end of the line"
	}
	want := expectation(sig, i)
	if want == "" {
		want = strings.TrimSpace(cleanExpect(pe.Message()))
	}
	if want == "" {
		return &SyntaxError{Span: span, Msg: fmt.Sprintf("unexpected %s", got)}
	}
	return &SyntaxError{Span: span, Msg: fmt.Sprintf("%s, found %s", want, got)}
}

// cleanExpect keeps the "(expected ...)" part of a participle message.
func cleanExpect(msg string) string {
	if i := strings.Index(msg, "(expected "); i >= 0 {
		e := strings.TrimSuffix(msg[i+len("(expected "):], ")")
		return "expected " + e
	}
	return ""
}

const (
	wantDirection = "expected a direction such as +z or (0, 0, 1) after '%s'"
	wantPoint     = "expected a point such as (0, 0, 0) after 'at'"
	wantSize      = "expected a size such as 12 +-0.05, 12 +0.1 -0 or 11.95..12.05"
	wantKind      = "expected a feature kind (plane, slot, tab, hole, pin, socket, ball, cone, extrusion or surface) after the feature name"
	wantRef       = "expected a datum reference such as A, B(M) or A-B"
)

// expectation says what should stand at sig[i], judged by the statement
// kind and the words before it.
func expectation(sig []token, i int) string {
	if i == 0 || len(sig) == 0 {
		return ""
	}
	kw := sig[0].Value
	prev := sig[i-1].Value
	depth := 0
	for _, t := range sig[:i] {
		switch t.Value {
		case "(":
			depth++
		case ")":
			depth--
		}
	}
	if depth > 0 && kw != "frame" {
		if i < len(sig) && sig[i].Value == ")" {
			return "a point or vector has three coordinates, (x, y, z)"
		}
		if i < len(sig) && sig[i].Value == "," && sig[i-1].Type == tokNumber {
			return "a point or vector has three coordinates, (x, y, z): close it with ')' after the third"
		}
		if sig[i-1].Type == tokNumber {
			return "expected ',' or ')' after the number: points and vectors are written (x, y, z)"
		}
		return "expected a number: points and vectors are written (x, y, z)"
	}
	switch prev {
	case "normal", "axis", "along":
		if kw == "feature" || kw == "basic" || kw == "dim" {
			return fmt.Sprintf(wantDirection, prev)
		}
	case "at":
		return wantPoint
	case "size":
		return wantSize + " after 'size'"
	case "+-", "±", "+/-":
		return "expected the tolerance after '" + prev + "', e.g. +-0.05"
	case "..":
		return "expected the upper limit after '..', e.g. 11.95..12.05"
	case "between":
		return "expected the names of the two plane features that bound the width after 'between'"
	case "datums", ",":
		if kw == "frame" {
			return wantRef
		}
	case "from", "to":
		return fmt.Sprintf("expected a feature name or a pattern member such as bolts.1 after '%s'", prev)
	case "about":
		return "expected the name of the feature whose axis the angle or circle is about, after 'about'"
	case "through":
		return "expected the name of a hole or pin pattern after 'through'"
	case "on":
		if kw == "datum" {
			return "expected the name of the feature that carries the datum after 'on'"
		}
	case "placed":
		return "expected a placement (on-surface, on-extension-line, on-dimension-line or on-frame) after 'placed'"
	case "composite":
		return "expected the lower segment's tolerance value after 'composite', e.g. composite dia 0.1 (M) datums A"
	case "units":
		return "expected mm or in after 'units'"
	case "standard":
		return "expected asme-2018, asme-2009 or iso after 'standard'"
	case "part":
		return `expected the part's name in double quotes after 'part', e.g. part "Bracket BR-7"`
	case "feature":
		return "expected a feature name after 'feature'"
	case "datum":
		return "expected a datum letter such as A after 'datum'"
	case "frame":
		return "expected the name of the controlled feature (or a pattern member such as bolts.2) after 'frame'"
	case ":":
		return "expected a characteristic such as position, flatness or perpendicularity after ':'"
	case "dim":
		return "expected a toleranced value such as 40 +-0.1 after 'dim'"
	case "basic":
		return "expected a basic value such as 40 or 30deg (or dia 80 through PATTERN about DATUM-FEATURE) after 'basic'"
	case "dia", "⌀", "sdia", "S⌀":
		return "expected the tolerance value after '" + prev + "'"
	}
	switch kw {
	case "feature":
		switch {
		case i == 2:
			return wantKind
		case i >= 3:
			return "expected a pattern count such as 4x, 'size' and a size, or the geometry (normal, axis, along, at or between)"
		}
	case "datum":
		if i == 2 {
			return "expected 'on' after the datum letter, e.g. datum A on base"
		}
		if i >= 4 {
			return "expected 'placed' and a placement, or the end of the line"
		}
	case "frame":
		if i == 2 {
			return "expected ':' after the feature name, e.g. frame bore: position dia 0.1 datums A, B, C"
		}
		if i == 3 {
			return "expected a characteristic such as position after ':'"
		}
		if sig[i-1].Type == tokIdent && i >= 4 && sig[i-2].Value == ":" {
			return "expected the tolerance value (after dia or sdia for a cylindrical or spherical zone)"
		}
		return "expected a modifier such as (M), 'datums' and the datum references, a 'composite' line, or the end of the frame"
	case "basic", "dim":
		if prev == "deg" || sig[i-1].Type == tokNumber {
			return "expected 'from' and the first feature, e.g. from left to bore"
		}
		return "expected 'along' and a direction, or the end of the line"
	}
	return ""
}
