package report

import (
	"bytes"
	"errors"
	"fmt"
	"math/rand/v2"
	"net/url"
	"os"
	"path"
	"path/filepath"
	"strings"
)

// PagePaths names the page of each file, as a slash-separated path below
// the output folder, in the order given:
//
//   - a file's page is named after its stem (mounting-plate.callouts →
//     mounting-plate.html), in the folders it was found in below the path
//     named on the command line (File.Root): parts/a/b.callouts found
//     under parts is a/b.html; a file named on the command line is at the
//     top;
//   - where two or more files would get the same page — two files with one
//     stem in one folder (a.callouts and a.qif), names that differ only in
//     case (which some file systems fold into one), a page named like a
//     folder of pages, or a top-level page named index.html — each of them
//     is named after its whole file name instead: a.callouts.html,
//     a.qif.html;
//   - where that still collides (the same file name under two paths named
//     on the command line), the later ones get -2, -3, … before .html, in
//     the order given.
//
// So no page overwrites another or the index, and a page's name does not
// depend on which other files happen to be checked unless they collide
// with it.
func PagePaths(files []File) []string {
	dirs := make([]string, len(files))
	bases := make([]string, len(files))
	for i, f := range files {
		dirs[i], bases[i] = placeBelow(f.Path, f.Root)
	}
	stemName := func(i int) string {
		base := bases[i]
		stem := strings.TrimSuffix(base, filepath.Ext(base))
		if stem == "" || stem == "." || stem == ".." {
			stem = base
		}
		return path.Join(dirs[i], stem+".html")
	}
	names := make([]string, len(files))
	count := map[string]int{}
	folders := map[string]bool{}
	for i := range files {
		names[i] = stemName(i)
		count[strings.ToLower(names[i])]++
		for d := dirs[i]; d != "."; d = path.Dir(d) {
			folders[strings.ToLower(d)] = true
		}
	}
	reserved := func(name string) bool {
		l := strings.ToLower(name)
		return l == "index.html" || folders[l]
	}
	for i := range files {
		if count[strings.ToLower(names[i])] > 1 || reserved(names[i]) {
			names[i] = path.Join(dirs[i], bases[i]+".html")
		}
	}
	used := map[string]bool{}
	for i := range files {
		name := names[i]
		for n := 2; used[strings.ToLower(name)] || reserved(name); n++ {
			name = strings.TrimSuffix(names[i], ".html") + fmt.Sprintf("-%d.html", n)
		}
		used[strings.ToLower(name)] = true
		names[i] = name
	}
	return names
}

// placeBelow returns the folder (slash-separated, "." for the top) and
// the file name of a file's page below the output folder: its folders
// relative to root, the path on the command line it was found under.
func placeBelow(file, root string) (dir, base string) {
	base = filepath.Base(file)
	if root == "" || filepath.Clean(root) == filepath.Clean(file) {
		return ".", base
	}
	rel, err := filepath.Rel(root, file)
	if err != nil {
		return ".", base
	}
	dir = filepath.ToSlash(filepath.Dir(rel))
	if dir == ".." || strings.HasPrefix(dir, "../") || path.IsAbs(dir) {
		return ".", base
	}
	return path.Clean(dir), base
}

// Href is a page's link from the index: each part of the path escaped, and
// "./" first so that a name with a colon is not read as a scheme.
func Href(page string) string {
	parts := strings.Split(page, "/")
	for i, p := range parts {
		parts[i] = url.PathEscape(p)
	}
	return "./" + strings.Join(parts, "/")
}

// indexHref is the link from a page back to the index.
func indexHref(page string) string {
	return strings.Repeat("../", strings.Count(page, "/")) + "index.html"
}

// WriteSite writes one page per file and the index into dir, which it
// creates if needed. Nothing is written outside dir: every file is opened
// through an os.Root on dir, which refuses a name or a symbolic link that
// leads out of it, and a page's path is made of the file's folders below
// the path named on the command line (PagePaths), never of "..". Each
// page is written atomically (a temporary file beside it, renamed over
// it), so a reader sees the old page or the new one; a symbolic link in
// the page's place is replaced, not followed. The index is written last,
// linking every part.
func WriteSite(dir string, files []File) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	root, err := os.OpenRoot(dir)
	if err != nil {
		return err
	}
	defer root.Close()
	names := PagePaths(files)
	entries := make([]IndexEntry, len(files))
	for i, f := range files {
		p := Build(f)
		p.IndexHref = indexHref(names[i])
		var b bytes.Buffer
		if err := p.WriteHTML(&b); err != nil {
			return err
		}
		if err := writeIn(root, names[i], b.Bytes()); err != nil {
			return fmt.Errorf("%s: %w", filepath.Join(dir, filepath.FromSlash(names[i])), err)
		}
		entries[i] = p.Entry(Href(names[i]))
	}
	var b bytes.Buffer
	if err := WriteIndex(&b, entries); err != nil {
		return err
	}
	if err := writeIn(root, "index.html", b.Bytes()); err != nil {
		return fmt.Errorf("%s: %w", filepath.Join(dir, "index.html"), err)
	}
	return nil
}

// writeIn writes name below root atomically: its folders are made, the
// data goes to a new temporary file in the same folder, which is synced
// and renamed over name.
func writeIn(root *os.Root, name string, data []byte) (err error) {
	if d := path.Dir(name); d != "." {
		if err := root.MkdirAll(d, 0o755); err != nil {
			return err
		}
	}
	if st, err := root.Lstat(name); err == nil && st.IsDir() {
		return errors.New("a folder is in the page's place")
	}
	var tmp string
	var f *os.File
	for range 100 {
		tmp = path.Join(path.Dir(name), fmt.Sprintf(".%s.%d.tmp", path.Base(name), rand.Uint32()))
		f, err = root.OpenFile(tmp, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
		if !errors.Is(err, os.ErrExist) {
			break
		}
	}
	if err != nil {
		return err
	}
	defer func() {
		if err != nil {
			f.Close()
			root.Remove(tmp)
		}
	}()
	if _, err = f.Write(data); err != nil {
		return err
	}
	if err = f.Sync(); err != nil {
		return err
	}
	if err = f.Close(); err != nil {
		return err
	}
	return root.Rename(tmp, name)
}
