package rules

import "strings"

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
	Source:  "common practice (as linters treat their ignore directives)",
	Bad:     "frame base: flatness 0.02  # datumlint: allow tolerance-value",
	Good:    "frame base: flatness 0  # datumlint: allow tolerance-value -- zero flatness is agreed with the supplier, ref. Q-112",
	Fix:     "remove the allow comment, or only the rules in it that silence nothing",
	FixSafe: true,
	Run: func(p *Pass) {
		for _, d := range p.Part.Suppressions {
			switch {
			case len(d.Rules) == 0:
				p.Report(d.Span, "this allow comment names no rule: write `# datumlint: allow RULE-ID -- reason`")
			case d.Reason == "":
				p.Report(d.Span, "this allow comment has no reason, so it silences nothing: add ` -- ` and why %s does not apply here", strings.Join(d.Rules, ", "))
			default:
				for _, id := range d.Rules {
					if Lookup(id) == nil {
						if sg := Suggest(id); sg != "" {
							p.Report(d.Span, "unknown rule '%s' in an allow comment; did you mean '%s'?", id, sg)
						} else {
							p.Report(d.Span, "unknown rule '%s' in an allow comment: `datumlint rules` lists them", id)
						}
					}
				}
			}
		}
	},
})
