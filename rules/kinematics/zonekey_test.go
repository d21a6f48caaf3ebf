package kinematics

import (
	"math"
	"testing"

	"github.com/datumlint/datumlint/rules/dof"
)

// TestZoneKeyTellsZonesApart checks the key Result shares zone analyses by:
// copies of a zone share it, and a zone that differs in anything its
// analysis reads (one bit of one coordinate included) does not.
func TestZoneKeyTellsZonesApart(t *testing.T) {
	hole := func(x float64) dof.Surface {
		return dof.Surface{Class: dof.Cylinder, Dir: dof.Vec{0, 0, 1}, Point: dof.Vec{x, 15, 0}}
	}
	base := dof.Zone{Surfaces: []dof.Surface{hole(15), hole(105)}}
	copied := dof.Zone{Surfaces: append([]dof.Surface(nil), base.Surfaces...)}
	if zoneKey(base) != zoneKey(copied) {
		t.Fatal("a copy of a zone has another key")
	}
	variants := map[string]dof.Zone{
		"orientation": {Surfaces: base.Surfaces, OrientationOnly: true},
		"one member":  {Surfaces: base.Surfaces[:1]},
		"class":       {Surfaces: []dof.Surface{{Class: dof.Plane, Dir: dof.Vec{0, 0, 1}, Point: dof.Vec{15, 15, 0}}, hole(105)}},
		"one bit":     {Surfaces: []dof.Surface{hole(math.Nextafter(15, 16)), hole(105)}},
		"-0":          {Surfaces: []dof.Surface{{Class: dof.Cylinder, Dir: dof.Vec{math.Copysign(0, -1), 0, 1}, Point: dof.Vec{15, 15, 0}}, hole(105)}},
		"extra":       {Surfaces: base.Surfaces, Extra: []dof.Twist{{V: dof.Vec{0, 0, 1}}}},
		"order":       {Surfaces: []dof.Surface{hole(105), hole(15)}},
	}
	seen := map[string]string{zoneKey(base): "base"}
	for name, z := range variants {
		k := zoneKey(z)
		if other, ok := seen[k]; ok {
			t.Errorf("%s has the same key as %s", name, other)
		}
		seen[k] = name
	}
	// Surfaces and extra twists cannot be confused by their count.
	a := dof.Zone{Extra: make([]dof.Twist, 7)}
	b := dof.Zone{Surfaces: make([]dof.Surface, 6)}
	if zoneKey(a) == zoneKey(b) {
		t.Error("six empty surfaces and seven empty twists share a key")
	}
}
