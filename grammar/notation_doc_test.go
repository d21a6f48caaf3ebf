package grammar_test

import (
	"fmt"
	"go/ast"
	"go/parser"
	"go/token"
	"io/fs"
	"os"
	"path/filepath"
	"reflect"
	"regexp"
	"regexp/syntax"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules"
)

// docs/notation.md is the notation's only reference in a clone, so it must
// name everything the grammar accepts. The words are taken from the grammar
// itself, never from a list kept here: the participle tags of every struct
// in the grammar's source, the words its hand-written parser, its checks and
// the resolver compare tokens with, the finite spellings of the lexer's
// token rules, and the word tables (kinds, characteristics and their
// symbols, standards, placements, modifiers). A keyword added to any of
// them fails TestNotationDocCoversGrammar until the page shows it.

const notationDoc = "../docs/notation.md"

// A word the grammar accepts and where it was found.
type grammarWord struct {
	text  string
	where string
}

func TestNotationDocCoversGrammar(t *testing.T) {
	src := grammarSources(t)
	words := collectWords(t, src)
	if len(words) < 100 {
		t.Fatalf("only %d words found in the grammar; the collection is broken", len(words))
	}
	doc, err := os.ReadFile(notationDoc)
	if err != nil {
		t.Fatal(err)
	}
	code := codeOf(string(doc))
	for _, w := range missingWords(words, code) {
		t.Errorf("docs/notation.md does not show %q in code (from %s): document it, with an example", w.text, w.where)
	}
	for _, kw := range statementKeywords(t, src) {
		if !startsCodeLine(code, kw) {
			t.Errorf("docs/notation.md has no example line that starts with the statement keyword %q: add one in a code block", kw)
		}
	}
}

// The page's examples are written in the notation: every block marked
// callouts reads without a syntax finding (a block of statements without
// a header is fine), and one marked "callouts clean" has no finding at
// all. Templates and output are in blocks marked text, json and so on.
func TestNotationDocExamplesParse(t *testing.T) {
	doc, err := os.ReadFile(notationDoc)
	if err != nil {
		t.Fatal(err)
	}
	blocks := 0
	for _, b := range fencedBlocks(string(doc)) {
		info := strings.Fields(b.info)
		if len(info) == 0 || info[0] != "callouts" {
			continue
		}
		blocks++
		name := fmt.Sprintf("docs/notation.md:%d", b.line)
		part := grammar.Read(name, []byte(b.text))
		for _, e := range part.Problems {
			t.Errorf("%s: the example does not read: %d:%d: %s", name, b.line+e.Span.Start.Line, e.Span.Start.Col, e.Message)
		}
		if len(info) > 1 && info[1] == "clean" {
			for _, d := range rules.Check(part, nil) {
				t.Errorf("%s: the clean example has a finding: %d:%d: %s: %s", name, b.line+d.Span.Start.Line, d.Span.Start.Col, d.Rule, d.Message)
			}
		}
	}
	if blocks < 10 {
		t.Errorf("only %d callouts examples found in docs/notation.md", blocks)
	}
}

// The check must be able to fail for every word: a page without the word
// is reported, whatever else it shows.
func TestNotationDocCheckFailsForEachWord(t *testing.T) {
	words := collectWords(t, grammarSources(t))
	doc, err := os.ReadFile(notationDoc)
	if err != nil {
		t.Fatal(err)
	}
	code := codeOf(string(doc))
	for _, w := range words {
		without := docCode{text: removeWord(code.text, w.text)}
		found := false
		for _, m := range missingWords([]grammarWord{w}, without) {
			found = found || m.text == w.text
		}
		if !found {
			t.Errorf("a page without %q is not reported", w.text)
		}
	}
	for _, kw := range statementKeywords(t, grammarSources(t)) {
		if startsCodeLine(docCode{lines: []string{"# " + kw, "  x " + kw}}, kw) {
			t.Errorf("a page whose code lines do not start with %q passes the example check", kw)
		}
	}
}

// A keyword added in a new file of the grammar, as a participle literal or
// as a word a parser compares, is collected.
func TestNotationDocCollectsNewKeywords(t *testing.T) {
	src := grammarSources(t)
	src["sweep.go"] = []byte("package grammar\n" +
		"type SweepStmt struct {\n\tnode\n\tPath *Name `parser:\"'sweep' @@ ( 'twist' @@ )?\"`\n}\n" +
		"func pick(w string) bool {\n\tswitch w {\n\tcase \"helix\":\n\t\treturn true\n\t}\n\treturn false\n}\n" +
		"func (p *fastParser) sweep() { p.expect(\"sweep\"); p.isWord(\"pitch\") }\n" +
		"var sweepParser = build[SweepStmt]()\n")
	got := map[string]bool{}
	for _, w := range collectWords(t, src) {
		got[w.text] = true
	}
	for _, w := range []string{"sweep", "twist", "helix", "pitch"} {
		if !got[w] {
			t.Errorf("the new keyword %q is not collected", w)
		}
	}
	kws := statementKeywords(t, src)
	if i := sort.SearchStrings(kws, "sweep"); i == len(kws) || kws[i] != "sweep" {
		t.Errorf("the new statement keyword sweep is not collected: %v", kws)
	}
}

// grammarSources reads the grammar's Go source (this folder and those
// below it, tests and test data left out, and the QIF reader, whose words
// are QIF's, not the notation's).
func grammarSources(t *testing.T) map[string][]byte {
	t.Helper()
	out := map[string][]byte{}
	err := filepath.WalkDir(".", func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() && (d.Name() == "testdata" || p == "qif") {
			return fs.SkipDir
		}
		if d.IsDir() || !strings.HasSuffix(p, ".go") || strings.HasSuffix(p, "_test.go") {
			return nil
		}
		b, err := os.ReadFile(p)
		out[p] = b
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

var literalRE = regexp.MustCompile(`'((?:\\.|[^'\\])*)'`)

// collectWords gathers every word and symbol the grammar accepts.
func collectWords(t *testing.T, src map[string][]byte) []grammarWord {
	t.Helper()
	seen := map[string]bool{}
	var out []grammarWord
	add := func(w, where string) {
		if w == "" || seen[w] {
			return
		}
		seen[w] = true
		out = append(out, grammarWord{w, where})
	}
	names := make([]string, 0, len(src))
	for name := range src {
		names = append(names, name)
	}
	sort.Strings(names)
	for _, name := range names {
		f, err := parser.ParseFile(token.NewFileSet(), name, src[name], 0)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		ast.Inspect(f, func(n ast.Node) bool {
			switch n := n.(type) {
			case *ast.Field:
				// participle literals: 'word' in a parser tag
				if n.Tag == nil {
					break
				}
				tag, err := strconv.Unquote(n.Tag.Value)
				if err != nil {
					break
				}
				for _, m := range literalRE.FindAllStringSubmatch(reflect.StructTag(tag).Get("parser"), -1) {
					add(m[1], name+": parser tag")
				}
			case *ast.CaseClause:
				// the words a parser, a check or the resolver switches on
				for _, e := range n.List {
					if s, ok := stringLit(e); ok && isToken(s) {
						add(s, name+": case")
					}
				}
			case *ast.CallExpr:
				// the hand-written parser's expect("w") and isWord("w")
				if sel, ok := n.Fun.(*ast.SelectorExpr); ok && (sel.Sel.Name == "expect" || sel.Sel.Name == "isWord") && len(n.Args) == 1 {
					if s, ok := stringLit(n.Args[0]); ok && isToken(s) {
						add(s, name+": "+sel.Sel.Name)
					}
				}
			}
			return true
		})
	}
	// Every fixed spelling of a token rule of the lexer (directions, the
	// dia and characteristic symbols, the circled modifiers, ±, ..), with
	// the ASCII word or modifier each one stands for.
	for _, r := range grammar.LexerRules() {
		for _, s := range spellings(t, r.Pattern) {
			add(s, "lexer rule "+r.Name)
			if c := grammar.CanonicalWord(s); c != s {
				add(c, "the ASCII form of "+s)
			}
			if r.Name == "Modifier" {
				add("("+grammar.ModifierLetter(s)+")", "the ASCII form of "+s)
			}
		}
	}
	for _, w := range grammar.Keywords {
		add(w, "grammar.Keywords")
	}
	for _, w := range grammar.CharacteristicWords {
		add(w, "grammar.CharacteristicWords")
	}
	for s, w := range grammar.CharacteristicSymbols {
		add(s, "the symbol of "+w)
	}
	for l := range grammar.FrameModifiers {
		add("("+l+")", "the frame modifiers (check.go)")
	}
	for _, w := range model.KindWords {
		add(w, "model.KindWords")
	}
	for _, w := range model.StandardWords {
		add(w, "model.StandardWords")
	}
	for _, w := range model.PlacementWords {
		add(w, "model.PlacementWords")
	}
	sort.Slice(out, func(i, j int) bool { return out[i].text < out[j].text })
	return out
}

func stringLit(e ast.Expr) (string, bool) {
	b, ok := e.(*ast.BasicLit)
	if !ok || b.Kind != token.STRING {
		return "", false
	}
	s, err := strconv.Unquote(b.Value)
	return s, err == nil
}

// isToken reports whether s is one token of the notation: the words the
// grammar compares with, not messages or other strings.
func isToken(s string) bool {
	if s == "" || strings.ContainsAny(s, " \t\n") {
		return false
	}
	for _, r := range grammar.LexerRules() {
		if r.Name == "Whitespace" {
			continue
		}
		re, err := regexp.Compile(`^(?:` + r.Pattern + `)$`)
		if err == nil && re.MatchString(s) {
			return true
		}
	}
	return false
}

// spellings lists the strings a token pattern matches when they are
// finitely many; of an alternation, the finite branches (the circled
// modifiers of `\(\s*[A-Za-z]\s*\)|[ⓂⓁ…]`).
func spellings(t *testing.T, pattern string) []string {
	re, err := syntax.Parse(pattern, syntax.Perl)
	if err != nil {
		t.Fatalf("lexer pattern %q: %v", pattern, err)
	}
	set, _ := expand(re.Simplify())
	sort.Strings(set)
	return set
}

// expand returns the strings re matches and whether that is all of them.
func expand(re *syntax.Regexp) ([]string, bool) {
	switch re.Op {
	case syntax.OpEmptyMatch, syntax.OpWordBoundary, syntax.OpNoWordBoundary,
		syntax.OpBeginText, syntax.OpEndText, syntax.OpBeginLine, syntax.OpEndLine:
		return []string{""}, true
	case syntax.OpLiteral:
		return []string{string(re.Rune)}, true
	case syntax.OpCharClass:
		var out []string
		for i := 0; i+1 < len(re.Rune); i += 2 {
			if re.Rune[i+1]-re.Rune[i] > 256 {
				return nil, false
			}
			for r := re.Rune[i]; r <= re.Rune[i+1]; r++ {
				out = append(out, string(r))
			}
		}
		return out, true
	case syntax.OpCapture:
		return expand(re.Sub[0])
	case syntax.OpQuest:
		s, ok := expand(re.Sub[0])
		return append([]string{""}, s...), ok
	case syntax.OpConcat:
		out := []string{""}
		for _, sub := range re.Sub {
			s, ok := expand(sub)
			if !ok {
				return nil, false
			}
			var next []string
			for _, a := range out {
				for _, b := range s {
					next = append(next, a+b)
				}
			}
			out = next
		}
		return out, true
	case syntax.OpAlternate:
		var out []string
		all := true
		for _, sub := range re.Sub {
			s, ok := expand(sub)
			all = all && ok
			if ok {
				out = append(out, s...)
			}
		}
		return out, all
	}
	return nil, false // repetitions, any character: not finitely many
}

// statementKeywords are the words a statement starts with: grammar.Keywords,
// the leading literal of every root the parsers are built for
// (build[T]()), and of the composite line.
func statementKeywords(t *testing.T, src map[string][]byte) []string {
	t.Helper()
	set := map[string]bool{}
	for _, w := range grammar.Keywords {
		set[w] = true
	}
	roots := map[string]bool{}
	tags := map[string]string{} // struct name -> its first parser tag
	for name, b := range src {
		f, err := parser.ParseFile(token.NewFileSet(), name, b, 0)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		ast.Inspect(f, func(n ast.Node) bool {
			switch n := n.(type) {
			case *ast.IndexExpr:
				if id, ok := n.X.(*ast.Ident); ok && id.Name == "build" {
					if arg, ok := n.Index.(*ast.Ident); ok {
						roots[arg.Name] = true
					}
				}
			case *ast.TypeSpec:
				if st, ok := n.Type.(*ast.StructType); ok {
					for _, fl := range st.Fields.List {
						if fl.Tag == nil {
							continue
						}
						tag, _ := strconv.Unquote(fl.Tag.Value)
						if p := reflect.StructTag(tag).Get("parser"); p != "" {
							tags[n.Name.Name] = p
							break
						}
					}
				}
			}
			return true
		})
	}
	composite := reflect.TypeOf(grammar.Composite{})
	for i := 0; i < composite.NumField(); i++ {
		if p := composite.Field(i).Tag.Get("parser"); p != "" {
			tags["Composite"], roots["Composite"] = p, true
			break
		}
	}
	if len(roots) < len(grammar.Keywords) {
		t.Fatalf("found %d parser roots (build[T]()) for %d statement keywords: the collection is broken", len(roots), len(grammar.Keywords))
	}
	for root := range roots {
		m := regexp.MustCompile(`^\s*'([^']+)'`).FindStringSubmatch(tags[root])
		if m == nil {
			t.Errorf("the statement root %s does not start with a keyword literal (its tag: %q)", root, tags[root])
			continue
		}
		set[m[1]] = true
	}
	out := make([]string, 0, len(set))
	for w := range set {
		out = append(out, w)
	}
	sort.Strings(out)
	return out
}

// A fenced block of a Markdown page: its info string, the line of its
// opening fence and its text.
type fencedBlock struct {
	info string
	line int
	text string
}

func fencedBlocks(md string) []fencedBlock {
	var out []fencedBlock
	var cur *fencedBlock
	var lines []string
	for i, line := range strings.Split(md, "\n") {
		t := strings.TrimSpace(line)
		switch {
		case cur == nil && strings.HasPrefix(t, "```"):
			cur = &fencedBlock{info: strings.TrimPrefix(t, "```"), line: i + 1}
			lines = nil
		case cur != nil && strings.HasPrefix(t, "```"):
			cur.text = strings.Join(lines, "\n") + "\n"
			out = append(out, *cur)
			cur = nil
		case cur != nil:
			lines = append(lines, line)
		}
	}
	return out
}

// docCode is the code of a Markdown page: the lines of its fenced blocks,
// and all of its code (blocks and inline spans) as one text.
type docCode struct {
	lines []string
	text  string
}

var inlineCodeRE = regexp.MustCompile("(`+)(.+?)(`+)")

func codeOf(md string) docCode {
	var c docCode
	var parts []string
	for _, b := range fencedBlocks(md) {
		lines := strings.Split(strings.TrimSuffix(b.text, "\n"), "\n")
		c.lines = append(c.lines, lines...)
		parts = append(parts, lines...)
	}
	fenced := false
	for _, line := range strings.Split(md, "\n") {
		if strings.HasPrefix(strings.TrimSpace(line), "```") {
			fenced = !fenced
			continue
		}
		if fenced {
			continue
		}
		for _, m := range inlineCodeRE.FindAllStringSubmatch(line, -1) {
			if m[1] == m[3] {
				parts = append(parts, strings.TrimSpace(m[2]))
			}
		}
	}
	c.text = strings.Join(parts, "\n")
	return c
}

// wordPattern finds w standing alone: a word not inside a longer name
// (`on` is not found in `on-surface`), a symbol anywhere.
func wordPattern(w string) *regexp.Regexp {
	if regexp.MustCompile(`^[A-Za-z_][A-Za-z0-9_-]*$`).MatchString(w) {
		return regexp.MustCompile(`(^|[^A-Za-z0-9_-])` + regexp.QuoteMeta(w) + `($|[^A-Za-z0-9_-])`)
	}
	return regexp.MustCompile(`()` + regexp.QuoteMeta(w) + `()`)
}

func missingWords(words []grammarWord, code docCode) []grammarWord {
	var out []grammarWord
	for _, w := range words {
		if !wordPattern(w.text).MatchString(code.text) {
			out = append(out, w)
		}
	}
	return out
}

func startsCodeLine(code docCode, kw string) bool {
	for _, l := range code.lines {
		if f := strings.Fields(l); len(f) > 0 && f[0] == kw {
			return true
		}
	}
	return false
}

// removeWord blanks every occurrence of w standing alone (repeatedly: a
// match takes the separator that a neighbouring occurrence needs).
func removeWord(text, w string) string {
	re := wordPattern(w)
	for re.MatchString(text) {
		text = re.ReplaceAllString(text, "${1}\x00${2}")
	}
	return text
}
