package grammar

import "github.com/alecthomas/participle/v2/lexer"

// The grammar's own tables, for the tests of package grammar_test (which
// may import grammar/model as well): notation_doc_test.go holds
// docs/notation.md to them.
var (
	LexerRules            = func() []lexer.Rule { return lexerDef.Rules()["Root"] }
	CharacteristicSymbols = characteristicSymbols
	FrameModifiers        = knownModifiers
)
