package rules

import (
	"strings"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
)

// Facts holds what several rules derive from one part, computed once per
// file on first use (files are checked in parallel, the rules of one file
// in turn, so no locking is needed).
type Facts struct {
	part   *model.Part
	used   map[string]bool
	broken map[string]bool
	cache  map[string]any
}

func newFacts(p *model.Part) *Facts { return &Facts{part: p, cache: map[string]any{}} }

// Memo returns the value stored under key, computing it on first use.
// Engines use it so that each is run once per file.
func Memo[T any](f *Facts, key string, compute func() T) T {
	if v, ok := f.cache[key]; ok {
		return v.(T)
	}
	v := compute()
	f.cache[key] = v
	return v
}

// UsedLetters returns the datum letters referenced by any frame, including
// letters named in frames that did not parse (so one typo does not also
// make a datum read as unused).
func (f *Facts) UsedLetters() map[string]bool {
	if f.used != nil {
		return f.used
	}
	f.used = map[string]bool{}
	for _, fr := range f.part.Frames {
		for _, seg := range fr.Segments {
			for _, r := range seg.Refs {
				for _, l := range r.Letters {
					f.used[l] = true
				}
			}
		}
	}
	for _, st := range f.part.File.Stmts {
		if bs, ok := st.(*grammar.BadStmt); ok && bs.Word == "frame" {
			for _, w := range bs.Words {
				for _, l := range strings.Split(w, "-") {
					f.used[l] = true
				}
			}
		}
	}
	return f.used
}

// BrokenMentions returns the names written in statements that did not
// parse, and the targets of frames whose characteristic is unknown. Rules
// that judge what is missing for a feature (a form control, a basic
// dimension) stay silent on these: what the drafter wrote there may be the
// very thing, and the syntax finding already asks for a fix.
func (f *Facts) BrokenMentions() map[string]bool {
	if f.broken != nil {
		return f.broken
	}
	f.broken = map[string]bool{}
	for _, st := range f.part.File.Stmts {
		if bs, ok := st.(*grammar.BadStmt); ok {
			for _, w := range bs.Words {
				f.broken[w] = true
				if i := strings.LastIndexByte(w, '.'); i > 0 {
					f.broken[w[:i]] = true
				}
			}
		}
	}
	for _, fr := range f.part.Frames {
		if fr.Characteristic.Category() == model.CategoryUnknown {
			f.broken[fr.Target.Name] = true
			if fr.Target.Feature != nil {
				f.broken[fr.Target.Feature.Name] = true
			}
		}
	}
	return f.broken
}
