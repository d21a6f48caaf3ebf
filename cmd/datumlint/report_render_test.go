package main

import (
	"bytes"
	"encoding/json"
	"flag"
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/cmd/datumlint/internal/report/chromium"
	"github.com/datumlint/datumlint/grammar"
)

var updateScreenshot = flag.Bool("update-screenshot", false, "write docs/report-example.png from the gearbox cover's page as `datumlint report` writes it")

// `datumlint report testdata/examples -o DIR`, as the README shows it,
// writes an index and a page per example part; each page renders in
// headless Chromium to a screenshot that is not blank and logs nothing on
// the console, refers to nothing outside the report, draws every frame
// with its line and carries every finding `check` prints; the index links
// every page.
func TestReportRendersInChromium(t *testing.T) {
	chromium.Find(t)
	// From the repository's top, so that the pages name the files as the
	// README's command does.
	t.Chdir(filepath.Join("..", ".."))
	examples := filepath.Join("testdata", "examples")
	dir := t.TempDir()
	var stdout, stderr bytes.Buffer
	if code := run([]string{"report", examples, "-o", dir}, &stdout, &stderr); code != 1 || stderr.Len() > 0 {
		// The gearbox cover is drafted with mistakes: exit 1, as check.
		t.Fatalf("report exited %d, stderr %q", code, stderr.String())
	}
	var findings []struct{ File, Message string }
	stdout.Reset()
	run([]string{"check", "--format", "json", examples}, &stdout, &stderr)
	if err := json.Unmarshal(stdout.Bytes(), &findings); err != nil || len(findings) == 0 {
		t.Fatalf("check --format json: %v (%d findings)", err, len(findings))
	}
	paths, err := filepath.Glob(filepath.Join(examples, "*.callouts"))
	qifs, _ := filepath.Glob(filepath.Join(examples, "*.qif")) // a QIF example gets its page too
	paths = append(paths, qifs...)
	if err != nil || len(paths) == 0 || len(qifs) == 0 {
		t.Fatal("no examples")
	}
	index, err := os.ReadFile(filepath.Join(dir, "index.html"))
	if err != nil {
		t.Fatal(err)
	}
	written := map[string]bool{}
	filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() {
			rel, _ := filepath.Rel(dir, p)
			written[filepath.ToSlash(rel)] = true
		}
		return nil
	})
	if len(written) != len(paths)+1 {
		t.Errorf("wrote %v; want index.html and one page per example", written)
	}
	for _, path := range paths {
		stem := strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
		page := filepath.Join(dir, stem+".html")
		t.Run(stem, func(t *testing.T) {
			html, err := os.ReadFile(page)
			if err != nil {
				t.Fatal(err)
			}
			if !bytes.Contains(index, []byte(`href="./`+stem+`.html"`)) {
				t.Errorf("the index does not link %s.html", stem)
			}
			src, _ := os.ReadFile(path)
			part := grammar.Read(path, src)
			for _, fr := range part.Frames {
				re := regexp.MustCompile(`<svg [^>]*class="fcf" [^>]*data-line="` + strconv.Itoa(fr.Span.Start.Line) + `"`)
				if !re.Match(html) {
					t.Errorf("the frame on line %d is not drawn with its data-line", fr.Span.Start.Line)
				}
			}
			for _, f := range findings {
				if filepath.Clean(f.File) == filepath.Clean(path) && !bytes.Contains(html, []byte(htmlText(f.Message))) {
					t.Errorf("the page lacks the finding %q", f.Message)
				}
			}
			noOutsideReference(t, string(html))
			png := filepath.Join(dir, stem+".png")
			chromium.CheckRendered(t, page, png, 1000, 2400)
			if *updateScreenshot && stem == "gearbox-cover" {
				data, err := os.ReadFile(png)
				if err != nil {
					t.Fatal(err)
				}
				if err := os.WriteFile(filepath.Join("docs", "report-example.png"), data, 0o644); err != nil {
					t.Fatal(err)
				}
			}
		})
	}
	noOutsideReference(t, string(index))
	chromium.CheckRendered(t, filepath.Join(dir, "index.html"), filepath.Join(dir, "index.png"), 1000, 600)
	if keep := os.Getenv("DATUMLINT_REPORT_KEEP"); keep != "" {
		// For a person to look at:
		// DATUMLINT_REPORT_KEEP=/tmp/report go test ./cmd/datumlint -run ReportRenders
		if err := os.CopyFS(keep, os.DirFS(dir)); err != nil {
			t.Log(err)
		}
	}
}

// outsideReferences lists anything that would load or link outside the
// report: a script, an embedded object, a style sheet import, a url(), a
// src, or an href other than a fragment or a relative .html page.
func outsideReferences(html string) []string {
	var out []string
	lower := strings.ToLower(html)
	for _, bad := range []string{"<script", "<link", "<iframe", "<object", "<embed", "@import", "url(", " src="} {
		if strings.Contains(lower, bad) {
			out = append(out, bad)
		}
	}
	for _, m := range regexp.MustCompile(`href="([^"]*)"`).FindAllStringSubmatch(html, -1) {
		h := m[1]
		if strings.HasPrefix(h, "#") {
			continue
		}
		if strings.Contains(h, ":") && !strings.HasPrefix(h, "./") || strings.HasPrefix(h, "/") || !strings.HasSuffix(h, ".html") {
			out = append(out, "href="+h)
		}
	}
	return out
}

func noOutsideReference(t *testing.T, html string) {
	t.Helper()
	for _, r := range outsideReferences(html) {
		t.Errorf("the page refers outside the report: %s", r)
	}
}

func TestOutsideReferences(t *testing.T) {
	for _, bad := range []string{`<img src="x.png">`, `<a href="https://example.invalid/a.html">`, `<a href="//host/a.html">`,
		`<style>@import "x.css";</style>`, `<a href="/etc/a.html">`, `<a href="other.pdf">`, `<div style="background:url(x)">`} {
		if len(outsideReferences(bad)) == 0 {
			t.Errorf("%s is not caught", bad)
		}
	}
	if r := outsideReferences(`<a href="#frame-3">x</a><a href="../index.html">y</a><a href="./sub/b%20c.html">z</a>`); len(r) != 0 {
		t.Errorf("links inside the report caught: %v", r)
	}
}

// htmlText escapes a message as the page writes text: &, < and >.
func htmlText(s string) string {
	return strings.NewReplacer("&", "&amp;", "<", "&lt;", ">", "&gt;").Replace(s)
}
