package basicsref

import (
	"testing"

	"github.com/datumlint/datumlint/rules/kinematics"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/basics"
	"github.com/datumlint/datumlint/rules/lint/internal/gen"
)

// benchPlate is one generated plate, resolved, with every frame segment's
// query for both engines (the kinematic analysis is done beforehand: these
// benchmarks time the basic-dimension engine alone, as a check uses it:
// build once, then every segment's Missing and the Mismatches).
type benchPlate struct {
	part *model.Part
	nq   []basics.Query
	oq   []Query
}

func benchPlates(b *testing.B) []benchPlate {
	var out []benchPlate
	for i := range 16 {
		part := grammar.Read("plate.callouts", gen.Plate(i))
		facts := kinematics.Analyze(part)
		bp := benchPlate{part: part}
		for _, fr := range part.Frames {
			for k, seg := range fr.Segments {
				if ask, _ := basics.Asks(fr, seg); !ask {
					continue
				}
				a := facts.Segment(fr, k)
				if !a.Resolved || a.DRF == nil {
					b.Fatalf("plate %d: frame on %s does not resolve", i, fr.Target.Name)
				}
				nq, nok := basics.FrameQuery(fr, seg, a.DRF)
				oq, ook := FrameQuery(fr, seg, a.DRF)
				if !nok || !ook {
					b.Fatalf("plate %d: no query for the frame on %s", i, fr.Target.Name)
				}
				bp.nq, bp.oq = append(bp.nq, nq), append(bp.oq, oq)
			}
		}
		out = append(out, bp)
	}
	return out
}

// BenchmarkEngine is the engine as it is, on 16 generated plates per op.
func BenchmarkEngine(b *testing.B) {
	ps := benchPlates(b)
	for b.Loop() {
		for _, p := range ps {
			e := basics.Build(p.part, nil)
			for _, q := range p.nq {
				e.Missing(q)
			}
			e.Mismatches()
		}
	}
}

// BenchmarkReference is the engine as it was, on the same plates.
func BenchmarkReference(b *testing.B) {
	ps := benchPlates(b)
	for b.Loop() {
		for _, p := range ps {
			e := Build(p.part, nil)
			for _, q := range p.oq {
				e.Missing(q)
			}
			e.Mismatches()
		}
	}
}
