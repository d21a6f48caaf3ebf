package lsp

import (
	"fmt"
	"strings"
	"testing"
	"time"

	protocol "github.com/tliron/glsp/protocol_3_16"
)

// The goal (issue 17): diagnostics for a 1,000-line file within 50 ms of
// the change, on this machine. The benchmarks measure exactly that, end to
// end: a didChange written to the server's input, until the
// publishDiagnostics of that version has been read from its output, with
// the default debounce. Run them with
//
//	go test -run '^$' -bench . -benchtime 20x ./cmd/datumlint/internal/lsp/
//
// Shapes are scenarios of our own (invented plates): holes located by
// basic dimensions from A, B and C; hole patterns under composite
// position; the holes with mistakes (a missing basic dimension and an
// undefined datum on every few); and lines that do not parse, which take
// the parser's slow path.

type shape struct {
	name string
	// block returns the lines of the i-th repeated unit.
	block func(i int) []string
}

const benchHeader = `part "Bench plate"
units mm
standard asme-2018
feature base plane normal -z at (0, 0, 0)
feature rear plane normal -y at (0, 0, 0)
feature left plane normal -x at (0, 0, 0)
datum A on base
datum B on rear
datum C on left
frame base: flatness 0.02
frame rear: perpendicularity 0.05 datums A
frame left: perpendicularity 0.05 datums A, B
`

func hole(i int) (x, y int) { return 10 + 10*(i%50), 10 + 10*(i/50) }

var shapes = []shape{
	{"holes", func(i int) []string {
		x, y := hole(i)
		return []string{
			fmt.Sprintf("feature h%d hole size 6 +-0.1 axis +z at (%d, %d, 0)", i, x, y),
			fmt.Sprintf("frame h%d: position dia 0.2 (M) datums A, B, C", i),
			fmt.Sprintf("basic %d from left to h%d", x, i),
			fmt.Sprintf("basic %d from rear to h%d", y, i),
		}
	}},
	{"patterns", func(i int) []string {
		x, y := 20*(i%25), 20*(i/25)
		return []string{
			fmt.Sprintf("feature p%d hole 4x size 5 +-0.1 axis +z at (%d, %d, 0) (%d, %d, 0) (%d, %d, 0) (%d, %d, 0)", i, x+5, y+5, x+15, y+5, x+5, y+15, x+15, y+15),
			fmt.Sprintf("frame p%d: position dia 0.3 (M) datums A, B, C", i),
			"    composite dia 0.1 (M) datums A",
			fmt.Sprintf("basic %d from left to p%d.1", x+5, i),
			fmt.Sprintf("basic %d from rear to p%d.1", y+5, i),
			fmt.Sprintf("basic 10 from p%d.1 to p%d.2", i, i),
			fmt.Sprintf("basic 10 from p%d.1 to p%d.3", i, i),
			fmt.Sprintf("basic 10 from p%d.3 to p%d.4", i, i),
		}
	}},
	{"findings", func(i int) []string {
		x, y := hole(i)
		refs := "A, B, C"
		if i%5 == 0 {
			refs = "A, B, D"
		}
		out := []string{
			fmt.Sprintf("feature h%d hole size 6 +-0.1 axis +z at (%d, %d, 0)", i, x, y),
			fmt.Sprintf("frame h%d: position dia 0.2 (M) datums %s", i, refs),
			fmt.Sprintf("basic %d from rear to h%d", y, i),
		}
		if i%2 == 0 {
			out = append(out, fmt.Sprintf("basic %d from left to h%d", x, i))
		}
		return out
	}},
	{"broken", func(i int) []string {
		x, y := hole(i)
		return []string{
			fmt.Sprintf("feature h%d hole size 6 +-0.1 axis +z at (%d, %d, 0)", i, x, y),
			fmt.Sprintf("frame h%d position dia 0.2 (M) datums A, B, C", i), // no colon
			fmt.Sprintf("basic %d from left h%d", x, i),                     // no 'to'
			fmt.Sprintf("basic %d from rear to h%d", y, i),
		}
	}},
}

// benchText writes a file of about n lines of a shape.
func benchText(s shape, n int) string {
	lines := strings.Split(strings.TrimSuffix(benchHeader, "\n"), "\n")
	for i := 0; len(lines) < n; i++ {
		lines = append(lines, s.block(i)...)
	}
	return strings.Join(lines, "\n") + "\n"
}

// changeLatency opens the text and measures, over changes, the time from
// a didChange to its diagnostics. Each change flips one digit of the flat
// face's flatness (0.02 <-> 0.03): a change that every rule sees again.
func changeLatency(b *testing.B, text string, changes int) time.Duration {
	c := startServer(b, newServer(Options{}))
	c.initialize()
	uri := "file:///bench/plate.callouts"
	c.open(uri, text)
	c.waitPublish(uri, 1)
	line := strings.Count(text[:strings.Index(text, "frame base: flatness 0.02")], "\n")
	digit := rng(line, len("frame base: flatness 0.0"), line, len("frame base: flatness 0.0")+1)
	start := time.Now()
	for i := 0; i < changes; i++ {
		v := c.change(uri, digit, []string{"3", "2"}[i%2])
		c.waitPublish(uri, v)
	}
	d := time.Since(start)
	c.must("shutdown", nil, nil)
	c.notify("exit", nil)
	<-c.code
	return d / time.Duration(max(changes, 1))
}

// BenchmarkDiagnostics measures each shape at 500, 1,000 and 2,000 lines
// in one run: ns/op is the latency at 1,000 lines (the goal's size), the
// other metrics the latency at each size and its growth (a ratio near 2
// per doubling is linear; the debounce, a constant, keeps it lower).
func BenchmarkDiagnostics(b *testing.B) {
	for _, s := range shapes {
		b.Run(s.name, func(b *testing.B) {
			lat := map[int]time.Duration{}
			for _, n := range []int{500, 1000, 2000} {
				lat[n] = changeLatency(b, benchText(s, n), b.N)
				b.ReportMetric(float64(lat[n].Microseconds())/1000, fmt.Sprintf("ms@%d", n))
			}
			b.ReportMetric(float64(lat[1000].Nanoseconds()), "ns/op")
			b.ReportMetric(float64(lat[2000])/float64(lat[1000]), "x1000to2000")
			b.ReportMetric(float64(lat[1000])/float64(lat[500]), "x500to1000")
		})
	}
}

// TestBenchShapes keeps the benchmark honest: each shape is the size it
// says, the clean ones are clean and the others have their findings.
func TestBenchShapes(t *testing.T) {
	want := map[string]string{"holes": "", "patterns": "", "findings": "basic-missing datum-undefined", "broken": "syntax"}
	for _, s := range shapes {
		text := benchText(s, 1000)
		if n := strings.Count(text, "\n"); n < 1000 || n > 1010 {
			t.Errorf("%s: %d lines", s.name, n)
		}
		sn := analyse("file:///bench.callouts", "", []byte(text), 1, 1)
		seen := map[string]bool{}
		for _, d := range sn.diags {
			seen[d.Rule] = true
		}
		var got []string
		for _, r := range strings.Fields("basic-missing datum-undefined syntax") {
			if seen[r] {
				got = append(got, r)
			}
		}
		if strings.Join(got, " ") != want[s.name] || (want[s.name] == "" && len(sn.diags) > 0) {
			t.Errorf("%s: findings %v (%d), want %q", s.name, got, len(sn.diags), want[s.name])
		}
	}
	_ = protocol.Position{}
}
