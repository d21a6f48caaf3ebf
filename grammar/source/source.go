// Package source holds positions and spans in a source file, apart from any
// reader's syntax, as go/token stands apart from go/ast: the notation's
// parser, the QIF reader, the part model, the rules and every output speak
// of places in a file with these types alone.
//
// Lines and columns are 1-based, and columns count characters (runes), not
// bytes, as the notation's contract requires; a span's end is exclusive.
package source

import (
	"bytes"
	"fmt"
	"sort"
	"unicode/utf8"
)

// Pos is a position in a source file: a 1-based line and a 1-based column
// counted in characters.
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

// Contains reports whether p lies in the span (start inclusive, end
// exclusive).
func (s Span) Contains(p Pos) bool {
	return !p.Before(s.Start) && p.Before(s.End)
}

// Point returns the one-character span at p.
func Point(p Pos) Span { return Span{Start: p, End: Pos{Line: p.Line, Col: p.Col + 1}} }

// Line returns the span of the first character of a line.
func Line(n int) Span { return Point(Pos{Line: n, Col: 1}) }

// File is a source file's name and bytes, with an index of where its lines
// start, so that byte offsets and positions convert both ways.
type File struct {
	Name string
	Src  []byte
	// starts[i] is the byte offset of line i+1; computed on first use.
	starts []int
}

// NewFile returns a file over src (which it does not copy).
func NewFile(name string, src []byte) *File { return &File{Name: name, Src: src} }

func (f *File) index() []int {
	if f.starts == nil {
		f.starts = append(make([]int, 0, bytes.Count(f.Src, []byte{'\n'})+1), 0)
		for i := 0; ; {
			j := bytes.IndexByte(f.Src[i:], '\n')
			if j < 0 {
				break
			}
			i += j + 1
			f.starts = append(f.starts, i)
		}
	}
	return f.starts
}

// Lines returns the number of lines (a final line without a newline
// counts; an empty file has one empty line).
func (f *File) Lines() int { return len(f.index()) }

// LineBytes returns line n (1-based) without its line end ("\n" or
// "\r\n"), or nil when there is no such line.
func (f *File) LineBytes(n int) []byte {
	st := f.index()
	if n < 1 || n > len(st) {
		return nil
	}
	end := len(f.Src)
	if n < len(st) {
		end = st[n] - 1
	}
	b := f.Src[st[n-1]:end]
	if len(b) > 0 && b[len(b)-1] == '\r' {
		b = b[:len(b)-1]
	}
	return b
}

// Position converts a byte offset into a position. Offsets past the end
// are clamped; an offset inside a multi-byte character counts as the
// character.
func (f *File) Position(off int) Pos {
	st := f.index()
	if off < 0 {
		off = 0
	}
	if off > len(f.Src) {
		off = len(f.Src)
	}
	i := sort.Search(len(st), func(i int) bool { return st[i] > off }) - 1
	for off > st[i] && off < len(f.Src) && !utf8.RuneStart(f.Src[off]) {
		off--
	}
	return Pos{Line: i + 1, Col: 1 + utf8.RuneCount(f.Src[st[i]:off])}
}

// Offset converts a position into a byte offset; a column past the end of
// its line gives the line's end, and a line past the end of the file the
// end of the file.
func (f *File) Offset(p Pos) int {
	st := f.index()
	if p.Line < 1 {
		return 0
	}
	if p.Line > len(st) {
		return len(f.Src)
	}
	off := st[p.Line-1]
	end := len(f.Src)
	if p.Line < len(st) {
		end = st[p.Line] - 1
	}
	if end > off && f.Src[end-1] == '\r' {
		end--
	}
	for col := 1; col < p.Col && off < end; col++ {
		if f.Src[off] < utf8.RuneSelf {
			off++ // what DecodeRune gives for ASCII
			continue
		}
		_, n := utf8.DecodeRune(f.Src[off:end])
		off += n
	}
	return off
}

// The Language Server Protocol counts a position's character in UTF-16
// code units from the start of its line, both 0-based (LSP 3.17, "Position":
// the default position encoding); the notation counts characters, 1-based.
// A character outside the Basic Multilingual Plane is one column and two
// UTF-16 code units.

// UTF16 converts p into a 0-based line and a 0-based UTF-16 offset in that
// line. Columns past the line's end (a finding just after the last
// character) count one code unit each, so that a span keeps its length; a
// line past the end of the file keeps its number.
func (f *File) UTF16(p Pos) (line, char int) {
	if p.Line < 1 {
		return 0, 0
	}
	line = p.Line - 1
	b := f.LineBytes(p.Line)
	col := 1
	for len(b) > 0 && col < p.Col {
		r, n := utf8.DecodeRune(b)
		b = b[n:]
		char += utf16Len(r)
		col++
	}
	if col < p.Col {
		char += p.Col - col
	}
	return line, char
}

// FromUTF16 converts a 0-based line and UTF-16 offset into a position. As
// the protocol asks, an offset past the line's end means the line's end;
// an offset inside a surrogate pair means the character it is part of; a
// line past the end of the file means the end of the file, and negative
// values the start.
func (f *File) FromUTF16(line, char int) Pos {
	if line < 0 {
		return Pos{Line: 1, Col: 1}
	}
	if line >= f.Lines() {
		return f.Position(len(f.Src))
	}
	b := f.LineBytes(line + 1)
	col, units := 1, 0
	for len(b) > 0 {
		r, n := utf8.DecodeRune(b)
		w := utf16Len(r)
		if units+w > char {
			break
		}
		units += w
		b = b[n:]
		col++
	}
	return Pos{Line: line + 1, Col: col}
}

// utf16Len is the number of UTF-16 code units of a rune; an invalid byte
// (utf8.RuneError) is one, as its replacement character is.
func utf16Len(r rune) int {
	if r >= 0x10000 && r <= utf8.MaxRune {
		return 2
	}
	return 1
}
