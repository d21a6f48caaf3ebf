package rules_test

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/rules"
)

// A suggestion in a message is a promise: doing what it says clears the
// finding. TestSuggestionsClear holds the rules of issue 11 (and the
// qualification rule they changed) to it on every test file, with every
// rule running: for each finding it does what the message says, as a
// drafter would (the text in backquotes, the value after "e.g.", the word to
// remove), checks again, and requires that one finding of that rule fewer
// is left and that the edit gave no new finding of the rules that would
// show a suggestion to be wrong (syntax, an undefined name or datum, a
// characteristic or zone the geometry contradicts).
func TestSuggestionsClear(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("testdata", "*.callouts"))
	if err != nil {
		t.Fatal(err)
	}
	srcs := map[string][]byte{}
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		srcs[f] = b
	}
	for _, r := range rules.All() {
		if suggestionRules[r.ID] || r.ID == rules.ModifierIllegal.ID || r.ID == rules.CompositeInvalid.ID {
			srcs[r.ID+" bad example"] = []byte(exampleFile(r.Bad))
		}
	}
	tried := map[string]int{}
	for name, src := range srcs {
		before := rules.Check(grammar.Read(name, src), nil)
		for _, d := range before {
			if !inScope(d) || d.Suppressed {
				continue
			}
			out, ok := followSuggestion(src, d)
			if !ok {
				t.Errorf("%s:%d: %s: the test does not know how to follow this message: %s", name, d.Span.Start.Line, d.Rule, d.Message)
				continue
			}
			tried[d.Rule]++
			after := rules.Check(grammar.Read(name, out), nil)
			if n, m := count2(before, d.Rule), count2(after, d.Rule); m > n-1 {
				t.Errorf("%s:%d: %s: following the suggestion left %d findings of the rule (was %d): %s\n%s", name, d.Span.Start.Line, d.Rule, m, n, d.Message, out)
			}
			for id := range revealing {
				if count2(after, id) > count2(before, id) {
					t.Errorf("%s:%d: %s: following the suggestion gave a new %s finding: %s\n%s", name, d.Span.Start.Line, d.Rule, id, d.Message, newOf(before, after, id))
				}
			}
		}
	}
	for id := range suggestionRules {
		if tried[id] == 0 {
			t.Errorf("no %s finding was tried", id)
		}
	}
	for _, id := range []string{rules.ModifierIllegal.ID, rules.CompositeInvalid.ID} {
		if tried[id] == 0 {
			t.Errorf("no %s finding was tried", id)
		}
	}
	t.Logf("findings whose suggestion was followed: %v", tried)
}

// inScope reports whether the test follows the finding's message: every
// message of suggestionRules, and the messages issue 11 added to older
// rules (a runout datum at MMB or LMB, a composite position on a single
// feature).
func inScope(d rules.Diagnostic) bool {
	switch d.Rule {
	case rules.ModifierIllegal.ID:
		return strings.Contains(d.Message, ") from datum ")
	case rules.CompositeInvalid.ID:
		return strings.HasPrefix(d.Message, "composite position on the single feature")
	}
	return suggestionRules[d.Rule]
}

// suggestionRules are the rules whose every message this test follows.
var suggestionRules = map[string]bool{
	"characteristic-mismatch": true, "refinement-ineffective": true, "datum-self-reference": true,
	"datum-same-feature": true, "envelope-redundant": true, "datum-letter": true, "datum-unqualified": true,
}

// revealing are the rules whose new finding after an edit shows the
// suggestion to be wrong.
var revealing = map[string]bool{
	"syntax": true, "name-undefined": true, "datum-undefined": true, "characteristic-mismatch": true,
	"zone-shape": true, "datums-required": true, "datums-forbidden": true, "modifier-illegal": true,
}

func count2(ds []rules.Diagnostic, rule string) int {
	n := 0
	for _, d := range ds {
		if d.Rule == rule && !d.Suppressed {
			n++
		}
	}
	return n
}

func newOf(before, after []rules.Diagnostic, rule string) string {
	had := map[string]bool{}
	for _, d := range before {
		had[d.Message] = true
	}
	var out []string
	for _, d := range after {
		if d.Rule == rule && !had[d.Message] {
			out = append(out, d.Message)
		}
	}
	return strings.Join(out, "\n")
}

var (
	quotedFrame  = regexp.MustCompile("`(frame [^`]*)`")
	quotedDatums = regexp.MustCompile("`(datums [^`]*)`")
	useWord      = regexp.MustCompile(`: use ([a-z-]+)( without dia)?`)
	egValue      = regexp.MustCompile(`e\.g\. ([0-9.]+)`)
	alreadyDatum = regexp.MustCompile(`is already datum (\S+) `)
)

// followSuggestion edits src as the finding's message says; ok is false
// where the test does not know how.
func followSuggestion(src []byte, d rules.Diagnostic) ([]byte, bool) {
	f := source.NewFile("", src)
	lines := strings.Split(string(src), "\n")
	line := d.Span.Start.Line - 1
	spanText := string(src[f.Offset(d.Span.Start):f.Offset(d.Span.End)])
	cut := func() []byte { // remove the span's text and one space before it
		from, to := f.Offset(d.Span.Start), f.Offset(d.Span.End)
		if from > 0 && src[from-1] == ' ' {
			from--
		}
		return append(append([]byte(nil), src[:from]...), src[to:]...)
	}
	replaceLine := func(text string) []byte {
		out := append([]string(nil), lines...)
		out[line] = text
		return []byte(strings.Join(out, "\n"))
	}
	m := d.Message
	switch d.Rule {
	case "characteristic-mismatch", "composite-invalid":
		switch {
		case strings.Contains(m, "remove dia"):
			return cut(), true
		case useWord.MatchString(m):
			w := useWord.FindStringSubmatch(m)
			from, to := f.Offset(d.Span.Start), f.Offset(d.Span.End)
			rest := src[to:]
			if w[2] != "" {
				rest = []byte(strings.Replace(string(rest), " dia", "", 1))
			}
			return append(append(append([]byte(nil), src[:from]...), w[1]...), rest...), true
		case quotedFrame.MatchString(m):
			return replaceLine(quotedFrame.FindStringSubmatch(m)[1]), true
		}
	case "refinement-ineffective":
		if v := egValue.FindStringSubmatch(m); v != nil {
			from, to := f.Offset(d.Span.Start), f.Offset(d.Span.End)
			return append(append(append([]byte(nil), src[:from]...), v[1]...), src[to:]...), true
		}
	case "datum-self-reference":
		if q := quotedDatums.FindStringSubmatch(m); q != nil {
			i := strings.Index(lines[line], "datums ")
			rest := lines[line][i:]
			end := strings.Index(rest, "#")
			if end < 0 {
				end = len(rest)
			}
			return replaceLine(lines[line][:i] + q[1] + " " + rest[end:]), true
		}
		if q := quotedFrame.FindStringSubmatch(m); q != nil {
			return replaceLine(q[1]), true
		}
	case "datum-same-feature":
		// Remove this symbol and reference the first letter where this one
		// is used.
		if a := alreadyDatum.FindStringSubmatch(m); a != nil {
			return renameLetter(lines, line, spanText, a[1], true), true
		}
	case "envelope-redundant", "modifier-illegal":
		return cut(), true
	case "datum-letter":
		// Choose another letter (one that no datum uses), everywhere.
		used := map[string]bool{}
		for _, l := range lines {
			if w := strings.Fields(l); len(w) > 1 && w[0] == "datum" {
				used[w[1]] = true
			}
		}
		for c := 'A'; c <= 'Z'; c++ {
			if !strings.ContainsRune("IOQ", c) && !used[string(c)] {
				return renameLetter(lines, line, spanText, string(c), false), true
			}
		}
	case "datum-unqualified":
		// Each problem adds a frame: the last one quoted in it (the form
		// tolerance where (E) is the other choice).
		out := src
		n := 0
		for _, part := range strings.Split(m, "; also, ") {
			q := quotedFrame.FindAllStringSubmatch(part, -1)
			if len(q) == 0 {
				return nil, false
			}
			out = []byte(strings.TrimRight(string(out), "\n") + "\n" + q[len(q)-1][1] + "\n")
			n++
		}
		return out, n > 0
	}
	return nil, false
}

// renameLetter replaces the datum letter from with to in every frame's
// datum references and, unless drop, in the datum statement on line; with
// drop it removes that statement.
func renameLetter(lines []string, line int, from, to string, drop bool) []byte {
	re := regexp.MustCompile(`\b` + regexp.QuoteMeta(from) + `\b`)
	var out []string
	for i, l := range lines {
		switch {
		case i == line && drop:
			continue
		case i == line:
			l = strings.Replace(l, "datum "+from+" ", "datum "+to+" ", 1)
		default:
			if k := strings.Index(l, "datums "); k >= 0 {
				code, comment := l[k:], ""
				if c := strings.Index(code, "#"); c >= 0 {
					code, comment = code[:c], code[c:]
				}
				l = l[:k] + re.ReplaceAllString(code, to) + comment
			}
		}
		out = append(out, l)
	}
	return []byte(strings.Join(out, "\n"))
}
