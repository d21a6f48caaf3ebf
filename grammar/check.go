package grammar

import (
	"fmt"

	"github.com/datumlint/datumlint/grammar/source"
)

// checkStmt makes the structural checks that the loose parts of the grammar
// leave open: the order of a geometry's parts and the modifiers' letters.
// Values (kinds, units, numbers) are the model's to judge.
func checkStmt(st Stmt) []*SyntaxError {
	var errs []*SyntaxError
	add := func(n source.Span, format string, args ...any) {
		errs = append(errs, &SyntaxError{Span: n, Msg: fmt.Sprintf(format, args...)})
	}
	switch s := st.(type) {
	case *FeatureStmt:
		if s.Geometry != nil {
			checkGeometry(s.Geometry, add)
		}
		if s.Size != nil && s.Size.Envelope != nil {
			if l := ModifierLetter(s.Size.Envelope.Symbol); l != "E" {
				add(s.Size.Envelope.Span(), "only (E), the envelope requirement, may follow a size; found (%s)", l)
			}
		}
		if c := s.Cbore; c != nil {
			noModifier(c.Diameter, "a counterbore's diameter", add)
			noModifier(c.Depth, "a counterbore's depth", add)
		}
		if c := s.Csink; c != nil {
			noModifier(c.Diameter, "a countersink's diameter", add)
			noModifier(c.Angle, "a countersink's angle", add)
		}
	case *FrameStmt:
		checkTolerance(s.Tolerance, add)
		for _, c := range s.Composites {
			checkTolerance(c.Tolerance, add)
		}
	case *DimStmt:
		if m := s.Size.Envelope; m != nil {
			if l := ModifierLetter(m.Symbol); l == "E" {
				add(m.Span(), "(E) belongs to a feature's size, not to a location dimension: remove it here (write it after the size on the feature's line)")
			} else {
				add(m.Span(), "(%s) does not belong to a dimension: remove it here; a dim is a value and its tolerance between two features, and modifiers go in a frame (after its tolerance, or on a datum reference)", l)
			}
		}
	}
	return errs
}

func checkGeometry(g *Geometry, add func(source.Span, string, ...any)) {
	w := g.Word.Value
	// where the next thing after the word stands, for "expected" messages
	after := func() source.Span {
		switch {
		case g.Dir != nil:
			return g.Dir.Span()
		case g.At != nil:
			return g.At.Span()
		case len(g.Points) > 0:
			return g.Points[0].Span()
		case len(g.Faces) > 0:
			return g.Faces[0].Span()
		}
		e := g.Word.Span().End
		return source.Span{Start: e, End: source.Pos{Line: e.Line, Col: e.Col + 1}}
	}
	switch w {
	case "normal", "axis", "along":
		switch {
		case g.Dir == nil:
			add(after(), wantDirection, w)
		case g.At == nil:
			sp := g.Dir.Span()
			if len(g.Points) > 0 {
				sp = g.Points[0].Span()
			}
			add(sp, "expected 'at' and a point after the direction, e.g. %s %s at (0, 0, 0)", w, "+z")
		case len(g.Points) == 0:
			sp := g.At.Span()
			if len(g.Faces) > 0 {
				sp = g.Faces[0].Span()
			} else {
				sp = source.Span{Start: sp.End, End: source.Pos{Line: sp.End.Line, Col: sp.End.Col + 1}}
			}
			add(sp, wantPoint)
		}
		if len(g.Faces) > 0 {
			add(g.Faces[0].Span(), "unexpected '%s' after the points", g.Faces[0].Value)
		}
	case "at":
		if g.Dir != nil {
			if g.Dir.Vector != nil {
				// "at (x, y, z)": the parser took the first point for a direction.
				g.Points = append([]*Vector{g.Dir.Vector}, g.Points...)
				g.Dir = nil
			} else {
				add(g.Dir.Span(), "a direction does not belong after 'at': write e.g. 'axis %s at (0, 0, 0)'", g.Dir.Axis)
			}
		}
		if g.At != nil {
			add(g.At.Span(), "'at' is written once, followed by the points")
		}
		if len(g.Points) == 0 && len(g.Faces) == 0 {
			add(after(), wantPoint)
		}
		if len(g.Faces) > 0 {
			add(g.Faces[0].Span(), "expected a point such as (0, 0, 0), found '%s'", g.Faces[0].Value)
		}
	case "between":
		if g.Dir != nil || g.At != nil || len(g.Points) > 0 {
			add(after(), "'between' takes the names of the two plane features that bound the width, e.g. between upper lower")
		} else if len(g.Faces) != 2 {
			sp := g.Word.Span()
			if len(g.Faces) > 2 {
				sp = g.Faces[2].Span()
			}
			add(sp, "'between' takes exactly two plane features (found %d)", len(g.Faces))
		}
	}
}

var knownModifiers = map[string]string{
	"M": "at maximum material condition",
	"L": "at least material condition",
	"F": "free state",
	"T": "tangent plane",
	"P": "projected tolerance zone",
	"U": "unequally disposed profile",
}

func checkTolerance(t *Tolerance, add func(source.Span, string, ...any)) {
	for _, m := range t.Modifiers {
		l := ModifierLetter(m.Symbol)
		if _, ok := knownModifiers[l]; !ok {
			add(m.Span(), "unknown modifier (%s) in a frame: use (M), (L), (F), (T), (P) HEIGHT or (U) VALUE", l)
			continue
		}
		switch {
		case (l == "P" || l == "U") && m.Value == nil:
			what := "the projected height, e.g. (P) 12"
			if l == "U" {
				what = "the offset toward the material's outside, e.g. (U) 0.2"
			}
			add(m.Span(), "(%s) takes a value: %s", l, what)
		case l != "P" && l != "U" && m.Value != nil:
			add(m.Value.Span(), "(%s) takes no value; a number after it has no meaning", l)
		}
	}
	for _, d := range t.Datums {
		prev := d.Modifiers
		for _, m := range d.More {
			if len(prev) == 0 {
				// A-B is one word; a separate dash would print back as one
				// and take the next letter's modifier for the whole.
				add(m.Span(), "write a common datum as one word, e.g. A-B; a dash starts a further letter only after a modifier, as in A(M)-B(M)")
			}
			prev = m.Modifiers
		}
		mods := d.Modifiers
		for _, m := range d.More {
			mods = append(mods[:len(mods):len(mods)], m.Modifiers...)
		}
		for _, m := range mods {
			if l := ModifierLetter(m.Symbol); l != "M" && l != "L" {
				add(m.Span(), "a datum reference takes only (M), at maximum material boundary, or (L), at least material boundary; found (%s)", l)
			}
		}
	}
	checkNotes(t.Notes, add)
}

// noteGroups are the notes of which a frame takes one: one extent, one
// thread diameter.
var noteGroups = map[string]string{
	"all-around": "extent", "all-over": "extent", "between": "extent",
	"major-dia": "thread", "minor-dia": "thread", "pitch-dia": "thread",
	"separate": "separate",
}

// checkNotes reports a note written twice, and two notes of one group (a
// profile has one extent; a tolerance applies to one diameter of a
// thread).
func checkNotes(notes []*Note, add func(source.Span, string, ...any)) {
	seen := map[string]string{}
	for _, n := range notes {
		w := n.Word
		if n.From != nil {
			w = "between"
		}
		g := noteGroups[w]
		switch prev, ok := seen[g]; {
		case ok && prev == w:
			add(n.Span(), "'%s' is written twice; write it once", w)
		case ok && g == "extent":
			add(n.Span(), "a profile has one extent: '%s' and '%s' cannot both apply; keep one", prev, w)
		case ok:
			add(n.Span(), "a tolerance applies to one diameter of a thread: '%s' and '%s' cannot both apply; keep one", prev, w)
		}
		seen[g] = w
	}
}

// noModifier reports a modifier after a value that takes none.
func noModifier(s *Size, what string, add func(source.Span, string, ...any)) {
	if s != nil && s.Envelope != nil {
		add(s.Envelope.Span(), "%s takes no modifier; (%s) belongs to the hole's size", what, ModifierLetter(s.Envelope.Symbol))
	}
}
