package rules_test

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/fix"
)

var updateFixes = flag.Bool("update-fixes", false, "rewrite rules/testdata/fix/*.golden from the fixes")

// TestFixData holds each rule's fixes to a golden file, as analysistest's
// RunWithSuggestedFixes does: testdata/fix/NAME.callouts carries its
// findings inline (# want), NAME.callouts.golden is the file after every
// offered fix (those that need review too) is applied. After the fixes the
// findings that had fixes are gone, and no finding appears that the file
// did not have.
func TestFixData(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("testdata", "fix", "*.callouts"))
	if len(files) == 0 {
		t.Fatal("no fix test data")
	}
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			src, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			s := settingsFor(t, f, src)
			check := checker(s)
			before, _ := check(f, src)
			checkWants(t, f, src, before)
			for _, d := range before {
				r := rules.Lookup(d.Rule)
				for _, fx := range d.Fixes {
					// explain and docs/rules.md say what each rule's fix is
					// and of which kind; hold them to what it does.
					if r == nil || r.Fix == "" || fx.Safe && !r.FixSafe || !fx.Safe && r.FixSafe && r.ReviewFix == "" {
						t.Errorf("%s offers a fix (safe %v) that its Rule.Fix/FixSafe do not document", d.Rule, fx.Safe)
					}
				}
			}
			res := fix.Run(f, src, check, true, nil)
			if res.Refused != "" {
				t.Fatalf("fixes refused: %s", res.Refused)
			}
			golden := f + ".golden"
			if *updateFixes {
				if err := os.WriteFile(golden, res.Src, 0o644); err != nil {
					t.Fatal(err)
				}
			}
			want, err := os.ReadFile(golden)
			if err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(res.Src, want) {
				t.Errorf("fixed text differs from %s:\n%s", golden, res.Src)
			}
			had := map[string]int{}
			for _, d := range before {
				if !d.Suppressed && len(d.Fixes) == 0 {
					had[d.Rule+"\x00"+d.Message]++
				}
			}
			for _, d := range res.Findings {
				if d.Suppressed {
					continue
				}
				if len(d.Fixes) > 0 {
					t.Errorf("a fixable finding remains: %s: %s", d.Rule, d.Message)
				} else if had[d.Rule+"\x00"+d.Message] == 0 {
					t.Errorf("the fixes brought a new finding: %d:%d %s: %s", d.Span.Start.Line, d.Span.Start.Col, d.Rule, d.Message)
				} else {
					had[d.Rule+"\x00"+d.Message]--
				}
			}
			if strings.Count(string(res.Src), "\n") == 0 {
				t.Error("the fixed file is empty")
			}
		})
	}
}

// checker is what rules/fix re-checks a text with: the notation's reader
// and the rules with the settings.
func checker(s *rules.Settings) fix.Checker {
	return func(name string, src []byte) ([]rules.Diagnostic, *source.File) {
		p := grammar.Read(name, src)
		return rules.Check(p, s), p.Source
	}
}
