package lint

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestCollectNamedPaths: a folder named like a file, given by name, is a
// warning (not an error: nothing went unread) and still walked; one file
// named twice is checked once.
func TestCollectNamedPaths(t *testing.T) {
	dir := t.TempDir()
	folder := filepath.Join(dir, "x.callouts")
	if err := os.Mkdir(folder, 0o755); err != nil {
		t.Fatal(err)
	}
	inner := filepath.Join(folder, "in.callouts")
	file := filepath.Join(dir, "a.callouts")
	for _, p := range []string{inner, file} {
		if err := os.WriteFile(p, []byte("units mm\nstandard iso\n"), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	found := Collect([]string{folder, file, dir + "/./a.callouts"}, nil)
	files := found.Files
	if len(found.Errors) != 0 {
		t.Errorf("errors %v, want none", found.Errors)
	}
	if w := found.Warnings; len(w) != 1 || w[0].Path != folder || !strings.Contains(w[0].Error(), "folder named like a callouts file; the files inside it are checked") {
		t.Errorf("warnings %v, want one about the folder", w)
	}
	if len(files) != 2 || files[0] != inner || files[1] != file {
		t.Errorf("files %v, want %s and %s once each", files, inner, file)
	}
}

// TestCollectCountsExcluded: the walked files that exclude leaves out are
// counted, so that a run can say why it checked nothing; a file named on
// the command line is never excluded.
func TestCollectCountsExcluded(t *testing.T) {
	dir := t.TempDir()
	for _, n := range []string{"a.callouts", "b.callouts", "notes.txt"} {
		if err := os.WriteFile(filepath.Join(dir, n), []byte("units mm\n"), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	all := func(string) bool { return true }
	found := Collect([]string{dir}, all)
	if len(found.Files) != 0 || found.Excluded != 2 {
		t.Errorf("files %v, excluded %d; want none and 2 (notes.txt is not a callouts file)", found.Files, found.Excluded)
	}
	named := filepath.Join(dir, "a.callouts")
	found = Collect([]string{named}, all)
	if len(found.Files) != 1 || found.Excluded != 0 {
		t.Errorf("a named file: files %v, excluded %d; want it checked", found.Files, found.Excluded)
	}
}

// Each file of a run knows the path on the command line it was found
// under: the walked folder, or itself where it was named; a file found
// twice keeps the first.
func TestRunRecordsRoots(t *testing.T) {
	dir := t.TempDir()
	sub := filepath.Join(dir, "parts", "sub")
	if err := os.MkdirAll(sub, 0o755); err != nil {
		t.Fatal(err)
	}
	deep := filepath.Join(sub, "deep.callouts")
	top := filepath.Join(dir, "top.callouts")
	for _, p := range []string{deep, top} {
		if err := os.WriteFile(p, []byte("units mm\nstandard iso\n"), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	parts := filepath.Join(dir, "parts")
	res := Run([]string{parts, top, sub}, Options{Workers: 2})
	got := map[string]string{}
	for _, f := range res.Files {
		got[f.Path] = f.Root
	}
	want := map[string]string{deep: parts, top: top}
	if len(got) != len(want) || got[deep] != want[deep] || got[top] != want[top] {
		t.Errorf("roots %v, want %v", got, want)
	}
}
