package dof

import (
	"math"
	"slices"
)

// Twist is a small rigid motion: a rotation W and a translation V at the
// part's origin, in the part's own units, so that a point x moves with
// V + W×x (a twist in the sense of screw theory; Murray, Li and Sastry, A
// Mathematical Introduction to Robotic Manipulation, 1994, chapter 2).
type Twist struct{ W, V Vec }

// Motion is a twist with the name the command-line contract prints for it:
// "translation x", "rotation z", "translation (a, b, c)" or
// "rotation (a, b, c) through (x, y, z)".
type Motion struct {
	Twist Twist
	Name  string
}

// Frame says how to normalise the part before any rank decision: lengths
// are measured from Center in units of Scale (the part's size). With it the
// same part gives the same answer in millimetres or inches, at the origin or
// a kilometre away. Scale <= 0 (or not finite) means 1; a non-finite Center
// component means 0.
type Frame struct {
	Center Vec
	Scale  float64
}

func (f Frame) sanitized() Frame {
	if !(f.Scale > 0) || math.IsInf(f.Scale, 0) {
		f.Scale = 1
	}
	for i, x := range f.Center {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			f.Center[i] = 0
		}
	}
	return f
}

// point maps a part point to normalised coordinates x' = (x − c)/L.
func (f Frame) point(p Vec) Vec {
	f = f.sanitized()
	return scale(sub(p, f.Center), 1/f.Scale)
}

// in maps a twist to normalised coordinates. A point's velocity V + W×x
// divided by L, written in x', is (V + W×c)/L + W×x'.
func (f Frame) in(t Twist) []float64 {
	f = f.sanitized()
	v := scale(add(t.V, cross(t.W, f.Center)), 1/f.Scale)
	return []float64{t.W[0], t.W[1], t.W[2], v[0], v[1], v[2]}
}

// out is the inverse of in: V = L·v' − W×c.
func (f Frame) out(x []float64) Twist {
	f = f.sanitized()
	w := Vec{x[0], x[1], x[2]}
	v := sub(scale(Vec{x[3], x[4], x[5]}, f.Scale), cross(w, f.Center))
	return Twist{W: w, V: v}
}

// Datum is one datum reference: one surface, or several whose conditions
// all hold at once (a common datum A-B, a pattern of holes used as one
// datum).
type Datum []Surface

// Step is what one datum reference, in precedence order, does to the part's
// freedom.
type Step struct {
	// Constrains is the number of degrees of freedom this reference newly
	// removes: dim F(k−1) − dim F(k).
	Constrains int
	// Removed is a basis of motions free before this reference and not
	// after it (together with Free it spans the earlier free space).
	Removed []Motion
	// Free is a basis of the motions still free after this reference.
	Free []Motion
}

// DRF is an analysed datum reference frame. It keeps the free subspace after
// each reference so that many tolerance zones can be checked against it
// without repeating the analysis. It is not changed after Analyze returns,
// so one DRF may be shared by goroutines.
type DRF struct {
	frame  Frame
	spaces []space // free subspace after 0, 1, … n references (normalised)
	splits []split // splitSpace of each space, for naming and for zones
	steps  []Step
	free   []Motion
}

// Analyze computes, reference by reference in precedence order, the
// subspace of small motions that every datum so far leaves unchanged:
// F(k) = F(k−1) ∩ S(k), where S(k) is the invariance subspace of the k-th
// reference (Clément, Rivière, Serré and Valade's TTRS model; Srinivasan,
// Computer-Aided Design 31, 1999). Each reference's conditions are restricted
// to an orthonormal basis of F(k−1) and the null space taken by SVD, so a
// reference that repeats what earlier ones fixed removes nothing.
//
// Analyze never panics. Surfaces that are not Valid contribute no
// conditions, and an empty Datum removes nothing.
func (f Frame) Analyze(refs []Datum) *DRF {
	f = f.sanitized()
	d := &DRF{
		frame:  f,
		spaces: make([]space, 1, len(refs)+1),
		splits: make([]split, 1, len(refs)+1),
		steps:  make([]Step, 0, len(refs)),
	}
	d.spaces[0], d.splits[0] = identity(6), wholeSplit()
	var rows []float64 // six numbers a row
	for _, ref := range refs {
		rows = d.step(ref, rows)
	}
	d.finish()
	return d
}

// Extend returns the analysis of d's references followed by ref: what
// Analyze of them all returns, step for step (each step depends only on
// the space and split before it and on its own reference), with d's steps
// shared and d unchanged. A part whose frames reference A, then A, B, then
// A, B, C analyses A once.
func (d *DRF) Extend(ref Datum) *DRF {
	d = d.orDefault()
	n := len(d.steps)
	e := &DRF{
		frame:  d.frame,
		spaces: append(make([]space, 0, n+2), d.spaces...),
		splits: append(make([]split, 0, n+2), d.splits...),
		steps:  append(make([]Step, 0, n+1), d.steps...),
	}
	e.step(ref, nil)
	e.finish()
	return e
}

// step adds the analysis of the next reference; rows is scratch, returned
// for the next step.
func (d *DRF) step(ref Datum, rows []float64) []float64 {
	f := d.frame
	k := len(d.steps)
	free, sp := d.spaces[k], d.splits[k]
	var next space
	var nsp split
	ok := false
	if k == 0 && len(ref) == 1 {
		// A single plane first: its invariance in closed form.
		next, _, nsp, ok = planeSpaces(f, ref[0])
	}
	if !ok {
		rows = rows[:0]
		for _, s := range ref {
			rows = s.appendConditions(rows, f)
		}
		next = restrictFlat(free, rows)
		// Each space is split once and the split reused for every
		// name and zone that needs it (splitSpace is a pure function
		// of the space, so this changes no answer).
		nsp = splitSpace(next)
	}
	d.steps = append(d.steps, Step{
		Constrains: len(free) - len(next),
		Removed:    f.readableSplit(sp, nsp),
		Free:       f.readableSplit(nsp, split{}),
	})
	d.spaces = append(d.spaces, next)
	d.splits = append(d.splits, nsp)
	return rows
}

// finish sets the frame's freedom, the last step's, named the same way;
// a copy, so that a caller changing one cannot change the other.
func (d *DRF) finish() {
	if n := len(d.steps); n > 0 {
		d.free = slices.Clone(d.steps[n-1].Free)
	} else {
		d.free = d.frame.readableSplit(d.splits[0], split{})
	}
}

// orDefault lets a nil *DRF behave as a frame with no references.
func (d *DRF) orDefault() *DRF {
	if d == nil || len(d.spaces) == 0 {
		return Frame{}.Analyze(nil)
	}
	return d
}

// Steps returns one Step per reference, in precedence order.
func (d *DRF) Steps() []Step {
	d = d.orDefault()
	return append([]Step(nil), d.steps...)
}

// Free returns a basis of the motions the whole frame leaves free; its
// length is the number of degrees of freedom left.
func (d *DRF) Free() []Motion {
	d = d.orDefault()
	return append([]Motion(nil), d.free...)
}
