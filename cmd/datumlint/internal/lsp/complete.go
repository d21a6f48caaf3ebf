package lsp

import (
	"fmt"
	"strings"
	"unicode/utf8"

	"github.com/tliron/glsp"
	protocol "github.com/tliron/glsp/protocol_3_16"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// Completion reads the words of the statement before the cursor (the
// notation's statements are short and start with their keyword, so the
// words say where the grammar stands) and offers what may come there:
// keywords, feature and member names, declared datum letters,
// characteristics, zones, modifiers, directions, kinds, units, editions
// and placements. Names come from the part model of the document as it
// is now.

var (
	directions    = []string{"+x", "-x", "+y", "-y", "+z", "-z"}
	zones         = []string{"dia", "sdia"}
	modifiers     = []string{"(M)", "(L)", "(F)", "(T)", "(P)", "(U)"}
	refModifiers  = []string{"(M)", "(L)"}
	unitWords     = []string{"mm", "in"}
	notes         = []string{"all-around", "all-over", "between", "separate", "major-dia", "minor-dia"}
	statementKeys = append(append([]string{}, grammar.Keywords...), "composite")
)

// item kinds by what is offered.
const (
	kwKind     = protocol.CompletionItemKindKeyword
	nameKind   = protocol.CompletionItemKindClass
	memberKind = protocol.CompletionItemKindField
	letterKind = protocol.CompletionItemKindConstant
	valueKind  = protocol.CompletionItemKindEnumMember
	modKind    = protocol.CompletionItemKindOperator
)

type offer struct {
	label  string
	kind   protocol.CompletionItemKind
	detail string
}

func (s *server) completion(_ *glsp.Context, p *protocol.CompletionParams) (any, error) {
	list := &protocol.CompletionList{Items: []protocol.CompletionItem{}}
	sn := s.current(p.TextDocument.URI)
	if sn == nil {
		return list, nil
	}
	_, part := sn.model()
	if part == nil {
		return list, nil
	}
	at := sn.pos.source(p.Position)
	line := []rune(string(sn.pos.f.LineBytes(at.Line)))
	if at.Col-1 > len(line) {
		at.Col = len(line) + 1
	}
	before := string(line[:at.Col-1])
	if inComment(before) {
		return list, nil
	}
	// The statement may have begun on lines ending in a backslash.
	stmt := before
	for l := at.Line - 1; l >= 1; l-- {
		prev := strings.TrimRight(string(sn.pos.f.LineBytes(l)), " \t")
		if !strings.HasSuffix(prev, `\`) {
			break
		}
		stmt = strings.TrimSuffix(prev, `\`) + " " + stmt
	}
	start := len(before)
	for start > 0 && !strings.ContainsRune(" \t,:", rune(before[start-1])) {
		start--
	}
	partial := before[start:]
	words := tokens(stmt[:len(stmt)-len(partial)])
	offers := offersAt(part, words)
	// The edit replaces what has been typed of the word; after a ':' or a
	// ',' with no space it adds one, as the canonical layout has it.
	from := source.Pos{Line: at.Line, Col: 1 + utf8.RuneCountInString(before[:start])}
	rng := protocol.Range{Start: sn.pos.lsp(from), End: sn.pos.lsp(at)}
	pad := ""
	if start > 0 && strings.ContainsRune(",:", rune(before[start-1])) {
		pad = " "
	}
	for i, o := range offers {
		kind := o.kind
		sort := fmt.Sprintf("%04d", i) // in the order offered
		it := protocol.CompletionItem{Label: o.label, Kind: &kind, SortText: &sort,
			TextEdit: protocol.TextEdit{Range: rng, NewText: pad + o.label}}
		if o.detail != "" {
			d := o.detail
			it.Detail = &d
		}
		if pad != "" {
			f := o.label
			it.FilterText = &f
		}
		list.Items = append(list.Items, it)
	}
	return list, nil
}

// inComment reports whether the text before the cursor has opened a
// comment (a '#' outside the part's quoted name).
func inComment(s string) bool {
	quoted := false
	for _, r := range s {
		switch {
		case r == '"':
			quoted = !quoted
		case r == '#' && !quoted:
			return true
		}
	}
	return false
}

// tokens splits a statement's words; ':' and ',' are words of their own.
func tokens(s string) []string {
	s = strings.NewReplacer(":", " : ", ",", " , ", `\`, " ").Replace(s)
	return strings.Fields(s)
}

// offersAt says what may follow the statement's words.
func offersAt(part *model.Part, w []string) []offer {
	if len(w) == 0 {
		return words(kwKind, statementKeys...)
	}
	rest := w[1:]
	switch w[0] {
	case "units":
		if len(rest) == 0 {
			return words(valueKind, unitWords...)
		}
	case "standard":
		if len(rest) == 0 {
			return words(valueKind, model.StandardWords...)
		}
	case "basis":
		if len(rest) == 0 {
			return words(valueKind, model.BasisWords...)
		}
	case "feature":
		return featureOffers(part, rest)
	case "target":
		return targetOffers(part, rest)
	case "datum":
		switch {
		case len(rest) == 1:
			return words(kwKind, "on")
		case len(rest) == 2 && rest[1] == "on":
			return names(part, true, nil)
		case len(rest) == 3:
			return words(kwKind, "placed")
		case len(rest) == 4 && rest[3] == "placed":
			return words(valueKind, model.PlacementWords...)
		}
	case "frame":
		colon := index(rest, ":")
		switch {
		case len(rest) == 0:
			return names(part, true, nil)
		case colon < 0:
			return nil
		case len(rest) == colon+1:
			return words(valueKind, grammar.CharacteristicWords...)
		default:
			return toleranceOffers(part, rest[colon+2:])
		}
	case "composite":
		return toleranceOffers(part, rest)
	case "basic":
		return dimensionOffers(part, rest, true)
	case "dim":
		return dimensionOffers(part, rest, false)
	case "ref":
		if len(rest) == 0 {
			return words(kwKind, "size")
		}
		if rest[0] == "size" {
			switch len(rest) {
			case 2:
				return words(kwKind, "of")
			case 3:
				return names(part, true, func(f *model.Feature) bool { return f.Kind.TakesSize() })
			}
			return nil
		}
		return dimensionOffers(part, rest, true)
	}
	return nil
}

// targetOffers: target LABEL SHAPE [AREA] on FEATURE (at POINT | from
// POINT to POINT) [normal DIR].
func targetOffers(part *model.Part, w []string) []offer {
	switch {
	case len(w) == 0:
		return nil // a new label
	case len(w) == 1:
		return words(valueKind, model.TargetShapeWords...)
	}
	on := index(w, "on")
	last := w[len(w)-1]
	switch {
	case on < 0 && w[1] == "area" && len(w) == 2:
		return words(kwKind, "dia")
	case on < 0:
		return words(kwKind, "on")
	case on == len(w)-1:
		return names(part, true, func(f *model.Feature) bool { return !f.Kind.IsElement() })
	case on == len(w)-2:
		if w[1] == "line" {
			return words(kwKind, "from")
		}
		return words(kwKind, "at")
	case last == "normal":
		return words(valueKind, directions...)
	case strings.HasSuffix(last, ")") && w[1] == "line" && index(w, "to") < 0:
		return words(kwKind, "to")
	case strings.HasSuffix(last, ")") && index(w, "normal") < 0:
		return words(kwKind, "normal")
	}
	return nil
}

// featureOffers: feature NAME KIND [Nx] [size SIZE] GEOMETRY.
func featureOffers(part *model.Part, w []string) []offer {
	switch len(w) {
	case 0:
		return nil // a new name
	case 1:
		return words(valueKind, model.KindWords...)
	}
	kind := model.ParseKind(w[1])
	last := w[len(w)-1]
	switch last {
	case "normal", "axis", "along":
		return words(valueKind, directions...)
	case "size", "at":
		return nil // a number or a point
	case "between":
		return planes(part)
	}
	if len(w) >= 3 && w[len(w)-2] == "between" {
		return planes(part)
	}
	if geometryStarted(w) {
		// After the direction of a normal, axis or extrusion comes 'at'.
		if index(w, "at") < 0 && index(w, "between") < 0 && (index(directions, last) >= 0 || strings.HasSuffix(last, ")")) {
			return words(kwKind, "at")
		}
		return nil
	}
	var out []offer
	if kind.TakesSize() && index(w, "size") < 0 {
		out = append(out, words(kwKind, "size")...)
	}
	if kind.IsCylinder() && index(w, "thread") < 0 {
		out = append(out, words(kwKind, "thread")...)
	}
	if kind == model.Hole {
		for _, f := range []string{"cbore", "csink"} {
			if index(w, f) < 0 {
				out = append(out, words(kwKind, f)...)
			}
		}
	}
	switch {
	case kind == model.Plane:
		out = append(out, words(kwKind, "normal")...)
	case kind.IsWidth():
		out = append(out, words(kwKind, "normal", "between")...)
	case kind.IsCylinder(), kind == model.Cone, kind == model.Circle:
		out = append(out, words(kwKind, "axis")...)
	case kind.IsSphere(), kind == model.Surface, kind == model.Point:
		out = append(out, words(kwKind, "at")...)
	case kind == model.Extrusion, kind == model.Line:
		out = append(out, words(kwKind, "along")...)
	}
	return out
}

// geometryStarted reports whether the words hold a geometry's first word.
func geometryStarted(w []string) bool {
	for _, g := range []string{"normal", "axis", "along", "at", "between"} {
		if index(w, g) >= 0 {
			return true
		}
	}
	return false
}

// toleranceOffers: [ZONE] VALUE [MODIFIER ...] [datums REF, REF, ...].
func toleranceOffers(part *model.Part, w []string) []offer {
	if d := index(w, "datums"); d >= 0 {
		refs := w[d+1:]
		used := map[string]bool{}
		for _, r := range refs {
			for _, l := range strings.Split(r, "-") {
				used[strings.TrimSuffix(strings.TrimSuffix(l, "(M)"), "(L)")] = true
			}
		}
		if len(refs) == 0 || refs[len(refs)-1] == "," {
			return letters(part, used)
		}
		return append(words(modKind, refModifiers...), words(kwKind, notes...)...)
	}
	if len(w) == 0 {
		return words(valueKind, zones...)
	}
	last := w[len(w)-1]
	if len(w) == 1 && (last == "dia" || last == "sdia" || grammar.CanonicalWord(last) != last) {
		return nil // the value comes next
	}
	return append(words(modKind, modifiers...), words(kwKind, "along", "datums")...)
}

// dimensionOffers: basic VALUE[deg] from F1 to F2 [along DIR] [about F],
// basic dia VALUE through PATTERN about FEATURE, dim SIZE from F1 to F2
// [along DIR].
func dimensionOffers(part *model.Part, w []string, basic bool) []offer {
	if len(w) == 0 {
		if basic {
			return words(kwKind, "dia")
		}
		return nil
	}
	if basic && w[0] == "dia" {
		switch len(w) {
		case 2:
			return words(kwKind, "through")
		case 3:
			return names(part, false, func(f *model.Feature) bool { return f.Pattern })
		case 4:
			return words(kwKind, "about")
		case 5:
			return names(part, false, func(f *model.Feature) bool { return f.Kind.IsCylinder() || f.Kind == model.Cone })
		}
		return nil
	}
	last := w[len(w)-1]
	switch last {
	case "from", "to", "about":
		return names(part, true, nil)
	case "along":
		return words(valueKind, directions...)
	}
	switch {
	case index(w, "to") >= 0 && index(w, "to") == len(w)-2:
		out := words(kwKind, "along")
		if basic {
			out = append(out, words(kwKind, "about")...)
		}
		return out
	case index(w, "from") >= 0 && index(w, "from") == len(w)-2:
		return words(kwKind, "to")
	case index(w, "from") < 0:
		out := words(kwKind, "from")
		if basic && len(w) == 1 && !strings.HasSuffix(last, "deg") {
			out = append(words(kwKind, "deg"), out...)
		}
		return out
	}
	return nil
}

func words(kind protocol.CompletionItemKind, ws ...string) []offer {
	out := make([]offer, len(ws))
	for i, w := range ws {
		out[i] = offer{label: w, kind: kind}
	}
	return out
}

// names offers the declared features, and with members the members of
// each pattern, that keep passes (nil: all).
func names(part *model.Part, members bool, keep func(*model.Feature) bool) []offer {
	var out []offer
	for _, f := range part.Features {
		if f.Broken || (keep != nil && !keep(f)) {
			continue
		}
		out = append(out, offer{label: f.Name, kind: nameKind, detail: featureDetail(f)})
		if members && f.Pattern {
			for _, m := range f.Members {
				out = append(out, offer{label: f.Name + "." + itoa(m.Index), kind: memberKind, detail: "member of " + f.Name + " at " + vecText(m.Point)})
			}
		}
	}
	return out
}

func planes(part *model.Part) []offer {
	return names(part, false, func(f *model.Feature) bool { return f.Kind == model.Plane })
}

// letters offers the declared datum letters not already in the frame.
func letters(part *model.Part, used map[string]bool) []offer {
	var out []offer
	seen := map[string]bool{}
	for _, d := range part.Datums {
		if d.Broken || used[d.Letter] || seen[d.Letter] {
			continue
		}
		seen[d.Letter] = true
		out = append(out, offer{label: d.Letter, kind: letterKind, detail: "datum on " + d.Target.Name})
	}
	return out
}

func index(w []string, s string) int {
	for i, x := range w {
		if x == s {
			return i
		}
	}
	return -1
}
