package basics_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/rules/kinematics"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/basics"
)

// platePattern is a plate with a 5 x 4 pattern of holes placed by its
// corner and spacings, and a 20-hole bolt circle about a datum bore.
func platePattern() string {
	var b strings.Builder
	b.WriteString(header + planes)
	b.WriteString("feature grid hole 20x size 5 +-0.1 axis +z at")
	for j := 0; j < 4; j++ {
		for i := 0; i < 5; i++ {
			fmt.Fprintf(&b, " (%d, %d, 0)", 20+25*i, 20+25*j)
		}
	}
	b.WriteString("\nfeature hub hole size 40 +0.05 -0 axis +z at (250, 60, 0)\nfeature ring hole 20x size 4 +-0.05 axis +z at")
	for k := 0; k < 20; k++ {
		a := 2 * math.Pi * float64(k) / 20
		fmt.Fprintf(&b, " (%s, %s, 0)", basics.Num(250+40*math.Cos(a)), basics.Num(60+40*math.Sin(a)))
	}
	b.WriteString(`
datum D on hub
frame grid: position dia 0.2 datums A, B, C
    composite dia 0.1 datums A
frame hub: position dia 0.1 datums A, B, C
frame ring: position dia 0.2 datums A, D, B
basic 20 from left to grid.1
basic 20 from rear to grid.1
basic 250 from left to hub
basic 60 from rear to hub
basic dia 80 through ring about hub
`)
	for i := 1; i < 5; i++ {
		fmt.Fprintf(&b, "basic 25 from grid.%d to grid.%d\n", i, i+1)
	}
	for j := 1; j < 4; j++ {
		fmt.Fprintf(&b, "basic 25 from grid.%d to grid.%d\n", 5*(j-1)+1, 5*j+1)
	}
	return b.String()
}

func BenchmarkPlateWithPatterns(b *testing.B) {
	src := []byte(platePattern())
	p := grammar.Read("plate.callouts", src)
	facts := kinematics.Analyze(p)
	var qs []basics.Query
	for _, fr := range p.Frames {
		for i, seg := range fr.Segments {
			a := facts.Segment(fr, i)
			q, ok := basics.FrameQuery(fr, seg, a.DRF)
			if !a.Resolved || !ok {
				b.Fatalf("frame %s does not resolve", fr.Target.Name)
			}
			qs = append(qs, q)
		}
	}
	for b.Loop() {
		e := basics.Build(p, nil)
		for _, q := range qs {
			if ms := e.Missing(q); len(ms) != 0 {
				b.Fatalf("%s: unexpected %+v", basics.Name(q.Target.Feature.Members[0]), ms[0])
			}
		}
		if ms := e.Mismatches(); len(ms) != 0 {
			b.Fatalf("mismatch on line %d", ms[0].Dim.Span.Start.Line)
		}
	}
}

// BenchmarkCheckPlate is the whole check of the same file, for the lines
// per second a repository of such parts is checked at.
func BenchmarkCheckPlate(b *testing.B) {
	src := []byte(platePattern())
	lines := strings.Count(string(src), "\n")
	for b.Loop() {
		rules.Check(grammar.Read("plate.callouts", src), nil)
	}
	b.ReportMetric(float64(lines)*float64(b.N)/b.Elapsed().Seconds(), "lines/s")
}
