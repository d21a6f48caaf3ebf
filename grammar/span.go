package grammar

import (
	"github.com/alecthomas/participle/v2/lexer"

	"github.com/datumlint/datumlint/grammar/source"
)

// Node is anything in the tree that knows where it was written.
type Node interface {
	Span() source.Span
}

// node is embedded in every tree node; participle fills Pos and EndPos.
// Tokens are moved to file positions before parsing, so the lines are
// absolute.
type node struct {
	Pos    lexer.Position
	EndPos lexer.Position
}

// Span returns the node's span in the file.
func (n *node) Span() source.Span {
	if n == nil {
		return source.Span{}
	}
	return source.Span{Start: source.Pos{Line: n.Pos.Line, Col: n.Pos.Column}, End: source.Pos{Line: n.EndPos.Line, Col: n.EndPos.Column}}
}
