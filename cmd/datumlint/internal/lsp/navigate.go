package lsp

import (
	"strings"
	"unicode/utf8"

	"github.com/tliron/glsp"
	protocol "github.com/tliron/glsp/protocol_3_16"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// Navigation reads the part model only: features with their name spans,
// the references (model.Part.Refs: every name a frame, datum or dimension
// uses, with what it resolved to), datums and frames' datum references.

// symbol is what a position names: a feature (its declaration or a
// reference), a pattern member (bolts.2), or a datum letter (its
// declaration or a frame's reference).
type symbol struct {
	span    source.Span
	feature *model.Feature
	member  *model.Member
	decl    bool // the declaration itself, not a reference
	letter  string
	datum   *model.Datum // the letter's first declaration, nil if none
}

// letterRef is one datum letter in a frame's datum reference (a common
// datum A-B holds two).
type letterRef struct {
	span    source.Span
	letter  string
	frame   *model.Frame
	seg     int
	ref     int // precedence: 0 primary, 1 secondary, 2 tertiary
	segment *model.Segment
}

// letterRefs lists every datum letter the frames reference, in file order.
func letterRefs(part *model.Part) []letterRef {
	var out []letterRef
	for _, fr := range part.Frames {
		for i, seg := range fr.Segments {
			for k, r := range seg.Refs {
				col := r.Span.Start.Col
				for _, piece := range strings.Split(r.Name, "-") {
					n := utf8.RuneCountInString(piece)
					sp := source.Span{Start: source.Pos{Line: r.Span.Start.Line, Col: col}, End: source.Pos{Line: r.Span.Start.Line, Col: col + n}}
					if piece != "" {
						out = append(out, letterRef{span: sp, letter: piece, frame: fr, seg: i, ref: k, segment: seg})
					}
					col += n + 1
				}
			}
		}
	}
	return out
}

// symbolAt finds what the position names. A position just after a name
// (where the cursor stands when a word has been typed) counts as on it
// when nothing starts there.
func symbolAt(part *model.Part, p source.Pos) (symbol, bool) {
	if part == nil {
		return symbol{}, false
	}
	for _, inclusive := range []bool{false, true} {
		in := func(sp source.Span) bool {
			if sp.IsZero() {
				return false
			}
			return sp.Contains(p) || (inclusive && p == sp.End)
		}
		for _, lr := range letterRefs(part) {
			if in(lr.span) {
				return symbol{span: lr.span, letter: lr.letter, datum: part.Datum(lr.letter)}, true
			}
		}
		for _, d := range part.Datums {
			if !d.Broken && in(d.LetterSpan) {
				return symbol{span: d.LetterSpan, letter: d.Letter, datum: d, decl: true}, true
			}
		}
		for _, fs := range [][]*model.Feature{part.Features, part.Duplicates} {
			for _, f := range fs {
				if !f.Broken && in(f.NameSpan) {
					return symbol{span: f.NameSpan, feature: f, decl: true}, true
				}
			}
		}
		for _, t := range part.Refs {
			if in(t.Span) {
				return symbol{span: t.Span, feature: t.Feature, member: t.Member}, true
			}
		}
	}
	return symbol{}, false
}

// memberSpan is where a pattern member's point is written; where it was
// not written (a width between two faces) it is the feature's name.
func memberSpan(m *model.Member) source.Span {
	if !m.Span.IsZero() {
		return m.Span
	}
	return declSpan(m.Feature)
}

// declSpan is where a feature is declared: its name, or the whole
// statement for a name recovered from a statement that did not parse.
func declSpan(f *model.Feature) source.Span {
	if f.Broken || f.NameSpan.IsZero() {
		return f.Span
	}
	return f.NameSpan
}

// definition of what a symbol names.
func (sym symbol) definition() (source.Span, bool) {
	switch {
	case sym.letter != "":
		if sym.datum == nil {
			return source.Span{}, false
		}
		if sym.datum.Broken {
			return sym.datum.Span, true
		}
		return sym.datum.LetterSpan, true
	case sym.member != nil:
		return memberSpan(sym.member), true
	case sym.feature != nil:
		return declSpan(sym.feature), true
	}
	return source.Span{}, false
}

// references of what a symbol names, in file order, with the declaration
// first when asked for.
func (sym symbol) references(part *model.Part, withDecl bool) []source.Span {
	var out []source.Span
	switch {
	case sym.letter != "":
		if withDecl {
			for _, d := range part.Datums {
				if d.Letter == sym.letter && !d.Broken {
					out = append(out, d.LetterSpan)
				}
			}
		}
		for _, lr := range letterRefs(part) {
			if lr.letter == sym.letter {
				out = append(out, lr.span)
			}
		}
	case sym.member != nil:
		out = targets(part, withDecl, memberSpan(sym.member), func(t *model.Target) bool { return t.Member == sym.member })
	case sym.feature != nil:
		out = targets(part, withDecl, declSpan(sym.feature), func(t *model.Target) bool { return t.Feature == sym.feature })
	}
	return out
}

// targets lists the declaration (when asked for) and the names that refer
// to what it declares.
func targets(part *model.Part, withDecl bool, decl source.Span, refers func(*model.Target) bool) []source.Span {
	var out []source.Span
	if withDecl {
		out = append(out, decl)
	}
	for _, t := range part.Refs {
		if refers(t) {
			out = append(out, t.Span)
		}
	}
	return out
}

// symbolFor finds what a request's position names in the document as it
// is now.
func (s *server) symbolFor(uri protocol.DocumentUri, at protocol.Position) (*snapshot, *model.Part, symbol, bool) {
	sn := s.current(uri)
	if sn == nil {
		return nil, nil, symbol{}, false
	}
	_, part := sn.model()
	sym, ok := symbolAt(part, sn.pos.source(at))
	return sn, part, sym, ok
}

func (s *server) definition(_ *glsp.Context, p *protocol.DefinitionParams) (any, error) {
	sn, _, sym, ok := s.symbolFor(p.TextDocument.URI, p.Position)
	if !ok {
		return nil, nil
	}
	sp, ok := sym.definition()
	if !ok {
		return nil, nil
	}
	return protocol.Location{URI: sn.uri, Range: sn.pos.rng(sp)}, nil
}

func (s *server) references(_ *glsp.Context, p *protocol.ReferenceParams) ([]protocol.Location, error) {
	sn, part, sym, ok := s.symbolFor(p.TextDocument.URI, p.Position)
	if !ok {
		return nil, nil
	}
	out := []protocol.Location{}
	for _, sp := range sym.references(part, p.Context.IncludeDeclaration) {
		out = append(out, protocol.Location{URI: sn.uri, Range: sn.pos.rng(sp)})
	}
	return out, nil
}

// documentSymbol outlines the part: features (with a pattern's members),
// datums and frames (with their composite segments), in file order within
// each group.
func (s *server) documentSymbol(_ *glsp.Context, p *protocol.DocumentSymbolParams) (any, error) {
	sn := s.current(p.TextDocument.URI)
	if sn == nil {
		return nil, nil
	}
	_, part := sn.model()
	if part == nil {
		return []protocol.DocumentSymbol{}, nil
	}
	syms := []protocol.DocumentSymbol{}
	add := func(name, detail string, kind protocol.SymbolKind, rng, sel source.Span, children []protocol.DocumentSymbol) protocol.DocumentSymbol {
		sym := protocol.DocumentSymbol{Name: name, Kind: kind, Range: sn.pos.rng(rng), SelectionRange: sn.pos.rng(sel), Children: children}
		if detail != "" {
			sym.Detail = &detail
		}
		return sym
	}
	for _, f := range part.Features {
		if f.Broken {
			continue
		}
		var members []protocol.DocumentSymbol
		if f.Pattern {
			for _, m := range f.Members {
				sp := memberSpan(m)
				if sp == declSpan(f) || !inside(sp, f.Span) {
					sp = f.NameSpan
				}
				members = append(members, add(f.Name+"."+itoa(m.Index), vecText(m.Point), protocol.SymbolKindField, sp, sp, nil))
			}
		}
		syms = append(syms, add(f.Name, featureDetail(f), protocol.SymbolKindStruct, f.Span, f.NameSpan, members))
	}
	for _, d := range part.Datums {
		if d.Broken {
			continue
		}
		syms = append(syms, add("datum "+d.Letter, "on "+d.Target.Name, protocol.SymbolKindConstant, d.Span, d.LetterSpan, nil))
	}
	for _, fr := range part.Frames {
		var segs []protocol.DocumentSymbol
		for _, seg := range fr.Segments[1:] {
			segs = append(segs, add("composite", sn.lineText(seg.Span.Start.Line), protocol.SymbolKindProperty, seg.Span, seg.Span, nil))
		}
		sel := fr.Target.Span
		if sel.IsZero() {
			sel = fr.Span
		}
		syms = append(syms, add("frame "+fr.Target.Name+": "+string(fr.Characteristic), sn.lineText(fr.Span.Start.Line), protocol.SymbolKindProperty, fr.Span, sel, segs))
	}
	s.mu.Lock()
	hierarchical := s.hierarchical
	s.mu.Unlock()
	if hierarchical {
		return syms, nil
	}
	// A client without hierarchical symbols gets a flat list.
	flat := []protocol.SymbolInformation{}
	var walk func(ds []protocol.DocumentSymbol, container string)
	walk = func(ds []protocol.DocumentSymbol, container string) {
		for _, d := range ds {
			si := protocol.SymbolInformation{Name: d.Name, Kind: d.Kind, Location: protocol.Location{URI: sn.uri, Range: d.Range}}
			if container != "" {
				c := container
				si.ContainerName = &c
			}
			flat = append(flat, si)
			walk(d.Children, d.Name)
		}
	}
	walk(syms, "")
	return flat, nil
}

// inside reports whether span a lies within span b.
func inside(a, b source.Span) bool {
	return !a.Start.Before(b.Start) && !b.End.Before(a.End)
}
