package model

import "testing"

// A part built without the resolver finds its features and datums by name
// and letter, and measures its extent, as a resolved one does.
func TestNewPartIndex(t *testing.T) {
	p := NewPart()
	if p.Feature("x") != nil || p.Scale != 1 {
		t.Fatalf("empty part: scale %g", p.Scale)
	}
	broken := &Feature{Name: "a", Broken: true, Members: []*Member{{Index: 1}}}
	a := &Feature{Name: "a", Kind: Plane, Members: []*Member{{Index: 1, Point: Vec{0, 0, 0}}}}
	b := &Feature{Name: "b", Kind: Hole, Size: &Size{Nominal: 8}, Members: []*Member{{Index: 1, Point: Vec{30, 40, 0}}}}
	p.Features = []*Feature{broken, a, b}
	brokenA := &Datum{Letter: "A", Broken: true}
	datumA := &Datum{Letter: "A", Target: Target{Name: "a", Feature: a}}
	p.Datums = []*Datum{brokenA, datumA}
	p.Index()
	if p.Feature("a") != a || p.Feature("b") != b || p.Datum("A") != datumA {
		t.Errorf("lookups: a good one takes the place of a broken one")
	}
	if p.Center != (Vec{15, 20, 0}) || p.Scale != 50 {
		t.Errorf("extent %v %g, want (15, 20, 0) and 50", p.Center, p.Scale)
	}
	// The same part through the resolver measures the same.
	r := resolve(t, "feature a plane normal +z at (0, 0, 0)\nfeature b hole size 8 +-0.1 axis +z at (30, 40, 0)\n")
	if r.Center != p.Center || r.Scale != p.Scale {
		t.Errorf("resolved extent %v %g", r.Center, r.Scale)
	}
}
