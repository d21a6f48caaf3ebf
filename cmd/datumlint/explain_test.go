package main

import (
	"bytes"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/rules"
)

// TestExplainEveryRule: `explain` answers for every registered rule with its
// summary, source, both examples and the advisory caution.
func TestExplainEveryRule(t *testing.T) {
	for _, r := range rules.All() {
		var out, errb bytes.Buffer
		if code := run([]string{"explain", r.ID}, &out, &errb); code != 0 {
			t.Errorf("explain %s: exit %d: %s", r.ID, code, errb.String())
			continue
		}
		text := out.String()
		for _, want := range []string{r.ID + " (default severity: " + r.Severity.String() + ")", "Source: " + r.Source, "Bad:\n", "Good:\n", "does not certify"} {
			if !strings.Contains(text, want) {
				t.Errorf("explain %s lacks %q", r.ID, want)
			}
		}
	}
}
