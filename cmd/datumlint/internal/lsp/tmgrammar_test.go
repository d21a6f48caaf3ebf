package lsp

import (
	"encoding/json"
	"os"
	"regexp"
	"slices"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
)

// The TextMate grammar in docs/editors colours .callouts files in editors
// that read TextMate grammars. This test runs it: each pattern is compiled
// (with Go's regexp, so the grammar keeps to what RE2 and Oniguruma share),
// and every line of the test data is tokenised as a TextMate engine
// tokenises a grammar of single-line match rules: at each point the rule
// whose match starts first wins, the earlier rule on a tie.

const tmGrammarPath = "../../../../docs/editors/callouts.tmLanguage.json"

type tmRule struct {
	Match    string `json:"match"`
	Name     string `json:"name"`
	Captures map[string]struct {
		Name string `json:"name"`
	} `json:"captures"`
	re *regexp.Regexp
}

type tmGrammar struct {
	Name      string   `json:"name"`
	ScopeName string   `json:"scopeName"`
	FileTypes []string `json:"fileTypes"`
	Patterns  []struct {
		Include string `json:"include"`
	} `json:"patterns"`
	Repository map[string]*tmRule `json:"repository"`
	rules      []*tmRule
}

var letterRE = regexp.MustCompile(`^[A-Z]{1,2}(-[A-Z]{1,2})?$`)

func loadTMGrammar(t *testing.T) *tmGrammar {
	t.Helper()
	b, err := os.ReadFile(tmGrammarPath)
	if err != nil {
		t.Fatal(err)
	}
	var g tmGrammar
	if err := json.Unmarshal(b, &g); err != nil {
		t.Fatalf("%s: %v", tmGrammarPath, err)
	}
	if g.ScopeName != "source.callouts" || len(g.FileTypes) != 1 || g.FileTypes[0] != "callouts" {
		t.Errorf("scope %q, file types %v", g.ScopeName, g.FileTypes)
	}
	for _, p := range g.Patterns {
		r := g.Repository[strings.TrimPrefix(p.Include, "#")]
		if r == nil {
			t.Fatalf("pattern %q is not in the repository", p.Include)
		}
		if r.re, err = regexp.Compile(r.Match); err != nil {
			t.Fatalf("%s: %v", p.Include, err)
		}
		g.rules = append(g.rules, r)
	}
	if len(g.rules) != len(g.Repository) {
		t.Errorf("%d repository rules, %d used", len(g.Repository), len(g.rules))
	}
	return &g
}

// token is a run of a line with a scope.
type token struct {
	text, scope string
}

func (g *tmGrammar) tokenize(line string) []token {
	var out []token
	for pos := 0; pos < len(line); {
		var best []int
		var rule *tmRule
		for _, r := range g.rules {
			if strings.HasPrefix(r.Match, "^") && pos > 0 {
				continue // anchored at the line's start
			}
			m := r.re.FindStringSubmatchIndex(line[pos:])
			if m == nil || m[1] == m[0] {
				continue
			}
			if best == nil || m[0] < best[0] {
				best, rule = m, r
			}
		}
		if best == nil {
			break
		}
		start, end := pos+best[0], pos+best[1]
		if rule.Name != "" {
			out = append(out, token{line[start:end], rule.Name})
		}
		var groups []int
		for k := range rule.Captures {
			n, _ := strconv.Atoi(k)
			groups = append(groups, n)
		}
		sort.Ints(groups)
		for _, n := range groups {
			if 2*n+1 < len(best) && best[2*n] >= 0 {
				out = append(out, token{line[pos+best[2*n] : pos+best[2*n+1]], rule.Captures[strconv.Itoa(n)].Name})
			}
		}
		pos = end
	}
	return out
}

// scopeOf returns the scopes given to the first token with the text.
func scopeOf(toks []token, text string) string {
	var scopes []string
	for _, t := range toks {
		if t.text == text {
			scopes = append(scopes, t.scope)
		}
	}
	return strings.Join(scopes, " ")
}

// TestTextMateGrammar: every statement kind in the test data gets its
// keyword coloured as a statement, and the parts each kind has (names,
// kinds, datum letters, characteristics, values, comments) their scopes.
func TestTextMateGrammar(t *testing.T) {
	g := loadTMGrammar(t)
	const stmt = "keyword.control.statement.callouts"
	seen := map[string]int{}
	for _, path := range corpus(t) {
		src, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		lines := strings.Split(strings.ReplaceAll(string(src), "\r\n", "\n"), "\n")
		f := grammar.Parse(path, src)
		for i, st := range f.Stmts {
			if _, bad := st.(*grammar.BadStmt); bad {
				continue
			}
			first := f.Extents[i].First
			line := lines[first-1]
			toks := g.tokenize(line)
			kw := st.Keyword()
			if got := scopeOf(toks, kw); !strings.Contains(got, stmt) {
				t.Errorf("%s:%d: %q is scoped %q, want %s\n%v", path, first, kw, got, stmt, toks)
				continue
			}
			seen[kw]++
			check := func(what, want string) {
				t.Helper()
				if got := scopeOf(toks, what); !strings.Contains(got, want) {
					t.Errorf("%s:%d: %q is scoped %q, want %s\n%s\n%v", path, first, what, got, want, line, toks)
				}
			}
			switch s := st.(type) {
			case *grammar.FeatureStmt:
				check(s.Name.Value, "entity.name.type.feature.callouts")
				check(s.Kind.Value, "storage.type.kind.callouts")
				if s.Size != nil && s.Size.Nominal != nil {
					check(s.Size.Nominal.Text, "constant.numeric")
				}
			case *grammar.DatumStmt:
				check(s.Letter.Value, "entity.name.constant.datum.callouts")
				check(s.Target.Value, "variable.other.feature.callouts")
			case *grammar.FrameStmt:
				check(s.Target.Value, "variable.other.feature.callouts")
				if s.Characteristic.Span().Start.Line == first && slices.Contains(grammar.CharacteristicWords, grammar.CanonicalWord(s.Characteristic.Value)) {
					check(s.Characteristic.Value, "support.function.characteristic.callouts")
				}
				for _, r := range s.Tolerance.Datums {
					if r.Span().Start.Line == first && letterRE.MatchString(r.Name) {
						check(r.Name, "constant.other.datum-reference.callouts")
					}
				}
				for _, c := range s.Composites {
					l := c.Span().Start.Line
					ct := g.tokenize(lines[l-1])
					if !strings.Contains(scopeOf(ct, "composite"), stmt) {
						t.Errorf("%s:%d: composite not scoped: %v", path, l, ct)
					}
					seen["composite"]++
				}
			case *grammar.BasicStmt:
				if s.Value != nil && s.Value.Span().Start.Line == first {
					check(s.Value.Text+map[bool]string{true: "deg"}[s.Deg], "constant.numeric.callouts")
				}
			case *grammar.UnitsStmt:
				check(s.Unit.Value, "constant.language.header.callouts")
			case *grammar.StandardStmt:
				check(s.Standard.Value, "constant.language.header.callouts")
			}
		}
		for _, c := range f.Comments {
			if c.Span.Start.Line > len(lines) {
				continue
			}
			toks := g.tokenize(lines[c.Span.Start.Line-1])
			want := "comment.line.number-sign"
			if strings.Contains(c.Text, "datumlint: allow") {
				want = "keyword.other.directive.allow.callouts"
				seen["allow"]++
			}
			found := false
			for _, tk := range toks {
				found = found || (strings.HasPrefix(c.Text, tk.text) || strings.HasPrefix(tk.text, "#")) && strings.Contains(tk.scope, want)
			}
			if !found {
				t.Errorf("%s:%d: the comment %q is not scoped %s: %v", path, c.Span.Start.Line, c.Text, want, toks)
			}
			seen["comment"]++
		}
	}
	for _, kw := range append(append([]string{}, grammar.Keywords...), "composite", "comment", "allow") {
		if seen[kw] == 0 {
			t.Errorf("no %s statement in the test data was tokenised", kw)
		}
	}
	t.Logf("tokenised: %v", seen)
}

// TestTextMateDetails pins a few colourings the corpus test does not
// name: modifiers, zones, directions, counts, symbols and continuations.
func TestTextMateDetails(t *testing.T) {
	g := loadTMGrammar(t)
	cases := []struct{ line, text, scope string }{
		{"frame bore: ⌖ ⌀0.1 Ⓜ datums A, B-C (M)", "⌖", "support.function.characteristic"},
		{"frame bore: ⌖ ⌀0.1 Ⓜ datums A, B-C (M)", "⌀", "storage.modifier.zone"},
		{"frame bore: ⌖ ⌀0.1 Ⓜ datums A, B-C (M)", "Ⓜ", "keyword.operator.modifier"},
		{"frame bore: ⌖ ⌀0.1 Ⓜ datums A, B-C (M)", "B-C", "constant.other.datum-reference"},
		{"frame bore: ⌖ ⌀0.1 Ⓜ datums A, B-C (M)", "(M)", "keyword.operator.modifier"},
		{"frame bore: ⌖ ⌀0.1 Ⓜ datums A, B-C (M)", "datums", "keyword.other"},
		{"feature bolts hole 4x size 8.4 +-0.1 axis +z at (15, 15, 0) \\", "4x", "constant.numeric.count"},
		{"feature bolts hole 4x size 8.4 +-0.1 axis +z at (15, 15, 0) \\", "+z", "constant.language.direction"},
		{"feature bolts hole 4x size 8.4 +-0.1 axis +z at (15, 15, 0) \\", "+-", "keyword.operator.tolerance"},
		{"feature bolts hole 4x size 8.4 +-0.1 axis +z at (15, 15, 0) \\", "\\", "constant.character.escape.continuation"},
		{"basic 30deg from h12 to bolts.2 about hub # a comment", "30deg", "constant.numeric"},
		{"basic 30deg from h12 to bolts.2 about hub # a comment", "h12", "variable.other.name"},
		{"basic 30deg from h12 to bolts.2 about hub # a comment", "bolts.2", "variable.other.name"},
		{"basic 30deg from h12 to bolts.2 about hub # a comment", "# a comment", "comment.line"},
		{`part "Plate # 7"`, `"Plate # 7"`, "string.quoted"},
	}
	for _, c := range cases {
		toks := g.tokenize(c.line)
		if got := scopeOf(toks, c.text); !strings.Contains(got, c.scope) {
			t.Errorf("%q in %q: scope %q, want %s\n%v", c.text, c.line, got, c.scope, toks)
		}
	}
}
