// Package fix applies the suggested fixes that findings carry
// (rules.Diagnostic.Fixes) to a file's text, as go/analysis's checker
// applies SuggestedFixes: in passes, each on a fresh check of the text the
// pass before left, until no fix is left. Edits that overlap in one pass
// are never merged: the fix that comes later in the file waits for the next
// pass, when it is offered again against the new text if it still applies.
//
// Nothing a user wrote is lost: a file whose text has a syntax finding is
// never changed, nor is one that a pass would leave with a syntax finding
// it did not have.
package fix

import (
	"bytes"
	"fmt"
	"sort"

	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/rules"
)

// MaxPasses bounds the passes over one file: a fix that keeps offering
// itself (a bug) cannot loop for ever.
const MaxPasses = 8

// Chosen is a fix chosen for a pass, with the finding it clears.
type Chosen struct {
	Finding rules.Diagnostic
	Fix     rules.Fix
}

// Select picks, from one file's findings, the fixes to apply in one pass:
// each unsuppressed finding's first fix that the mode allows (safe ones
// only, or also those that need review), in file order. A fix with an edit
// that overlaps an edit already taken is left for the next pass; deferred
// counts them.
func Select(src *source.File, ds []rules.Diagnostic, review bool) (take []Chosen, deferred int) {
	var taken []span
	clashes := func(ss []span) bool {
		for i, s := range ss {
			for _, t := range taken {
				if s.overlaps(t) {
					return true
				}
			}
			for _, t := range ss[:i] {
				// One fix's insertions at one place go in the order it
				// lists them; only ranges that share a byte clash.
				if s.overlaps(t) && !(s.from == s.to && t.from == t.to) {
					return true
				}
			}
		}
		return false
	}
	for _, d := range ds {
		if d.Suppressed {
			continue
		}
		for _, f := range d.Fixes {
			if !f.Safe && !review || len(f.Edits) == 0 {
				continue
			}
			spans := make([]span, 0, len(f.Edits))
			ok := true
			for _, e := range f.Edits {
				s := span{src.Offset(e.Span.Start), src.Offset(e.Span.End)}
				ok = ok && !e.Span.End.Before(e.Span.Start) && s.from <= s.to
				spans = append(spans, s)
			}
			if !ok || clashes(spans) {
				deferred++
				break
			}
			taken = append(taken, spans...)
			take = append(take, Chosen{d, f})
			break // one fix per finding
		}
	}
	return take, deferred
}

// span is an edit's byte range in the text.
type span struct{ from, to int }

// overlaps reports whether two edits cannot both be made in one pass: their
// ranges share a byte, or both insert at one place (no order is right).
func (s span) overlaps(t span) bool {
	if s.from == s.to && t.from == t.to {
		return s.from == t.from
	}
	return s.from < t.to && t.from < s.to
}

// Apply returns the text with the chosen fixes' edits made. The edits must
// not overlap (Select sees to it). Inserted line ends follow the file's:
// where its first line ends in CRLF, every "\n" of new text becomes "\r\n".
func Apply(src *source.File, chosen []Chosen) []byte {
	type edit struct {
		from, to int
		text     []byte
	}
	crlf := usesCRLF(src.Src)
	var es []edit
	for _, c := range chosen {
		for _, e := range c.Fix.Edits {
			text := []byte(e.NewText)
			if crlf {
				text = bytes.ReplaceAll(bytes.ReplaceAll(text, []byte("\r\n"), []byte("\n")), []byte("\n"), []byte("\r\n"))
			}
			es = append(es, edit{src.Offset(e.Span.Start), src.Offset(e.Span.End), text})
		}
	}
	sort.SliceStable(es, func(i, j int) bool {
		if es[i].from != es[j].from {
			return es[i].from < es[j].from
		}
		return es[i].to < es[j].to // an insertion before a deletion at the same place
	})
	var out bytes.Buffer
	at := 0
	for _, e := range es {
		out.Write(src.Src[at:e.from])
		out.Write(e.text)
		at = e.to
	}
	out.Write(src.Src[at:])
	return out.Bytes()
}

// usesCRLF reports whether the text's first line ends in CRLF.
func usesCRLF(b []byte) bool {
	i := bytes.IndexByte(b, '\n')
	return i > 0 && b[i-1] == '\r'
}

// Result is what Run did to one file.
type Result struct {
	// Src is the fixed text (the original where nothing was applied).
	Src []byte
	// Applied counts the fixes applied, over every pass; Passes the passes
	// that applied at least one.
	Applied, Passes int
	// Refused says why the file was left as it was ("" where it was not).
	Refused string
	// Findings are the findings of the final text.
	Findings []rules.Diagnostic
}

// Checker checks a file's text.
type Checker func(name string, src []byte) ([]rules.Diagnostic, *source.File)

// Run applies fixes to one file's text until none is left (at most
// MaxPasses passes), re-checking the text before every pass. canon, where
// it is not nil, gives a file's canonical layout and whether it could be
// given: a file in canonical layout before the fixes is put back in it
// after them, so that `fmt` and the fixes agree.
func Run(name string, src []byte, check Checker, review bool, canon func([]byte) ([]byte, bool)) Result {
	ds, file := check(name, src)
	res := Result{Src: src, Findings: ds}
	if hasSyntax(ds) {
		res.Refused = "it has syntax findings; fix them first (a file that does not parse is never rewritten)"
		return res
	}
	wasCanon := false
	if canon != nil {
		if c, ok := canon(src); ok && bytes.Equal(c, src) {
			wasCanon = true
		}
	}
	cur := src
	for pass := 0; pass < MaxPasses; pass++ {
		take, _ := Select(file, ds, review)
		if len(take) == 0 {
			break
		}
		next := Apply(file, take)
		nds, nfile := check(name, next)
		if hasSyntax(nds) {
			// A fix that breaks the file is a bug in the fix: keep what the
			// passes before made, and say so.
			res.Refused = fmt.Sprintf("a fix for %s would leave a line that does not parse; the fixes before it were kept", take[0].Finding.Rule)
			break
		}
		cur, ds, file = next, nds, nfile
		res.Applied += len(take)
		res.Passes++
	}
	if wasCanon && res.Applied > 0 {
		if c, ok := canon(cur); ok && !bytes.Equal(c, cur) {
			if nds, _ := check(name, c); !hasSyntax(nds) {
				cur, ds = c, nds
			}
		}
	}
	res.Src, res.Findings = cur, ds
	return res
}

func hasSyntax(ds []rules.Diagnostic) bool {
	for _, d := range ds {
		if d.Rule == rules.Syntax.ID && !d.Suppressed {
			return true
		}
	}
	return false
}
