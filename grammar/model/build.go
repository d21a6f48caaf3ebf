package model

import "math"

// NewPart returns an empty part for a reader that builds the model without
// the notation's resolver (the QIF reader, grammar/qif). The reader appends
// to Features, Datums, Frames, Dims and Refs and sets the other fields it
// knows, then calls Index once, before any rule reads the part.
func NewPart() *Part {
	return &Part{Scale: 1, byName: map[string]*Feature{}, byLetter: map[string]*Datum{}}
}

// Index builds what the part derives from its features and datums: the
// lookups behind Feature and Datum (the first feature of a name and the
// first datum of a letter win, and a good one takes the place of a broken
// one, as in Resolve) and the part's extent (Center and Scale). Call it
// again after changing Features or Datums.
func (p *Part) Index() {
	p.byName = make(map[string]*Feature, len(p.Features))
	for _, f := range p.Features {
		if prev := p.byName[f.Name]; prev == nil || (prev.Broken && !f.Broken) {
			p.byName[f.Name] = f
		}
	}
	p.byLetter = make(map[string]*Datum, len(p.Datums))
	for _, d := range p.Datums {
		if prev := p.byLetter[d.Letter]; prev == nil || prev.Broken {
			p.byLetter[d.Letter] = d
		}
	}
	p.measureExtent()
}

// measureExtent computes the box around every nominal point, for
// normalising: Center is its centre and Scale its diagonal, or the largest
// size where that is larger (at least 1).
func (p *Part) measureExtent() {
	lo := Vec{math.Inf(1), math.Inf(1), math.Inf(1)}
	hi := Vec{math.Inf(-1), math.Inf(-1), math.Inf(-1)}
	n := 0
	biggest := 0.0
	for _, ft := range p.Features {
		for _, m := range ft.Members {
			for i := 0; i < 3; i++ {
				lo[i] = math.Min(lo[i], m.Point[i])
				hi[i] = math.Max(hi[i], m.Point[i])
			}
			n++
		}
		if ft.Size != nil {
			biggest = math.Max(biggest, math.Abs(ft.Size.Nominal))
		}
	}
	if n == 0 {
		p.Center, p.Scale = Vec{}, 1
		return
	}
	p.Center = lo.Add(hi).Scale(0.5)
	p.Scale = math.Max(hi.Sub(lo).Norm(), biggest)
	if p.Scale == 0 || math.IsInf(p.Scale, 0) || math.IsNaN(p.Scale) {
		p.Scale = 1
	}
}
