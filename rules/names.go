package rules

import (
	"fmt"

	"github.com/datumlint/datumlint/grammar/model"
)

// NameUndefined reports a name that no feature declares.
var NameUndefined = Register(&Rule{
	ID:       "name-undefined",
	Summary:  "a frame, datum or dimension names a feature or member that does not exist",
	Severity: Error,
	Rationale: `Every control frame, datum feature symbol and dimension is attached to a feature of the
part. A name that nothing declares (usually a typo, or a feature renamed in one place only)
attaches the annotation to nothing, and none of its checks can run.`,
	Source: "common practice (every annotation is associated with a feature: ASME Y14.41-2019, annotation association)",
	Bad:    "feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)\nframe bor: position dia 0.1 datums A",
	Good:   "feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)\nframe bore: position dia 0.1 datums A",
	Fix:    "write the one declared name near the typo, where exactly one is near",
	Run: func(p *Pass) {
		for _, t := range p.Part.Refs {
			if t.Resolved() {
				continue
			}
			d := Diagnostic{Span: t.Span, Message: fmt.Sprintf("'%s' names nothing: %s", t.Name, t.Problem)}
			if t.Suggestion != "" {
				d.Fixes = []Fix{{Message: "write " + t.Suggestion, Edits: []Edit{replace(t.Span, t.Suggestion)}}}
			}
			p.ReportDiagnostic(d)
		}
	},
})

// NameDuplicate reports a feature name declared twice.
var NameDuplicate = Register(&Rule{
	ID:       "name-duplicate",
	Summary:  "a feature name declared twice",
	Severity: Error,
	Rationale: `A feature name must say which feature an annotation belongs to. Two declarations under
one name make every reference to it ambiguous; datumlint uses the first and reports the second.`,
	Source: "common practice",
	Bad:    "feature base plane normal -z at (0, 0, 0)\nfeature base plane normal +z at (0, 0, 10)",
	Good:   "feature base plane normal -z at (0, 0, 0)\nfeature top plane normal +z at (0, 0, 10)",
	Run: func(p *Pass) {
		for _, d := range p.Part.Duplicates {
			first := p.Part.Feature(d.Name)
			p.ReportRelated(d.NameSpan, []Related{{first.NameSpan, "'" + d.Name + "' is first declared here"}},
				"the feature name '%s' is already declared on line %d; give this %s a name of its own", d.Name, first.NameSpan.Start.Line, kindWord(d))
		}
	},
})

// kindWord names a feature's kind for a message, or "feature" where the
// feature or its kind is unknown.
func kindWord(f *model.Feature) string {
	if f == nil || f.Kind == model.KindUnknown {
		return "feature"
	}
	return f.Kind.String()
}

// SizeMissing reports a feature of size declared without its size.
var SizeMissing = Register(&Rule{
	ID:       "size-missing",
	Summary:  "a feature of size without SIZE",
	Severity: Error,
	Rationale: `A feature of size (slot, tab, hole, pin, socket, ball) is controlled first by its size
tolerance, and its maximum and least material conditions, on which (M) and (L) and the
envelope rule depend, come from its limits of size. Without a size those cannot be known. A
screw thread's designation gives its size (extension: a threaded hole or pin needs no SIZE).`,
	Source: "ASME Y14.5-2018, features of size and limits of size (Rule #1); ISO 14405-1:2016",
	Bad:    "feature bore hole axis +z at (60, 40, 0)",
	Good:   "feature bore hole size 25 +0.05 -0 axis +z at (60, 40, 0)",
	Run: func(p *Pass) {
		for _, f := range append(p.Part.Features, p.Part.Duplicates...) {
			if f.Broken || !f.Kind.IsFOS() || f.Size != nil || f.Thread != "" {
				continue // a thread's designation gives its size
			}
			p.Report(f.NameSpan, "the %s '%s' is a feature of size but has no size: add one after the kind, e.g. %s",
				f.Kind, f.Name, sizeExample(f))
		}
	},
})

func sizeExample(f *model.Feature) string {
	switch f.Kind {
	case model.Hole, model.Slot, model.Socket:
		return fmt.Sprintf("feature %s %s size 10 +0.1 -0 ...", f.Name, f.Kind)
	}
	return fmt.Sprintf("feature %s %s size 10 +0 -0.1 ...", f.Name, f.Kind)
}

// EnvelopeRedundant reports (E) on a size where an ASME edition governs.
var EnvelopeRedundant = Register(&Rule{
	ID:       "envelope-redundant",
	Summary:  "(E) on a size under an ASME edition, where Rule #1 already applies the envelope",
	Severity: Info,
	Rationale: `(E), the envelope requirement, is how ISO 14405-1 asks that a feature of size not exceed its
boundary of perfect form at MMC, because ISO 8015 makes independency the default: without it
size and form are independent. Under ASME Y14.5 the envelope is the default instead: Rule #1
already bounds the form of every regular feature of size by its limits of size, so (E) adds
nothing and is not an ASME symbol. It is harmless, so the finding is information only: the
file may have been written for ISO, or copied from an ISO drawing, and the standard header is
worth a look. (Where the drawing's notes override Rule #1, the envelope is meant and (E)
records it.)`,
	Source:  "ASME Y14.5-2018, Rule #1, limits of size and the envelope principle (from memory, section 5.8); ASME Y14.5-2009, Rule #1; ISO 14405-1:2016, envelope requirement (E); ISO 8015:2011, independency principle",
	Bad:     "feature pilot pin size 20 -0.007 -0.02 (E) axis +z at (0, 0, 0)",
	Good:    "feature pilot pin size 20 -0.007 -0.02 axis +z at (0, 0, 0)",
	Fix:     "remove (E), which Rule #1 already gives",
	FixSafe: true,
	Run: func(p *Pass) {
		if !p.Part.Standard.IsASME() {
			return
		}
		for _, f := range p.Part.Features {
			if f.Broken || f.Size == nil || !f.Size.Envelope {
				continue
			}
			d := Diagnostic{Span: f.Size.EnvelopeSpan,
				Message: fmt.Sprintf("under %s Rule #1 already bounds the form of '%s' by its envelope at MMC, so (E) adds nothing (it is how ISO 14405-1 asks for the envelope, where independency is the default): remove it, or if the file follows ISO, write `standard iso`", p.Part.Standard, f.Name)}
			if d.Span.IsZero() {
				d.Span = f.Size.Span // a reader that does not say where (E) is
			} else {
				d.Fixes = []Fix{{Message: "remove (E)", Safe: true, Edits: []Edit{deleteWithBlankBefore(p.Part.Source, d.Span)}}}
			}
			p.ReportDiagnostic(d)
		}
	},
})
