package report

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/rules"
)

// The example parts' pages render in headless Chromium to a screenshot
// that is not blank, and log nothing on the console.
func TestExamplePagesRender(t *testing.T) {
	chromium(t)
	dir := t.TempDir()
	var entries []IndexEntry
	for _, path := range examplePaths(t) {
		p, _, _ := build(t, path)
		stem := strings.TrimSuffix(filepath.Base(path), ".callouts")
		html := filepath.Join(dir, stem+".html")
		f, err := os.Create(html)
		if err != nil {
			t.Fatal(err)
		}
		if err := p.WriteHTML(f); err != nil {
			t.Fatal(err)
		}
		f.Close()
		entries = append(entries, p.Entry(stem+".html"))
		png := filepath.Join(dir, stem+".png")
		CheckRendered(t, html, png, 1000, 2400)
		if *updateScreenshot && stem == "gearbox-cover" {
			data, err := os.ReadFile(png)
			if err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile("../../../../docs/report-example.png", data, 0o644); err != nil {
				t.Fatal(err)
			}
		}
		if out := os.Getenv("DATUMLINT_REPORT_KEEP"); out != "" {
			// For a person to look at: DATUMLINT_REPORT_KEEP=/tmp/r go test -run Render
			_ = os.MkdirAll(out, 0o755)
			for _, n := range []string{html, png} {
				data, _ := os.ReadFile(n)
				_ = os.WriteFile(filepath.Join(out, filepath.Base(n)), data, 0o644)
			}
		}
	}
	index := filepath.Join(dir, "index.html")
	f, err := os.Create(index)
	if err != nil {
		t.Fatal(err)
	}
	if err := WriteIndex(f, entries); err != nil {
		t.Fatal(err)
	}
	f.Close()
	CheckRendered(t, index, filepath.Join(dir, "index.png"), 1000, 600)
}

// The helper catches a page that loads something from the network.
func TestScreenshotReportsConsoleMessages(t *testing.T) {
	chromium(t)
	dir := t.TempDir()
	html := filepath.Join(dir, "bad.html")
	page := `<!DOCTYPE html><html><head><meta http-equiv="Content-Security-Policy" content="default-src 'none'"><title>x</title></head>` +
		`<body><p>text</p><img src="http://example.invalid/logo.png" alt=""></body></html>`
	if err := os.WriteFile(html, []byte(page), 0o644); err != nil {
		t.Fatal(err)
	}
	msgs := Screenshot(t, html, filepath.Join(dir, "bad.png"), 400, 300)
	if len(msgs) == 0 {
		t.Error("a page loading a network image logged nothing")
	}
}

// The page prints on A4 and on Letter, each part of the page from a new
// sheet: at least one sheet for the header and frames, and one each for the
// datum symbols, the material conditions, the views and the findings.
func TestPagePrintsOnA4AndLetter(t *testing.T) {
	chromium(t)
	dir := t.TempDir()
	// A small part, whose page would fit on two sheets without the breaks.
	src := "part \"Spacer\"\nunits mm\nstandard iso\nfeature face plane normal -z at (0, 0, 0)\n" +
		"datum A on face\nframe face: flatness 0.01\n"
	part := grammar.Read("spacer.callouts", []byte(src))
	p := Build(File{Path: "spacer.callouts", Source: []byte(src), Part: part, Findings: rules.Check(part, nil)})
	var b strings.Builder
	if err := p.WriteHTML(&b); err != nil {
		t.Fatal(err)
	}
	for _, paper := range []struct {
		name string
		w, h float64 // points: ISO 216 A4 is 210 x 297 mm, Letter 8.5 x 11 in
	}{{"A4", 595.3, 841.9}, {"Letter", 612, 792}} {
		// The reader's choice of paper, as a print dialogue makes it.
		html := strings.Replace(b.String(), "</head>", "<style>@page{size:"+paper.name+"}</style></head>", 1)
		path := filepath.Join(dir, paper.name+".html")
		if err := os.WriteFile(path, []byte(html), 0o644); err != nil {
			t.Fatal(err)
		}
		n, w, h := pdfPages(PrintPDF(t, path, filepath.Join(dir, paper.name+".pdf")))
		if d := w - paper.w; d > 1 || d < -1 || h-paper.h > 1 || h-paper.h < -1 {
			t.Errorf("%s: printed on %g x %g points", paper.name, w, h)
		}
		if n < 5 {
			t.Errorf("%s: %d sheets; each of the five parts should start a sheet", paper.name, n)
		}
	}
}
