package main

import (
	"bytes"
	"encoding/json"
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

type hostileFinding struct {
	File      string `json:"file"`
	Line      int    `json:"line"`
	Column    int    `json:"column"`
	EndLine   int    `json:"end_line"`
	EndColumn int    `json:"end_column"`
	Rule      string `json:"rule"`
	Severity  string `json:"severity"`
	Message   string `json:"message"`
}

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
