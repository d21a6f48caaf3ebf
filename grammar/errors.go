package grammar

import (
	"errors"
	"fmt"
	"regexp"
	"strings"

	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"

	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/grammar/spell"
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
	if sp, msg := slip(sig, i); msg != "" {
		return &SyntaxError{Span: sp, Msg: msg}
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

// slip recognises the commonest slips at sig[i], where the parser stopped,
// and says what to write instead, with the drafter's own values; "" when
// the statement holds none of them. Each message is a promise: writing
// what it says parses (grammar tests hold every one to it).
func slip(sig []token, i int) (source.Span, string) {
	if i == 0 || i > len(sig) {
		return source.Span{}, ""
	}
	kw := sig[0].Value
	at := func(k int) string {
		if k >= 0 && k < len(sig) {
			return sig[k].Value
		}
		return ""
	}
	isNum := func(k int) bool { return k >= 0 && k < len(sig) && sig[k].Type == tokNumber }
	join := func(a, b int) source.Span { return source.Span{Start: sig[a].span.Start, End: sig[b].span.End} }
	depth := parenDepth(sig[:i])

	// A decimal comma, 0,1: written as one number, outside a point.
	if at(i) == "," && depth == 0 && isNum(i-1) && isNum(i+1) && isDigits(at(i+1)) &&
		sig[i-1].span.End == sig[i].span.Start && sig[i].span.End == sig[i+1].span.Start {
		n := at(i-1) + "." + at(i+1)
		return join(i-1, i+1), fmt.Sprintf("write decimals with a point: %s, not %s,%s (a comma separates coordinates and datum references)", n, at(i-1), at(i+1))
	}

	// One deviation where a size takes two: size 6 +0.012, dim 5 +0.1.
	// The parser stops at the upper deviation or just after it (after a
	// '/' too), depending on what follows.
	for _, up := range []int{i, i - 1, i - 2} {
		after := up + 1
		if at(after) == "/" {
			after++
		}
		if kw != "feature" && kw != "dim" || after < i || !isNum(up) || !isNum(up-1) || isNum(after) ||
			!strings.ContainsAny(at(up)[:1], "+-") || !(kw == "dim" && up-1 == 1 || kw == "feature" && at(up-2) == "size") {
			continue
		}
		nominal, dev := at(up-1), at(up)
		both := nominal + " " + dev + " -0"
		if dev[0] == '-' {
			both = nominal + " +0 " + dev
		}
		return join(up-1, up), fmt.Sprintf("the lower deviation is missing: a size with deviations takes both, upper then lower, e.g. %s (or %s +-%s for equal ones)", both, nominal, strings.TrimLeft(dev, "+-"))
	}

	if kw != "frame" || i == len(sig) {
		return source.Span{}, ""
	}
	// (P15) or (P 15): the projected height (or the unequal profile's
	// offset) is written after the parenthesis.
	if at(i) == "(" && i+2 < len(sig) {
		if m := glued.FindStringSubmatch(at(i + 1)); m != nil && at(i+2) == ")" {
			return join(i, i+2), fmt.Sprintf("write the modifier and its value apart: (%s) %s", strings.ToUpper(m[1]), m[2])
		}
		if l := strings.ToUpper(at(i + 1)); (l == "P" || l == "U") && isNum(i+2) && at(i+3) == ")" {
			return join(i, i+3), fmt.Sprintf("write the modifier and its value apart: (%s) %s", l, at(i+2))
		}
	}
	// The word before the references: datum A, B for datums A, B.
	if sig[i].Type == tokIdent {
		if w := at(i); w != "datums" && spell.Nearest(w, []string{"datums"}) != "" {
			refs := refList(sig, i+1)
			return sig[i].span, fmt.Sprintf("did you mean 'datums'? a frame's references follow 'datums', even a single one: datums %s", refs)
		}
	}
	// A lower-case word after the references is no datum letter but a
	// note misspelt: datums A, B all-round.
	if sig[i].Type == tokIdent && strings.ToLower(at(i)) == at(i) && len(at(i)) > 2 && opened(sig[:i], "datums", "composite") {
		if n := spell.Nearest(at(i), noteWords); n != "" {
			return sig[i].span, fmt.Sprintf("unknown note '%s'; did you mean '%s'?", at(i), n)
		}
		return sig[i].span, fmt.Sprintf("unknown note '%s' after the datum references: a frame's line ends with all-around, all-over, between P Q, separate, major-dia, minor-dia or pitch-dia", at(i))
	}
	// References without commas: datums A B C.
	if sig[i].Type == tokIdent && at(i) != "composite" {
		k := i - 1
		for k > 0 && (sig[k].Type == tokIdent || sig[k].Value == "," || isRefModifier(sig[k])) && at(k) != "datums" {
			k--
		}
		if at(k) == "datums" && k < i-1 {
			return sig[i].span, fmt.Sprintf("separate the datum references with commas: datums %s", refList(sig, k+1))
		}
	}
	return source.Span{}, ""
}

// noteWords are the notes a frame may end with.
var noteWords = []string{"all-around", "all-over", "between", "separate", "major-dia", "minor-dia", "pitch-dia"}

// glued is a value-taking modifier written with its value inside the
// parentheses: (P15), (U0.2), (p 15) lexes apart.
var glued = regexp.MustCompile(`^([PpUu])(\d+(?:\.\d+)?)$`)

// parenDepth is how many parentheses the tokens leave open.
func parenDepth(toks []token) int {
	depth := 0
	for _, t := range toks {
		switch t.Value {
		case "(":
			depth++
		case ")":
			depth--
		}
	}
	return depth
}

func isDigits(s string) bool {
	if s == "" {
		return false
	}
	for _, r := range s {
		if r < '0' || r > '9' {
			return false
		}
	}
	return true
}

func isRefModifier(t token) bool { return t.Type == tokModifier }

// refList writes the datum references from sig[k] on as the notation
// wants them, "A, B(M), C": names with their modifiers, commas between,
// up to a composite line or the end.
func refList(sig []token, k int) string {
	var refs []string
	for ; k < len(sig) && sig[k].Value != "composite"; k++ {
		switch {
		case sig[k].Type == tokIdent:
			refs = append(refs, sig[k].Value)
		case isRefModifier(sig[k]) && len(refs) > 0:
			refs[len(refs)-1] += "(" + ModifierLetter(sig[k].Value) + ")"
		case sig[k].Value == ",":
		default:
			return strings.Join(refs, ", ")
		}
	}
	return strings.Join(refs, ", ")
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
	depth := parenDepth(sig[:i])
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
