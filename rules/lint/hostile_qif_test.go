package lint

import (
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"runtime/metrics"
	"strings"
	"testing"
	"time"

	"github.com/datumlint/datumlint/rules"
)

// Hostile QIF documents through the whole check: a positioned finding,
// never a crash, and memory bounded by the input.

const qifRoot = `<QIFDocument xmlns="http://qifstandards.org/xsd/qif3" versionQIF="3.0.0" idMax="9">`

func exampleQIF(t *testing.T) string {
	t.Helper()
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "examples", "bearing-flange.qif"))
	if err != nil {
		t.Fatal(err)
	}
	return string(src)
}

func TestHostileQIFFiles(t *testing.T) {
	ex := exampleQIF(t)
	name := strings.Index(ex, "<Name>") + len("<Name>")
	cases := map[string]hostile{
		"billion laughs": {`<?xml version="1.0"?>
<!DOCTYPE QIFDocument [<!ENTITY a "aaaaaaaaaa"><!ENTITY b "&a;&a;&a;&a;&a;&a;&a;&a;&a;&a;"><!ENTITY c "&b;&b;&b;&b;&b;&b;&b;&b;&b;&b;">]>
` + qifRoot + "<QPId>&c;</QPId></QIFDocument>", rules.Syntax.ID, 2},
		"external entity":   {`<!DOCTYPE QIFDocument SYSTEM "file:///etc/passwd">` + qifRoot + "</QIFDocument>", rules.Syntax.ID, 1},
		"undeclared entity": {qifRoot + "\n<QPId>&x;</QPId></QIFDocument>", rules.Syntax.ID, 2},
		"deep nesting":      {qifRoot + "\n" + strings.Repeat("<Features>", 100000) + strings.Repeat("</Features>", 100000) + "</QIFDocument>", rules.Syntax.ID, 2},
		"not XML":           {"part \"Bracket\"\nunits mm\n", rules.Syntax.ID, 1},
		"not QIF":           {"<?xml version=\"1.0\"?>\n<svg xmlns=\"http://www.w3.org/2000/svg\"/>\n", rules.Syntax.ID, 2},
		"QIF 2":             {`<QIFDocument xmlns="http://qifstandards.org/xsd/qif2" versionQIF="2.1.0"/>`, rules.Syntax.ID, 1},
		"truncated":         {ex[:len(ex)/2], rules.Syntax.ID, 0},
		"binary":            {"\x00\x01\x02" + strings.Repeat("\xff", 1000), rules.Syntax.ID, 1},
		// 12 MB of text in a name the reader keeps (it keeps 4 KiB), and
		// 2 million elements in a section it skips: read, not refused.
		"huge name":     {ex[:name] + strings.Repeat("x", 12<<20) + ex[name:], "", 0},
		"many skipped":  {strings.Replace(ex, "</QIFDocument>", "<PlansResults>"+strings.Repeat("<x/>", 2_000_000)+"</PlansResults></QIFDocument>", 1), "", 0},
		"the example":   {ex, "", 0},
		"upper-case id": {strings.Replace(ex, `id="50"`, `id="L"`, 1), rules.QIFInconsistent.ID, 0},
	}
	dir := t.TempDir()
	for name, h := range cases {
		if err := os.WriteFile(filepath.Join(dir, strings.ReplaceAll(name, " ", "-")+QIFExt), []byte(h.src), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	for name, h := range cases {
		t.Run(name, func(t *testing.T) {
			path := filepath.Join(dir, strings.ReplaceAll(name, " ", "-")+QIFExt)
			var res Result
			peak := peakHeap(func() { res = Run([]string{path}, Options{}) })
			if len(res.Errors) > 0 {
				t.Fatal(res.Errors)
			}
			// The heap while checking stays within a small multiple of the
			// file (and 64 MB for a small one; garbage not yet collected
			// included).
			if peak > uint64(8*len(h.src)+64<<20) {
				t.Errorf("checking %d bytes took the heap to %d bytes", len(h.src), peak)
			}
			ds := res.Diagnostics()
			checkPositions(t, []byte(h.src), ds)
			if h.want == "" {
				for _, d := range ds {
					if d.Severity >= rules.Warning {
						t.Errorf("want no warning or error, got %s %s: %s", d.Span.Start, d.Rule, d.Message)
					}
				}
				return
			}
			found := false
			for _, d := range ds {
				found = found || d.Rule == h.want && (h.line == 0 || d.Span.Start.Line == h.line)
			}
			if !found {
				t.Errorf("want a %s finding on line %d, got %s", h.want, h.line, summary(ds))
			}
		})
	}
}

// peakHeap runs f and returns the most heap its objects took meanwhile
// (sampled every millisecond; runtime/metrics, garbage not yet swept
// included).
func peakHeap(f func()) uint64 {
	sample := []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}}
	runtime.GC()
	done := make(chan struct{})
	peak := make(chan uint64)
	go func() {
		var max uint64
		tick := time.NewTicker(time.Millisecond)
		defer tick.Stop()
		for {
			metrics.Read(sample)
			max = maxU(max, sample[0].Value.Uint64())
			select {
			case <-done:
				peak <- max
				return
			case <-tick.C:
			}
		}
	}()
	f()
	close(done)
	return <-peak
}

func maxU(a, b uint64) uint64 {
	if a > b {
		return a
	}
	return b
}

// Every prefix of the example, and the example with bytes changed at
// random (seeded), checks without a crash and with findings in the file.
func TestMutatedQIF(t *testing.T) {
	ex := exampleQIF(t)
	try := func(src string) {
		f := &File{Path: "m.qif"}
		CheckSource(f, []byte(src), nil, false)
		checkPositions(t, []byte(src), f.Diagnostics)
	}
	for i := 0; i < len(ex); i += 97 {
		try(ex[:i])
	}
	r := rand.New(rand.NewPCG(14, 3))
	junk := []byte("<>/=\"'&;x0.-9 \n\x00\xff")
	for k := 0; k < 300; k++ {
		b := []byte(ex)
		for j := 0; j < 1+r.IntN(8); j++ {
			b[r.IntN(len(b))] = junk[r.IntN(len(junk))]
		}
		try(string(b))
	}
}
