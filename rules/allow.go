package rules

import (
	"fmt"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
)

// AllowUnused reports allow comments that are malformed or silence nothing.
// Malformed ones are found here; the ones that silence nothing are found by
// Check after every other rule has run, under this rule's identifier.
var AllowUnused = Register(&Rule{
	ID:       "allow-unused",
	Summary:  "a suppression without a reason, or one that silences nothing",
	Severity: Warning,
	Rationale: `A suppression records a reviewed decision: that a finding does not apply here, and why.
Without a reason the next checker cannot judge the decision; one that silences nothing is
left over from an earlier version of the file and would hide a future finding by accident.
A malformed suppression silences nothing.`,
	Source:    "common practice (as linters treat their ignore directives)",
	Bad:       "frame base: flatness 0.02  # datumlint: allow tolerance-value",
	Good:      "frame base: flatness 0  # datumlint: allow tolerance-value -- zero flatness is agreed with the supplier, ref. Q-112",
	Fix:       "remove the allow comment, or only the rules in it that silence nothing or that are not rules",
	FixSafe:   true,
	ReviewFix: "write the rule an unknown identifier was probably meant to name",
	Run: func(p *Pass) {
		src := p.Part.Source
		remove := func(d *model.Suppression, why string) []Fix {
			return []Fix{{Message: "remove the allow comment" + why, Safe: true, Edits: []Edit{removeDirective(src, d)}}}
		}
		for _, d := range p.Part.Suppressions {
			switch {
			case len(d.Rules) == 0:
				p.ReportDiagnostic(Diagnostic{Span: d.Span, Fixes: remove(d, ""),
					Message: "this allow comment names no rule: write `# datumlint: allow RULE-ID -- reason`"})
			case d.Reason == "":
				p.ReportDiagnostic(Diagnostic{Span: d.Span, Fixes: remove(d, " (without a reason it silences nothing)"),
					Message: fmt.Sprintf("this allow comment has no reason, so it silences nothing: add ` -- ` and why %s does not apply here", strings.Join(d.Rules, ", "))})
			default:
				for j, id := range d.Rules {
					if Lookup(id) != nil {
						continue
					}
					// Dropping the unknown identifier changes nothing that
					// is silenced (it silenced nothing); putting in the rule
					// it was probably meant to name does, so that needs review.
					drop := remove(d, "")[0]
					if len(d.Rules) > 1 {
						drop = Fix{Message: "remove '" + id + "' from the allow comment", Safe: true, Edits: removeRules(d, []int{j})}
					}
					if sg := Suggest(id); sg != "" {
						p.ReportDiagnostic(Diagnostic{Span: d.RuleSpans[j],
							Message: fmt.Sprintf("unknown rule '%s' in an allow comment; did you mean '%s'?", id, sg),
							Fixes:   []Fix{{Message: "write " + sg, Edits: []Edit{replace(d.RuleSpans[j], sg)}}, drop}})
					} else {
						p.ReportDiagnostic(Diagnostic{Span: d.RuleSpans[j], Fixes: []Fix{drop},
							Message: fmt.Sprintf("unknown rule '%s' in an allow comment: `datumlint rules` lists them", id)})
					}
				}
			}
		}
	},
})
