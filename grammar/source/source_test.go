package source

import "testing"

func TestPositionOffsetRoundTrip(t *testing.T) {
	src := []byte("ab\r\n⌀c\n\nlast")
	f := NewFile("x", src)
	if f.Lines() != 4 {
		t.Fatalf("Lines() = %d, want 4", f.Lines())
	}
	for off := 0; off <= len(src); off++ {
		p := f.Position(off)
		back := f.Offset(p)
		// Offsets inside the three bytes of ⌀ come back to its start.
		if back > off || off-back > 2 {
			t.Errorf("offset %d -> %v -> %d", off, p, back)
		}
	}
	if got := f.Position(7); got != (Pos{2, 2}) {
		t.Errorf("Position(7) = %v, want 2:2 (columns count characters)", got)
	}
	if got := string(f.LineBytes(1)); got != "ab" {
		t.Errorf("LineBytes(1) = %q, want CR removed", got)
	}
	if got := string(f.LineBytes(4)); got != "last" {
		t.Errorf("LineBytes(4) = %q", got)
	}
	if f.LineBytes(5) != nil {
		t.Error("LineBytes past the end should be nil")
	}
	if got := f.Offset(Pos{1, 99}); got != 2 {
		t.Errorf("Offset past the line's end = %d, want 2", got)
	}
}

func TestSpan(t *testing.T) {
	a := Span{Pos{1, 3}, Pos{1, 6}}
	b := Span{Pos{2, 1}, Pos{2, 4}}
	j := a.Join(b)
	if j.Start != a.Start || j.End != b.End {
		t.Errorf("Join = %v", j)
	}
	if !a.Contains(Pos{1, 5}) || a.Contains(Pos{1, 6}) {
		t.Error("Contains: start inclusive, end exclusive")
	}
	if (Span{}).Join(a) != a || !(Span{}).IsZero() {
		t.Error("zero span")
	}
}

func TestUTF16(t *testing.T) {
	// 𝜙 (U+1D719) is one character and two UTF-16 code units; ⌀ is one of
	// each; the second line ends in CR LF.
	f := NewFile("x", []byte("a𝜙b\r\n⌀c\nlast"))
	cases := []struct {
		pos        Pos
		line, char int
	}{
		{Pos{1, 1}, 0, 0},
		{Pos{1, 2}, 0, 1},
		{Pos{1, 3}, 0, 3}, // after the surrogate pair
		{Pos{1, 4}, 0, 4}, // the line's end
		{Pos{1, 5}, 0, 5}, // past it: one unit a column
		{Pos{1, 7}, 0, 7},
		{Pos{2, 2}, 1, 1},
		{Pos{3, 5}, 2, 4},
	}
	for _, c := range cases {
		if l, ch := f.UTF16(c.pos); l != c.line || ch != c.char {
			t.Errorf("UTF16(%v) = %d:%d, want %d:%d", c.pos, l, ch, c.line, c.char)
		}
		if c.pos.Col <= len([]rune(string(f.LineBytes(c.pos.Line))))+1 {
			if back := f.FromUTF16(c.line, c.char); back != c.pos {
				t.Errorf("FromUTF16(%d, %d) = %v, want %v", c.line, c.char, back, c.pos)
			}
		}
	}
	if got := f.FromUTF16(0, 2); got != (Pos{1, 2}) {
		t.Errorf("an offset inside a surrogate pair: %v, want the pair's character 1:2", got)
	}
	if got := f.FromUTF16(0, 99); got != (Pos{1, 4}) {
		t.Errorf("an offset past the line's end: %v, want the end 1:4", got)
	}
	if got := f.FromUTF16(1, 99); got != (Pos{2, 3}) {
		t.Errorf("past the end of a CR LF line: %v, want 2:3 (before the CR)", got)
	}
	if got := f.FromUTF16(7, 0); got != (Pos{3, 5}) {
		t.Errorf("a line past the end: %v, want the end of the file 3:5", got)
	}
	if got := f.FromUTF16(-1, 3); got != (Pos{1, 1}) {
		t.Errorf("a negative line: %v", got)
	}
}
