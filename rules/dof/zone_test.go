package dof

import (
	"reflect"
	"testing"
)

var bolts = []Surface{
	cylinder(Vec{0, 0, 1}, Vec{15, 15, 0}),
	cylinder(Vec{0, 0, 1}, Vec{105, 15, 0}),
	cylinder(Vec{0, 0, 1}, Vec{15, 65, 0}),
	cylinder(Vec{0, 0, 1}, Vec{105, 65, 0}),
}

func TestZones(t *testing.T) {
	rear := plane(Vec{0, -1, 0}, Vec{})
	side := plane(Vec{1, 0, 0}, Vec{120, 0, 0})
	tests := []struct {
		name      string
		source    string
		refs      []Datum
		zone      Zone
		perStep   []int
		free      []string
		translate bool
	}{
		{
			name: "hole position to a primary plane only", source: "ASME Y14.5-2018 section 7 (a plane leaves the hole free to slide in it)",
			refs: []Datum{planeZ}, zone: Zone{Surfaces: []Surface{bore}},
			perStep: []int{4, 2}, free: []string{"translation x", "translation y"}, translate: true,
		},
		{
			name: "hole position to three planes", source: "common practice (3-2-1 locates the zone)",
			refs: []Datum{planeZ, planeY, planeX}, zone: Zone{Surfaces: []Surface{bore}},
			perStep: []int{4, 2, 1, 0}, free: []string{},
		},
		{
			name: "perpendicularity to a primary plane", source: "ASME Y14.5-2018 section 9 (orientation controls orient, not locate)",
			refs: []Datum{planeZ}, zone: Zone{Surfaces: []Surface{side}, OrientationOnly: true},
			perStep: []int{2, 1}, free: []string{"rotation z"},
		},
		{
			name: "perpendicularity to a primary and a secondary plane", source: "ASME Y14.5-2018 section 9",
			refs: []Datum{planeZ, {rear}}, zone: Zone{Surfaces: []Surface{side}, OrientationOnly: true},
			perStep: []int{2, 1, 0}, free: []string{},
		},
		{
			name: "perpendicular hole axis to a primary plane", source: "ASME Y14.5-2018 section 9 (a cylindrical orientation zone turns only off its axis)",
			refs: []Datum{planeZ}, zone: Zone{Surfaces: []Surface{bore}, OrientationOnly: true},
			perStep: []int{2, 0}, free: []string{},
		},
		{
			name: "hole pattern to a plane and a central bore", source: "ASME Y14.5-2018 section 7 (a datum axis leaves the pattern free to turn about it)",
			refs: []Datum{planeZ, {bore}}, zone: Zone{Surfaces: bolts},
			perStep: []int{5, 3, 1}, free: []string{"rotation (0, 0, 1) through (60, 40, 0)"},
		},
		{
			name: "hole pattern clocked by a rear plane", source: "common practice (a tertiary datum clocks a pattern)",
			refs: []Datum{planeZ, {bore}, {rear}}, zone: Zone{Surfaces: bolts},
			perStep: []int{5, 3, 1, 0}, free: []string{},
		},
		{
			name: "axial runout zone floats along the datum axis", source: "ASME Y14.5-2018 section 12 (runout is measured about the datum axis)",
			refs: []Datum{{bore}}, zone: Zone{Surfaces: []Surface{plane(Vec{0, 0, 1}, Vec{60, 40, 10})}, Extra: []Twist{{V: Vec{0, 0, 1}}}},
			perStep: []int{2, 0}, free: []string{},
		},
		{
			name: "the same face as a located plane is not fixed by the axis alone", source: "ASME Y14.5-2018 section 7 (an axis does not stop a slide along it)",
			refs: []Datum{{bore}}, zone: Zone{Surfaces: []Surface{plane(Vec{0, 0, 1}, Vec{60, 40, 10})}},
			perStep: []int{3, 1}, free: []string{"translation z"}, translate: true,
		},
		{
			name: "profile of a free-form surface to three planes", source: "common practice",
			refs: []Datum{planeZ, planeY, planeX}, zone: Zone{Surfaces: []Surface{{Class: Complex}}},
			perStep: []int{6, 3, 1, 0}, free: []string{},
		},
		{
			name: "zone with no valid surface is never moved", source: "documented behaviour",
			refs: []Datum{planeZ}, zone: Zone{Surfaces: []Surface{{}}},
			perStep: []int{0, 0}, free: []string{},
		},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := plate.Analyze(tc.refs).Zone(tc.zone)
			if !reflect.DeepEqual(got.PerStep, tc.perStep) {
				t.Errorf("per step %v, want %v (%s)", got.PerStep, tc.perStep, tc.source)
			}
			if n := names(got.Free); !reflect.DeepEqual(n, tc.free) {
				t.Errorf("zone free %q, want %q", n, tc.free)
			}
			if got.TranslationMoves != tc.translate {
				t.Errorf("TranslationMoves %v, want %v", got.TranslationMoves, tc.translate)
			}
			if len(got.Free) != got.PerStep[len(got.PerStep)-1] {
				t.Errorf("%d zone-free motions named, %d counted", len(got.Free), got.PerStep[len(got.PerStep)-1])
			}
		})
	}
}

// The zone-moving motions must really move the zone: none of them may lie
// in the zone's invariance (checked here for location zones).
func TestZoneFreeMovesZone(t *testing.T) {
	got := plate.Analyze([]Datum{planeZ}).Zone(Zone{Surfaces: []Surface{bore}})
	rows := bore.conditions(plate)
	for _, m := range got.Free {
		if worst(rows, plate.in(m.Twist)) < 1e-6 {
			t.Errorf("%q leaves the zone unchanged", m.Name)
		}
	}
}
