package ruledoc

import (
	"os"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/rules"
)

func TestMarkdown(t *testing.T) {
	r := &rules.Rule{ID: "x-y", Summary: "a thing wrong", Rationale: "Because.\n", Source: "common practice",
		Bad: "frame a: flatness 0", Good: "frame a: flatness ``` 1"}
	got := Markdown(r)
	want := "A thing wrong\n\nBecause.\n\nSource: common practice\n\nFix: none\n\nBad:\n\n```\nframe a: flatness 0\n```\n\nGood:\n\n````\nframe a: flatness ``` 1\n````\n"
	if got != want {
		t.Errorf("got:\n%s\nwant:\n%s", got, want)
	}
	r.Bad, r.Good = "", ""
	if got := Markdown(r); strings.Contains(got, "Bad:") || !strings.HasSuffix(got, "Fix: none\n") {
		t.Errorf("a rule without examples: %q", got)
	}
	r.Fix, r.FixSafe = "remove it", true
	if got := Markdown(r); !strings.Contains(got, "Fix: remove it (safe: `check --fix` applies it)") {
		t.Errorf("a rule with a safe fix: %q", got)
	}
}

// TestURLMatchesHeading checks that a rule's address points at a heading
// that docs/rules.md has: its anchor is the identifier itself.
func TestURLMatchesHeading(t *testing.T) {
	doc, err := os.ReadFile("../../docs/rules.md")
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range rules.All() {
		u := URL(r.ID)
		if !strings.HasPrefix(u, RulesDoc+"#") {
			t.Fatalf("URL(%q) = %q", r.ID, u)
		}
		if !strings.Contains(string(doc), "\n## "+strings.TrimPrefix(u, RulesDoc+"#")+"\n") {
			t.Errorf("docs/rules.md has no section %q for %s", "## "+r.ID, u)
		}
	}
}
