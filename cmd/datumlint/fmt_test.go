package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const fmtMessy = "units mm\nstandard iso\nfeature a plane normal +z at (0,0,0)\nfeature bb plane normal -z at (0,0,5)\n"
const fmtCanonical = "units mm\nstandard iso\nfeature a  plane normal +z at (0, 0, 0)\nfeature bb plane normal -z at (0, 0, 5)\n"

// The exit statuses of fmt: 0 done, 1 would change (--check) or does not
// parse, 2 usage or unreadable path.
func TestFmtExitCodes(t *testing.T) {
	dir := t.TempDir()
	write := func(name, s string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(s), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	messy := write("messy.callouts", fmtMessy)
	canon := write("canon.callouts", fmtCanonical)
	bad := write("bad.callouts", "units mm\nfeature a plane normal\n")
	cases := []struct {
		args []string
		code int
	}{
		{[]string{"fmt", canon}, 0},
		{[]string{"fmt", messy}, 0},
		{[]string{"fmt", "--check", canon}, 0},
		{[]string{"fmt", "--check", messy}, 1},
		{[]string{"fmt", "--diff", messy}, 0},
		{[]string{"fmt", "--check", "--diff", messy}, 1},
		{[]string{"fmt", bad}, 1},
		{[]string{"fmt", "-w", bad}, 1},
		{[]string{"fmt", "--check", bad, canon}, 1},
		{[]string{"fmt", filepath.Join(dir, "missing.callouts")}, 2},
		{[]string{"fmt", bad, filepath.Join(dir, "missing.callouts")}, 2},
		{[]string{"fmt", "-w", "--check", messy}, 2},
		{[]string{"fmt", "-w", "-"}, 2},
		{[]string{"fmt", "--no-such-flag"}, 2},
	}
	for _, c := range cases {
		var out, errb bytes.Buffer
		if got := run(c.args, &out, &errb); got != c.code {
			t.Errorf("datumlint %s: exit %d, want %d\nstdout: %s\nstderr: %s", strings.Join(c.args, " "), got, c.code, out.String(), errb.String())
		}
	}
	if b, _ := os.ReadFile(messy); string(b) != fmtMessy {
		t.Errorf("a command without -w changed the file:\n%s", b)
	}
}

// -w keeps the file's mode, writes through a symbolic link (which stays a
// link), leaves no temporary file behind and does not touch a file that is
// already canonical.
func TestFmtWriteKeepsModeAndLinks(t *testing.T) {
	dir := t.TempDir()
	target := filepath.Join(dir, "part.callouts")
	if err := os.WriteFile(target, []byte(fmtMessy), 0o640); err != nil {
		t.Fatal(err)
	}
	if err := os.Chmod(target, 0o640); err != nil { // umask-proof
		t.Fatal(err)
	}
	link := filepath.Join(dir, "link.callouts")
	if err := os.Symlink(target, link); err != nil {
		t.Skipf("no symbolic links here: %v", err)
	}
	canon := filepath.Join(dir, "canon.callouts")
	if err := os.WriteFile(canon, []byte(fmtCanonical), 0o600); err != nil {
		t.Fatal(err)
	}
	old := mustStat(t, canon).ModTime().Add(-3600e9)
	if err := os.Chtimes(canon, old, old); err != nil {
		t.Fatal(err)
	}

	var out, errb bytes.Buffer
	if code := run([]string{"fmt", "-w", link, canon}, &out, &errb); code != 0 {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	if b, _ := os.ReadFile(target); string(b) != fmtCanonical {
		t.Errorf("the link's target was not rewritten:\n%s", b)
	}
	if st := mustStat(t, target); st.Mode().Perm() != 0o640 {
		t.Errorf("mode %v after -w, want 0640", st.Mode().Perm())
	}
	if st, err := os.Lstat(link); err != nil || st.Mode()&os.ModeSymlink == 0 {
		t.Errorf("the symbolic link was replaced by a file")
	}
	if !mustStat(t, canon).ModTime().Equal(old) {
		t.Errorf("a canonical file was rewritten")
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 3 {
		var names []string
		for _, e := range entries {
			names = append(names, e.Name())
		}
		t.Errorf("files left in the folder: %v", names)
	}
}

func mustStat(t *testing.T, p string) os.FileInfo {
	t.Helper()
	st, err := os.Stat(p)
	if err != nil {
		t.Fatal(err)
	}
	return st
}

// -w keeps the file's line ends and mode: a file saved with CR LF is
// rewritten with CR LF (and its byte-order mark), and --check finds a CR LF
// file that is otherwise canonical already canonical.
func TestFmtWriteKeepsLineEnds(t *testing.T) {
	dir := t.TempDir()
	crlf := func(s string) string { return strings.ReplaceAll(s, "\n", "\r\n") }
	files := map[string]struct{ in, want string }{
		"crlf.callouts": {crlf(fmtMessy), crlf(fmtCanonical)},
		"bom.callouts":  {"\ufeff" + crlf(fmtMessy), "\ufeff" + crlf(fmtCanonical)},
		"lf.callouts":   {fmtMessy, fmtCanonical},
	}
	for name, f := range files {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(f.in), 0o600); err != nil {
			t.Fatal(err)
		}
		if err := os.Chmod(p, 0o751); err != nil {
			t.Fatal(err)
		}
	}
	var out, errb bytes.Buffer
	if code := run([]string{"fmt", "-w", dir}, &out, &errb); code != 0 {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	for name, f := range files {
		p := filepath.Join(dir, name)
		if b, _ := os.ReadFile(p); string(b) != f.want {
			t.Errorf("%s after -w: %q, want %q", name, b, f.want)
		}
		if st := mustStat(t, p); st.Mode().Perm() != 0o751 {
			t.Errorf("%s: mode %v after -w, want 0751", name, st.Mode().Perm())
		}
	}
	out.Reset()
	if code := run([]string{"fmt", "--check", dir}, &out, &errb); code != 0 || out.Len() != 0 {
		t.Errorf("--check after -w: exit %d, listed %q; want 0 and nothing", code, out.String())
	}
	// Printed to stdout, the canonical text keeps the line ends as well.
	out.Reset()
	if code := run([]string{"fmt", filepath.Join(dir, "crlf.callouts")}, &out, &errb); code != 0 || out.String() != crlf(fmtCanonical) {
		t.Errorf("fmt of a CR LF file: exit %d, %q", code, out.String())
	}
}
