package rules_test

import (
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"

	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/lint"
	"github.com/datumlint/datumlint/rules/longtest"
)

// want is one expected finding, written in a test file as a trailing
// comment: `# want RULE-ID` or `# want RULE-ID "regexp"`.
type want struct {
	line int
	rule string
	re   *regexp.Regexp
}

var wantRE = regexp.MustCompile(`#\s*want\s+(.*)$`)

// checkRE matches the line that names the rules a test file is about:
// `# check: RULE-ID, RULE-ID`. Only those rules run on the file (as
// analysistest runs one analyzer over its own folder), so that a new rule
// does not break the test files of others; a file without it runs every
// rule, as the clean files and the whole-corpus runs (examples, generated
// parts) do, which is where a rule firing on a correct part shows.
var checkRE = regexp.MustCompile(`(?m)^#\s*check:\s*(.*)$`)

// settingsFor returns the settings that run only the rules a test file
// names, or nil (every rule at its default) when it names none.
func settingsFor(t *testing.T, name string, src []byte) *rules.Settings {
	t.Helper()
	m := checkRE.FindSubmatch(src)
	if m == nil {
		return nil
	}
	s := &rules.Settings{Severity: map[string]rules.Severity{}}
	for _, r := range rules.All() {
		s.Severity[r.ID] = rules.Off
	}
	for _, id := range strings.FieldsFunc(string(m[1]), func(r rune) bool { return r == ',' || r == ' ' }) {
		r := rules.Lookup(id)
		if r == nil {
			t.Fatalf("%s: '# check:' names unknown rule %q", name, id)
		}
		s.Severity[id] = r.Severity
	}
	return s
}

// parseWants reads the expectations of a test file.
func parseWants(t *testing.T, name string, src []byte) []want {
	t.Helper()
	var out []want
	for i, line := range strings.Split(string(src), "\n") {
		m := wantRE.FindStringSubmatch(line)
		if m == nil {
			continue
		}
		rest := strings.TrimSpace(m[1])
		for rest != "" {
			if rest[0] == '"' {
				end := strings.Index(rest[1:], `"`)
				if end < 0 || len(out) == 0 || out[len(out)-1].line != i+1 {
					t.Fatalf("%s:%d: malformed want comment", name, i+1)
				}
				out[len(out)-1].re = regexp.MustCompile(rest[1 : end+1])
				rest = strings.TrimSpace(rest[end+2:])
				continue
			}
			f := strings.Fields(rest)[0]
			if rules.Lookup(f) == nil && f != rules.InternalRule {
				t.Fatalf("%s:%d: want names unknown rule %q", name, i+1, f)
			}
			out = append(out, want{line: i + 1, rule: f})
			rest = strings.TrimSpace(rest[len(f):])
		}
	}
	return out
}

// checkWants fails the test on every missing and every unexpected finding.
func checkWants(t *testing.T, name string, src []byte, ds []rules.Diagnostic) {
	t.Helper()
	wants := parseWants(t, name, src)
	used := make([]bool, len(ds))
	for _, w := range wants {
		found := false
		for i, d := range ds {
			if used[i] || d.Suppressed || d.Span.Start.Line != w.line || d.Rule != w.rule {
				continue
			}
			if w.re != nil && !w.re.MatchString(d.Message) {
				continue
			}
			used[i], found = true, true
			break
		}
		if !found {
			re := ""
			if w.re != nil {
				re = fmt.Sprintf(" matching %q", w.re)
			}
			t.Errorf("%s:%d: missing %s finding%s", name, w.line, w.rule, re)
		}
	}
	for i, d := range ds {
		if !used[i] && !d.Suppressed {
			t.Errorf("%s:%d:%d: unexpected %s %s: %s", name, d.Span.Start.Line, d.Span.Start.Col, d.Severity, d.Rule, d.Message)
		}
	}
}

// TestRuleData checks every file in testdata against its inline
// expectations.
func TestRuleData(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("testdata", "*.callouts"))
	if err != nil {
		t.Fatal(err)
	}
	if len(files) == 0 {
		t.Fatal("no test data found")
	}
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			src, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			s := settingsFor(t, f, src)
			if s != nil {
				for _, w := range parseWants(t, f, src) {
					if s.Severity[w.rule] == rules.Off {
						t.Fatalf("%s:%d: want names %s, which the file's '# check:' line does not run", f, w.line, w.rule)
					}
				}
			}
			ds := rules.Check(grammar.Read(f, src), s)
			checkWants(t, f, src, ds)
			for _, d := range ds {
				if r := rules.Lookup(d.Rule); len(d.Fixes) > 0 && (r == nil || r.Fix == "") {
					t.Errorf("%s offers a fix that its rule does not document (Rule.Fix)", d.Rule)
				}
			}
		})
	}
}

// TestRegistry checks that every rule is complete, that its bad example
// triggers it and that its good example does not.
func TestRegistry(t *testing.T) {
	all := rules.All()
	if len(all) < 15 {
		t.Fatalf("only %d rules registered", len(all))
	}
	for _, r := range all {
		t.Run(r.ID, func(t *testing.T) {
			if err := rules.Validate(r); err != nil {
				t.Fatal(err)
			}
			if n := count(r.ID, exampleFile(r.Bad)); n == 0 {
				t.Errorf("bad example does not trigger %s:\n%s", r.ID, r.Bad)
			}
			if n := count(r.ID, exampleFile(r.Good)); n != 0 {
				t.Errorf("good example triggers %s %d times:\n%s", r.ID, n, r.Good)
			}
			if isQIF(r.Bad) != isQIF(r.Good) {
				t.Errorf("one example is a QIF document and the other is not")
			}
			if isQIF(r.Good) {
				for _, d := range rules.Check(lint.Read(exampleName(r.Good), []byte(r.Good)), nil) {
					t.Errorf("the good QIF example has a finding: %s %s: %s", d.Span.Start, d.Rule, d.Message)
				}
			}
		})
	}
}

// isQIF reports whether an example is a QIF document (a rule about QIF
// documents as such shows one), which is read as a .qif file.
func isQIF(ex string) bool { return strings.HasPrefix(strings.TrimSpace(ex), "<") }

func exampleName(ex string) string {
	if isQIF(ex) {
		return "example.qif"
	}
	return "example.callouts"
}

// exampleFile wraps an example in a header unless it has one of its own
// (or is a QIF document).
func exampleFile(ex string) string {
	if isQIF(ex) {
		return ex
	}
	for _, l := range strings.Split(ex, "\n") {
		w := strings.Fields(l)
		if len(w) > 0 && (w[0] == "units" || w[0] == "standard" || w[0] == "part") {
			return ex + "\n"
		}
	}
	return "units mm\nstandard asme-2018\n" + ex + "\n"
}

func count(rule, src string) int {
	n := 0
	for _, d := range rules.Check(lint.Read(exampleName(src), []byte(src)), nil) {
		if d.Rule == rule && !d.Suppressed {
			n++
		}
	}
	return n
}

// TestNoPanicOnEveryPrefix feeds prefixes of the test files (cut at every
// 7th byte in the long run, every 31st otherwise) through the whole check:
// bad input yields findings, never a panic.
func TestNoPanicOnEveryPrefix(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join("testdata", "*.callouts"))
	step := longtest.N(31, 7)
	for _, f := range files {
		src, _ := os.ReadFile(f)
		for i := 0; i < len(src); i += step {
			for _, d := range rules.Check(grammar.Read(f, src[:i]), nil) {
				if d.Rule == rules.InternalRule {
					t.Fatalf("%s cut at %d: %s", f, i, d.Message)
				}
				if d.Span.Start.Line < 1 || d.Span.Start.Col < 1 {
					t.Fatalf("%s cut at %d: finding without position: %+v", f, i, d)
				}
			}
		}
	}
}
