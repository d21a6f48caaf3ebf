// Package model resolves a parsed .callouts file into the part's model:
// features with their nominal geometry and sizes, pattern members, datums,
// control frames and dimensions, with every name looked up. Rules and the
// geometry engines read this model; they never look at raw text.
package model

import (
	"sync"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/source"
)

// Span is a source range.
type Span = source.Span

// Size is a feature's size or a dimension's tolerance: a nominal with an
// upper and a lower deviation (limits are stored the same way).
type Size struct {
	Nominal      float64
	Upper, Lower float64 // signed deviations
	Toleranced   bool    // false where only a nominal was written
	Envelope     bool    // (E): ISO 14405-1 envelope requirement
	Span         Span
}

// Max and Min are the limits of size.
func (s *Size) Max() float64 { return s.Nominal + s.Upper }
func (s *Size) Min() float64 { return s.Nominal + s.Lower }

// Feature is one declared feature (a single feature or a whole pattern).
type Feature struct {
	Name     string
	NameSpan Span
	Span     Span
	Kind     Kind
	Stmt     *grammar.FeatureStmt // nil for a feature recovered from a bad statement
	Size     *Size
	// Dir is the unit normal (plane; mid-plane of a width), axis (hole,
	// pin, cone) or direction (extrusion); zero for spheres and surfaces.
	Dir Vec
	// HasGeometry is false where the geometry was missing or unreadable.
	HasGeometry bool
	// Members holds one entry per member; a single feature has one.
	Members []*Member
	// Pattern is true for an Nx pattern.
	Pattern bool
	// Faces are the two planes of a width given with 'between'.
	Faces [2]*Target
	// FaceOf is the width a plane bounds, where a width names it in its
	// 'between'; nil otherwise.
	FaceOf *Feature
	// Broken marks a name recovered from a statement that did not parse,
	// so that references to it do not cascade into more findings.
	Broken bool
}

// Point returns the feature's (first member's) point.
func (f *Feature) Point() Vec {
	if len(f.Members) == 0 {
		return Vec{}
	}
	return f.Members[0].Point
}

// MMC and LMC are the maximum and least material conditions of the size
// (ASME Y14.5-2018, definitions; an internal feature is at MMC at its
// smallest size).
func (f *Feature) MMC() float64 {
	if f.Size == nil {
		return 0
	}
	if f.Kind.Internal() {
		return f.Size.Min()
	}
	return f.Size.Max()
}

func (f *Feature) LMC() float64 {
	if f.Size == nil {
		return 0
	}
	if f.Kind.Internal() {
		return f.Size.Max()
	}
	return f.Size.Min()
}

// Member is one member of a feature (index 1-based, in the order written).
type Member struct {
	Feature *Feature
	Index   int
	Point   Vec
}

// Target is a name as used by a frame, a datum or a dimension, with what it
// resolved to. Feature is nil when the name is undefined.
type Target struct {
	Name    string
	Span    Span
	Feature *Feature
	Member  *Member // nil: the whole feature (every member of a pattern)
	// Problem explains why a name did not resolve ("bolts has 4 members").
	Problem string
}

// Resolved reports whether the name was found.
func (t *Target) Resolved() bool { return t != nil && t.Feature != nil }

// Points returns the nominal points the target stands for.
func (t *Target) Points() []Vec {
	if !t.Resolved() {
		return nil
	}
	if t.Member != nil {
		return []Vec{t.Member.Point}
	}
	out := make([]Vec, len(t.Feature.Members))
	for i, m := range t.Feature.Members {
		out[i] = m.Point
	}
	return out
}

// IsPattern reports whether the target is a whole pattern.
func (t *Target) IsPattern() bool {
	return t.Resolved() && t.Member == nil && t.Feature.Pattern
}

// Datum is a datum feature symbol.
type Datum struct {
	Letter        string
	LetterSpan    Span
	Span          Span
	Stmt          *grammar.DatumStmt
	Target        Target
	Placement     string // "" when not given
	PlacementSpan Span
	Broken        bool
}

// DatumRef is one datum reference of a frame segment.
type DatumRef struct {
	Name     string   // as written: "A" or "A-B"
	Letters  []string // "A", "B"
	Datums   []*Datum // parallel to Letters; nil where undefined
	Material string   // "", "M" (MMB) or "L" (LMB)
	MatSpan  Span
	Span     Span
}

// Common reports whether the reference is a common datum (A-B).
func (r *DatumRef) Common() bool { return len(r.Letters) > 1 }

// Resolved reports whether every letter names a declared datum.
func (r *DatumRef) Resolved() bool {
	for _, d := range r.Datums {
		if d == nil || !d.Target.Resolved() {
			return false
		}
	}
	return len(r.Datums) > 0
}

// Modifier is a tolerance modifier: "M", "L", "F", "T", "P" (Value: height)
// or "U" (Value: offset).
type Modifier struct {
	Letter string
	Value  float64
	// HasValue is false where (P) or (U) was written without its value
	// (a syntax finding), so that no rule judges a value never written.
	HasValue bool
	Span     Span
}

// Segment is one segment of a frame: the upper one, or a composite lower one.
type Segment struct {
	Composite bool
	Zone      string // "", "dia" or "sdia"
	ZoneSpan  Span
	Value     float64
	ValueSpan Span
	Modifiers []Modifier
	Refs      []*DatumRef
	Span      Span
	Tree      *grammar.Tolerance
	// Named is a characteristic written on a composite line in place of a
	// zone ("composite surface-profile 0.1"); "" where none was.
	Named     Characteristic
	NamedSpan Span
}

// Modifier returns the modifier with the letter, if present.
func (s *Segment) Modifier(letter string) (Modifier, bool) {
	for _, m := range s.Modifiers {
		if m.Letter == letter {
			return m, true
		}
	}
	return Modifier{}, false
}

// Frame is a feature control frame.
type Frame struct {
	Target         Target
	Characteristic Characteristic
	CharSpan       Span
	Segments       []*Segment // [0] is the upper segment
	Span           Span
	Stmt           *grammar.FrameStmt
}

// Upper returns the frame's first segment.
func (f *Frame) Upper() *Segment { return f.Segments[0] }

// Dimension is a basic or a toleranced dimension.
type Dimension struct {
	Basic     bool
	Angle     bool
	Value     float64
	ValueSpan Span
	Tol       *Size // toleranced (dim) only
	From, To  Target
	Along     *Vec // unit; nil when absent
	About     *Target
	// Circle is set for the bolt-circle extension: a basic diameter of the
	// circle through a pattern's axes about a datum feature's axis.
	Circle *BoltCircle
	Span   Span
	Stmt   grammar.Stmt
}

// BoltCircle is a basic diameter through a pattern's axes about an axis.
type BoltCircle struct {
	Diameter float64
	Pattern  Target
	About    Target
}

// HeaderLine records a header statement.
type HeaderLine struct {
	Keyword string
	Value   string
	Span    Span
}

// Part is the resolved model of one file.
type Part struct {
	File     *grammar.File
	Title    string
	Units    Units
	Standard Standard
	// Headers lists every header statement in order (for duplicate and
	// placement checks).
	Headers []HeaderLine
	// FirstStmt is the span of the file's first statement (where a missing
	// header is reported); zero for a file without statements.
	FirstStmt Span

	Features []*Feature
	Datums   []*Datum
	Frames   []*Frame
	Dims     []*Dimension

	// Duplicates are features declared under a name already taken.
	Duplicates []*Feature
	// Refs is every name reference, resolved or not, in file order.
	Refs []*Target
	// Errors are value errors found while resolving (unknown kinds,
	// numbers out of range, geometry that does not fit the kind). They are
	// reported as syntax findings.
	Errors []*grammar.SyntaxError
	// Geometry problems (faces of a width that are not parallel planes).
	GeometryErrors []*grammar.SyntaxError

	// Center and Scale describe the part's extent: the centre and the
	// diagonal of the box around all nominal points (at least 1).
	Center Vec
	Scale  float64

	byName   map[string]*Feature
	byLetter map[string]*Datum

	indexOnce sync.Once
	framesOn  map[*Feature][]*Frame
	datumsOn  map[*Feature][]*Datum
}

// Feature returns the first feature declared with the name, or nil.
func (p *Part) Feature(name string) *Feature { return p.byName[name] }

// Datum returns the first datum declared with the letter, or nil.
func (p *Part) Datum(letter string) *Datum { return p.byLetter[letter] }

// DatumsOn returns the datums whose target is the feature (any member), in
// file order.
func (p *Part) DatumsOn(f *Feature) []*Datum {
	p.indexOnce.Do(p.index)
	return p.datumsOn[f]
}

// FramesOn returns the frames whose target is the feature or one of its
// members, in file order.
func (p *Part) FramesOn(f *Feature) []*Frame {
	p.indexOnce.Do(p.index)
	return p.framesOn[f]
}

// index files the frames and datums by target feature, once: rules ask
// for them feature by feature, and scanning every frame for each feature
// made a part of n features cost n² (rules read the part only after
// Resolve, so the index sees every frame and datum).
func (p *Part) index() {
	p.framesOn = map[*Feature][]*Frame{}
	p.datumsOn = map[*Feature][]*Datum{}
	for _, fr := range p.Frames {
		p.framesOn[fr.Target.Feature] = append(p.framesOn[fr.Target.Feature], fr)
	}
	for _, d := range p.Datums {
		p.datumsOn[d.Target.Feature] = append(p.datumsOn[d.Target.Feature], d)
	}
}

// Tolerance returns a length tolerance relative to the part's size, for
// comparing nominal values (about 1e-6 of the part's size).
func (p *Part) Tolerance() float64 { return 1e-6 * p.Scale }
