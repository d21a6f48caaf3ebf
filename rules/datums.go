package rules

import (
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
	Rationale: `The letters I, O and Q are not used to identify datum features because they are easily
read as the digits 1 and 0. When the single letters are used up, double letters follow
(AA, AB, ...). Lower case letters and longer names are not datum feature identifiers.`,
	Source: "ASME Y14.5-2018, datum feature symbol letters (I, O and Q not used; from memory, section 7); ISO 5459:2011",
	Bad:    "datum O on base",
	Good:   "datum A on base",
	Run: func(p *Pass) {
		for _, d := range p.Part.Datums {
			switch {
			case !letterRE.MatchString(d.Letter):
				p.Report(d.LetterSpan, "'%s' is not a datum letter: use one or two capital letters, A to Z, then AA, AB, ...", d.Letter)
			case strings.ContainsAny(d.Letter, "IOQ"):
				p.Report(d.LetterSpan, "datum letter %s uses %s, which the standard does not use (it reads as a digit); choose another letter", d.Letter, badLetters(d.Letter))
			}
		}
	},
})

func badLetters(s string) string {
	var out []string
	for _, c := range s {
		if strings.ContainsRune("IOQ", c) && !slices.Contains(out, string(c)) {
			out = append(out, string(c))
		}
	}
	return strings.Join(out, " and ")
}
