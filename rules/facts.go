package rules

import (
	"bytes"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/basics"
	"github.com/datumlint/datumlint/rules/kinematics"
)

// facts holds what several rules derive from one part, computed once per
// part on first use (parts are checked in parallel, the rules of one part
// in turn, so no locking is needed).
type facts struct {
	part   *model.Part
	kin    *kinematics.Result
	bas    *basics.Analysis
	used   map[string]bool
	broken map[string]bool
	eol    string
}

// lineEnd is the line end that text a fix inserts takes: the file's own
// (CRLF where its first line ends so, as rules/fix reads it).
func (f *facts) lineEnd() string {
	if f.eol == "" {
		f.eol = "\n"
		src := f.part.Source.Src
		if i := bytes.IndexByte(src, '\n'); i > 0 && src[i-1] == '\r' {
			f.eol = "\r\n"
		}
	}
	return f.eol
}

func (f *facts) kinematics() *kinematics.Result {
	if f.kin == nil {
		f.kin = kinematics.Analyze(f.part)
	}
	return f.kin
}

func (f *facts) basics() *basics.Analysis {
	if f.bas == nil {
		f.bas = basics.Analyze(f.part, f.kinematics())
	}
	return f.bas
}

// usedLetters returns the datum letters referenced by any frame, including
// letters named in frames that did not parse (so one typo does not also
// make a datum read as unused).
func (f *facts) usedLetters() map[string]bool {
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
	for _, st := range f.part.Statements {
		if !st.Parsed && st.Keyword == "frame" {
			for _, w := range st.Words {
				for _, l := range strings.Split(w, "-") {
					f.used[l] = true
				}
			}
		}
	}
	return f.used
}

// brokenMentions returns the names written in statements that did not
// parse, and the targets of frames whose characteristic is unknown. Rules
// that judge what is missing for a feature (a form control, a basic
// dimension) stay silent on these: what the drafter wrote there may be the
// very thing, and the syntax finding already asks for a fix.
func (f *facts) brokenMentions() map[string]bool {
	if f.broken != nil {
		return f.broken
	}
	f.broken = map[string]bool{}
	for _, st := range f.part.Statements {
		if st.Parsed {
			continue
		}
		for _, w := range st.Words {
			f.broken[w] = true
			if i := strings.LastIndexByte(w, '.'); i > 0 {
				f.broken[w[:i]] = true
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
