// Package ruledoc renders a rule's documentation as Markdown: the one
// rendering behind docs/rules.md (rules/gendocs), the help of the SARIF
// rule descriptors (cmd/datumlint) and the language server's hovers; and it
// says where each rule's section of docs/rules.md is published.
package ruledoc

import (
	"fmt"
	"strings"

	"github.com/datumlint/datumlint/rules"
)

// RulesDoc is the published address of docs/rules.md.
const RulesDoc = "https://github.com/datumlint/datumlint/blob/main/docs/rules.md"

// URL is the address of a rule's section of docs/rules.md: the section's
// heading is the rule's identifier, which is its anchor. SARIF's helpUri and
// the language server's codeDescription both use it.
func URL(id string) string { return RulesDoc + "#" + id }

// Markdown renders a rule's summary, rationale, source and, where it has
// them, its bad and good examples as code blocks. It has no heading, so
// that the caller can place it.
func Markdown(r *rules.Rule) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s\n\n", upperFirst(r.Summary))
	fmt.Fprintf(&b, "%s\n\n", strings.TrimSpace(r.Rationale))
	fmt.Fprintf(&b, "Source: %s\n\n", r.Source)
	fmt.Fprintf(&b, "Fix: %s\n", r.FixText())
	if r.Bad != "" || r.Good != "" {
		fmt.Fprintf(&b, "\nBad:\n\n%s\n\nGood:\n\n%s\n", Fence(r.Bad), Fence(r.Good))
	}
	return b.String()
}

// Fence puts text in a Markdown code block whose fence is longer than any
// run of backticks inside it.
func Fence(s string) string {
	fence := "```"
	for strings.Contains(s, fence) {
		fence += "`"
	}
	return fence + "\n" + strings.TrimRight(s, "\n") + "\n" + fence
}

func upperFirst(s string) string {
	for i, r := range s {
		return strings.ToUpper(string(r)) + s[i+len(string(r)):]
	}
	return s
}
