package grammar

import (
	"fmt"

	"github.com/alecthomas/participle/v2/lexer"
)

// Pos is a position in a source file: 1-based line and 1-based column,
// where columns count characters (runes), not bytes, as the notation's
// contract requires.
type Pos struct {
	Line, Col int
}

func (p Pos) String() string { return fmt.Sprintf("%d:%d", p.Line, p.Col) }

// Before reports whether p comes strictly before q.
func (p Pos) Before(q Pos) bool {
	return p.Line < q.Line || (p.Line == q.Line && p.Col < q.Col)
}

// Span is a range of source text. End is exclusive, as in go/token and LSP.
type Span struct {
	Start, End Pos
}

func (s Span) String() string { return s.Start.String() + "-" + s.End.String() }

// IsZero reports whether the span was never set.
func (s Span) IsZero() bool { return s.Start.Line == 0 }

// Join returns the smallest span covering both.
func (s Span) Join(t Span) Span {
	if s.IsZero() {
		return t
	}
	if t.IsZero() {
		return s
	}
	out := s
	if t.Start.Before(out.Start) {
		out.Start = t.Start
	}
	if out.End.Before(t.End) {
		out.End = t.End
	}
	return out
}

// Node is anything in the tree that knows where it was written.
type Node interface {
	Span() Span
}

// node is embedded in every tree node; participle fills Pos and EndPos.
// Tokens are moved to file positions before parsing, so the lines are
// absolute.
type node struct {
	Pos    lexer.Position
	EndPos lexer.Position
}

// Span returns the node's span in the file.
func (n *node) Span() Span {
	if n == nil {
		return Span{}
	}
	return Span{Start: Pos{n.Pos.Line, n.Pos.Column}, End: Pos{n.EndPos.Line, n.EndPos.Column}}
}
