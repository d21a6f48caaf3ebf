package rules

import (
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// This file holds the edits that several rules' fixes are made of. Spans
// are the model's, in the checked file's own text.

// deleteWithBlankBefore deletes a span and the blanks before it on its
// line ("flatness 0.02 datums A" -> "flatness 0.02").
func deleteWithBlankBefore(src *source.File, sp source.Span) Edit {
	line := []rune(string(src.LineBytes(sp.Start.Line)))
	c := min(sp.Start.Col-1, len(line))
	for c > 0 && (line[c-1] == ' ' || line[c-1] == '\t') {
		c--
	}
	sp.Start.Col = c + 1
	return Edit{Span: sp}
}

// deleteWithBlankAfter deletes a span and the blanks after it on its line
// ("dia 0.1" -> "0.1").
func deleteWithBlankAfter(src *source.File, sp source.Span) Edit {
	line := []rune(string(src.LineBytes(sp.End.Line)))
	c := sp.End.Col - 1
	for c < len(line) && (line[c] == ' ' || line[c] == '\t') {
		c++
	}
	sp.End.Col = c + 1
	return Edit{Span: sp}
}

// insertAt inserts text at a position.
func insertAt(p source.Pos, text string) Edit {
	return Edit{Span: source.Span{Start: p, End: p}, NewText: text}
}

// replace replaces a span's text.
func replace(sp source.Span, text string) Edit { return Edit{Span: sp, NewText: text} }

// dropRef deletes reference k of a segment with its separator; the only
// reference goes with the word 'datums'.
func dropRef(src *source.File, seg *model.Segment, k int) Edit {
	refs := seg.Refs
	switch {
	case len(refs) == 1:
		return deleteWithBlankBefore(src, seg.DatumsSpan)
	case k > 0:
		return Edit{Span: source.Span{Start: refs[k-1].FullSpan.End, End: refs[k].FullSpan.End}}
	}
	return Edit{Span: source.Span{Start: refs[0].FullSpan.Start, End: refs[1].FullSpan.Start}}
}
