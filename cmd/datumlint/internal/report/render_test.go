package report

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/cmd/datumlint/internal/report/chromium"
	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/rules"
)

// The example parts' pages as the report command writes them are rendered
// in Chromium by cmd/datumlint's TestReportRendersInChromium.

// The page prints on A4 and on Letter, each part of the page from a new
// sheet: at least one sheet for the header and frames, and one each for the
// datum symbols, the material conditions, the inspection set-up, the views
// and the findings.
func TestPagePrintsOnA4AndLetter(t *testing.T) {
	chromium.Find(t)
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
		n, w, h := chromium.PDFPages(chromium.PrintPDF(t, path, filepath.Join(dir, paper.name+".pdf")))
		if d := w - paper.w; d > 1 || d < -1 || h-paper.h > 1 || h-paper.h < -1 {
			t.Errorf("%s: printed on %g x %g points", paper.name, w, h)
		}
		if n < 6 {
			t.Errorf("%s: %d sheets; each of the six parts should start a sheet", paper.name, n)
		}
	}
}
