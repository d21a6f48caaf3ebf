package grammar

import (
	"io/fs"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/alecthomas/participle/v2/lexer"
)

// regexLex lexes with lexerDef, the reference definition of the tokens.
func regexLex(name, text string) ([]lexer.Token, lexer.Token, error) {
	lx, err := lexerDef.LexString(name, text)
	if err != nil {
		return nil, lexer.Token{}, err
	}
	var toks []lexer.Token
	for {
		t, err := lx.Next()
		if err != nil {
			return nil, lexer.Token{}, err
		}
		if t.EOF() {
			return toks, t, nil
		}
		toks = append(toks, t)
	}
}

// sameLexing fails when scanTokens and lexerDef disagree on text: tokens
// (type, value, position), the end position, or where an error is.
func sameLexing(t *testing.T, text string) {
	t.Helper()
	want, wantEOF, wantErr := regexLex("f", text)
	got, gotEOF, gotErr := scanTokens("f", text)
	if (wantErr == nil) != (gotErr == nil) {
		t.Fatalf("%q: regexp lexer error %v, scanner error %v", text, wantErr, gotErr)
	}
	if wantErr != nil {
		wp := wantErr.(interface{ Position() lexer.Position }).Position()
		gp := gotErr.(interface{ Position() lexer.Position }).Position()
		if wp != gp {
			t.Fatalf("%q: regexp lexer fails at %v, scanner at %v", text, wp, gp)
		}
		return
	}
	if len(got) == 0 {
		got = nil
	}
	if !reflect.DeepEqual(want, got) || wantEOF != gotEOF {
		t.Fatalf("%q:\nregexp  %v %v\nscanner %v %v", text, want, wantEOF, got, gotEOF)
	}
}

// lexerCases are the corners of the token rules.
var lexerCases = []string{
	"", " ", "\t\v\f\r\n", "feature bolts hole 4x size 8.4 +-0.1 axis +z at (15, 15, 0) (105,15,0)",
	"frame bolts.2: ⌖ ⌀0.1 Ⓜ datums A, B(M), C (L)", "( M )", "(\nM\t)", "(MM)", "(1)",
	"12..13", "12.", ".5", "-.5", "+.5e-3", "1e", "1e+", "1E309", "-0", "+0.1/-0", "+/-0.1", "±0.1",
	"+x", "+xy", "-z_", "+x-1", "+x.", "+xé", "-Z", "+w", "+", "-", "bolts.", "bolts.1.2", "b-1.2",
	"S⌀0.2", "SØ", "Sø", "Sx", "S", "Ø", "ø", "⌀", "⏤⏥○⌭⌒⌓∠⟂⊥∥⌖◎⌯↗⌰", `"a\"b"`, `"a\\"`, `"a\`,
	"\"a\\\nb\"", "\"a\nb\"", `"unterminated`, "#", "a#b", "é", "\x00", "\xff", "\"\xff\"", "..", "...",
	"a:b/c", "30deg", "4 x", "4X", "_a-b", "a\\\nb", "Ⓢ", "ⓂⓁⒺⒻⓉⓅⓊⓈ",
	"25x25", "0.005/25x25", ".5x.5", "25X2.5", "25x", "x25", "1e3x4", "25x25x25", "2.x3", "4x8.4 ", "-25x25",
	"H(M)-J(M)", "A(M)-X(M)", "A(M)-x", "A(M)-Xy", "-_a", "--a", "-a-b-", "-", "- a", "-1", "-.5x2",
}

func TestScannerMatchesRegexpLexer(t *testing.T) {
	for _, c := range lexerCases {
		sameLexing(t, c)
	}
}

// TestScannerMatchesRegexpLexerOnTestdata lexes every .callouts file and
// txtar script of the repository, whole and line by line.
func TestScannerMatchesRegexpLexerOnTestdata(t *testing.T) {
	n := 0
	err := filepath.WalkDir("..", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() || !(strings.HasSuffix(p, ".callouts") || strings.HasSuffix(p, ".txtar")) {
			return err
		}
		b, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		n++
		sameLexing(t, string(b))
		for _, line := range strings.Split(string(b), "\n") {
			if i := strings.IndexByte(line, '#'); i >= 0 {
				line = line[:i]
			}
			sameLexing(t, line)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if n == 0 {
		t.Fatal("no .callouts or .txtar file found to compare the lexers on")
	}
}

// FuzzScanner holds the hand-coded scanner to the regexp lexer on any text.
func FuzzScanner(f *testing.F) {
	for _, c := range lexerCases {
		f.Add(c)
	}
	f.Fuzz(func(t *testing.T, text string) {
		sameLexing(t, text)
	})
}
