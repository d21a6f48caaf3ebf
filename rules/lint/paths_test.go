package lint

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestCollectNamedPaths: a folder named like a file, given by name, is
// reported (exit 2) and still walked; one file named twice is checked once.
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
	files, errs := Collect([]string{folder, file, dir + "/./a.callouts"}, nil)
	if len(errs) != 1 || !strings.Contains(errs[0].Error(), "folder named like a callouts file") {
		t.Errorf("errors %v, want one about the folder", errs)
	}
	if len(files) != 2 || files[0] != inner || files[1] != file {
		t.Errorf("files %v, want %s and %s once each", files, inner, file)
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
