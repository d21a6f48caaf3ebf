package material

import (
	"math"
	"testing"

	"github.com/datumlint/datumlint/grammar"
)

func near(a, b float64) bool { return math.Abs(a-b) < 1e-9 }

func TestComputeFourCases(t *testing.T) {
	// Check values worked by hand from the definitions of ASME Y14.5-2018,
	// section 1 (virtual and resultant condition), for sizes of our own.
	cases := []struct {
		name          string
		size          Size
		tol           float64
		c             Condition
		mmc, lmc      float64
		vc, rc, bonus float64
	}{
		// The mounting plate's bore: 25 +0.05 -0, position dia 0.1 (M).
		{"hole at MMC", Size{Internal: true, Min: 25, Max: 25.05}, 0.1, MMC, 25, 25.05, 24.9, 25.2, 0.05},
		// A pin 9.8..10.0 under position dia 0.2 (M).
		{"pin at MMC", Size{Min: 9.8, Max: 10}, 0.2, MMC, 10, 9.8, 10.2, 9.4, 0.2},
		// A hole 16.0..16.2 under position dia 0.1 (L).
		{"hole at LMC", Size{Internal: true, Min: 16, Max: 16.2}, 0.1, LMC, 16, 16.2, 16.3, 15.7, 0.2},
		// A boss 19.8..20.0 under position dia 0.1 (L).
		{"pin at LMC", Size{Min: 19.8, Max: 20}, 0.1, LMC, 20, 19.8, 19.7, 20.3, 0.2},
		// A slot 10.00..10.05 under position 0.1 (M): a width as a hole.
		{"slot at MMC", Size{Internal: true, Min: 10, Max: 10.05}, 0.1, MMC, 10, 10.05, 9.9, 10.2, 0.05},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			f, err := Compute(c.size, c.tol, c.c)
			if err != nil {
				t.Fatal(err)
			}
			got := []float64{f.MMC, f.LMC, f.Virtual, f.Resultant, f.Bonus}
			want := []float64{c.mmc, c.lmc, c.vc, c.rc, c.bonus}
			names := []string{"MMC", "LMC", "virtual", "resultant", "bonus"}
			for i := range got {
				if !near(got[i], want[i]) {
					t.Errorf("%s = %g, want %g", names[i], got[i], want[i])
				}
			}
			if !near(f.MaxTolerance(), c.tol+c.bonus) {
				t.Errorf("largest tolerance %g, want %g", f.MaxTolerance(), c.tol+c.bonus)
			}
		})
	}
}

// The floating fastener formula, T = H − F (ASME Y14.5-2018, appendix B,
// from memory): the largest fastener F that always passes a hole at MMC H
// with a position tolerance T at MMC is the hole's virtual condition.
func TestFloatingFastenerIsHoleVirtualCondition(t *testing.T) {
	for _, c := range []struct{ h, lmc, tol float64 }{
		{8.3, 8.5, 0.4}, // the mounting plate's bolt holes, 8.4 +-0.1
		{6.5, 6.7, 0.3}, // the gearbox cover's screw holes, 6.6 +-0.1
		{10.5, 10.7, 0.5},
	} {
		f, err := Compute(Size{Internal: true, Min: c.h, Max: c.lmc}, c.tol, MMC)
		if err != nil {
			t.Fatal(err)
		}
		if fastener := c.h - c.tol; !near(f.Virtual, fastener) {
			t.Errorf("hole %g, T %g: VC %g, floating fastener F = H − T = %g", c.h, c.tol, f.Virtual, fastener)
		}
	}
}

// The fixed fastener formula, T = (H − F)/2 (ASME Y14.5-2018, appendix B,
// from memory): with equal tolerances at MMC on a pin of MMC F and a hole
// of MMC H, the pin's virtual condition meets the hole's exactly.
func TestFixedFastenerVirtualConditionsMeet(t *testing.T) {
	for _, c := range []struct{ h, f float64 }{{10.5, 10}, {6.6, 6}, {12.4, 12}} {
		tol := (c.h - c.f) / 2
		hole, err := Compute(Size{Internal: true, Min: c.h, Max: c.h + 0.1}, tol, MMC)
		if err != nil {
			t.Fatal(err)
		}
		pin, err := Compute(Size{Min: c.f - 0.05, Max: c.f}, tol, MMC)
		if err != nil {
			t.Fatal(err)
		}
		if !near(hole.Virtual, pin.Virtual) {
			t.Errorf("H %g, F %g, T %g: hole VC %g, pin VC %g", c.h, c.f, tol, hole.Virtual, pin.Virtual)
		}
	}
}

// Least material condition protects a wall (ASME Y14.5-2018, LMC, from
// memory): the thinnest wall between a boss and a coaxial bore, both at
// LMC, is half the difference of their LMC virtual conditions. Worked by
// hand: boss 19.8..20 at dia 0 (L) to its own axis, bore 16..16.2 at dia 0.1
// (L): (19.8 − 16.3) / 2 = 1.75.
func TestLeastMaterialWall(t *testing.T) {
	boss, _ := Compute(Size{Min: 19.8, Max: 20}, 0, LMC)
	bore, _ := Compute(Size{Internal: true, Min: 16, Max: 16.2}, 0.1, LMC)
	if wall := (boss.Virtual - bore.Virtual) / 2; !near(wall, 1.75) {
		t.Errorf("minimum wall %g, want 1.75", wall)
	}
}

// Zero positional tolerance at MMC (ASME Y14.5-2018, from memory): the
// virtual condition is the MMC itself and the whole size tolerance is
// available as bonus.
func TestZeroToleranceAtMMC(t *testing.T) {
	f, err := Compute(Size{Internal: true, Min: 10, Max: 10.1}, 0, MMC)
	if err != nil {
		t.Fatal(err)
	}
	if !near(f.Virtual, 10) || !near(f.Bonus, 0.1) || !near(f.MaxTolerance(), 0.1) || !near(f.Resultant, 10.2) {
		t.Errorf("got %+v", f)
	}
}

func TestComputeRejectsBadInput(t *testing.T) {
	for _, c := range []struct {
		s   Size
		tol float64
		c   Condition
	}{
		{Size{Min: 10.1, Max: 10}, 0.1, MMC},
		{Size{Min: 10, Max: math.NaN()}, 0.1, MMC},
		{Size{Min: 10, Max: 10.1}, -0.1, MMC},
		{Size{Min: 10, Max: 10.1}, math.Inf(1), LMC},
		{Size{Min: 10, Max: 10.1}, 0.1, RFS},
	} {
		if _, err := Compute(c.s, c.tol, c.c); err == nil {
			t.Errorf("Compute(%+v, %g, %v) accepted bad input", c.s, c.tol, c.c)
		}
	}
}

func TestDatumBoundary(t *testing.T) {
	hole := Size{Internal: true, Min: 10, Max: 10.1}
	// Without a relation the boundary is the MMC or LMC.
	b, err := BoundaryOf(hole, MMC, nil)
	if err != nil || !near(b.Size, 10) || b.From != "" {
		t.Fatalf("primary hole at MMB: %+v, %v", b, err)
	}
	b, _ = BoundaryOf(hole, LMC, nil)
	if !near(b.Size, 10.1) {
		t.Errorf("hole at LMB: %g, want 10.1", b.Size)
	}
	// A perpendicularity dia 0.05 (M) to A: MMB = 10 − 0.05 (worked by hand).
	b, _ = BoundaryOf(hole, MMC, []Relation{{Tolerance: 0.05, Material: MMC, What: "perp"}})
	if !near(b.Size, 9.95) || b.From != "perp" || b.Ambiguous {
		t.Errorf("hole at MMB with a relation: %+v", b)
	}
	// A relation at LMC does not bound the MMB side.
	b, _ = BoundaryOf(hole, MMC, []Relation{{Tolerance: 0.05, Material: LMC}})
	if !near(b.Size, 10) {
		t.Errorf("an (L) relation changed the MMB: %+v", b)
	}
	// Two relations that disagree: ambiguous, and the smaller simulator pin.
	b, _ = BoundaryOf(hole, MMC, []Relation{{Tolerance: 0.05, What: "a"}, {Tolerance: 0.2, Material: MMC, What: "b"}})
	if !b.Ambiguous || !near(b.Size, 9.8) || b.From != "b" {
		t.Errorf("two relations: %+v", b)
	}
	// A pin at MMB with a position dia 0.1 (M): 12 + 0.1.
	b, _ = BoundaryOf(Size{Min: 11.9, Max: 12}, MMC, []Relation{{Tolerance: 0.1, Material: MMC}})
	if !near(b.Size, 12.1) {
		t.Errorf("pin at MMB: %g, want 12.1", b.Size)
	}
	if _, err := BoundaryOf(hole, RFS, nil); err == nil {
		t.Error("a boundary at RFS was accepted")
	}
}

func TestRelationsFromModel(t *testing.T) {
	src := `part "Test block"
units mm
standard asme-2018
feature base plane normal -z at (0, 0, 0)
feature rear plane normal -y at (0, 0, 0)
feature bore hole size 10 +0.1 -0 axis +z at (20, 20, 0)
feature shaft pin size 6 -0 -0.05 axis +z at (40, 20, 0)
datum A on base
datum B on bore
datum C on rear
datum D on shaft
frame bore: perpendicularity dia 0.05 (M) datums A
frame bore: position dia 0.2 (M) datums A, C
frame shaft: straightness dia 0.02 (M)
frame shaft: position dia 0.1 datums A, B
`
	part := grammar.Read("t.callouts", []byte(src))
	bore, shaft := part.Feature("bore"), part.Feature("shaft")
	rel := Relations(part, bore, []string{"A"})
	if len(rel) != 1 || !near(rel[0].Tolerance, 0.05) || rel[0].Material != MMC {
		t.Fatalf("bore after A: %+v", rel)
	}
	if rel[0].What != "perpendicularity dia 0.05 (M) to A, line 12" {
		t.Errorf("description %q", rel[0].What)
	}
	if rel := Relations(part, bore, []string{"A", "C"}); len(rel) != 2 {
		t.Errorf("bore after A, C: %d relations, want 2", len(rel))
	}
	if rel := Relations(part, bore, nil); len(rel) != 0 {
		t.Errorf("bore as primary: %+v, want none", rel)
	}
	rel = Relations(part, shaft, nil)
	if len(rel) != 1 || !near(rel[0].Tolerance, 0.02) {
		t.Errorf("shaft as primary: %+v, want its straightness at MMC", rel)
	}
	if rel := Relations(part, shaft, []string{"A"}); len(rel) != 0 {
		t.Errorf("shaft after A alone: %+v, want none (its position also names B)", rel)
	}
	s, ok := SizeOf(shaft)
	if !ok || s.Internal || !near(s.MMC(), 6) || !near(s.LMC(), 5.95) {
		t.Errorf("SizeOf(shaft) = %+v, %v", s, ok)
	}
	if _, ok := SizeOf(part.Feature("base")); ok {
		t.Error("a plane has a size")
	}
}
