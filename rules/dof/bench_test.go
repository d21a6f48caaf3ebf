package dof

import "testing"

func BenchmarkThreeDatumFrame(b *testing.B) {
	refs := []Datum{planeZ, planeY, planeX}
	zone := Zone{Surfaces: bolts}
	for b.Loop() {
		d := plate.Analyze(refs)
		if z := d.Zone(zone); len(z.PerStep) != 4 {
			b.Fatalf("per step %v", z.PerStep)
		}
	}
}
