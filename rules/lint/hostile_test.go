package lint

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/source"

	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/lint/internal/gen"
	"github.com/datumlint/datumlint/rules/longtest"
)

// Hostile input: each file gives a clear, positioned finding or none, and
// never a crash; a path that cannot be read is reported while every other
// file is still checked.

const contract = `part "Mounting plate MP-40"
units mm
standard asme-2018

feature base  plane normal -z at (0, 0, 0)
feature rear  plane normal -y at (0, 0, 0)
feature left  plane normal -x at (0, 0, 0)
feature bore  hole size 25 +0.05 -0 axis +z at (60, 40, 0)
feature bolts hole 4x size 8.4 +-0.1 axis +z at (15, 15, 0) (105, 15, 0) (15, 65, 0) (105, 65, 0)

datum A on base
datum B on rear
datum C on left

frame base: flatness 0.02
frame rear: perpendicularity 0.05 datums A
frame left: perpendicularity 0.05 datums A, B
frame bore: position dia 0.1 (M) datums A, B, C
frame bolts: position dia 0.4 (M) datums A, B, C
    composite dia 0.1 (M) datums A

basic 60 from left to bore
basic 40 from rear to bore
basic 15 from left to bolts.1
basic 15 from rear to bolts.1
basic 90 from bolts.1 to bolts.2
basic 50 from bolts.1 to bolts.3
basic 90 from bolts.3 to bolts.4
`

// duplicated writes every statement twice in a row.
func duplicated(src string) string {
	var b strings.Builder
	for _, l := range strings.SplitAfter(src, "\n") {
		if strings.HasPrefix(l, "    composite") {
			b.WriteString(l) // belongs to the frame above; the frame line was doubled
			continue
		}
		b.WriteString(l)
		b.WriteString(l)
	}
	return b.String()
}

type hostile struct {
	src string
	// want is the rule of a finding that must be reported (at line, if
	// line > 0), or "" for a file that must be clean.
	want string
	line int
}

func hostileFiles() map[string]hostile {
	crlf := strings.ReplaceAll(contract, "\n", "\r\n")
	return map[string]hostile{
		"empty":            {"", rules.HeaderMissing.ID, 1},
		"blank lines":      {"\n\n   \n\t\n", rules.HeaderMissing.ID, 1},
		"binary":           {"\x7fELF\x02\x01\x01\x00\x00\x00\x00\x00" + strings.Repeat("\x00\xff\x10", 300), rules.Syntax.ID, 1},
		"invalid utf-8":    {strings.Replace(contract, "Mounting", "Mount\xe9ing", 1), rules.Syntax.ID, 1},
		"nul byte":         {strings.Replace(contract, "datum B", "datum\x00B", 1), rules.Syntax.ID, 1},
		"byte-order mark":  {"\xef\xbb\xbf" + contract, "", 0},
		"crlf":             {crlf, "", 0},
		"bom and crlf":     {"\xef\xbb\xbf" + crlf, "", 0},
		"lone cr":          {strings.ReplaceAll(contract, "\n", "\r"), rules.Syntax.ID, 1},
		"1 MB line":        {strings.Replace(contract, "datum A on base", "datum A on base "+strings.Repeat("base ", 1<<18), 1), rules.Syntax.ID, 11},
		"nested parens":    {strings.Replace(contract, "at (60, 40, 0)", "at "+strings.Repeat("(", 100000)+strings.Repeat(")", 100000), 1), rules.Syntax.ID, 8},
		"1e309":            {strings.Replace(contract, "basic 60 from", "basic 1e309 from", 1), rules.Syntax.ID, 22},
		"1e309 point":      {strings.Replace(contract, "(60, 40, 0)", "(1e309, 40, 0)", 1), rules.Syntax.ID, 8},
		"-1e309 tolerance": {strings.Replace(contract, "flatness 0.02", "flatness -1e309", 1), rules.Syntax.ID, 15},
		"tiny numbers":     {strings.Replace(contract, "flatness 0.02", "flatness 1e-400", 1), rules.ToleranceValue.ID, 15}, // underflows to zero
		"duplicated":       {duplicated(contract), rules.NameDuplicate.ID, 10},
		"only comments":    {"# nothing but a comment\n# datumlint: allow syntax -- no reason to\n", rules.HeaderMissing.ID, 0},
		"continuation eof": {contract + "frame bore: position dia \\", rules.Syntax.ID, 29},
		"control chars":    {strings.Replace(contract, "units mm", "units \x1b[31mmm", 1), rules.Syntax.ID, 2},
	}
}

// A binary file is one finding, whatever else it seems to lack or hold: a
// file that is not text is not also reported as missing its header.
func TestBinaryFileIsOneFinding(t *testing.T) {
	for name, src := range map[string]string{
		"executable":         "\x7fELF\x02\x01\x01\x00\x00\x00\x00\x00" + strings.Repeat("\x00\xff\x10", 300),
		"header, then a NUL": "units mm\nstandard iso\n\x00\x01",
		"a NUL, no header":   "frame bore: flatness 0.1\n\x00",
		"with a BOM":         "\xef\xbb\xbf\x00\x00",
	} {
		ds := rules.Check(Read("b"+Ext, []byte(src)), nil)
		if len(ds) != 1 || ds[0].Rule != rules.Syntax.ID || !strings.Contains(ds[0].Message, "binary data") || ds[0].Span.Start != (source.Pos{Line: 1, Col: 1}) {
			t.Errorf("%s: want one syntax finding at 1:1 about binary data, got %s", name, summary(ds))
		}
	}
}

// checkPositions fails on a finding whose position is not in its file.
func checkPositions(t *testing.T, src []byte, ds []rules.Diagnostic) {
	t.Helper()
	lines := strings.Split(string(bytes.TrimPrefix(src, []byte("\xef\xbb\xbf"))), "\n")
	width := func(l int) int { return utf8.RuneCountInString(strings.TrimSuffix(lines[l-1], "\r")) }
	valid := func(p source.Pos) bool {
		return p.Line >= 1 && p.Line <= len(lines) && p.Col >= 1 && p.Col <= width(p.Line)+1
	}
	for _, d := range ds {
		if d.Rule == rules.InternalRule {
			t.Errorf("internal error: %s", d.Message)
		}
		if rules.Lookup(d.Rule) == nil {
			t.Errorf("finding of unregistered rule %q", d.Rule)
		}
		s := d.Span
		pastEnd := valid(s.Start) && s.Start.Col == width(s.Start.Line)+1 && s.End == source.Pos{Line: s.Start.Line, Col: s.Start.Col + 1}
		if !valid(s.Start) || !pastEnd && (!valid(s.End) || s.End.Before(s.Start)) {
			t.Errorf("%s: %s %.200q: span outside the file (%d lines)", s, d.Rule, d.Message, len(lines))
		}
	}
}

func TestHostileFiles(t *testing.T) {
	dir := t.TempDir()
	cases := hostileFiles()
	for name, h := range cases {
		if err := os.WriteFile(filepath.Join(dir, strings.ReplaceAll(name, " ", "-")+Ext), []byte(h.src), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	// All at once, as `datumlint check DIR` does, and each on its own.
	res := Run([]string{dir}, Options{})
	if len(res.Errors) > 0 || len(res.Files) != len(cases) {
		t.Fatalf("%d files of %d checked; errors %v", len(res.Files), len(cases), res.Errors)
	}
	byFile := map[string][]rules.Diagnostic{}
	for _, d := range res.Diagnostics() {
		byFile[d.File] = append(byFile[d.File], d)
	}
	for name, h := range cases {
		t.Run(name, func(t *testing.T) {
			path := filepath.Join(dir, strings.ReplaceAll(name, " ", "-")+Ext)
			ds := byFile[path]
			checkPositions(t, []byte(h.src), ds)
			if h.want == "" {
				for _, d := range ds {
					t.Errorf("want no finding, got %s %s: %s", d.Span.Start, d.Rule, d.Message)
				}
				return
			}
			found := false
			for _, d := range ds {
				found = found || d.Rule == h.want && (h.line == 0 || d.Span.Start.Line == h.line)
			}
			if !found {
				t.Errorf("want a %s finding on line %d, got %s", h.want, h.line, summary(ds))
			}
		})
	}
}

func summary(ds []rules.Diagnostic) string {
	var b strings.Builder
	for _, d := range ds {
		fmt.Fprintf(&b, "\n  %s %s: %.120s", d.Span.Start, d.Rule, d.Message)
	}
	return b.String()
}

// CRLF line ends and a byte-order mark change nothing: the same findings
// at the same positions as the plain file.
func TestLineEndsAndBOMDoNotChangeFindings(t *testing.T) {
	bad := strings.Replace(contract, "datums A, B, C\nframe bolts", "datums A, B, Q\nframe bolts", 1)
	want := rules.Check(grammar.Read("f", []byte(bad)), nil)
	if len(want) == 0 {
		t.Fatal("the test file has no finding to compare")
	}
	for name, src := range map[string]string{
		"crlf": strings.ReplaceAll(bad, "\n", "\r\n"),
		"bom":  "\xef\xbb\xbf" + bad,
	} {
		got := rules.Check(grammar.Read("f", []byte(src)), nil)
		if fmt.Sprint(got) != fmt.Sprint(want) {
			t.Errorf("%s: findings differ from the plain file:%s\nwant:%s", name, summary(got), summary(want))
		}
	}
}

// A 10 MB file (built here, not committed): every plate of a generated
// repository in one file, so every name is declared many times over.
func TestTenMegabyteFile(t *testing.T) {
	longtest.Skip(t, "builds and checks a 10 MB file")
	var b bytes.Buffer
	for i := 0; b.Len() < 10<<20; i++ {
		b.Write(gen.Plate(i))
	}
	path := filepath.Join(t.TempDir(), "huge"+Ext)
	if err := os.WriteFile(path, b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	res := Run([]string{path}, Options{})
	if len(res.Errors) > 0 {
		t.Fatal(res.Errors)
	}
	checkPositions(t, b.Bytes(), res.Diagnostics())
	dup := 0
	for _, d := range res.Diagnostics() {
		if d.Rule == rules.NameDuplicate.ID {
			dup++
		}
	}
	if dup == 0 {
		t.Errorf("no name-duplicate finding in a file that declares every plate's names again:%s", summary(res.Diagnostics()[:min(10, len(res.Diagnostics()))]))
	}
}

// The size limit gives one clear finding on the file and reads nothing.
func TestSizeLimit(t *testing.T) {
	dir := t.TempDir()
	big, small := filepath.Join(dir, "big"+Ext), filepath.Join(dir, "small"+Ext)
	os.WriteFile(big, []byte(contract), 0o644)
	os.WriteFile(small, []byte(contract[:40]), 0o644)
	res := Run([]string{dir}, Options{MaxBytes: 100})
	var onBig []rules.Diagnostic
	for _, d := range res.Diagnostics() {
		if d.File == big {
			onBig = append(onBig, d)
		}
	}
	if len(onBig) != 1 {
		t.Fatalf("want one finding on the file over the limit, got %s", summary(onBig))
	}
	d := onBig[0]
	if d.Span.Start != (source.Pos{Line: 1, Col: 1}) || d.Severity != rules.Error ||
		!strings.Contains(d.Message, "size limit of 100 bytes") || !strings.Contains(d.Message, "--max-bytes") {
		t.Errorf("unclear size-limit finding: %s %s %s", d.Span.Start, d.Severity, d.Message)
	}
	small2 := 0
	for _, d := range res.Diagnostics() {
		if d.File == small {
			small2++
		}
	}
	if small2 == 0 {
		t.Error("the file under the limit was not checked (it lacks its standard line, so it has a finding)")
	}
	if DefaultMaxBytes < 10<<20 {
		t.Errorf("DefaultMaxBytes %d would refuse a 10 MB part", DefaultMaxBytes)
	}
}

// Paths that cannot be read are reported; every other file is checked.
func TestUnreadablePaths(t *testing.T) {
	dir := t.TempDir()
	good := filepath.Join(dir, "good"+Ext)
	os.WriteFile(good, []byte(contract), 0o644)
	bad := filepath.Join(dir, "z-bad"+Ext)
	os.WriteFile(bad, []byte("units mm\n"), 0o644)
	// a symbolic link loop named like a callouts file
	loop1, loop2 := filepath.Join(dir, "loop1"+Ext), filepath.Join(dir, "loop2"+Ext)
	if err := os.Symlink(loop2, loop1); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	os.Symlink(loop1, loop2)
	// a dangling link
	os.Symlink(filepath.Join(dir, "gone"), filepath.Join(dir, "dangling"+Ext))
	// a folder named like a file, holding a real part
	folder := filepath.Join(dir, "x"+Ext)
	os.Mkdir(folder, 0o755)
	inner := filepath.Join(folder, "inner"+Ext)
	os.WriteFile(inner, []byte("units mm\n"), 0o644)
	missing := filepath.Join(dir, "missing"+Ext)

	res := Run([]string{dir, missing}, Options{})
	errs := map[string]string{}
	for _, e := range res.Errors {
		errs[e.Path] = e.Err.Error()
	}
	for path, want := range map[string]string{
		loop1: "", loop2: "", filepath.Join(dir, "dangling"+Ext): "no such file", missing: "no such file",
	} {
		msg, ok := errs[path]
		if !ok || !strings.Contains(msg, want) {
			t.Errorf("%s: want an error containing %q, got %q (reported: %v)", filepath.Base(path), want, msg, res.Errors)
		}
	}
	if _, ok := errs[folder]; ok {
		t.Errorf("the folder named like a file is an error; it should be a warning only: %v", res.Errors)
	}
	if len(res.Warnings) != 1 || res.Warnings[0].Path != folder {
		t.Errorf("warnings %v, want one about %s", res.Warnings, folder)
	}
	checked := map[string]bool{}
	for _, f := range res.Files {
		checked[f.Path] = true
	}
	for _, f := range []string{good, bad, inner} {
		if !checked[f] {
			t.Errorf("%s was not checked; checked %v", filepath.Base(f), res.Files)
		}
	}
	found := false
	for _, d := range res.Diagnostics() {
		found = found || d.File == bad && d.Rule == rules.HeaderMissing.ID
	}
	if !found {
		t.Errorf("the findings of the readable files are missing: %s", summary(res.Diagnostics()))
	}
}

// A file without read permission is reported, not skipped silently.
func TestPermissionDenied(t *testing.T) {
	if os.Geteuid() == 0 {
		t.Skip("running as root: a mode of 000 does not stop root from reading, so there is nothing to test")
	}
	dir := t.TempDir()
	locked := filepath.Join(dir, "locked"+Ext)
	os.WriteFile(locked, []byte(contract), 0o000)
	sub := filepath.Join(dir, "sealed")
	os.Mkdir(sub, 0o000)
	t.Cleanup(func() { os.Chmod(sub, 0o755) })
	open := filepath.Join(dir, "open"+Ext)
	os.WriteFile(open, []byte(contract), 0o644)
	res := Run([]string{dir}, Options{})
	errs := map[string]string{}
	for _, e := range res.Errors {
		errs[e.Path] = e.Err.Error()
	}
	for _, p := range []string{locked, sub} {
		if !strings.Contains(errs[p], "permission denied") {
			t.Errorf("%s: want permission denied, got %q", p, errs[p])
		}
	}
	if len(res.Files) == 0 || res.Files[len(res.Files)-1].Path != open {
		t.Errorf("the readable file was not checked: %v", res.Files)
	}
}
