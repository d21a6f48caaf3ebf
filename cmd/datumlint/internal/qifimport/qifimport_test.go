package qifimport

import (
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/lint"
)

// qifFiles are the QIF documents under the repository's testdata.
func qifFiles(t *testing.T) []string {
	t.Helper()
	var out []string
	root := filepath.Join("..", "..", "..", "..", "testdata")
	filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() && lint.IsQIF(p) {
			out = append(out, p)
		}
		return nil
	})
	if len(out) < 4 {
		t.Fatalf("only %d QIF files under testdata", len(out))
	}
	return out
}

// counts counts findings by rule, leaving out the findings about a QIF
// document as such (qif-*), which its import lists as comments.
func counts(ds []rules.Diagnostic) string {
	n := map[string]int{}
	for _, d := range ds {
		if !strings.HasPrefix(d.Rule, "qif-") {
			n[d.Rule]++
		}
	}
	var out []string
	for r, k := range n {
		out = append(out, fmt.Sprintf("%s %d", r, k))
	}
	sort.Strings(out)
	return strings.Join(out, ", ")
}

// Every QIF document under testdata, imported, checks to the same findings
// (rules and counts) as the document itself, but for those about the QIF
// document as such; the written file reads without a syntax finding, is in
// the canonical layout, and says where each statement comes from.
func TestImportChecksLikeTheQIF(t *testing.T) {
	for _, path := range qifFiles(t) {
		t.Run(filepath.Base(path), func(t *testing.T) {
			src, err := os.ReadFile(path)
			if err != nil {
				t.Fatal(err)
			}
			out, err := Import(path, src)
			if err != nil {
				t.Fatal(err)
			}
			name := strings.TrimSuffix(path, filepath.Ext(path)) + ".callouts"
			imported := lint.Read(name, out)
			for _, e := range imported.Problems {
				t.Errorf("the import has a problem: %v", e)
			}
			qifFindings := rules.Check(lint.Read(path, src), nil)
			if got, want := counts(rules.Check(imported, nil)), counts(qifFindings); got != want {
				t.Errorf("the import checks to\n  %s\nthe QIF document to\n  %s", got, want)
			}
			f := grammar.Parse(name, out)
			if canon, err := grammar.Format(f); err != nil || string(canon) != string(out) {
				t.Errorf("the import is not in the canonical layout (%v)", err)
			}
			// Every feature, datum and frame statement names its QIF ids.
			for i, st := range f.Stmts {
				switch st.Keyword() {
				case "feature", "datum", "frame", "basic", "dim":
					line := strings.Split(string(out), "\n")[f.Extents[i].First-1]
					if !regexp.MustCompile(`# QIF \d+`).MatchString(line) {
						t.Errorf("no QIF id on %q", line)
					}
				}
			}
			// Each qif-* finding of the document is listed in the import.
			for _, d := range qifFindings {
				if strings.HasPrefix(d.Rule, "qif-") && !strings.Contains(string(out), fmt.Sprintf("# line %d: ", d.Span.Start.Line)) {
					t.Errorf("%s at line %d is not listed in the import", d.Rule, d.Span.Start.Line)
				}
			}
		})
	}
}

// The shipped example imports with its QIF names, its four bolt holes as
// one pattern under their position, and each statement's QIF id.
func TestImportExample(t *testing.T) {
	path := filepath.Join("..", "..", "..", "..", "testdata", "examples", "bearing-flange.qif")
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	out, err := Import(path, src)
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{
		"part \"Bearing flange BF-30\"\nunits mm\nstandard asme-2018\nbasis model\n",
		"feature pilot    pin size 30 +0 -0.021 axis +z at (0, 0, 0) # QIF 52\n",
		"feature holes_55 hole 4x size 6.6 +-0.1 axis +z at (25, 25, 0) (-25, 25, 0) (-25, -25, 0) (25, -25, 0) # QIF 55, 56, 57, 58 (members in order)\n",
		"datum B on pilot # QIF 11\n",
		"frame holes_55: position dia 0.2 (M) datums A, B, C # QIF 75\n",
		"basic 25 from pilot to holes_55.1 along +x # QIF 79\n",
	} {
		if !strings.Contains(string(out), want) {
			t.Errorf("the import lacks %q:\n%s", want, out)
		}
	}
	if strings.Contains(string(out), "# What the QIF document says") {
		t.Errorf("the example gives every basic and carries everything:\n%s", out)
	}
}

// A model is written under basis model, what it says that the notation
// cannot carry listed at the end; a refused document is an error with its
// position.
func TestImportImpliedAndRefused(t *testing.T) {
	path := filepath.Join("..", "..", "..", "..", "testdata", "qif", "nist", "nist_ctc_01_asme1_ap242.qif")
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	out, err := Import(path, src)
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{
		"standard asme-2009\nbasis model\n",
		"# line 23935: not carried: an angular size (Angle) nominal 1491 is not read",
		"feature line_2184    line along -z at (400, -175, 0) # QIF 2184\n",
		"frame surface_2173: surface-profile 0.5 datums A all-around # QIF 1462\n",
	} {
		if !strings.Contains(string(out), want) {
			t.Errorf("the import lacks %q", want)
		}
	}
	if _, err := Import("bad.qif", []byte("<QIFDocument versionQIF=\"2.0\"/>")); err == nil || !strings.Contains(err.Error(), "1:1: QIF version 2.0") {
		t.Errorf("a QIF 2 document: %v", err)
	}
}

// FuzzImport: whatever the bytes, import refuses them or writes a file
// that reads without a syntax problem, and checking either never reports an
// internal error.
//
//	go test -run '^$' -fuzz '^FuzzImport$' -fuzztime 3m -fuzzminimizetime 5s ./cmd/datumlint/internal/qifimport/
func FuzzImport(f *testing.F) {
	ex, err := os.ReadFile(filepath.Join("..", "..", "..", "..", "testdata", "examples", "bearing-flange.qif"))
	if err != nil {
		f.Fatal(err)
	}
	f.Add(ex)
	f.Add([]byte("<QIFDocument versionQIF=\"3.0\"/>"))
	f.Fuzz(func(t *testing.T, src []byte) {
		for _, d := range rules.Check(lint.Read("f.qif", src), nil) {
			if d.Rule == rules.InternalRule {
				t.Fatalf("checking the document: %s", d.Message)
			}
		}
		out, err := Import("f.qif", src)
		if err != nil {
			return
		}
		p := lint.Read("f.callouts", out)
		for _, e := range p.Problems {
			t.Fatalf("the import has a problem %v:\n%s", e, out)
		}
		for _, d := range rules.Check(p, nil) {
			if d.Rule == rules.InternalRule {
				t.Fatalf("checking the import: %s", d.Message)
			}
		}
	})
}
