package model

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/grammar/spell"
)

// This file is how a reader builds a Part: NewPart, then Declare each
// feature, Lookup each name that an annotation uses, AddDatum each datum
// feature symbol, append frames and dimensions, and Finish.

// NewPart returns an empty part read from src.
func NewPart(src *source.File) *Part {
	return &Part{Source: src, Scale: 1, byName: map[string]*Feature{}, byLetter: map[string]*Datum{}}
}

// Problemf records a problem found while reading.
func (p *Part) Problemf(kind ProblemKind, sp source.Span, format string, args ...any) {
	p.Problems = append(p.Problems, &Problem{Kind: kind, Span: sp, Message: fmt.Sprintf(format, args...)})
}

// Declare adds a feature under its name. A second declaration of a name is
// kept in Duplicates (the first one counts), except that a feature read
// from a statement that parsed replaces one recovered from a statement
// that did not.
func (p *Part) Declare(ft *Feature) {
	if ft == nil {
		return
	}
	prev, ok := p.byName[ft.Name]
	switch {
	case ok && !prev.Broken:
		p.Duplicates = append(p.Duplicates, ft)
	case ok && !ft.Broken:
		for i, f := range p.Features {
			if f == prev {
				p.Features[i] = ft
			}
		}
		p.byName[ft.Name] = ft
	case ok:
	default:
		p.byName[ft.Name] = ft
		p.Features = append(p.Features, ft)
	}
}

// AddDatum adds a datum feature symbol; the first usable declaration of a
// letter is the one Datum returns.
func (p *Part) AddDatum(d *Datum) {
	p.Datums = append(p.Datums, d)
	if prev := p.byLetter[d.Letter]; prev == nil || prev.Broken && !d.Broken {
		p.byLetter[d.Letter] = d
	}
}

// Lookup resolves a name written at sp: a feature, or a member written
// NAME.N. The target is recorded in Refs, resolved or not; an unresolved
// one says why in Problem.
func (p *Part) Lookup(name string, sp source.Span) *Target {
	if len(p.targets) == 0 {
		p.targets = make([]Target, 32)
	}
	t := &p.targets[0]
	p.targets = p.targets[1:]
	*t = Target{Name: name, Span: sp}
	p.Refs = append(p.Refs, t)
	if ft := p.byName[name]; ft != nil {
		t.Feature = ft
		return t
	}
	if i := strings.LastIndexByte(name, '.'); i > 0 {
		base, idx := name[:i], name[i+1:]
		ft := p.byName[base]
		k, err := strconv.Atoi(idx)
		switch {
		case ft == nil:
			t.Problem = fmt.Sprintf("no feature is named '%s'", base)
		case ft.Broken:
			t.Feature = ft
		case !ft.Pattern:
			t.Problem = fmt.Sprintf("%s is a single %s, not a pattern: write '%s'", base, ft.Kind, base)
		case err != nil || k < 1 || k > len(ft.Members):
			t.Problem = fmt.Sprintf("%s has %d members, %s.1 to %s.%d", base, len(ft.Members), base, base, len(ft.Members))
		default:
			t.Feature, t.Member = ft, ft.Members[k-1]
		}
		return t
	}
	names := make([]string, 0, len(p.Features))
	for _, f := range p.Features {
		names = append(names, f.Name)
	}
	t.Problem = fmt.Sprintf("no feature is named '%s'", name)
	if sg := spell.Nearest(name, names); sg != "" && len(name) > 2 {
		t.Problem += fmt.Sprintf("; did you mean '%s'?", sg)
		t.Suggestion = spell.Only(name, names)
	}
	return t
}

// AddTarget adds a datum target; Finish links it to the datum of its
// letter.
func (p *Part) AddTarget(t *DatumTarget) { p.Targets = append(p.Targets, t) }

// Finish indexes the part, links datum targets to their datums and works
// out the part's extent; a reader calls it once, after the last element is
// added.
func (p *Part) Finish() {
	for _, d := range p.Datums {
		d.Targets = nil
	}
	for _, t := range p.Targets {
		if d := p.byLetter[t.Letter]; d != nil && t.Letter != "" {
			d.Targets = append(d.Targets, t)
		}
	}
	p.framesOn = make(map[*Feature][]*Frame, len(p.Features))
	for _, fr := range p.Frames {
		if f := fr.Target.Feature; f != nil {
			p.framesOn[f] = append(p.framesOn[f], fr)
		}
	}
	p.datumsOn = make(map[*Feature][]*Datum, len(p.Datums))
	for _, d := range p.Datums {
		if f := d.Target.Feature; f != nil {
			p.datumsOn[f] = append(p.datumsOn[f], d)
		}
	}
	p.widthOf = map[*Feature]*Feature{}
	for _, w := range p.Features {
		if w.Broken || !w.Kind.IsWidth() {
			continue
		}
		for _, fc := range w.Faces {
			if fc != nil && fc.Feature != nil && fc.Member == nil && p.widthOf[fc.Feature] == nil {
				p.widthOf[fc.Feature] = w
			}
		}
	}
	p.extent()
}

// extent computes the box around every nominal point, for normalising.
func (p *Part) extent() {
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
		p.Scale = 1
		return
	}
	p.Center = lo.Add(hi).Scale(0.5)
	p.Scale = math.Max(hi.Sub(lo).Norm(), biggest)
	if p.Scale == 0 || math.IsInf(p.Scale, 0) || math.IsNaN(p.Scale) {
		p.Scale = 1
	}
}
