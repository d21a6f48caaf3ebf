package grammar

import (
	"github.com/alecthomas/participle/v2/lexer"
)

// The notation's tokens. Order matters: the simple lexer tries the rules in
// turn and takes the first that matches, so the more specific forms come
// first ("+-" before a signed number, "+x" before a number, "25x25"
// before a number, "bolts.2" before a plain name, ".." before ".5").
var lexerDef = lexer.MustSimple([]lexer.SimpleRule{
	{Name: "String", Pattern: `"(?:\\.|[^"\\])*"`},
	// (M), (L), (E), (F), (T), (P), (U), (S) and their circled forms.
	{Name: "Modifier", Pattern: `\(\s*[A-Za-z]\s*\)|[ⓂⓁⒺⒻⓉⓅⓊⓈ]`},
	{Name: "PlusMinus", Pattern: `\+-|±|\+/-`},
	{Name: "Dir", Pattern: `[+-][xyzXYZ]\b`},
	// A further member of a common datum after a modifier: the -J of
	// H(M)-J(M). After Dir, so that -x stays a direction.
	{Name: "Dash", Pattern: `-[A-Za-z_][A-Za-z0-9_-]*`},
	// Two lengths joined by x, an area: 25x25 (a tolerance per unit area,
	// a rectangular datum target). Before Number, which would take the
	// first length alone.
	{Name: "Area", Pattern: `(?:\d+\.\d+|\.\d+|\d+)[xX](?:\d+\.\d+|\.\d+|\d+)`},
	{Name: "Number", Pattern: `[+-]?(?:\d+\.\d+|\.\d+|\d+)(?:[eE][+-]?\d+)?`},
	{Name: "Member", Pattern: `[A-Za-z_][A-Za-z0-9_-]*\.\d+`},
	{Name: "SDia", Pattern: `S[⌀Øø]`},
	{Name: "Ident", Pattern: `[A-Za-z_][A-Za-z0-9_-]*`},
	{Name: "Dia", Pattern: `[⌀Øø]`},
	// The characteristic symbols of ASME Y14.5 and ISO 1101 (Unicode
	// Miscellaneous Technical block and neighbours).
	{Name: "Symbol", Pattern: `[⏤⏥○⌭⌒⌓∠⟂⊥∥⌖◎⌯↗⌰]`},
	{Name: "Range", Pattern: `\.\.`},
	{Name: "Punct", Pattern: `[(),:/]`},
	{Name: "Whitespace", Pattern: `[ \t\r\n\f\v]+`},
})

var (
	tokWhitespace = lexerDef.Symbols()["Whitespace"]
	tokIdent      = lexerDef.Symbols()["Ident"]
	tokNumber     = lexerDef.Symbols()["Number"]
)

// sliceLexer replays tokens that were lexed (and re-positioned) earlier, so
// that the parser sees absolute file positions.
type sliceLexer struct {
	toks []lexer.Token
	i    int
	eof  lexer.Token
}

func (s *sliceLexer) Next() (lexer.Token, error) {
	if s.i >= len(s.toks) {
		return s.eof, nil
	}
	t := s.toks[s.i]
	s.i++
	return t, nil
}
