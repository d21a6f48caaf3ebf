package grammar

import (
	"strings"
	"unicode/utf8"

	"github.com/alecthomas/participle/v2/lexer"
)

// scanTokens lexes one statement's text exactly as lexerDef does (same
// rules, tried in the same order, first match wins; same token types,
// values and positions; an error at the same position), without running a
// regular expression per token. Profiling showed the regular-expression
// lexer taking more than a third of a whole check; participle's code
// generator for lexers is a separate tool that is not in the module, so the
// rules are hand-coded here and lexerDef stays the reference: a
// conformance test and a fuzz target hold the two to the same output.
func scanTokens(name, text string) ([]lexer.Token, lexer.Token, error) {
	toks := make([]lexer.Token, 0, 8+len(text)/3)
	pos := lexer.Position{Filename: name, Line: 1, Column: 1}
	for i := 0; i < len(text); {
		typ, end := scanOne(text, i)
		if end <= i {
			sample := []rune(text[i:])
			if len(sample) > 16 {
				sample = append(sample[:16], []rune("...")...)
			}
			return nil, lexer.Token{}, &lexer.Error{Msg: "lexer: invalid input text \"" + string(sample) + "\"", Pos: pos}
		}
		span := text[i:end]
		toks = append(toks, lexer.Token{Type: typ, Value: span, Pos: pos})
		advance(&pos, span)
		i = end
	}
	return toks, lexer.EOFToken(pos), nil
}

// advance moves a position past span, as lexer.Position.Advance does,
// without counting twice for the common single-line ASCII token.
func advance(p *lexer.Position, span string) {
	p.Offset += len(span)
	nl := strings.LastIndexByte(span, '\n')
	if nl < 0 {
		p.Column += runeCount(span)
		return
	}
	p.Line += strings.Count(span, "\n")
	p.Column = runeCount(span[nl:])
}

func runeCount(s string) int {
	for i := 0; i < len(s); i++ {
		if s[i] >= utf8.RuneSelf {
			return utf8.RuneCountInString(s)
		}
	}
	return len(s)
}

var (
	tokString     = lexerDef.Symbols()["String"]
	tokModifier   = lexerDef.Symbols()["Modifier"]
	tokPlusMinus  = lexerDef.Symbols()["PlusMinus"]
	tokDir        = lexerDef.Symbols()["Dir"]
	tokArea       = lexerDef.Symbols()["Area"]
	tokDash       = lexerDef.Symbols()["Dash"]
	tokMember     = lexerDef.Symbols()["Member"]
	tokSDia       = lexerDef.Symbols()["SDia"]
	tokDia        = lexerDef.Symbols()["Dia"]
	tokSymbol     = lexerDef.Symbols()["Symbol"]
	tokRange      = lexerDef.Symbols()["Range"]
	tokPunct      = lexerDef.Symbols()["Punct"]
	scanRuleOrder = []func(s string, i int) int{
		scanString, scanModifier, scanPlusMinus, scanDir, scanDash, scanArea, scanNumber, scanMember,
		scanSDia, scanIdent, scanDia, scanSymbol, scanRange, scanPunct, scanWhitespace,
	}
	scanRuleTypes = []lexer.TokenType{
		tokString, tokModifier, tokPlusMinus, tokDir, tokDash, tokArea, tokNumber, tokMember,
		tokSDia, tokIdent, tokDia, tokSymbol, tokRange, tokPunct, tokWhitespace,
	}
)

// scanOne returns the type and end of the token at s[i:], trying the rules
// in lexerDef's order; end <= i means no rule matches.
func scanOne(s string, i int) (lexer.TokenType, int) {
	for k, rule := range scanRuleOrder {
		if end := rule(s, i); end > i {
			return scanRuleTypes[k], end
		}
	}
	return 0, -1
}

func isDigit(c byte) bool     { return c >= '0' && c <= '9' }
func isNameStart(c byte) bool { return c == '_' || c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' }

// isWordByte is \w of Go's regular expressions: ASCII letters, digits, _.
func isWordByte(c byte) bool { return c != '-' && isNameByte(c) }

// isRESpace is \s of Go's regular expressions.
func isRESpace(c byte) bool { return c == ' ' || c == '\t' || c == '\n' || c == '\f' || c == '\r' }

func digits(s string, i int) int {
	for i < len(s) && isDigit(s[i]) {
		i++
	}
	return i
}

func nameEnd(s string, i int) int {
	for i < len(s) && isNameByte(s[i]) {
		i++
	}
	return i
}

// runeIn returns the end of the rune at s[i] when it is one of set.
func runeIn(s string, i int, set string) int {
	if i >= len(s) || s[i] < utf8.RuneSelf {
		return -1
	}
	r, w := utf8.DecodeRuneInString(s[i:])
	if r != utf8.RuneError && strings.ContainsRune(set, r) {
		return i + w
	}
	return -1
}

// `"(?:\\.|[^"\\])*"`
func scanString(s string, i int) int {
	if s[i] != '"' {
		return -1
	}
	for j := i + 1; j < len(s); {
		switch s[j] {
		case '"':
			return j + 1
		case '\\':
			// `\\.`: the escaped character is any but a newline.
			if j+1 >= len(s) || s[j+1] == '\n' {
				return -1
			}
			_, w := utf8.DecodeRuneInString(s[j+1:])
			j += 1 + w
		default:
			_, w := utf8.DecodeRuneInString(s[j:])
			j += w
		}
	}
	return -1
}

// `\(\s*[A-Za-z]\s*\)|[ⓂⓁⒺⒻⓉⓅⓊⓈ]`
func scanModifier(s string, i int) int {
	if s[i] != '(' {
		return runeIn(s, i, "ⓂⓁⒺⒻⓉⓅⓊⓈ")
	}
	j := i + 1
	for j < len(s) && isRESpace(s[j]) {
		j++
	}
	if j >= len(s) || !(s[j] >= 'a' && s[j] <= 'z' || s[j] >= 'A' && s[j] <= 'Z') {
		return -1
	}
	j++
	for j < len(s) && isRESpace(s[j]) {
		j++
	}
	if j < len(s) && s[j] == ')' {
		return j + 1
	}
	return -1
}

// `\+-|±|\+/-`
func scanPlusMinus(s string, i int) int {
	switch {
	case strings.HasPrefix(s[i:], "+-"):
		return i + 2
	case strings.HasPrefix(s[i:], "±"):
		return i + len("±")
	case strings.HasPrefix(s[i:], "+/-"):
		return i + 3
	}
	return -1
}

// `[+-][xyzXYZ]\b`
func scanDir(s string, i int) int {
	if s[i] != '+' && s[i] != '-' || i+1 >= len(s) || !strings.ContainsRune("xyzXYZ", rune(s[i+1])) {
		return -1
	}
	if i+2 < len(s) && isWordByte(s[i+2]) {
		return -1
	}
	return i + 2
}

// `-[A-Za-z_][A-Za-z0-9_-]*`
func scanDash(s string, i int) int {
	if s[i] != '-' || i+1 >= len(s) || !isNameStart(s[i+1]) {
		return -1
	}
	return nameEnd(s, i+2)
}

// unsignedLength is `(?:\d+\.\d+|\.\d+|\d+)` at s[i:]: its end, or -1.
func unsignedLength(s string, i int) int {
	switch {
	case i < len(s) && isDigit(s[i]):
		j := digits(s, i)
		if j+1 < len(s) && s[j] == '.' && isDigit(s[j+1]) {
			j = digits(s, j+1)
		}
		return j
	case i+1 < len(s) && s[i] == '.' && isDigit(s[i+1]):
		return digits(s, i+1)
	}
	return -1
}

// `(?:\d+\.\d+|\.\d+|\d+)[xX](?:\d+\.\d+|\.\d+|\d+)`
func scanArea(s string, i int) int {
	j := unsignedLength(s, i)
	if j < 0 || j >= len(s) || s[j] != 'x' && s[j] != 'X' {
		return -1
	}
	return unsignedLength(s, j+1)
}

// `[+-]?(?:\d+\.\d+|\.\d+|\d+)(?:[eE][+-]?\d+)?`
func scanNumber(s string, i int) int {
	j := i
	if s[j] == '+' || s[j] == '-' {
		j++
	}
	if j = unsignedLength(s, j); j < 0 {
		return -1
	}
	if j < len(s) && (s[j] == 'e' || s[j] == 'E') {
		k := j + 1
		if k < len(s) && (s[k] == '+' || s[k] == '-') {
			k++
		}
		if k < len(s) && isDigit(s[k]) {
			j = digits(s, k)
		}
	}
	return j
}

// `[A-Za-z_][A-Za-z0-9_-]*\.\d+`
func scanMember(s string, i int) int {
	if !isNameStart(s[i]) {
		return -1
	}
	j := nameEnd(s, i+1)
	if j+1 < len(s) && s[j] == '.' && isDigit(s[j+1]) {
		return digits(s, j+1)
	}
	return -1
}

// `S[⌀Øø]`
func scanSDia(s string, i int) int {
	if s[i] != 'S' {
		return -1
	}
	return runeIn(s, i+1, "⌀Øø")
}

// `[A-Za-z_][A-Za-z0-9_-]*`
func scanIdent(s string, i int) int {
	if !isNameStart(s[i]) {
		return -1
	}
	return nameEnd(s, i+1)
}

// `[⌀Øø]`
func scanDia(s string, i int) int { return runeIn(s, i, "⌀Øø") }

// the characteristic symbols
func scanSymbol(s string, i int) int {
	return runeIn(s, i, "⏤⏥○⌭⌒⌓∠⟂⊥∥⌖◎⌯↗⌰")
}

// `\.\.`
func scanRange(s string, i int) int {
	if strings.HasPrefix(s[i:], "..") {
		return i + 2
	}
	return -1
}

// `[(),:/]`
func scanPunct(s string, i int) int {
	switch s[i] {
	case '(', ')', ',', ':', '/':
		return i + 1
	}
	return -1
}

// `[ \t\r\n\f\v]+`
func scanWhitespace(s string, i int) int {
	j := i
	for j < len(s) && (isRESpace(s[j]) || s[j] == '\v') {
		j++
	}
	return j
}
