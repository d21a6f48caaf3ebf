package config

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/rules"
)

func TestParse(t *testing.T) {
	src := `# project settings
fail-on = "error"
exclude = ["build/**", "**/*.draft.callouts"]
max-bytes = 1000

[rules]
datum-unused = "off"
zone-shape = "error"
"allow-unused" = "info"
`
	c, err := Parse("x/.datumlint.toml", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	if !c.FailOnSet || c.FailOn != rules.Error {
		t.Errorf("fail-on = %v (set %v), want error", c.FailOn, c.FailOnSet)
	}
	if c.MaxBytes != 1000 {
		t.Errorf("max-bytes = %d", c.MaxBytes)
	}
	want := map[string]rules.Severity{"datum-unused": rules.Off, "zone-shape": rules.Error, "allow-unused": rules.Info}
	if len(c.Rules) != len(want) {
		t.Errorf("rules = %v, want %v", c.Rules, want)
	}
	for id, sev := range want {
		if c.Rules[id] != sev {
			t.Errorf("rules[%s] = %v, want %v", id, c.Rules[id], sev)
		}
	}
}

func TestParseErrors(t *testing.T) {
	for _, tc := range []struct{ name, src, want string }{
		{"unknown rule", "fail-on = \"info\"\n[rules]\ndatum-unused = \"off\"\nno-such-rule = \"off\"\n", `f.toml:4: unknown rule "no-such-rule"`},
		{"unknown top key", "fail-on = \"info\"\nfail_on = \"info\"\n", `f.toml:2: unknown key "fail_on"`},
		{"unknown table", "[rule]\ndatum-unused = \"off\"\n", `f.toml:1: unknown key "rule"`},
		{"bad severity", "[rules]\n\ndatum-unused = \"loud\"\n", `f.toml:3: unknown severity "loud"`},
		{"fail-on off", "\nfail-on = \"off\"\n", `f.toml:2: fail-on takes`},
		{"bad fail-on", "fail-on = \"sometimes\"\n", `f.toml:1: unknown severity "sometimes"`},
		{"max-bytes", "max-bytes = -1\n", `f.toml:1: max-bytes must be a positive`},
		{"glob", "exclude = [\"a**b\"]\n", `f.toml:1: bad exclude pattern "a**b"`},
		{"syntax", "a = 1\nb = = 2\n", `f.toml:2: expected`},
		{"wrong type", "exclude = 3\n", `f.toml`},
		{"dotted unknown rule", "rules.nope = \"off\"\n", `f.toml:1: unknown rule "nope"`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Parse("f.toml", []byte(tc.src))
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error = %v, want it to contain %q", err, tc.want)
			}
		})
	}
}

// Every mistake of a file is reported at once, in line order, each on its
// line, with a hint where one is sure: a top-level key written under
// [rules] belongs above it, a rule written almost right gets a
// did-you-mean, a rule's severity written at the top goes under [rules].
func TestParseReportsEveryErrorInLineOrder(t *testing.T) {
	src := `max-bytes = -5
fail_on = "error"
datum-unused = "off"
exclude = ["ok/**", "a**b"]

[rules]
zone-shape = "loud"
fail-on = "error"
basic_missing = "off"
Basic-Missing = "info"
basic-missng = "warning"
datum-letter = 3
no-such-rule = "off"
`
	_, err := Parse("f.toml", []byte(src))
	var errs Errors
	if !errors.As(err, &errs) {
		t.Fatalf("error %v (%T), want config.Errors", err, err)
	}
	want := []string{
		`f.toml:1: max-bytes must be a positive number of bytes, not -5`,
		`f.toml:2: unknown key "fail_on": did you mean "fail-on"?`,
		`f.toml:3: unknown key "datum-unused": a rule's severity goes in the [rules] table, as datum-unused = "..." under [rules]`,
		`f.toml:4: bad exclude pattern "a**b"`,
		`f.toml:7: unknown severity "loud" for rule zone-shape`,
		`f.toml:8: fail-on is a top-level key, not a rule: move it above [rules]`,
		`f.toml:9: unknown rule "basic_missing" in [rules]; did you mean "basic-missing"?`,
		`f.toml:10: unknown rule "Basic-Missing" in [rules]; did you mean "basic-missing"?`,
		`f.toml:11: unknown rule "basic-missng" in [rules]; did you mean "basic-missing"?`,
		`f.toml:12: rule datum-letter takes a severity in quotes`,
		"f.toml:13: unknown rule \"no-such-rule\" in [rules]: `datumlint rules` lists them",
	}
	if len(errs) != len(want) {
		t.Fatalf("%d errors, want %d:\n%v", len(errs), len(want), err)
	}
	for i, w := range want {
		if !strings.HasPrefix(errs[i].Error(), w) {
			t.Errorf("error %d = %q, want it to start %q", i, errs[i], w)
		}
	}
	if lines := strings.Split(err.Error(), "\n"); len(lines) != len(want) {
		t.Errorf("the joined message has %d lines, want one per error:\n%v", len(lines), err)
	}
}

// Each hint is a promise: doing what it says clears the error.
func TestParseHintsClearTheirErrors(t *testing.T) {
	for _, tc := range []struct{ name, bad, good string }{
		{"top-level key under [rules]", "[rules]\nfail-on = \"error\"\n", "fail-on = \"error\"\n[rules]\n"},
		{"rule at the top", "datum-unused = \"off\"\n", "[rules]\ndatum-unused = \"off\"\n"},
		{"misspelt key", "fail_on = \"error\"\n", "fail-on = \"error\"\n"},
		{"misspelt rule", "[rules]\nbasic_missing = \"off\"\n", "[rules]\nbasic-missing = \"off\"\n"},
	} {
		if _, err := Parse("f.toml", []byte(tc.bad)); err == nil {
			t.Errorf("%s: %q parsed", tc.name, tc.bad)
		}
		if _, err := Parse("f.toml", []byte(tc.good)); err != nil {
			t.Errorf("%s: doing what the hint says still fails: %v", tc.name, err)
		}
	}
}

// --enable and --disable offer the rule meant.
func TestOverridesSuggest(t *testing.T) {
	for _, o := range []Overrides{{Enable: []string{"basic_missing"}}, {Disable: []string{"Basic-Missing"}}, {Disable: []string{"basic-missng"}}} {
		err := o.Check()
		if err == nil || !strings.Contains(err.Error(), `did you mean "basic-missing"?`) {
			t.Errorf("%+v: error %v, want a did-you-mean", o, err)
		}
	}
}

func TestMatch(t *testing.T) {
	for _, tc := range []struct {
		glob, name string
		want       bool
	}{
		{"build/**", "build/a.callouts", true},
		{"build/**", "build/x/y/a.callouts", true},
		{"build/**", "src/build/a.callouts", false},
		{"build", "build/x/a.callouts", true}, // a folder excludes what it holds
		{"**/*.draft.callouts", "a.draft.callouts", true},
		{"**/*.draft.callouts", "x/y/a.draft.callouts", true},
		{"**/*.draft.callouts", "x/y/a.callouts", false},
		{"*.callouts", "x/a.callouts", false}, // * stays within a segment
		{"*.callouts", "a.callouts", true},
		{"x/**/old/*.callouts", "x/old/a.callouts", true},
		{"x/**/old/*.callouts", "x/p/q/old/a.callouts", true},
		{"x/**/old/*.callouts", "x/p/q/new/a.callouts", false},
		{"./gen/p?.callouts", "gen/p1.callouts", true},
		{"gen/[ab].callouts", "gen/c.callouts", false},
	} {
		if got := Match(tc.glob, tc.name); got != tc.want {
			t.Errorf("Match(%q, %q) = %v, want %v", tc.glob, tc.name, got, tc.want)
		}
	}
}

func TestSettingsOverrides(t *testing.T) {
	c := &Config{Rules: map[string]rules.Severity{"datum-unused": rules.Off, "zone-shape": rules.Error}}
	s := c.Settings(Overrides{Enable: []string{"datum-unused", "zone-shape"}, Disable: []string{"datum-letter"}})
	if sev, ok := s.Severity["datum-unused"]; ok {
		t.Errorf("enabled rule turned off by the config should run at its default, got %v", sev)
	}
	if s.Severity["zone-shape"] != rules.Error {
		t.Errorf("enable must keep the config's severity, got %v", s.Severity["zone-shape"])
	}
	if sev, ok := s.Severity["datum-letter"]; !ok || sev != rules.Off {
		t.Errorf("disabled rule = %v, %v; want off", sev, ok)
	}
	if err := (Overrides{Enable: []string{"nope"}}).Check(); err == nil || !strings.Contains(err.Error(), `"nope"`) {
		t.Errorf("unknown --enable: %v", err)
	}
	if err := (Overrides{Enable: []string{"datum-unused"}, Disable: []string{"datum-unused"}}).Check(); err == nil {
		t.Error("a rule both enabled and disabled must be an error")
	}
}

func write(t *testing.T, p, s string) {
	t.Helper()
	if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(p, []byte(s), 0o644); err != nil {
		t.Fatal(err)
	}
}

func TestFind(t *testing.T) {
	top := t.TempDir()
	// A configuration above the repository root must not be used.
	write(t, filepath.Join(top, FileName), "[rules]\ndatum-unused = \"error\"\n")
	repo := filepath.Join(top, "repo")
	if err := os.MkdirAll(filepath.Join(repo, ".git"), 0o755); err != nil {
		t.Fatal(err)
	}
	write(t, filepath.Join(repo, "sub", FileName), "exclude = [\"old/**\"]\n[rules]\ndatum-unused = \"off\"\n")
	write(t, filepath.Join(repo, "bad", FileName), "[rules]\nnope = \"off\"\n")

	var f Finder
	c, err := f.Find(filepath.Join(repo, "a", "b"))
	if err != nil || c != nil {
		t.Fatalf("outside any config below the repo root: got %v, %v; want nil, nil", c, err)
	}
	c, err = f.Find(filepath.Join(repo, "sub", "deep", "er"))
	if err != nil || c == nil || c.Rules["datum-unused"] != rules.Off {
		t.Fatalf("nearest config: got %+v, %v", c, err)
	}
	c2, _ := f.Find(filepath.Join(repo, "sub"))
	if c2 != c {
		t.Error("the same file must give the same (cached) configuration")
	}
	if !c.Excluded(filepath.Join(repo, "sub", "old", "x.callouts")) || c.Excluded(filepath.Join(repo, "old", "x.callouts")) {
		t.Error("exclude globs must be matched relative to the config's folder")
	}
	if _, err := f.Find(filepath.Join(repo, "bad")); err == nil || !strings.Contains(err.Error(), filepath.Join("bad", FileName)+":2") {
		t.Errorf("bad config: %v", err)
	}
	// Without a .git folder the walk goes on to the top configuration.
	c, err = (&Finder{}).Find(filepath.Join(top, "norepo", "x"))
	if err != nil || c == nil || c.Rules["datum-unused"] != rules.Error {
		t.Errorf("walk to the filesystem root: %+v, %v", c, err)
	}
}
