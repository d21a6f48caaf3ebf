package lint

import (
	"strings"
	"testing"

	"github.com/datumlint/datumlint/rules"
)

// RunReader checks text read from a reader under the name given: the name
// is in the findings and chooses the settings; input over the limit gets
// one finding and is not read further.
func TestRunReader(t *testing.T) {
	src := "units mm\nstandard asme-2018\nfeature base plane normal -z at (0, 0, 0)\ndatum A on base\n"
	var asked []string
	opt := Options{SettingsFor: func(p string) (*rules.Settings, error) {
		asked = append(asked, p)
		return &rules.Settings{Severity: map[string]rules.Severity{rules.DatumUnused.ID: rules.Error}}, nil
	}}
	res := RunReader("parts/p.callouts", strings.NewReader(src), opt)
	if len(res.Errors) > 0 || len(res.Files) != 1 {
		t.Fatalf("errors %v, files %d", res.Errors, len(res.Files))
	}
	if len(asked) != 1 || asked[0] != "parts/p.callouts" {
		t.Errorf("settings asked for %v, want the given name", asked)
	}
	ds := res.Diagnostics()
	if len(ds) != 1 || ds[0].File != "parts/p.callouts" || ds[0].Rule != rules.DatumUnused.ID || ds[0].Severity != rules.Error || ds[0].Span.Start.Line != 4 {
		t.Errorf("findings %s, want datum-unused as an error on line 4 of parts/p.callouts", summary(ds))
	}
	if f := res.File("parts/p.callouts"); f == nil || f.Source == nil {
		t.Error("the source of a file with findings is not kept for the outputs")
	}

	res = RunReader("big.callouts", strings.NewReader(src), Options{MaxBytes: 10})
	ds = res.Diagnostics()
	if len(ds) != 1 || ds[0].Rule != rules.Syntax.ID || !strings.Contains(ds[0].Message, "over the size limit of 10 bytes") {
		t.Errorf("over the limit: findings %s, want one syntax finding naming the limit", summary(ds))
	}
}
