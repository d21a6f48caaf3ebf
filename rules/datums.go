package rules

import (
	"fmt"
	"regexp"
	"slices"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
)

// DatumUndefined reports a reference to a letter that no datum declares.
var DatumUndefined = Register(&Rule{
	ID:       "datum-undefined",
	Summary:  "a frame references a letter that no `datum` declares",
	Severity: Error,
	Rationale: `A datum reference in a feature control frame points at a datum feature identified on the
drawing by a datum feature symbol. A letter with no symbol points at nothing: the inspector
cannot know which feature to set the part up on. A datum target (A1) names the datum it
establishes by its letter, which a datum feature symbol must declare too (extension).`,
	Source: "ASME Y14.5-2018, datum feature symbol and datum references in a feature control frame; ISO 5459:2011",
	Bad:    "datum A on base\nframe bore: position dia 0.1 datums A, B",
	Good:   "datum A on base\ndatum B on rear\nframe bore: position dia 0.1 datums A, B",
	Run: func(p *Pass) {
		// Extension: a datum target names its datum by its label's letter.
		for _, t := range p.Part.Targets {
			if t.Letter == "" || p.Part.Datum(t.Letter) != nil {
				continue
			}
			on := "FEATURE"
			if t.On.Resolved() {
				on = t.On.Name
			}
			p.Report(t.LabelSpan, "datum target %s is a target of datum %s, which no datum feature symbol declares: add `datum %s on %s`", t.Label, t.Letter, t.Letter, on)
		}
		for _, fr := range p.Part.Frames {
			for _, seg := range fr.Segments {
				for _, r := range seg.Refs {
					for i, l := range r.Letters {
						switch {
						case r.Datums[i] != nil:
						case !letterRE.MatchString(l) || strings.ContainsAny(l, "IOQ"):
							p.Report(r.Span, "datum %s is not declared, and %s is not a letter the standard uses: declare the datum feature with another letter (e.g. `datum A on FEATURE`) and reference that", l, l)
						default:
							p.Report(r.Span, "datum %s is not declared: add a datum feature symbol, e.g. `datum %s on FEATURE`", l, l)
						}
					}
				}
			}
		}
	},
})

// DatumDuplicate reports a letter declared twice or repeated in a frame.
var DatumDuplicate = Register(&Rule{
	ID:       "datum-duplicate",
	Summary:  "a letter declared twice, or repeated within one frame",
	Severity: Error,
	Rationale: `Each datum feature symbol letter identifies one datum feature; two symbols with the same
letter leave the datum undefined. A letter repeated within one frame references the same
datum twice, which fixes nothing more and usually hides a wrong letter.`,
	Source: "ASME Y14.5-2018, datum feature symbol (each letter identifies one datum feature); ISO 5459:2011",
	Bad:    "datum A on base\ndatum A on rear",
	Good:   "datum A on base\ndatum B on rear",
	Run: func(p *Pass) {
		first := map[string]*model.Datum{}
		for _, d := range p.Part.Datums {
			if f := first[d.Letter]; f != nil {
				p.ReportRelated(d.LetterSpan, []Related{{f.LetterSpan, "datum " + d.Letter + " is first declared here"}},
					"datum %s is already declared on line %d; choose another letter", d.Letter, f.LetterSpan.Start.Line)
				continue
			}
			first[d.Letter] = d
		}
		for _, fr := range p.Part.Frames {
			for _, seg := range fr.Segments {
				seen := map[string]bool{}
				for _, r := range seg.Refs {
					for _, l := range r.Letters {
						if seen[l] {
							p.Report(r.Span, "datum %s is referenced twice in this frame; each datum appears once, in order of precedence", l)
						}
						seen[l] = true
					}
				}
			}
		}
	},
})

// DatumUnused reports a datum symbol no frame references.
var DatumUnused = Register(&Rule{
	ID:       "datum-unused",
	Summary:  "a declared datum that no frame references",
	Severity: Warning,
	Rationale: `A datum feature symbol that no feature control frame references gives the inspector a
setup that nothing uses, and often means a frame lost its reference to it.`,
	Source: "common practice",
	Bad:    "datum A on base\ndatum D on lug\nframe bore: position dia 0.1 datums A",
	Good:   "datum A on base\nframe bore: position dia 0.1 datums A",
	Run: func(p *Pass) {
		used := p.facts.usedLetters()
		seen := map[string]bool{}
		for _, d := range p.Part.Datums {
			if d.Broken || seen[d.Letter] {
				continue
			}
			seen[d.Letter] = true
			if !used[d.Letter] {
				p.Report(d.LetterSpan, "datum %s is declared but no frame references it: reference it in a frame or remove the symbol", d.Letter)
			}
		}
	},
})

var letterRE = regexp.MustCompile(`^[A-Z]{1,2}$`)

// DatumLetter reports a letter the standard does not use.
var DatumLetter = Register(&Rule{
	ID:       "datum-letter",
	Summary:  "a datum letter the standard does not use (I, O, Q), or one that is not one or two capitals",
	Severity: Error,
	Rationale: `ASME Y14.5 does not use the letters I, O and Q to identify datum features, because they are
easily read as the digits 1 and 0; when the single letters are used up, double letters follow
(AA, AB, ...). Lower case letters and longer names are not datum feature identifiers.

ISO 5459 identifies datums by capital letters too. Whether it excludes the same three letters
datumlint could not check against the text: from memory it gives no such list. datumlint keeps
the conservative reading and applies the ASME exclusion under iso as well (a letter that reads
as a digit misleads on any drawing), and its message says which standard the rule comes from.`,
	Source: "ASME Y14.5-2018 and -2009, datum feature symbol letters (I, O and Q not used; from memory, 2018 section 6); ISO 5459:2011, datum letters are capitals (no exclusion list as far as datumlint knows, from memory)",
	Bad:    "datum O on base",
	Good:   "datum A on base",
	Run: func(p *Pass) {
		for _, d := range p.Part.Datums {
			switch {
			case !letterRE.MatchString(d.Letter):
				p.Report(d.LetterSpan, "'%s' is not a datum letter: %s identify datum features by one or two capital letters, A to Z, then AA, AB, ...; use one", d.Letter, letterStandard(p.Part.Standard))
			case strings.ContainsAny(d.Letter, "IOQ"):
				p.Report(d.LetterSpan, "datum letter %s uses %s, %s; choose another letter", d.Letter, badLetters(d.Letter), excludedBy(p.Part.Standard))
			}
		}
	},
})

// letterStandard names the standards whose datum letters the part uses.
func letterStandard(s model.Standard) string {
	if s.IsASME() {
		return editionName(s)
	}
	return "ISO 5459 and ASME Y14.5"
}

// excludedBy says which standard excludes I, O and Q, for the message.
func excludedBy(s model.Standard) string {
	switch s {
	case model.ISO:
		return "which ASME Y14.5 does not use in datum letters (I, O and Q read as the digits 1 and 0; ISO 5459 asks for capital letters and, as far as datumlint knows, lists no exclusion, so datumlint applies the ASME rule under ISO too)"
	case model.ASME2018, model.ASME2009:
		return "which " + editionName(s) + " does not use in datum letters (I, O and Q read as the digits 1 and 0)"
	}
	return "which ASME Y14.5 does not use in datum letters (I, O and Q read as the digits 1 and 0)"
}

func badLetters(s string) string {
	var out []string
	for _, c := range s {
		if strings.ContainsRune("IOQ", c) && !slices.Contains(out, string(c)) {
			out = append(out, string(c))
		}
	}
	return strings.Join(out, " and ")
}

// DatumSameFeature reports one feature designated by two datum letters.
var DatumSameFeature = Register(&Rule{
	ID:       "datum-same-feature",
	Summary:  "one feature (or pattern member) designated by two datum letters",
	Severity: Warning,
	Rationale: `A datum feature symbol identifies a feature as a datum feature, and its letter is how frames
refer to it. Two letters on one feature give the same datum two names: a reader cannot tell
whether frames that use different letters mean different setups, each letter must be
qualified on its own, and a frame that references both references one datum twice. Use one
letter and reference it wherever the datum is meant. A width and one of its faces, or a
pattern and one of its members, are different features and are not reported; nor is a datum
established by datum targets, which its targets tell apart (extension).`,
	Source: "ASME Y14.5-2018, datum feature symbol (a datum feature is identified by a letter; from memory, section 6); common practice",
	Bad:    "feature base plane normal -z at (0, 0, 0)\ndatum A on base\ndatum D on base",
	Good:   "feature base plane normal -z at (0, 0, 0)\ndatum A on base",
	Run: func(p *Pass) {
		type key struct {
			f *model.Feature
			m *model.Member
		}
		first := map[key]*model.Datum{}
		for _, d := range p.Part.Datums {
			if !d.Usable() || len(d.Targets) > 0 {
				continue // datums by targets are told apart by their targets (extension)
			}
			k := key{d.Target.Feature, d.Target.Member}
			f := first[k]
			switch {
			case f == nil:
				first[k] = d
			case f.Letter != d.Letter: // the same letter twice is datum-duplicate's
				p.ReportRelated(d.LetterSpan, []Related{{f.LetterSpan, "datum " + f.Letter + " is on the same feature"}},
					"'%s' is already datum %s (line %d): one feature takes one datum letter; remove this symbol and reference %s where %s is used",
					d.Target.Name, f.Letter, f.LetterSpan.Start.Line, f.Letter, d.Letter)
			}
		}
	},
})

// DatumSelfReference reports a frame on a datum feature that references
// the datum that feature alone establishes.
var DatumSelfReference = Register(&Rule{
	ID:       "datum-self-reference",
	Summary:  "a frame on a datum feature that references the datum that feature alone establishes",
	Severity: Error,
	Rationale: `A tolerance relates the feature it is on to the datums it references. A datum feature's own
datum is simulated from that very feature, so a frame on it that references its own letter
relates the feature to itself: perpendicularity of the back face to A, B with B on the back
face asks nothing of B (only of A), and runout of a journal to its own axis reads nothing
but the journal's form. It is a slip for the datum meant (often the primary alone, or the
common datum of two journals), or for a form tolerance. A datum feature controlled to a
common datum that it is one of is right and not reported: runout of journals A and B to
A-B is the standard's way of relating two coaxial journals to the axis they establish
together. A form frame with datums is datums-forbidden's finding alone.`,
	Source: "ASME Y14.5-2018, datum reference frames and datum feature controls (a datum feature is related to other datums, or to a common datum it helps establish: coaxial journals to A-B; from memory, sections 7 and 12); ISO 5459:2011, datums and common datums",
	Bad: `feature base plane normal -z at (0, 0, 0)
feature back plane normal -y at (0, 0, 0)
datum A on base
datum B on back
frame back: perpendicularity 0.05 datums A, B`,
	Good: `feature base plane normal -z at (0, 0, 0)
feature back plane normal -y at (0, 0, 0)
datum A on base
datum B on back
frame back: perpendicularity 0.05 datums A`,
	Fix: "remove the reference to the feature's own datum, where the frame has others",
	Run: func(p *Pass) {
		for _, fr := range p.Part.Frames {
			c := fr.Characteristic
			if !fr.Target.Known() || c.Category() == model.Form || c.Category() == model.CategoryUnknown {
				continue // a form frame with datums is datums-forbidden's finding
			}
			if withdrawn(p.Part, c) {
				continue // characteristic-withdrawn reports the frame
			}
			r, d, seg, k := selfReference(fr)
			if r == nil {
				continue
			}
			if a := p.Kinematics().Segment(fr, seg); a.Resolved && k < len(a.DRF.Steps()) && a.DRF.Steps()[k].Constrains == 0 {
				continue // it removes nothing: datum-redundant's finding, which says why
			}
			sg := fr.Segments[seg]
			diag := Diagnostic{Span: r.Span, Message: selfReferenceMessage(fr, sg, r, d)}
			if len(sg.Refs) > 1 {
				diag.Fixes = []Fix{{Message: "remove datum " + d.Letter + " from the frame", Edits: []Edit{dropRef(p.Part.Source, sg, k)}}}
			}
			p.ReportDiagnostic(diag)
		}
	},
})

// withdrawn reports whether the edition has no such characteristic
// (characteristic-withdrawn's finding, which other rules leave alone).
func withdrawn(part *model.Part, c model.Characteristic) bool {
	return part.Standard == model.ASME2018 && (c == model.Concentricity || c == model.Symmetry)
}

// selfReference returns the first reference of the frame (in any segment)
// to a single datum established by the frame's own target, with the
// segment's and the reference's index, or nil. A common datum the target
// is one of (journal A to A-B) is not one.
func selfReference(fr *model.Frame) (*model.DatumRef, *model.Datum, int, int) {
	for i, seg := range fr.Segments {
		for k, r := range seg.Refs {
			if isSelfReference(fr, r) {
				return r, r.Datums[0], i, k
			}
		}
	}
	return nil, nil, 0, 0
}

// isSelfReference reports whether the reference is a single datum that the
// frame's own target establishes.
func isSelfReference(fr *model.Frame, r *model.DatumRef) bool {
	if r.Common() || len(r.Datums) != 1 || !r.Datums[0].Usable() {
		return false
	}
	t := r.Datums[0].Target
	return t.Feature == fr.Target.Feature && t.Member == fr.Target.Member
}

func selfReferenceMessage(fr *model.Frame, seg *model.Segment, r *model.DatumRef, d *model.Datum) string {
	head := fmt.Sprintf("'%s' establishes datum %s itself, so this %s relates it to itself", fr.Target.Name, d.Letter, fr.Characteristic)
	var rest []string
	for _, o := range seg.Refs {
		if o != r {
			rest = append(rest, o.Label())
		}
	}
	if len(rest) > 0 {
		return fmt.Sprintf("%s: remove %s from the references (`datums %s`)", head, d.Letter, strings.Join(rest, ", "))
	}
	return fmt.Sprintf("%s: reference the datum it must be related to instead of %s (another feature's datum, or a common datum it is one of, such as the axis of two coaxial journals), or, if only its form was meant, write a form tolerance without datums, e.g. `frame %s: %s %s`",
		head, d.Letter, fr.Target.Name, formCharFor(fr.Target.Feature.Kind), seg.ValueText)
}

// formCharFor is the form characteristic that suits a kind on its own.
func formCharFor(k model.Kind) model.Characteristic {
	switch {
	case k == model.Plane || k.IsWidth():
		return model.Flatness
	case k.IsCylinder():
		return model.Cylindricity
	case k.IsSphere() || k == model.Cone:
		return model.Circularity
	}
	return model.SurfaceProfile
}
