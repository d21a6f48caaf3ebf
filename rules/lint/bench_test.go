package lint

import (
	"bytes"
	"fmt"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/rules/kinematics"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/lint/internal/gen"
)

// The benchmarks measure each stage of a check on generated plates (about
// 150 lines each) and the whole run over a 2,000-plate repository. They
// report lines/s so that the figures compare with docs/performance.md; the
// goals there are measured, never asserted.
//
//	go test -run '^$' -bench . -benchmem ./rules/lint/

// plates returns a handful of different plates, parsed and raw.
func plates(n int) (srcs [][]byte, lines int) {
	for i := 0; i < n; i++ {
		src := gen.Plate(i)
		srcs = append(srcs, src)
		lines += bytes.Count(src, []byte("\n"))
	}
	return srcs, lines
}

const sample = 16

func reportLines(b *testing.B, lines int) {
	b.ReportMetric(float64(lines)*float64(b.N)/b.Elapsed().Seconds(), "lines/s")
}

func BenchmarkParse(b *testing.B) {
	srcs, lines := plates(sample)
	b.ResetTimer()
	for b.Loop() {
		for i, src := range srcs {
			if f := grammar.Parse(fmt.Sprint(i), src); len(f.Errors) > 0 {
				b.Fatal(f.Errors[0])
			}
		}
	}
	reportLines(b, lines)
}

func BenchmarkResolve(b *testing.B) {
	srcs, lines := plates(sample)
	var files []*grammar.File
	for i, src := range srcs {
		files = append(files, grammar.Parse(fmt.Sprint(i), src))
	}
	b.ResetTimer()
	for b.Loop() {
		for _, f := range files {
			if p := grammar.Resolve(f); len(p.Problems) > 0 {
				b.Fatal(p.Problems[0])
			}
		}
	}
	reportLines(b, lines)
}

// BenchmarkDOF runs the kinematic engine over every segment of every frame
// of a file, as the kinematic rules do (each distinct reference list once).
func BenchmarkDOF(b *testing.B) {
	srcs, lines := plates(sample)
	var parts []*model.Part
	for i, src := range srcs {
		parts = append(parts, grammar.Read(fmt.Sprint(i), src))
	}
	b.ResetTimer()
	for b.Loop() {
		for _, p := range parts {
			facts := kinematics.Analyze(p)
			for _, fr := range p.Frames {
				for s := range fr.Segments {
					if d := facts.Segment(fr, s); !d.Resolved {
						b.Fatal(d.Problem)
					}
				}
			}
		}
	}
	reportLines(b, lines)
}

// BenchmarkCheck is the whole check of one file in memory: parse, resolve,
// every rule and the suppressions. (That the plates are clean is
// gen.TestPlatesAreClean's to assert, not a benchmark's.)
func BenchmarkCheck(b *testing.B) {
	srcs, lines := plates(sample)
	b.ResetTimer()
	for b.Loop() {
		for i, src := range srcs {
			rules.Check(grammar.Read(fmt.Sprint(i), src), nil)
		}
	}
	reportLines(b, lines)
}

// BenchmarkRun2000 is the whole run over a generated repository of 2,000
// plates on disk: walking, reading, checking in parallel and sorting.
func BenchmarkRun2000(b *testing.B) {
	dir := b.TempDir()
	st, err := gen.Write(dir, 2000)
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for b.Loop() {
		res := Run([]string{dir}, Options{})
		if len(res.Files) != st.Files || len(res.Errors) > 0 {
			b.Fatalf("%d files of %d checked, %d errors", len(res.Files), st.Files, len(res.Errors))
		}
	}
	b.ReportMetric(float64(st.Lines)*float64(b.N)/b.Elapsed().Seconds(), "lines/s")
	b.ReportMetric(float64(st.Bytes)/float64(1<<20), "MiB")
}

// BenchmarkBasicRules runs only the basic-dimension rules (and so the
// basic-chain engine) over whole files; parsing and resolving are included.
func BenchmarkBasicRules(b *testing.B) {
	srcs, lines := plates(sample)
	only := &rules.Settings{Severity: map[string]rules.Severity{}}
	n := 0
	for _, r := range rules.All() {
		if strings.HasPrefix(r.ID, "basic-") {
			n++
			continue
		}
		only.Severity[r.ID] = rules.Off
	}
	if n == 0 {
		b.Skip("no basic-dimension rule is registered")
	}
	b.ResetTimer()
	for b.Loop() {
		for i, src := range srcs {
			rules.Check(grammar.Read(fmt.Sprint(i), src), only)
		}
	}
	reportLines(b, lines)
}

// BenchmarkCheckRow checks one part with a row of n holes for growing n:
// with a linear engine ns/op doubles with n; the ratio between the
// sub-benchmarks shows how the cost of a part grows with its features.
func BenchmarkCheckRow(b *testing.B) {
	for _, n := range []int{25, 50, 100, 200} {
		src := gen.Row(n)
		b.Run(fmt.Sprintf("holes=%d", n), func(b *testing.B) {
			for b.Loop() {
				rules.Check(grammar.Read("row.callouts", src), nil)
			}
		})
	}
}

// BenchmarkCheckLongFile checks one file made of n plates one after the
// other (every name declared n times): the cost should double with n, as
// it does for n files; a rule that compares every frame with every other
// shows here first.
func BenchmarkCheckLongFile(b *testing.B) {
	for _, n := range []int{40, 80, 160} {
		var src []byte
		for i := 0; i < n; i++ {
			src = append(src, gen.Plate(i)...)
		}
		b.Run(fmt.Sprintf("plates=%d", n), func(b *testing.B) {
			for b.Loop() {
				rules.Check(grammar.Read("long.callouts", src), nil)
			}
			b.ReportMetric(float64(bytes.Count(src, []byte("\n")))*float64(b.N)/b.Elapsed().Seconds(), "lines/s")
		})
	}
}

// partSizes are the sizes of one part that BenchmarkCheckPart measures, in
// located features: 4 x the features should cost at most about 5 x the
// time (docs/performance.md).
var partSizes = []int{250, 1000, 4000, 10000}

// BenchmarkCheckPart is the whole check of one generated part in memory
// (parse, resolve, every rule), for every shape and size:
// BenchmarkCheckPart/shape=mix/features=1000. Run one size across shapes
// with -bench 'CheckPart/.*/features=1000$', and compare sizes as ratios
// within one run.
func BenchmarkCheckPart(b *testing.B) {
	for _, s := range gen.Shapes {
		for _, n := range partSizes {
			b.Run(fmt.Sprintf("shape=%s/features=%d", s, n), func(b *testing.B) {
				src := gen.Part(s, 0, n)
				lines := bytes.Count(src, []byte("\n"))
				b.ResetTimer()
				for b.Loop() {
					rules.Check(grammar.Read("part.callouts", src), nil)
				}
				reportLines(b, lines)
			})
		}
	}
}

// BenchmarkCheckShape is the whole check of 16 parts of each shape at its
// own size (12 to 28 located features, a repository's parts), for the
// lines per second of a repository of that shape.
func BenchmarkCheckShape(b *testing.B) {
	for _, s := range gen.Shapes {
		b.Run("shape="+string(s), func(b *testing.B) {
			var srcs [][]byte
			lines := 0
			for i := range sample {
				src := gen.Part(s, i, 0)
				srcs = append(srcs, src)
				lines += bytes.Count(src, []byte("\n"))
			}
			b.ResetTimer()
			for b.Loop() {
				for i, src := range srcs {
					rules.Check(grammar.Read(fmt.Sprint(i), src), nil)
				}
			}
			reportLines(b, lines)
		})
	}
}
