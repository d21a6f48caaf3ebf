package grammar_test

import (
	"fmt"
	"os"
	"sort"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules"
)

// ruleCounts counts a file's findings by rule, without suppressed ones and
// allow-unused (a part written from its model has no allow comments).
func ruleCounts(ds []rules.Diagnostic) string {
	n := map[string]int{}
	for _, d := range ds {
		if !d.Suppressed && d.Rule != rules.AllowUnused.ID {
			n[d.Rule]++
		}
	}
	var out []string
	for r, k := range n {
		out = append(out, fmt.Sprintf("%s %d", r, k))
	}
	sort.Strings(out)
	return strings.Join(out, ", ")
}

// A part written from its model reads back as the same part: every test
// and example file that reads without a problem, written by FromModel and
// laid out by Format, gives the same findings, rule by rule.
func TestFromModelKeepsFindings(t *testing.T) {
	n := 0
	for _, path := range fileList(t) {
		src, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		part := grammar.Read(path, src)
		if len(part.Problems) > 0 || len(part.Duplicates) > 0 || len(part.Suppressions) > 0 || hasBroken(part) || headerTwice(part) {
			continue // what did not read cannot be written back as it was
		}
		n++
		t.Run(path, func(t *testing.T) {
			out, err := grammar.Format(grammar.FromModel(part, grammar.Notes{}))
			if err != nil {
				t.Fatal(err)
			}
			back := grammar.Read("written.callouts", out)
			for _, e := range back.Problems {
				t.Errorf("the written file has a problem: %v\n%s", e, out)
			}
			want, got := ruleCounts(rules.Check(part, nil)), ruleCounts(rules.Check(back, nil))
			if got != want {
				t.Errorf("findings %s\nwant     %s\nwritten:\n%s", got, want, out)
			}
			// Written again, the file is the same: the writer is stable.
			again, err := grammar.Format(grammar.FromModel(back, grammar.Notes{}))
			if err != nil || string(again) != string(out) {
				t.Errorf("written twice differs (%v):\n%s\n---\n%s", err, out, again)
			}
		})
	}
	if n < 10 {
		t.Fatalf("only %d files read without a problem", n)
	}
}

func headerTwice(p *model.Part) bool {
	seen := map[string]bool{}
	for _, h := range p.Headers {
		if seen[h.Keyword] {
			return true
		}
		seen[h.Keyword] = true
	}
	return false
}

func hasBroken(p *model.Part) bool {
	for _, st := range p.Statements {
		if !st.Parsed {
			return true
		}
	}
	return false
}
