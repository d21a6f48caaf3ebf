package qif

import (
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/datumlint/datumlint/grammar/source"
)

// Benchmarks on documents built from the NIST models (test data): two
// shapes, three sizes each, and the growth from the smallest to the largest
// as ratios in one run.
//
//	go test -run '^$' -bench . -benchmem ./grammar/qif/

var idRE = regexp.MustCompile(`(id="|<Id>)(\d+)`)

// renumber adds off to every id and id reference in s, so that a copy of a
// section names its own elements.
func renumber(s string, off int) string {
	return idRE.ReplaceAllStringFunc(s, func(m string) string {
		sub := idRE.FindStringSubmatch(m)
		n, _ := strconv.Atoi(sub[2])
		return sub[1] + strconv.Itoa(n+off)
	})
}

func inner(src, tag string) (before, body, after string) {
	open := strings.Index(src, "<"+tag)
	start := open + strings.Index(src[open:], ">") + 1
	end := strings.Index(src, "</"+tag+">")
	return src[:start], src[start:end], src[end:]
}

// featuresShape repeats FTC 06's feature and characteristic nominals (with
// fresh ids) in a file without its B-rep: the sections the reader keeps.
func featuresShape(base string, size int) string {
	for _, tag := range []string{"GeometrySet", "TopologySet", "VisualizationSet"} {
		a := strings.Index(base, "<"+tag+">")
		b := strings.Index(base, "</"+tag+">")
		base = base[:a] + base[b+len(tag)+3:]
	}
	pre, feats, post := inner(base, "FeatureNominals")
	pre2, chars, post2 := inner(post, "CharacteristicNominals")
	var fb, cb strings.Builder
	fb.WriteString(feats)
	cb.WriteString(chars)
	for k := 1; len(pre)+fb.Len()+len(pre2)+cb.Len()+len(post2) < size; k++ {
		fb.WriteString(renumber(feats, k*100000))
		cb.WriteString(renumber(chars, k*100000))
	}
	return pre + fb.String() + pre2 + cb.String() + post2
}

// brepShape repeats CTC 01's geometry, which the reader walks and skips.
func brepShape(base string, size int) string {
	pre, geo, post := inner(base, "GeometrySet")
	var b strings.Builder
	b.WriteString(geo)
	for k := 1; len(pre)+b.Len()+len(post) < size; k++ {
		b.WriteString(geo)
	}
	return pre + b.String() + post
}

type shape struct {
	name  string
	model string
	build func(string, int) string
}

var shapes = []shape{
	{"features", "nist_ftc_06_asme1_ap242", featuresShape},
	{"brep", "nist_ctc_01_asme1_ap242", brepShape},
}

func benchDoc(b *testing.B, s shape, size int) []byte {
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "qif", "nist", s.model+".qif"))
	if err != nil {
		b.Fatal(err)
	}
	return []byte(s.build(string(src), size))
}

func readOnce(b *testing.B, src []byte) {
	if _, err := ReadFile(source.NewFile("bench.qif", src)); err != nil {
		b.Fatal(err)
	}
}

func BenchmarkRead(b *testing.B) {
	for _, s := range shapes {
		for _, mb := range []int{1, 4, 16} {
			src := benchDoc(b, s, mb<<20)
			b.Run(fmt.Sprintf("%s/%dMB", s.name, mb), func(b *testing.B) {
				b.SetBytes(int64(len(src)))
				for b.Loop() {
					readOnce(b, src)
				}
			})
		}
	}
}

// BenchmarkReadGrowth reports, per shape, the time per byte of a 16 MB
// document over that of a 1 MB one: 1 is linear growth.
func BenchmarkReadGrowth(b *testing.B) {
	for _, s := range shapes {
		small, large := benchDoc(b, s, 1<<20), benchDoc(b, s, 16<<20)
		b.Run(s.name, func(b *testing.B) {
			var ts, tl time.Duration
			for b.Loop() {
				t0 := time.Now()
				readOnce(b, small)
				t1 := time.Now()
				readOnce(b, large)
				ts, tl = ts+t1.Sub(t0), tl+time.Since(t1)
			}
			perSmall := float64(ts) / float64(len(small))
			perLarge := float64(tl) / float64(len(large))
			b.ReportMetric(perLarge/perSmall, "growth-16MB/1MB")
			b.ReportMetric(perSmall*float64(4<<20)/1e6, "ms-per-4MB")
		})
	}
}
