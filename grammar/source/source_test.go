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
