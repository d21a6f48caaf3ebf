package dof

import (
	"math"
	"slices"
	"testing"
)

func contact(n, p Vec) Surface { return Surface{Class: Contact, Dir: n, Point: p} }

// Datum targets as point contacts (ASME Y14.5-2018, datum targets; ISO
// 5459:2011): three points not on one line of a plane remove what the
// plane removes, two along a line two, one one; a contact's count follows
// the surface's normal where it lies.
func TestContactTargets(t *testing.T) {
	up := Vec{0, 0, -1}
	three := Datum{contact(up, Vec{10, 10, 0}), contact(up, Vec{110, 10, 0}), contact(up, Vec{60, 70, 0})}
	cases := []struct {
		name string
		refs []Datum
		want []int
	}{
		{"three points on a plane", []Datum{three}, []int{3}},
		{"three points on one line of a plane", []Datum{{contact(up, Vec{10, 10, 0}), contact(up, Vec{60, 10, 0}), contact(up, Vec{110, 10, 0})}}, []int{2}},
		{"two points", []Datum{{contact(up, Vec{10, 10, 0}), contact(up, Vec{110, 10, 0})}}, []int{2}},
		{"one point", []Datum{{contact(up, Vec{10, 10, 0})}}, []int{1}},
		{"3-2-1 by targets", []Datum{three, {contact(Vec{0, -1, 0}, Vec{20, 0, 5}), contact(Vec{0, -1, 0}, Vec{100, 0, 5})}, {contact(Vec{-1, 0, 0}, Vec{0, 40, 5})}}, []int{3, 2, 1}},
		{"a second target on the primary plane adds nothing", []Datum{three, {contact(up, Vec{30, 30, 0})}}, []int{3, 0}},
		{"a point on an inclined face after the primary", []Datum{three, {contact(Vec{math.Sqrt2 / 2, math.Sqrt2 / 2, 0}, Vec{40, 0, 5})}}, []int{3, 1}},
		// Two line targets on the faces of a vee (each line two contacts)
		// after the primary plane across them: the vee locates across and
		// along its faces' common normal plane.
		{"two lines on a vee", []Datum{three, {
			contact(Vec{0.906, 0.423, 0}, Vec{40, 20, 0}), contact(Vec{0.906, 0.423, 0}, Vec{40, 20, 10}),
			contact(Vec{-0.906, 0.423, 0}, Vec{80, 20, 0}), contact(Vec{-0.906, 0.423, 0}, Vec{80, 20, 10}),
		}}, []int{3, 2}},
	}
	for _, c := range cases {
		d := plate.Analyze(c.refs)
		if got := constrains(d); !slices.Equal(got, c.want) {
			t.Errorf("%s: constrains %v, want %v", c.name, got, c.want)
		}
	}
}

// A contact matches a plane's one condition along its normal: the plane
// through the contact point with the contact's normal leaves free
// everything the contact leaves free, and more.
func TestContactIsPartOfPlane(t *testing.T) {
	n, p := Vec{0, 1, 0}, Vec{30, 0, 7}
	c := plate.Analyze([]Datum{{contact(n, p)}, {plane(n, p)}})
	if got := constrains(c); !slices.Equal(got, []int{1, 2}) {
		t.Errorf("contact then its plane: %v, want [1 2]", got)
	}
	if (Surface{Class: Contact, Point: p}).Valid() {
		t.Error("a contact without a normal is valid")
	}
	if got := contact(n, p).conditions(plate); len(got) != 1 {
		t.Errorf("a contact has %d conditions, want 1", len(got))
	}
}
