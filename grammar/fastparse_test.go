package grammar

import (
	"bytes"
	"fmt"
	"go/ast"
	"go/parser"
	gotoken "go/token"
	"io/fs"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"github.com/alecthomas/participle/v2/lexer"
)

// participleStmt parses one lexed statement with participle alone, the
// reference for the hand-written parser.
func participleStmt(keyword string, all []lexer.Token, eof lexer.Token) (Stmt, error) {
	p, err := lexer.Upgrade(&sliceLexer{toks: all, eof: eof}, tokWhitespace)
	if err != nil {
		return nil, err
	}
	switch keyword {
	case "part":
		return run(partParser(), p)
	case "units":
		return run(unitsParser(), p)
	case "standard":
		return run(standardParser(), p)
	case "feature":
		return run(featureParser(), p)
	case "datum":
		return run(datumParser(), p)
	case "frame":
		return run(frameParser(), p)
	case "basic":
		return run(basicParser(), p)
	case "dim":
		return run(dimParser(), p)
	case "basis":
		return run(basisParser(), p)
	case "target":
		return run(targetParser(), p)
	case "ref":
		return run(refParser(), p)
	}
	return nil, fmt.Errorf("no statement starts with %q", keyword)
}

// stmtResult is what both parsers made of one statement.
type stmtResult struct {
	text     string
	fast     Stmt  // nil: not handled
	ref      Stmt  // participle's tree, nil on error
	refErr   error // participle's error
	lexError bool  // the statement does not lex (lexStmt): participle never sees it
}

// parseBoth splits src into statements as Parse does and parses each with
// both parsers.
func parseBoth(src []byte) []stmtResult {
	body := bytes.TrimPrefix(src, []byte("\xef\xbb\xbf"))
	if looksBinary(body) {
		return nil
	}
	var out []stmtResult
	for _, rs := range splitStatements(splitLines(body)) {
		r := stmtResult{text: rs.text, fast: fastParse("t.callouts", rs)}
		all, sig, eof, lerr := lexStmt("t.callouts", rs)
		if lerr != nil || len(sig) == 0 {
			r.lexError = true
			out = append(out, r)
			continue
		}
		r.ref, r.refErr = participleStmt(sig[0].Value, all, eof)
		if e := outOfRange(sig); r.refErr == nil && e != nil {
			// parseStmt rejects what participle accepts with a number
			// beyond a float64; the fast parser must leave it.
			r.ref, r.refErr = nil, e
		}
		out = append(out, r)
	}
	return out
}

// sameTrees fails when the fast parser accepted a statement and participle
// did not, or built a different tree. With valid set, it also fails when
// participle accepted a statement the fast parser left to it.
func sameTrees(t *testing.T, where string, src []byte, valid bool) (handled, total int) {
	t.Helper()
	for _, r := range parseBoth(src) {
		if r.lexError {
			if valid {
				t.Errorf("%s: %q does not lex", where, r.text)
			}
			if r.fast != nil {
				t.Errorf("%s: %q: the fast parser accepted a statement that does not lex:\n%s", where, r.text, dumpTree(r.fast))
			}
			continue
		}
		total++
		switch {
		case r.fast != nil && r.refErr != nil:
			t.Errorf("%s: %q: the fast parser accepted what participle rejects (%v):\n%s", where, r.text, r.refErr, dumpTree(r.fast))
		case r.fast != nil && !reflect.DeepEqual(r.fast, r.ref):
			t.Errorf("%s: %q: the trees differ\nparticiple:\n%s\nfast:\n%s", where, r.text, dumpTree(r.ref), dumpTree(r.fast))
		case r.fast == nil && r.refErr == nil && valid:
			t.Errorf("%s: %q: the fast parser left a statement to participle that participle accepts", where, r.text)
		}
		if r.fast != nil {
			handled++
		}
	}
	return handled, total
}

// dumpTree prints a tree with every field and position, one node per
// line, so that two trees can be compared by eye.
func dumpTree(v any) string {
	var b strings.Builder
	var walk func(rv reflect.Value, indent string)
	walk = func(rv reflect.Value, indent string) {
		switch rv.Kind() {
		case reflect.Interface, reflect.Pointer:
			if rv.IsNil() {
				b.WriteString("nil\n")
				return
			}
			walk(rv.Elem(), indent)
		case reflect.Slice:
			if rv.IsNil() {
				b.WriteString("nil slice\n")
				return
			}
			b.WriteString("[\n")
			for i := 0; i < rv.Len(); i++ {
				b.WriteString(indent + "  ")
				walk(rv.Index(i), indent+"  ")
			}
			b.WriteString(indent + "]\n")
		case reflect.Struct:
			if rv.Type() == reflect.TypeOf(lexer.Position{}) {
				p := rv.Interface().(lexer.Position)
				fmt.Fprintf(&b, "%s:%d:%d@%d\n", p.Filename, p.Line, p.Column, p.Offset)
				return
			}
			b.WriteString(rv.Type().Name() + "\n")
			for i := 0; i < rv.NumField(); i++ {
				f := rv.Type().Field(i)
				b.WriteString(indent + "  " + f.Name + ": ")
				walk(rv.Field(i), indent+"  ")
			}
		default:
			fmt.Fprintf(&b, "%#v\n", rv.Interface())
		}
	}
	walk(reflect.ValueOf(v), "")
	return b.String()
}

// testFuncStrings returns the cases written as a composite literal in one
// test function of this package, so that the corner cases kept there are checked here
// too without a second copy of the list.
func testFuncStrings(t testing.TB, file, fn string) []string {
	t.Helper()
	f, err := parser.ParseFile(gotoken.NewFileSet(), file, nil, 0)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, d := range f.Decls {
		fd, ok := d.(*ast.FuncDecl)
		if !ok || fd.Name.Name != fn {
			continue
		}
		// The cases are the elements of a composite literal: strings, or
		// structs whose first field is the source.
		ast.Inspect(fd.Body, func(n ast.Node) bool {
			cl, ok := n.(*ast.CompositeLit)
			if !ok {
				return true
			}
			for _, e := range cl.Elts {
				if inner, ok := e.(*ast.CompositeLit); ok && len(inner.Elts) > 0 {
					e = inner.Elts[0]
				}
				if lit, ok := e.(*ast.BasicLit); ok && lit.Kind == gotoken.STRING {
					if s, err := strconv.Unquote(lit.Value); err == nil {
						out = append(out, s)
					}
				}
			}
			return false
		})
	}
	if len(out) == 0 {
		t.Fatalf("no string literals found in %s of %s", fn, file)
	}
	return out
}

// fastCases are the corners of the grammar where participle's ordered,
// greedy matching decides: optional parts that start alike, words that are
// both keywords and names, positions at the ends of lines. Some are valid,
// some are not; either way the two parsers must agree.
var fastCases = []string{
	"part \"\xff\"", "part \"a\x01b\"", "units mm @", "units\x01mm", "units mm\r", "units mm\v\f",
	"units mm  ", "  units mm", "units\tmm\t", "units ⌀", "units", "units mm mm", "part \"\"", "part x",
	"feature s socket size 10 +-0.1 at (0, 0, 0)", "feature s ball 2x size 10 +-0.1 at (0, 0, 0) (1, 0, 0)",
	"feature a size 10", "feature a hole 4 size 10", "feature a hole 4X", "feature a hole size 10 +0.1",
	"feature a hole size 10 +0.1 /", "feature a hole size 10 +0.1 / -0", "feature a hole size 10 (E)",
	"feature a hole size 10 +-", "feature a hole size 10..", "feature a hole size 10deg +-1 (M) at",
	"feature a plane normal at at at", "feature a plane between at b.1 c", "feature a plane at (1,2,3) b (4,5,6)",
	"feature a plane normal (1, 2) at (0,0,0)", "feature a plane normal ( 1 x", "feature bolts.2 hole",
	"feature a plane along +x+y", "feature a plane normal +z at (0,0,0) \\\n  (1,1,1)",
	"datum A on b placed", "datum A on b placed on-surface extra", "datum A-B on b.3", "datum A on b placed ⌀",
	"frame a: flatness 0.1 (M) 3 (P) 12 (F)", "frame a: flatness datums 0.1", "frame a: position dia 0.1 datums A,",
	"frame a: position dia 0.1 datums A B", "frame a: position dia 0.1 datums A(M)(L), B ( M ), C",
	"frame a: position 0.1 datums", "frame a: position dia dia 0.1", "frame a:position⌀0.1Ⓜdatums A",
	"frame a: position dia 0.4 (M) datums A, B\n  composite dia 0.1\n\n  composite dia 0.05 datums A",
	"frame a: position dia 0.4\n  composite", "frame a: position dia 0.4 composite 0.1 composite",
	"frame a b: flatness 0.1", "frame a: 0.1", "frame a: ⌖ 0.1", "frame a: flatness S⌀ 0.1",
	"basic dia 80 through b about c", "basic dia 80 through b about", "basic dia 80 from a to b",
	"basic 1 from a to b along ( 1 , 2 , 3 ) about c", "basic 1deg from a to b about c along +x",
	"basic 1 from a to b along", "basic x", "basic", "basic ⌀ 1 through b.1 about c.2",
	"dim 1 from a to b", "dim 1 +1 -1 (E) from a to b along -Z", "dim 1 / 2 from a to b", "dim 1..2 (M) from a to b",
	"dim 1 +-1 from a to b along (1,1,0) extra", "dim from a to b", "dim 1e3 +-1e-3 from a.1 to b.2",
	"basis", "basis model drawing", "basis ⌀", "basis (1, 2, 3)",
	"target A1 point on b at (0,0,0) normal", "target A1 area dia on b at (0,0,0)", "target A1 area dia dia 1 on b at (0,0,0)",
	"target A1 area 1x2 3 on b at (0,0,0)", "target A1 point on b from (0,0,0)", "target A1 point on b at (0,0,0) to (1,1,1)",
	"target A1 on b at (0,0,0)", "target A.1 point on b at (0,0,0)", "target A1 point on b.2 from (0,0,0) to (1,1,1) normal (1, 0, 0)",
	"target A1 ⌀ 1 on b at (0,0,0)", "target A1 area Ø 1 on b at (0,0,0)", "target A1 area 1x2x3 on b at (0,0,0)",
	"frame a: flatness 1/2x3 (M)", "frame a: flatness 1/2/3", "frame a: flatness 1/", "frame a: flatness 1 /2x", "frame a: flatness 1/-2",
	"frame a: position 1 along", "frame a: position 1 along +x along +y", "frame a: position 1 (M) along +x (L)",
	"frame a: position 1 datums A all-around separate between p q", "frame a: position 1 between p", "frame a: position 1 between p.1 q.2 x",
	"frame a: position 1 datums A(M)-B(M)-C(L), D", "frame a: position 1 datums A(M)-B-C", "frame a: position 1 datums A(M)-x(M)",
	"frame a: position 1 datums A(M)-Xy", "frame a: position 1 datums A(M)--B", "frame a: position 1 datums A-B(M)-", "frame a: position 1 datums A(M)+x",
	"frame a: position 1 separate\n composite 0.5 separate", "frame a: position 1 datums A separate composite 0.5",
	"feature a hole thread \"\" axis +z at (0,0,0)", "feature a hole thread \"x\" thread \"y\"", "feature a hole size 1 cbore 2 depth",
	"feature a hole cbore 2 depth 3 cbore 2 depth 3", "feature a hole csink 2 angle 90deg cbore 2 depth 3", "feature a hole 2x cbore 2 depth 3deg at (0,0,0)",
	"feature a point at (1,2,3) normal +x", "feature a line along +x at (0,0,0)", "feature a circle size 2 axis +z at (0,0,0)",
	"ref size 1 of a along +x", "ref size of a", "ref 1 of a", "ref size 1deg of a", "ref 1deg from a to b about c along +x", "ref 1 from a to b along",
	"frame a: flatness 25x25", "basic 25x25 from a to b", "feature a hole 4x4 size 1",
}

// TestFastParserMatchesParticiple compares the two parsers on every
// statement of every .callouts file and txtar script of the repository (all
// valid statements there must take the fast path), on the notation's
// written forms and syntax errors listed in parser_test.go, and on the
// corner cases above.
func TestFastParserMatchesParticiple(t *testing.T) {
	handled, total, files := 0, 0, 0
	err := filepath.WalkDir("..", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() || !(strings.HasSuffix(p, ".callouts") || strings.HasSuffix(p, ".txtar")) {
			return err
		}
		src, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		files++
		// Test data holds broken statements on purpose, so only the
		// agreement of the two parsers is checked, and separately that no
		// statement participle accepts is left to it.
		h, n := sameTrees(t, p, src, false)
		handled, total = handled+h, total+n
		for _, r := range parseBoth(src) {
			if !r.lexError && r.refErr == nil && r.fast == nil {
				t.Errorf("%s: %q: the fast parser left a statement to participle that participle accepts", p, r.text)
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if files == 0 || handled == 0 {
		t.Fatalf("compared %d statements of %d files, the fast parser took %d", total, files, handled)
	}
	t.Logf("%d files, %d statements, %d parsed on the fast path", files, total, handled)

	for _, src := range testFuncStrings(t, "parser_test.go", "TestParsesContractForms") {
		if h, n := sameTrees(t, "contract form", []byte(src), true); h != n || n == 0 {
			t.Errorf("contract form %q: %d of %d statements on the fast path", src, h, n)
		}
	}
	for _, src := range testFuncStrings(t, "parser_test.go", "TestParsesExtensionForms") {
		if h, n := sameTrees(t, "extension form", []byte(src), true); h != n || n == 0 {
			t.Errorf("extension form %q: %d of %d statements on the fast path", src, h, n)
		}
	}
	for _, src := range testFuncStrings(t, "parser_test.go", "TestSyntaxErrors") {
		sameTrees(t, "syntax error case", []byte(src), false)
	}
	for _, src := range fastCases {
		sameTrees(t, "corner case", []byte(src), false)
	}
}

// TestFastParserDeclinesErrors: a statement with a lexical or syntax error
// never takes the fast path, so its message is still lexStmt's or
// participle's.
func TestFastParserDeclinesErrors(t *testing.T) {
	for _, src := range testFuncStrings(t, "parser_test.go", "TestSyntaxErrors") {
		for _, r := range parseBoth([]byte(src)) {
			if r.refErr != nil && r.fast != nil {
				t.Errorf("%q: the fast parser accepted a statement with a syntax error", r.text)
			}
		}
	}
	declined := 0
	for _, src := range fastCases {
		for _, r := range parseBoth([]byte(src)) {
			if r.lexError || r.refErr != nil {
				declined++
				if r.fast != nil {
					t.Errorf("%q: the fast parser accepted a statement with an error", r.text)
				}
			}
		}
	}
	if declined == 0 {
		t.Fatal("no corner case has a syntax error: the cases no longer test declining")
	}
}

// sameScan fails when scanNext and scanOne read a different token at some
// offset of s.
func sameScan(t *testing.T, s string) {
	t.Helper()
	for i := range len(s) {
		wt, we := scanOne(s, i)
		gt, ge := scanNext(s, i)
		if we <= i && ge <= i {
			continue // neither matches
		}
		if wt != gt || we != ge {
			t.Fatalf("%q at %d: scanOne reads type %d up to %d, scanNext type %d up to %d", s, i, wt, we, gt, ge)
		}
	}
}

func TestScanNextMatchesScanOne(t *testing.T) {
	for _, s := range append(append([]string{}, lexerCases...), fastCases...) {
		sameScan(t, s)
	}
	var all strings.Builder
	for c := range 128 {
		all.WriteByte(byte(c))
		all.WriteString("S.1 Sx S⌀ 1 (M) +x -1 .5 .. ")
	}
	sameScan(t, all.String())
}

// FuzzFastParser: whenever the fast parser accepts a statement of any
// text, participle accepts it too and builds an identical tree.
func FuzzFastParser(f *testing.F) {
	for _, s := range fastCases {
		f.Add(s)
	}
	for _, s := range testFuncStrings(f, "parser_test.go", "TestParsesContractForms") {
		f.Add(s)
	}
	for _, s := range testFuncStrings(f, "parser_test.go", "TestSyntaxErrors") {
		f.Add(s)
	}
	for _, path := range testdataFiles(f) {
		if src, err := os.ReadFile(path); err == nil {
			f.Add(string(src))
		}
	}
	f.Fuzz(func(t *testing.T, src string) {
		sameTrees(t, "fuzz", []byte(src), false)
		sameScan(t, src)
	})
}
