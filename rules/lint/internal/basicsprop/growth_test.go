package basicsprop

import (
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/rules/basics"
	"github.com/datumlint/datumlint/rules/kinematics"
	"github.com/datumlint/datumlint/rules/lint/internal/gen"
)

// work runs every query of a part through one engine and returns what the
// engine did.
func work(src []byte) basics.Stats {
	part := grammar.Read("part.callouts", src)
	facts := kinematics.Analyze(part)
	e := basics.Build(part, nil)
	for _, fr := range part.Frames {
		for i, seg := range fr.Segments {
			if ask, _ := basics.Asks(fr, seg); !ask {
				continue
			}
			if a := facts.Segment(fr, i); a.Resolved && a.DRF != nil {
				if q, ok := basics.FrameQuery(fr, seg, a.DRF); ok {
					e.Missing(q)
				}
			}
		}
	}
	return e.Stats()
}

// TestWorkGrowsLinearly bounds the basic engine's work on clean parts of
// every shape, counted, not timed: no query needs the whole part's
// factor; the rows the queries' local factorisations take together stay
// within five times the part's relations (each query takes its target's
// own rows and a budget in proportion to its variables, and a pattern's
// rows are its own for each of its frame's segments); and the relations
// grow in proportion to the located features (at most 5/4 as fast, between
// 1,000 and 4,000 of them). The work is then linear in the features.
func TestWorkGrowsLinearly(t *testing.T) {
	sizes := []int{1000, 4000}
	if testing.Short() {
		sizes = []int{250, 1000}
	}
	for _, s := range gen.Shapes {
		var rel []int
		for _, n := range sizes {
			st := work(gen.Part(s, 0, n))
			t.Logf("%s, %d features: %d relations, %d rows factorised, %d whole-part factorisations", s, n, st.Relations, st.Factorised, st.Wholes)
			if st.Wholes != 0 {
				t.Errorf("%s of %d features: %d queries fell back to the whole part's factor", s, n, st.Wholes)
			}
			if st.Factorised > 5*int64(st.Relations) {
				t.Errorf("%s of %d features: the local factorisations took %d rows, more than five times the part's %d relations", s, n, st.Factorised, st.Relations)
			}
			rel = append(rel, max(st.Relations, 1))
		}
		growth := float64(rel[1]) / float64(rel[0])
		want := 1.25 * float64(sizes[1]) / float64(sizes[0])
		if growth > want {
			t.Errorf("%s: the relations grow %.2f times from %d to %d features, more than %.2f", s, growth, sizes[0], sizes[1], want)
		}
	}
}
