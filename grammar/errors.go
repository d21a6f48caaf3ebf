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
	if i < len(sig) && sig[i].Type == tokDash {
		if msg := dashMessage(sig, i); msg != "" {
			return &SyntaxError{Span: span, Msg: msg}
		}
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

// opened reports whether the word open stands among toks and close does
// not after it.
func opened(toks []token, open, close string) bool {
	for k := len(toks) - 1; k >= 0; k-- {
		switch toks[k].Value {
		case close:
			return false
		case open:
			return true
		}
	}
	return false
}

// dashMessage explains a word that starts with a dash where none belongs:
// a direction misspelt, or a common datum's member joined in the wrong
// place.
func dashMessage(sig []token, i int) string {
	t := sig[i]
	if i > 0 {
		switch sig[i-1].Value {
		case "normal", "axis", "along":
			return fmt.Sprintf("unknown direction '%s': use +x, -x, +y, -y, +z, -z or a vector such as (0, 0, 1)", t.Value)
		}
	}
	return fmt.Sprintf("unexpected '%s': a dash joins a further letter to a common datum after a modifier, as in A(M)-B(M); a common datum without modifiers is written A-B", t.Value)
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
	wantKind      = "expected a feature kind (plane, slot, tab, hole, pin, socket, ball, cone, extrusion, surface, point, line or circle) after the feature name"
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
		if kw == "feature" || kw == "basic" || kw == "dim" || kw == "ref" || kw == "frame" || kw == "target" {
			return fmt.Sprintf(wantDirection, prev)
		}
	case "/":
		if kw == "frame" {
			return "expected the unit length or area after '/', e.g. 0.01/25 (per 25 of length) or 0.005/25x25 (per 25 by 25 of area)"
		}
	case "thread":
		return `expected the thread's designation in double quotes after 'thread', e.g. thread "M8x1.25-6H"`
	case "cbore":
		return "expected the counterbore's diameter after 'cbore', e.g. cbore 11 depth 6.5"
	case "depth":
		return "expected the counterbore's depth after 'depth', e.g. depth 6.5"
	case "csink":
		return "expected the countersink's diameter after 'csink', e.g. csink 12 angle 90deg"
	case "angle":
		return "expected the countersink's included angle after 'angle', e.g. angle 90deg"
	case "basis":
		return "expected model or drawing after 'basis'"
	case "target":
		if kw == "target" {
			return "expected the target's name after 'target': its datum's letter and a number, e.g. A1"
		}
	case "ref":
		return "expected a reference value such as 40 or 30deg, or 'size' and a size, after 'ref'"
	case "of":
		if kw == "ref" {
			return "expected the name of the feature whose size is given, after 'of'"
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
		if kw == "frame" {
			return "expected the names of the two points the profile runs between after 'between', e.g. between P Q"
		}
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
		if kw == "target" {
			return "expected the name of the feature the target lies on after 'on'"
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
		case opened(sig[:i], "cbore", "depth"):
			return "expected 'depth' and the counterbore's depth after its diameter, e.g. cbore 11 depth 6.5"
		case opened(sig[:i], "csink", "angle"):
			return "expected 'angle' and the countersink's included angle after its diameter, e.g. csink 12 angle 90deg"
		case i >= 3:
			return "expected a pattern count such as 4x, 'size' and a size, 'thread', 'cbore', 'csink', or the geometry (normal, axis, along, at or between)"
		}
	case "target":
		switch {
		case i == 2:
			return "expected the target's shape after its name: point, line, or area and its size"
		case prev == "area":
			return "expected the area's size after 'area': dia 8 (circular) or 10x20 (rectangular), then 'on' and the feature"
		case sig[i-2].Value == "on":
			return "expected 'at' and the target's point, or 'from' and 'to' and a line target's ends, after the feature"
		case opened(sig[:i], "from", "to"):
			return "expected 'to' and the other end of the line target, e.g. from (0, 0, 0) to (50, 0, 0)"
		case prev == ")" || sig[i-1].Type == tokDir:
			return "expected 'normal' and a direction, or the end of the line"
		}
		return "expected 'on' and the feature the target lies on"
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
		if sig[i-2].Value == "between" {
			return "expected the names of the two points the profile runs between, e.g. between P Q"
		}
		return "expected a modifier such as (M), 'along' and a zone direction, 'datums' and the datum references, a note (all-around, all-over, between P Q, separate, major-dia, minor-dia), a 'composite' line, or the end of the frame"
	case "basic", "dim", "ref":
		if kw == "ref" && len(sig) > 1 && sig[1].Value == "size" {
			return "expected 'of' and the feature whose size is given, e.g. ref size 12 of bore"
		}
		if prev == "deg" || sig[i-1].Type == tokNumber {
			return "expected 'from' and the first feature, e.g. from left to bore"
		}
		return "expected 'along' and a direction, or the end of the line"
	}
	return ""
}
