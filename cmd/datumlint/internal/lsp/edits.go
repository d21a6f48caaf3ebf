package lsp

import (
	"bytes"
	"unicode"
	"unicode/utf8"

	"github.com/tliron/glsp"
	protocol "github.com/tliron/glsp/protocol_3_16"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// formatting returns the edit that turns the document into exactly what
// `datumlint fmt` would print for it. A document that does not parse (or
// holds a value the model cannot read, which fmt refuses too) gets no
// edit: what does not parse is never rewritten.
func (s *server) formatting(_ *glsp.Context, p *protocol.DocumentFormattingParams) ([]protocol.TextEdit, error) {
	sn := s.current(p.TextDocument.URI)
	if sn == nil {
		return nil, nil
	}
	out, ok := sn.formatted()
	if !ok {
		s.logf(protocol.MessageTypeInfo, "%s does not parse; it is not formatted", sn.uri)
		return nil, nil
	}
	return replaceEdits(sn.text, out), nil
}

// formatted is the canonical layout of the document, as `datumlint fmt`
// makes it: grammar.Format of the parse, refused where the parse or the
// model found errors.
func (sn *snapshot) formatted() ([]byte, bool) {
	file, part := sn.model()
	if file == nil || len(file.Errors) > 0 || hasProblem(part, model.Syntax) {
		return nil, false
	}
	out, err := grammar.Format(file)
	if err != nil {
		return nil, false
	}
	return out, true
}

// replaceEdits returns one edit that turns old into new, replacing only
// the lines between their common first and last lines (so that the
// editor's cursor and marks elsewhere stay put); none when they are equal.
func replaceEdits(old, new []byte) []protocol.TextEdit {
	if bytes.Equal(old, new) {
		return []protocol.TextEdit{}
	}
	a, b := splitLines(old), splitLines(new)
	i := 0
	for i < len(a) && i < len(b) && bytes.Equal(a[i], b[i]) {
		i++
	}
	j := 0
	for j < len(a)-i && j < len(b)-i && bytes.Equal(a[len(a)-1-j], b[len(b)-1-j]) {
		j++
	}
	from, to := lineOffset(a, i), lineOffset(a, len(a)-j)
	nfrom, nto := lineOffset(b, i), lineOffset(b, len(b)-j)
	raw := source.NewFile("", old) // the editor's text, a byte-order mark included
	return []protocol.TextEdit{{
		Range:   protocol.Range{Start: rawPosition(raw, from), End: rawPosition(raw, to)},
		NewText: string(new[nfrom:nto]),
	}}
}

// splitLines splits text after each "\n"; a final line end makes no empty
// line.
func splitLines(text []byte) [][]byte {
	out := bytes.SplitAfter(text, []byte("\n"))
	if len(out) > 0 && len(out[len(out)-1]) == 0 {
		out = out[:len(out)-1]
	}
	return out
}

func lineOffset(lines [][]byte, n int) int {
	off := 0
	for _, l := range lines[:n] {
		off += len(l)
	}
	return off
}

// rawPosition is the protocol position of a byte offset of the editor's
// text.
func rawPosition(f *source.File, off int) protocol.Position {
	line, char := f.UTF16(f.Position(off))
	return protocol.Position{Line: protocol.UInteger(line), Character: protocol.UInteger(char)}
}

// codeAction offers the suggested fixes of the findings in the range, as
// the rules give them (rules.Diagnostic.Fixes): each fix's edits become
// one workspace edit of the document. A fix that changes what the drawing
// says is titled as needing review.
func (s *server) codeAction(_ *glsp.Context, p *protocol.CodeActionParams) (any, error) {
	sn := s.current(p.TextDocument.URI)
	if sn == nil {
		return nil, nil
	}
	actions := []protocol.CodeAction{}
	if len(p.Context.Only) > 0 {
		wanted := false
		for _, k := range p.Context.Only {
			// Kinds are hierarchical: "" takes every kind.
			wanted = wanted || k == protocol.CodeActionKindQuickFix || k == ""
		}
		if !wanted {
			return actions, nil
		}
	}
	from, to := sn.pos.source(p.Range.Start), sn.pos.source(p.Range.End)
	if to.Before(from) {
		from, to = to, from
	}
	for _, d := range sn.diags {
		if d.Span.End.Before(from) || to.Before(d.Span.Start) {
			continue
		}
		for _, fix := range d.Fixes {
			if len(fix.Edits) == 0 {
				continue
			}
			edits := make([]protocol.TextEdit, 0, len(fix.Edits))
			for _, e := range fix.Edits {
				edits = append(edits, protocol.TextEdit{Range: sn.pos.rng(e.Span), NewText: e.NewText})
			}
			title := upperFirst(fix.Message)
			if title == "" {
				title = "Fix " + d.Rule
			}
			if !fix.Safe {
				title += " (needs review: it changes what the drawing says)"
			}
			kind := protocol.CodeActionKindQuickFix
			preferred := fix.Safe && len(d.Fixes) == 1
			actions = append(actions, protocol.CodeAction{
				Title:       title,
				Kind:        &kind,
				Diagnostics: []protocol.Diagnostic{sn.lspDiagnostic(d)},
				IsPreferred: &preferred,
				Edit:        &protocol.WorkspaceEdit{Changes: map[protocol.DocumentUri][]protocol.TextEdit{sn.uri: edits}},
			})
		}
	}
	return actions, nil
}

func upperFirst(s string) string {
	r, n := utf8.DecodeRuneInString(s)
	if n == 0 {
		return s
	}
	return string(unicode.ToUpper(r)) + s[n:]
}

// hasProblem reports whether the reader found a problem of the kind.
func hasProblem(p *model.Part, kind model.ProblemKind) bool {
	for _, e := range p.Problems {
		if e.Kind == kind {
			return true
		}
	}
	return false
}
