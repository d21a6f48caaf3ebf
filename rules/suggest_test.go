package rules

import (
	"regexp"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
)

// Suggest finds the rule meant by another case, '_' for '-', or a typo;
// it offers nothing for a word near no rule.
func TestSuggest(t *testing.T) {
	for id, want := range map[string]string{
		"basic_missing":  "basic-missing",
		"Basic-Missing":  "basic-missing",
		"basic-missng":   "basic-missing",
		"BASIC MISSING":  "basic-missing",
		"datum-unsued":   "datum-unused",
		"no-such-rule":   "",
		"":               "",
		"flatness-check": "",
	} {
		if got := Suggest(id); got != want {
			t.Errorf("Suggest(%q) = %q, want %q", id, got, want)
		}
	}
}

// An allow comment that names a rule almost right gets a did-you-mean, and
// doing what it says silences the finding it was written for: the
// suggestion is a promise.
func TestAllowSuggestionClearsFinding(t *testing.T) {
	const tmpl = `part "Test plate TP-2"
units mm
standard asme-2018
feature base plane normal -z at (0, 0, 0)
datum A on base  # datumlint: allow RULE -- kept for the fixture drawing F-3
`
	suggested := regexp.MustCompile(`did you mean '([a-z-]+)'\?`)
	for _, typo := range []string{"Datum-Unused", "datum-unsued", "datum_unused"} {
		src := strings.Replace(tmpl, "RULE", typo, 1)
		var sg string
		for _, d := range Check(grammar.Read("t.callouts", []byte(src)), nil) {
			if d.Rule == AllowUnused.ID {
				if m := suggested.FindStringSubmatch(d.Message); m != nil {
					sg = m[1]
				}
			}
		}
		if sg == "" {
			t.Errorf("%s: no did-you-mean in the allow-unused finding", typo)
			continue
		}
		fixed := strings.Replace(tmpl, "RULE", sg, 1)
		for _, d := range Check(grammar.Read("t.callouts", []byte(fixed)), nil) {
			if !d.Suppressed {
				t.Errorf("%s -> %s: still %s: %s", typo, sg, d.Rule, d.Message)
			}
		}
	}
}
