package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// The command on hostile input: `check --format json` prints a JSON array
// of positioned findings whatever the files hold, and unreadable paths
// make it exit 2 while every readable file is still checked.

const hostilePlate = "part \"Hostile plate HP-1\"\nunits mm\nstandard asme-2018\nfeature base plane normal -z at (0, 0, 0)\nframe base: flatness 0.02\n"

func hostileTree(t *testing.T) (dir string, files map[string]string) {
	dir = t.TempDir()
	files = map[string]string{
		"empty.callouts":     "",
		"binary.callouts":    "\x7fELF\x02\x01\x01\x00" + strings.Repeat("\x00\xff", 500),
		"utf8.callouts":      strings.Replace(hostilePlate, "Hostile", "Host\xffile", 1),
		"nul.callouts":       strings.Replace(hostilePlate, "frame base", "frame\x00base", 1),
		"bom.callouts":       "\xef\xbb\xbf" + hostilePlate,
		"crlf.callouts":      strings.ReplaceAll(hostilePlate, "\n", "\r\n"),
		"longline.callouts":  hostilePlate + "frame base: flatness 0.02 " + strings.Repeat("0.02 ", 1<<18) + "\n",
		"parens.callouts":    hostilePlate + "feature p pin size 4 +-0.1 axis +z at " + strings.Repeat("(", 100000) + "\n",
		"huge.callouts":      strings.Replace(hostilePlate, "0.02", "1e309", 1),
		"duplicate.callouts": hostilePlate + hostilePlate,
	}
	for name, src := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(src), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir, files
}

// hostileFinding is the JSON finding the command prints.
type hostileFinding = jsonFinding

func checkHostileJSON(t *testing.T, args ...string) (int, []hostileFinding, string) {
	t.Helper()
	var stdout, stderr bytes.Buffer
	code := run(append([]string{"check", "--format", "json"}, args...), &stdout, &stderr)
	var out []hostileFinding
	if err := json.Unmarshal(stdout.Bytes(), &out); err != nil {
		t.Fatalf("stdout is not a JSON array of findings: %v\n%.500s", err, stdout.String())
	}
	for _, f := range out {
		if f.Line < 1 || f.Column < 1 || f.EndLine < f.Line || f.Rule == "" || f.Message == "" || f.Severity == "" {
			t.Errorf("malformed hostileFinding %+v", f)
		}
		if f.Rule == "internal-error" {
			t.Errorf("internal error: %+v", f)
		}
	}
	return code, out, stderr.String()
}

func TestCheckJSONOnHostileFiles(t *testing.T) {
	dir, files := hostileTree(t)
	code, out, stderr := checkHostileJSON(t, dir)
	if code != 1 || stderr != "" {
		t.Fatalf("exit %d, stderr %q; want 1 and nothing on stderr", code, stderr)
	}
	seen := map[string]bool{}
	for _, f := range out {
		seen[filepath.Base(f.File)] = true
	}
	for name := range files {
		clean := name == "bom.callouts" || name == "crlf.callouts"
		if seen[name] == clean {
			t.Errorf("%s: findings %v, want %v", name, seen[name], !clean)
		}
	}
}

// A binary file is one finding in the text output too, with no source
// line: its bytes would be sent to the terminal raw.
func TestCheckTextOnBinaryFile(t *testing.T) {
	path := filepath.Join(t.TempDir(), "binary.callouts")
	os.WriteFile(path, []byte("\x7fELF\x02\x01\x01\x00"+strings.Repeat("\x00\xff", 500)), 0o644)
	var stdout, stderr bytes.Buffer
	code := run([]string{"check", "--color", "never", path}, &stdout, &stderr)
	want := path + ":1:1: error syntax: this file holds binary data (a NUL byte), not callout text; check that the right file was named\n"
	if code != 1 || stdout.String() != want {
		t.Errorf("exit %d, stdout %q; want 1 and exactly %q", code, stdout.String(), want)
	}
	if stderr.String() != "1 file checked: 1 error\n" {
		t.Errorf("stderr %q, want the one-line summary", stderr.String())
	}
}

func TestCheckReportsUnreadablePathsAndChecksTheRest(t *testing.T) {
	dir, _ := hostileTree(t)
	os.Mkdir(filepath.Join(dir, "folder.callouts"), 0o755)
	os.Symlink("loop-b.callouts", filepath.Join(dir, "loop-a.callouts"))
	os.Symlink("loop-a.callouts", filepath.Join(dir, "loop-b.callouts"))
	code, out, stderr := checkHostileJSON(t, dir, filepath.Join(dir, "absent.callouts"))
	if code != 2 {
		t.Errorf("exit %d, want 2", code)
	}
	for _, want := range []string{"absent.callouts: no such file", "folder.callouts: a folder named like", "loop-a.callouts: too many levels", "loop-b.callouts: too many levels"} {
		if !strings.Contains(stderr, want) {
			t.Errorf("stderr lacks %q:\n%s", want, stderr)
		}
	}
	if len(out) == 0 {
		t.Error("the readable files' findings are missing")
	}
}

func TestMaxBytes(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "big.callouts")
	os.WriteFile(path, []byte(hostilePlate), 0o644)
	code, out, _ := checkHostileJSON(t, "--max-bytes", "64", path)
	if code != 1 || len(out) != 1 || out[0].Line != 1 || !strings.Contains(out[0].Message, "--max-bytes") ||
		!strings.Contains(out[0].Message, "over the size limit of 64 bytes") {
		t.Fatalf("exit %d, findings %+v; want one hostileFinding at line 1 naming the limit and --max-bytes", code, out)
	}
	if code, _, _ := checkHostileJSON(t, "--max-bytes", "100000", path); code != 0 {
		t.Errorf("under the limit the hostilePlate is clean, exit %d", code)
	}
}

// `fmt -w` never rewrites a file that check says does not parse (any
// finding of the rule syntax, including values the model cannot read such
// as 1e309): such a file stays byte for byte as it was.
func TestFmtWriteLeavesFilesWithSyntaxFindingsAlone(t *testing.T) {
	dir, files := hostileTree(t)
	for name, src := range map[string]string{
		"units.callouts":   strings.Replace(hostilePlate, "units mm", "units furlong", 1),
		"point.callouts":   strings.Replace(hostilePlate, "(0, 0, 0)", "(0, 0, -1e400000)", 1),
		"spacing.callouts": strings.Replace(hostilePlate, "frame base:", "frame   base :", 1) + "frame base: flatness 2e309\n",
	} {
		files[name] = src
		os.WriteFile(filepath.Join(dir, name), []byte(src), 0o644)
	}
	_, before, _ := checkHostileJSON(t, dir)
	broken := map[string]bool{}
	for _, f := range before {
		if f.Rule == "syntax" {
			broken[filepath.Base(f.File)] = true
		}
	}
	for _, name := range []string{"units.callouts", "point.callouts", "spacing.callouts", "huge.callouts", "binary.callouts"} {
		if !broken[name] {
			t.Fatalf("%s has no syntax finding; the test needs it to", name)
		}
	}
	var stdout, stderr bytes.Buffer
	run([]string{"fmt", "-w", dir}, &stdout, &stderr)
	for name := range broken {
		got, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil || string(got) != files[name] {
			t.Errorf("fmt -w changed %s, which has a syntax finding (err %v)", name, err)
		}
	}
}

// mutate returns a damaged copy of src: the kinds of damage an editor, a
// bad merge or a broken export does.
func mutate(src []byte, rng *rand.Rand) []byte {
	lines := strings.SplitAfter(string(src), "\n")
	pick := func() int { return rng.IntN(len(lines)) }
	b := []byte(string(src))
	switch rng.IntN(10) {
	case 0: // delete a byte
		if len(b) > 0 {
			i := rng.IntN(len(b))
			b = append(b[:i], b[i+1:]...)
		}
	case 1: // insert an arbitrary byte
		i := rng.IntN(len(b) + 1)
		b = append(b[:i], append([]byte{byte(rng.IntN(256))}, b[i:]...)...)
	case 2: // truncate
		b = b[:rng.IntN(len(b)+1)]
	case 3: // duplicate a line
		i := pick()
		lines = append(lines[:i+1], lines[i:]...)
		b = []byte(strings.Join(lines, ""))
	case 4: // swap two lines
		i, j := pick(), pick()
		lines[i], lines[j] = lines[j], lines[i]
		b = []byte(strings.Join(lines, ""))
	case 5: // drop a line
		i := pick()
		b = []byte(strings.Join(append(lines[:i:i], lines[i+1:]...), ""))
	case 6: // a number gets huge
		b = []byte(strings.Replace(string(b), "0.", "9e999", 1+rng.IntN(3)))
	case 7: // a parenthesis or comma goes missing
		for _, c := range []string{"(", ")", ","} {
			b = []byte(strings.Replace(string(b), c, "", 1))
		}
	case 8: // a word is cut short
		words := strings.Fields(string(b))
		if len(words) > 0 {
			w := words[rng.IntN(len(words))]
			b = []byte(strings.Replace(string(b), w, w[:len(w)/2], 1))
		}
	case 9: // a continuation backslash at a random line end
		i := pick()
		lines[i] = strings.TrimSuffix(lines[i], "\n") + " \\\n"
		b = []byte(strings.Join(lines, ""))
	}
	return b
}

// Several hundred mutated copies of the test data: check gives valid JSON
// with every finding inside its file, and fmt -w leaves every file with a
// syntax finding as it was.
func TestMutatedFiles(t *testing.T) {
	var seeds [][]byte
	for _, root := range []string{"../../rules/testdata", "../../testdata"} {
		paths, _ := filepath.Glob(filepath.Join(root, "*.callouts"))
		more, _ := filepath.Glob(filepath.Join(root, "*", "*.callouts"))
		for _, p := range append(paths, more...) {
			if b, err := os.ReadFile(p); err == nil {
				seeds = append(seeds, b)
			}
		}
	}
	if len(seeds) < 10 {
		t.Fatalf("only %d test files to mutate", len(seeds))
	}
	rng := rand.New(rand.NewPCG(7, 11))
	dir := t.TempDir()
	files := map[string][]byte{}
	for i := 0; i < 400; i++ {
		src := seeds[i%len(seeds)]
		for k := 0; k <= rng.IntN(3); k++ {
			src = mutate(src, rng)
		}
		name := fmt.Sprintf("m%03d.callouts", i)
		files[name] = src
		os.WriteFile(filepath.Join(dir, name), src, 0o644)
	}
	code, out, stderr := checkHostileJSON(t, dir)
	if code == 2 || code == 0 {
		t.Fatalf("exit %d, stderr %s", code, stderr)
	}
	broken := map[string]bool{}
	for _, f := range out {
		name := filepath.Base(f.File)
		if n := len(strings.Split(string(bytes.TrimPrefix(files[name], []byte("\xef\xbb\xbf"))), "\n")); f.Line > n || f.EndLine > n {
			t.Errorf("%s: finding at line %d of a file of %d lines: %s", name, f.Line, n, f.Message)
		}
		if f.Rule == "syntax" {
			broken[name] = true
		}
	}
	if len(broken) < 50 {
		t.Errorf("only %d of 400 mutated files have a syntax finding: the mutations are too gentle to test anything", len(broken))
	}
	var so, se bytes.Buffer
	run([]string{"fmt", "-w", dir}, &so, &se)
	for name := range broken {
		if got, _ := os.ReadFile(filepath.Join(dir, name)); !bytes.Equal(got, files[name]) {
			t.Errorf("fmt -w rewrote %s, which has a syntax finding", name)
		}
	}
}
