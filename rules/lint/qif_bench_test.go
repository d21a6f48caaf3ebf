package lint

import (
	"fmt"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/datumlint/datumlint/grammar/qif"
	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/rules/lint/internal/gen"
)

// Benchmarks of QIF files on documents grown from the NIST models (test
// data), in two shapes, three sizes each, with the growth from the
// smallest to the largest as a ratio in the same run:
//
//   - brep: CTC 1 with its B-rep repeated, as large exports are (the
//     reader walks and skips the geometry; the part stays CTC 1's);
//   - features: FTC 6's feature and characteristic nominals repeated with
//     fresh ids and no B-rep, so that the part itself grows (every copy
//     refers to the same datums: one part of many features).
//
//	go test -run '^$' -bench QIF -benchmem ./rules/lint/
//
// End to end (docs/performance.md): go run ./rules/lint/internal/gen/cmd/genqif
// writes such a document, and hyperfine times `datumlint check` on it.

type qifShape struct {
	name  string
	model string
	grow  func(string, int) string
	sizes []int // bytes
}

var qifShapes = []qifShape{
	{"brep", "nist_ctc_01_asme1_ap242", gen.QIFBrep, []int{1 << 20, 4 << 20, 16 << 20}},
	{"features", "nist_ftc_06_asme1_ap242", gen.QIFFeatures, []int{1 << 20, 4 << 20, 15 << 20}},
}

func qifDoc(b *testing.B, s qifShape, size int) []byte {
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "qif", "nist", s.model+".qif"))
	if err != nil {
		b.Fatal(err)
	}
	return []byte(s.grow(string(src), size))
}

func sizeName(n int) string {
	if n >= 1<<20 {
		return fmt.Sprintf("%dMB", n>>20)
	}
	return fmt.Sprintf("%dKB", n>>10)
}

// readQIFOnce reads a document with the QIF reader alone.
func readQIFOnce(b *testing.B, src []byte) {
	if _, err := qif.ReadFile(source.NewFile("bench.qif", src)); err != nil {
		b.Fatal(err)
	}
}

// checkQIFOnce reads and checks a document as check does.
func checkQIFOnce(b *testing.B, src []byte) {
	f := &File{Path: "bench.qif"}
	CheckSource(f, src, nil, false)
	if len(f.Diagnostics) == 0 {
		b.Fatal("no findings: the document was not checked")
	}
}

func benchQIF(b *testing.B, once func(*testing.B, []byte)) {
	for _, s := range qifShapes {
		for _, size := range s.sizes {
			src := qifDoc(b, s, size)
			b.Run(s.name+"/"+sizeName(size), func(b *testing.B) {
				b.SetBytes(int64(len(src)))
				for b.Loop() {
					once(b, src)
				}
			})
		}
	}
}

func BenchmarkQIFRead(b *testing.B)  { benchQIF(b, readQIFOnce) }
func BenchmarkQIFCheck(b *testing.B) { benchQIF(b, checkQIFOnce) }

// BenchmarkQIFGrowth reports, per shape and stage, the time per byte of
// the largest document over that of the smallest: 1 is linear growth.
func BenchmarkQIFGrowth(b *testing.B) {
	for _, stage := range []struct {
		name string
		once func(*testing.B, []byte)
	}{{"read", readQIFOnce}, {"check", checkQIFOnce}} {
		for _, s := range qifShapes {
			small, large := qifDoc(b, s, s.sizes[0]), qifDoc(b, s, s.sizes[len(s.sizes)-1])
			b.Run(stage.name+"/"+s.name, func(b *testing.B) {
				var ts, tl time.Duration
				for b.Loop() {
					t0 := time.Now()
					stage.once(b, small)
					t1 := time.Now()
					stage.once(b, large)
					ts, tl = ts+t1.Sub(t0), tl+time.Since(t1)
				}
				perSmall := float64(ts) / float64(len(small))
				perLarge := float64(tl) / float64(len(large))
				b.ReportMetric(perLarge/perSmall, "growth")
			})
		}
	}
}
