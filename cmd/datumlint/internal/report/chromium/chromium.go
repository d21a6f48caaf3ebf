// Package chromium renders HTML in Debian's headless Chromium for tests: a
// screenshot with the console messages the page logged, a count of the
// pixels it inked, and a print to PDF with its sheets counted. Every
// helper skips the test where chromium is not installed, or under -short.
package chromium

import (
	"bytes"
	"context"
	"fmt"
	"image/png"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"
)

// Find returns the path of Debian's headless-capable browser, or skips
// the test where it is missing (and under -short).
func Find(t testing.TB) string {
	t.Helper()
	if testing.Short() {
		t.Skip("renders in a browser; skipped under -short")
	}
	for _, name := range []string{"chromium", "chromium-browser"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	t.Skip("chromium is not installed (Debian: apt-get install chromium)")
	return ""
}

// consoleLine matches what Chromium writes to stderr, with
// --enable-logging=stderr, for each console message of the page: its
// level is not printed, so every message counts. The pages run no script,
// so a message can only be a failed load or a refused policy.
var consoleLine = regexp.MustCompile(`:CONSOLE[(:]\d*\)?\] "(.*)", source: (.*)`)

// runChromium runs headless Chromium on an HTML file with the flags every
// run needs (no sandbox, no GPU, nothing fetched in the background, a new
// empty profile) and the extra flags given; it returns what it printed.
func runChromium(t testing.TB, htmlPath string, extra ...string) string {
	t.Helper()
	bin := Find(t)
	abs, err := filepath.Abs(htmlPath)
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
	defer cancel()
	args := append([]string{
		"--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
		"--disable-background-networking", "--disable-component-update", "--disable-sync",
		"--user-data-dir=" + t.TempDir()}, extra...)
	cmd := exec.CommandContext(ctx, bin, append(args, "file://"+abs)...)
	var out bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &out
	if err := cmd.Run(); err != nil {
		t.Fatalf("chromium: %v\n%s", err, out.String())
	}
	return out.String()
}

// Screenshot renders an HTML file in headless Chromium to a PNG of the
// given window size, and returns the console messages the page logged.
func Screenshot(t testing.TB, htmlPath, pngPath string, width, height int) []string {
	t.Helper()
	out, err := filepath.Abs(pngPath)
	if err != nil {
		t.Fatal(err)
	}
	log := runChromium(t, htmlPath, "--enable-logging=stderr", "--v=0", "--hide-scrollbars",
		fmt.Sprintf("--window-size=%d,%d", width, height), "--screenshot="+out)
	var msgs []string
	for _, line := range strings.Split(log, "\n") {
		if m := consoleLine.FindStringSubmatch(line); m != nil {
			msgs = append(msgs, m[1]+" ("+m[2]+")")
		}
	}
	return msgs
}

// InkedPixels counts the pixels of a PNG that differ from its top-left
// pixel (the page's background).
func InkedPixels(t testing.TB, path string) (inked, total int) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	b := img.Bounds()
	br, bg, bb, _ := img.At(b.Min.X, b.Min.Y).RGBA()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, _ := img.At(x, y).RGBA()
			if diff(r, br)+diff(g, bg)+diff(bl, bb) > 3*0x0800 {
				inked++
			}
		}
	}
	return inked, b.Dx() * b.Dy()
}

func diff(a, b uint32) uint32 {
	if a > b {
		return a - b
	}
	return b - a
}

// CheckRendered renders a page and fails when it is blank or logged a
// console message.
func CheckRendered(t testing.TB, htmlPath, pngPath string, width, height int) {
	t.Helper()
	msgs := Screenshot(t, htmlPath, pngPath, width, height)
	for _, m := range msgs {
		t.Errorf("%s logged: %s", htmlPath, m)
	}
	inked, total := InkedPixels(t, pngPath)
	// A page with a heading, a frame and a table inks well over 1% of a
	// screen; a blank or failed render inks nothing.
	if inked*100 < total {
		t.Errorf("%s looks blank: %d of %d pixels differ from the background", pngPath, inked, total)
	}
}

// PrintPDF prints an HTML file to PDF with headless Chromium, as a reader
// printing the page would, and returns the PDF.
func PrintPDF(t testing.TB, htmlPath, pdfPath string) []byte {
	t.Helper()
	out, err := filepath.Abs(pdfPath)
	if err != nil {
		t.Fatal(err)
	}
	runChromium(t, htmlPath, "--no-pdf-header-footer", "--print-to-pdf="+out)
	data, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	return data
}

var (
	pdfPage     = regexp.MustCompile(`/Type\s*/Page\b`)
	pdfMediaBox = regexp.MustCompile(`/MediaBox\s*\[\s*0 0 ([\d.]+) ([\d.]+)\s*\]`)
)

// PDFPages returns the number of pages of a PDF and the size of its first
// page in points.
func PDFPages(data []byte) (n int, w, h float64) {
	n = len(pdfPage.FindAll(data, -1))
	if m := pdfMediaBox.FindSubmatch(data); m != nil {
		fmt.Sscan(string(m[1]), &w)
		fmt.Sscan(string(m[2]), &h)
	}
	return n, w, h
}
