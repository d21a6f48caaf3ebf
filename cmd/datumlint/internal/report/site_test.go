package report

import (
	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func pages(files ...[2]string) []string {
	var fs []File
	for _, f := range files {
		fs = append(fs, File{Path: f[0], Root: f[1]})
	}
	return PagePaths(fs)
}

func TestPagePaths(t *testing.T) {
	cases := []struct {
		name  string
		files [][2]string // path, root
		want  []string
	}{
		{"named file", [][2]string{{"parts/mounting-plate.callouts", "parts/mounting-plate.callouts"}}, []string{"mounting-plate.html"}},
		{"folder mirrored", [][2]string{
			{"parts/a.callouts", "parts"}, {"parts/sub/deep/b.callouts", "parts"}, {"./parts/c.callouts", "parts/"},
		}, []string{"a.html", "sub/deep/b.html", "c.html"}},
		{"one stem, two readers", [][2]string{{"p/a.callouts", "p"}, {"p/a.qif", "p"}, {"p/b.callouts", "p"}},
			[]string{"a.callouts.html", "a.qif.html", "b.html"}},
		{"names differing in case", [][2]string{{"p/Plate.callouts", "p"}, {"p/plate.callouts", "p"}},
			// Still one name where case is folded: the later gets a number.
			[]string{"Plate.callouts.html", "plate.callouts-2.html"}},
		{"the index's name", [][2]string{{"p/index.callouts", "p"}, {"p/sub/index.callouts", "p"}},
			[]string{"index.callouts.html", "sub/index.html"}},
		{"one name under two paths", [][2]string{{"a/x.callouts", "a"}, {"b/x.callouts", "b"}},
			[]string{"x.callouts.html", "x.callouts-2.html"}},
		{"a page named like a folder", [][2]string{{"p/x.callouts", "p"}, {"p/x.html/y.callouts", "p"}, {"p/sub.callouts", "p"}, {"p/sub/z.callouts", "p"}},
			[]string{"x.callouts.html", "x.html/y.html", "sub.html", "sub/z.html"}},
		{"parent folders and absolute paths", [][2]string{{"../x.callouts", "../x.callouts"}, {"/abs/q/r.callouts", "/abs"}, {"../up/z.callouts", ".."}},
			[]string{"x.html", "q/r.html", "up/z.html"}},
		{"a file outside its root", [][2]string{{"other/w.callouts", "parts"}}, []string{"w.html"}},
		{"no stem", [][2]string{{"p/.callouts", "p"}}, []string{".callouts.html"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := pages(c.files...)
			if strings.Join(got, " ") != strings.Join(c.want, " ") {
				t.Errorf("pages %q, want %q", got, c.want)
			}
			for _, g := range got {
				if strings.HasPrefix(g, "/") || strings.HasPrefix(g, "../") || strings.Contains(g, "/../") {
					t.Errorf("page %q leaves the folder", g)
				}
			}
		})
	}
}

func TestHref(t *testing.T) {
	for page, want := range map[string]string{
		"a.html":         "./a.html",
		"sub/b c.html":   "./sub/b%20c.html",
		"c:d.html":       "./c:d.html",
		"x#y?.html":      "./x%23y%3F.html",
		"deep/er/z.html": "./deep/er/z.html",
	} {
		if got := Href(page); got != want {
			t.Errorf("Href(%q) = %q, want %q", page, got, want)
		}
	}
	if got := indexHref("sub/deep/p.html"); got != "../../index.html" {
		t.Errorf("indexHref = %q", got)
	}
}

func plate(path, root string) File {
	src := "part \"P\"\nunits mm\nstandard iso\nfeature face plane normal -z at (0, 0, 0)\ndatum A on face\nframe face: flatness 0.01\n"
	return File{Path: path, Root: root, Source: []byte(src), Part: readPart(path, src)}
}

// WriteSite writes the pages and the index inside the folder and nowhere
// else: a symbolic link in a page's place is replaced, not written
// through; a folder that is a link out of the report stops the write; no
// temporary file is left behind.
func TestWriteSiteStaysInside(t *testing.T) {
	base := t.TempDir()
	out := filepath.Join(base, "report")
	outside := filepath.Join(base, "outside")
	if err := os.MkdirAll(filepath.Join(out, "parts"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.Mkdir(outside, 0o755); err != nil {
		t.Fatal(err)
	}
	victim := filepath.Join(outside, "victim.html")
	if err := os.WriteFile(victim, []byte("keep"), 0o644); err != nil {
		t.Fatal(err)
	}
	// report/a.html is a link to a file outside.
	if err := os.Symlink(victim, filepath.Join(out, "a.html")); err != nil {
		t.Fatal(err)
	}
	files := []File{plate("../a.callouts", "../a.callouts"), plate(filepath.Join(base, "src", "parts", "b.callouts"), filepath.Join(base, "src"))}
	if err := WriteSite(out, files); err != nil {
		t.Fatal(err)
	}
	if data, _ := os.ReadFile(victim); string(data) != "keep" {
		t.Errorf("the file outside was written through a link: %q", data)
	}
	for _, name := range []string{"a.html", "parts/b.html", "index.html"} {
		st, err := os.Lstat(filepath.Join(out, filepath.FromSlash(name)))
		if err != nil || !st.Mode().IsRegular() {
			t.Errorf("%s: %v, %v", name, st, err)
		}
	}
	index, _ := os.ReadFile(filepath.Join(out, "index.html"))
	for _, href := range []string{`href="./a.html"`, `href="./parts/b.html"`} {
		if !strings.Contains(string(index), href) {
			t.Errorf("the index lacks %s", href)
		}
	}
	page, _ := os.ReadFile(filepath.Join(out, "parts", "b.html"))
	if !strings.Contains(string(page), `href="../index.html"`) {
		t.Error("the page does not link back to the index")
	}
	filepath.Walk(base, func(p string, info os.FileInfo, err error) error {
		if err == nil && strings.HasSuffix(p, ".tmp") {
			t.Errorf("left behind: %s", p)
		}
		return nil
	})

	// A folder of the report that links outside: the page is not written.
	out2 := filepath.Join(base, "report2")
	if err := os.Mkdir(out2, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(outside, filepath.Join(out2, "parts")); err != nil {
		t.Fatal(err)
	}
	err := WriteSite(out2, []File{plate(filepath.Join(base, "src", "parts", "c.callouts"), filepath.Join(base, "src"))})
	if err == nil {
		t.Error("a page was written through a link that leads outside")
	}
	if _, err := os.Stat(filepath.Join(outside, "c.html")); err == nil {
		t.Error("c.html was written outside the report")
	}
	entries, _ := os.ReadDir(outside)
	if len(entries) != 1 {
		t.Errorf("outside holds %d files, want only victim.html", len(entries))
	}
}

// A folder in a page's place is an error, not overwritten.
func TestWriteSiteFolderInPagesPlace(t *testing.T) {
	out := t.TempDir()
	if err := os.MkdirAll(filepath.Join(out, "a.html", "keep"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := WriteSite(out, []File{plate("a.callouts", "a.callouts")}); err == nil || !strings.Contains(err.Error(), "folder") {
		t.Errorf("err = %v", err)
	}
	if _, err := os.Stat(filepath.Join(out, "a.html", "keep")); err != nil {
		t.Error("the folder was removed")
	}
}

func readPart(path, src string) *model.Part { return grammar.Read(path, []byte(src)) }
