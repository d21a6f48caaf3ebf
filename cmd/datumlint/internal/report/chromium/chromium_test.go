package chromium

import (
	"image"
	"image/png"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestInkedPixelsSeesABlankImage(t *testing.T) {
	dir := t.TempDir()
	img := image.NewRGBA(image.Rect(0, 0, 40, 30))
	for i := range img.Pix {
		img.Pix[i] = 0xff
	}
	write := func(name string) string {
		p := filepath.Join(dir, name)
		f, err := os.Create(p)
		if err != nil {
			t.Fatal(err)
		}
		if err := png.Encode(f, img); err != nil {
			t.Fatal(err)
		}
		f.Close()
		return p
	}
	if n, _ := InkedPixels(t, write("blank.png")); n != 0 {
		t.Errorf("a white image has %d inked pixels", n)
	}
	for x := 0; x < 10; x++ {
		img.Set(x+5, 10, image.Black.C)
	}
	if n, _ := InkedPixels(t, write("line.png")); n != 10 {
		t.Errorf("a ten-pixel line has %d inked pixels", n)
	}
}

func TestConsoleLinePattern(t *testing.T) {
	line := `[4294:4294:1204/192943.769025:INFO:CONSOLE:0] "Loading the image 'http://example.invalid/x.png' violates the following Content Security Policy directive", source: file:///tmp/t.html (0)`
	if m := consoleLine.FindStringSubmatch(line); m == nil || !strings.HasPrefix(m[1], "Loading the image") {
		t.Errorf("console line not read: %q", m)
	}
	old := `[1:1:0101/000000.0:INFO:CONSOLE(12)] "Uncaught x", source: file:///a.html (12)`
	if consoleLine.FindStringSubmatch(old) == nil {
		t.Error("the older console line form is not read")
	}
	if consoleLine.FindStringSubmatch(`[1:1:ERROR:dbus/bus.cc:405] Failed to connect to the bus`) != nil {
		t.Error("a browser log line read as a console message")
	}
}

// The helper catches a page that loads something from the network.
func TestScreenshotReportsConsoleMessages(t *testing.T) {
	Find(t)
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
