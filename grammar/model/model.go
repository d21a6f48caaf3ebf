// Package model is the part as datumlint checks it: features with their
// nominal geometry and sizes, pattern members, datums, control frames and
// dimensions, every name looked up, and every element's span in the file it
// was read from. It imports no reader's syntax: the callout notation
// (package grammar) and the QIF reader each build a Part, and the rules,
// the engines and every output read only the Part.
//
// Besides the geometry, a Part records what rules and outputs need of the
// file as written: problems found while reading, the statements (with the
// names written in those that did not parse), the written text and
// precision of values that messages quote, and the suppressions.
package model

import (
	"bytes"
	"strings"

	"github.com/datumlint/datumlint/grammar/source"
)

// Size is a feature's size or a dimension's tolerance: a nominal with an
// upper and a lower deviation (limits are stored the same way).
type Size struct {
	Nominal      float64
	Upper, Lower float64 // signed deviations
	Toleranced   bool    // false where only a nominal was written
	Envelope     bool    // (E): ISO 14405-1 envelope requirement
	// EnvelopeSpan is where (E) was written, where a reader knows it.
	EnvelopeSpan source.Span
	Span         source.Span
	// Text is the size as written, for messages that quote it.
	Text string
}

// Max and Min are the limits of size.
func (s *Size) Max() float64 { return s.Nominal + s.Upper }
func (s *Size) Min() float64 { return s.Nominal + s.Lower }

// Feature is one declared feature (a single feature or a whole pattern).
type Feature struct {
	Name     string
	NameSpan source.Span
	Span     source.Span
	Kind     Kind
	Size     *Size
	// Dir is the unit normal (plane; mid-plane of a width), axis (hole,
	// pin, cone) or direction (extrusion); zero for spheres and surfaces.
	Dir Vec
	// DirDecimals is the number of decimals written in each component of a
	// direction given as a vector; -1 where none was written (an axis word
	// such as +z, a reader that gives binary values) or in exponent form.
	DirDecimals [3]int
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

	// Thread is a screw thread's designation ("M8x1.25-6H"); "" for a
	// feature that is not threaded. A tolerance or datum on a thread
	// applies to its pitch cylinder unless a frame says otherwise (ASME
	// Y14.5-2018, screw threads; from memory).
	Thread     string
	ThreadSpan source.Span
	// Counterbore and Countersink are a hole's; nil where none was given.
	Counterbore *Counterbore
	Countersink *Countersink
	// DatumTarget is set on the point or line feature a datum target
	// stands for, so that dimensions may name the target.
	DatumTarget *DatumTarget
}

// Counterbore is a counterbore of a hole: its diameter and depth.
type Counterbore struct {
	Diameter, Depth *Size
	Span            source.Span
}

// Countersink is a countersink of a hole: its diameter at the surface and
// its included angle in degrees (Angle.Nominal).
type Countersink struct {
	Diameter, Angle *Size
	Span            source.Span
}

// Known reports whether the feature was read well enough for rules to
// judge it: declared by a statement that parsed, of a known kind.
func (f *Feature) Known() bool { return f != nil && !f.Broken && f.Kind != KindUnknown }

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
	// Decimals is the number of decimals written in each coordinate of the
	// point; -1 where it was not written in decimals (exponent form, a
	// reader that gives binary values, a point derived from other
	// features).
	Decimals [3]int
	// Span is where the member's point was written.
	Span source.Span
}

// Target is a name as used by a frame, a datum or a dimension, with what it
// resolved to. Feature is nil when the name is undefined.
type Target struct {
	Name    string
	Span    source.Span
	Feature *Feature
	Member  *Member // nil: the whole feature (every member of a pattern)
	// Problem explains why a name did not resolve ("bolts has 4 members").
	Problem string
	// Suggestion is the one declared name near an unresolved one, where
	// exactly one is near (a likely typo); "" otherwise.
	Suggestion string
}

// Resolved reports whether the name was found.
func (t *Target) Resolved() bool { return t != nil && t.Feature != nil }

// Known reports whether the name was found and its feature can be judged
// (Feature.Known).
func (t *Target) Known() bool { return t.Resolved() && t.Feature.Known() }

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
	LetterSpan    source.Span
	Span          source.Span
	Target        Target
	Placement     string // "" when not given
	PlacementSpan source.Span
	Broken        bool
	// Targets are the datum targets that establish the datum (Finish
	// links them by letter); empty for a datum established by its whole
	// feature.
	Targets []*DatumTarget
}

// DatumTarget is a datum target: a point, a line or an area of a datum
// feature where the datum feature simulator touches it (ASME Y14.5-2018,
// datum targets; ISO 5459:2011). A datum established by targets takes its
// degrees of freedom from them.
type DatumTarget struct {
	// Label is the target's name: its datum's letter and a number ("A1").
	Label     string
	LabelSpan source.Span
	Span      source.Span
	// Letter is the datum the target establishes.
	Letter string
	Shape  TargetShape
	// On is the feature the target lies on.
	On Target
	// Point is the point of a point target and the centre of an area;
	// a line target runs from Point to End.
	Point, End Vec
	// Normal is the surface normal written with the target; zero where
	// none was, and the surface's own normal at Point applies.
	Normal Vec
	// An area target is circular of diameter Dia, or Width by Height.
	Dia, Width, Height float64
	// Feature is the point or line feature that stands for the target.
	Feature *Feature
	Broken  bool
}

// Usable reports whether the datum was declared by a statement that parsed
// and sits on a feature that can be judged.
func (d *Datum) Usable() bool { return d != nil && !d.Broken && d.Target.Known() }

// DatumRef is one datum reference of a frame segment.
type DatumRef struct {
	Name    string   // as written, without modifiers: "A" or "A-B"
	Letters []string // "A", "B"
	Datums  []*Datum // parallel to Letters; nil where undefined
	// Material is the modifier written after the whole reference: "", "M"
	// (MMB) or "L" (LMB).
	Material string
	MatSpan  source.Span
	// Materials and MatSpans are each letter's material boundary,
	// parallel to Letters: the modifier written after that letter of a
	// common datum (H(M)-J(M)), or else the reference's own.
	Materials []string
	MatSpans  []source.Span
	Span      source.Span
	// FullSpan covers the reference as written, its modifiers included.
	FullSpan source.Span
}

// Boundary returns the material boundary of letter i of the reference
// and where its modifier is written.
func (r *DatumRef) Boundary(i int) (string, source.Span) {
	if i < len(r.Materials) {
		return r.Materials[i], r.MatSpans[i]
	}
	return r.Material, r.MatSpan
}

// Label writes the reference with its material boundaries: A-B(M) where
// one modifier is the whole reference's, H(M)-J(M) where each letter has
// its own, A where it has none.
func (r *DatumRef) Label() string {
	if r.Material != "" || len(r.Materials) == 0 {
		s := strings.Join(r.Letters, "-")
		if r.Material != "" {
			s += "(" + r.Material + ")"
		}
		return s
	}
	parts := make([]string, len(r.Letters))
	for i, l := range r.Letters {
		parts[i] = l
		if m, _ := r.Boundary(i); m != "" {
			parts[i] += "(" + m + ")"
		}
	}
	return strings.Join(parts, "-")
}

// AnyBoundary reports whether some letter of the reference is at MMB or
// LMB.
func (r *DatumRef) AnyBoundary() bool {
	for i := range r.Letters {
		if m, _ := r.Boundary(i); m != "" {
			return true
		}
	}
	return r.Material != ""
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
	Span     source.Span
}

// Segment is one segment of a frame: the upper one, or a composite lower one.
type Segment struct {
	Composite bool
	Zone      string // "", "dia" or "sdia"
	ZoneSpan  source.Span
	// ZoneText is the word written in the zone's place, also where it is
	// not a zone the notation knows (a syntax finding; Zone is then "").
	ZoneText  string
	Value     float64
	ValueSpan source.Span
	// ValueText is the tolerance value as written.
	ValueText string
	Modifiers []Modifier
	Refs      []*DatumRef
	// DatumsSpan covers the datum references with the word that
	// introduces them ("datums A, B(M)"); zero where there are none.
	DatumsSpan source.Span
	Span       source.Span
	// Named is a characteristic written on a composite line in place of a
	// zone ("composite surface-profile 0.1"); "" where none was.
	Named     Characteristic
	NamedSpan source.Span
	// PerUnit is a tolerance per unit length or area (0.01/25,
	// 0.005/25x25); nil where the tolerance applies to the whole feature.
	PerUnit *PerUnit
	// ZoneDir is the direction of a parallel-planes zone (the planes are
	// normal to it): a position of a hole or pin toleranced in one
	// direction (bidirectional positional tolerancing); nil otherwise.
	ZoneDir     *Vec
	ZoneDirSpan source.Span
	// PlanesStated is set where the source says outright that the zone is
	// two parallel planes (a QIF NonDiametricalZone, at ZoneSpan), which
	// the notation says by writing no zone word.
	PlanesStated bool
	// Separate is a separate requirement: the segment's zone is not
	// simultaneous with others on the same datums (ASME Y14.5-2018,
	// simultaneous requirements).
	Separate     bool
	SeparateSpan source.Span
}

// PerUnit is a tolerance that applies to any length, or (Area) any
// rectangular area Length by Width, of the feature.
type PerUnit struct {
	Length, Width float64
	Area          bool
	Span          source.Span
	// Text is the unit as written after the slash ("25x25").
	Text string
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

// RefsSpan covers the segment's datum references.
func (s *Segment) RefsSpan() source.Span {
	var sp source.Span
	for _, r := range s.Refs {
		sp = sp.Join(r.Span)
	}
	return sp
}

// Frame is a feature control frame.
type Frame struct {
	Target         Target
	Characteristic Characteristic
	CharSpan       source.Span
	Segments       []*Segment // [0] is the upper segment
	Span           source.Span
	// Extent is where a profile applies: "" (the feature as named),
	// AllAround, AllOver or Between, from Between[0] to Between[1].
	Extent     string
	ExtentSpan source.Span
	Between    [2]*Target
	// ThreadDiameter is the diameter of a screw thread the frame applies
	// to, where the frame says so (MajorDiameter, MinorDiameter,
	// PitchDiameter); "" for the default, the pitch diameter.
	ThreadDiameter     string
	ThreadDiameterSpan source.Span
}

// Upper returns the frame's first segment.
func (f *Frame) Upper() *Segment { return f.Segments[0] }

// Located reports whether the frame places its zone at a true position
// given by basic dimensions: position, or a profile with datums (ASME
// Y14.5-2018, position and profile; ISO 1101:2017, located profile).
func (f *Frame) Located() bool {
	return f.Characteristic == Position ||
		f.Characteristic.Category() == Profile && len(f.Upper().Refs) > 0
}

// RefersTo reports whether any segment of the frame references the letter
// (alone or in a common datum).
func (f *Frame) RefersTo(letter string) bool {
	for _, seg := range f.Segments {
		for _, r := range seg.Refs {
			for _, l := range r.Letters {
				if l == letter {
					return true
				}
			}
		}
	}
	return false
}

// Dimension is a basic, a toleranced or a reference dimension.
type Dimension struct {
	Basic bool
	// Reference marks a reference dimension: given for information,
	// checked against the model, it locates and tolerances nothing.
	Reference bool
	// SizeOf is the feature whose size a reference size gives; nil for a
	// distance or an angle.
	SizeOf    *Target
	Angle     bool
	Value     float64
	ValueSpan source.Span
	// ValueText is the value as written (without deg).
	ValueText string
	Tol       *Size // toleranced (dim) only
	From, To  Target
	Along     *Vec // unit; nil when absent
	About     *Target
	// Circle is set for the bolt-circle extension: a basic diameter of the
	// circle through a pattern's axes about a datum feature's axis.
	Circle *BoltCircle
	Span   source.Span
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
	Span    source.Span
}

// ProblemKind says what sort of problem a reader found.
type ProblemKind int

const (
	// Syntax: what was written does not follow the format, or a value the
	// format does not know (a kind, a characteristic, a unit).
	Syntax ProblemKind = iota + 1
	// Geometry: nominal geometry that cannot be built (a width between
	// faces that are not parallel planes).
	Geometry
	// Unsupported: something the file says that the model cannot carry
	// and the reader left out (a construct of an exchange format).
	Unsupported
	// Inconsistent: the file contradicts itself or is incomplete (unit
	// labels that disagree, a reference to no element, a size that is not
	// its feature's); the reader says what it read instead.
	Inconsistent
)

// Problem is a positioned problem found while reading.
type Problem struct {
	Kind    ProblemKind
	Span    source.Span
	Message string
}

func (p *Problem) Error() string { return p.Span.Start.String() + ": " + p.Message }

// Statement is one statement of the file (one element of an exchange
// format), in file order.
type Statement struct {
	// Keyword is the statement's leading word as written ("feature",
	// "frame"; for a statement that did not parse, its first word).
	Keyword string
	Span    source.Span
	// First and Last are the physical lines (1-based, inclusive) it spans.
	First, Last int
	// Parsed is false for a statement that did not parse.
	Parsed bool
	// Comments are the trailing comments on the statement's lines (which
	// StatementText leaves out).
	Comments []source.Span
	// Name is the name or letter a statement that did not parse declares,
	// where it could be read; Words are the names written in it. They keep
	// one typo from cascading into name-undefined or datum-unused findings.
	Name  string
	Words []string
}

// StatementText is a statement as written with its trailing comments
// removed and runs of white space made one space: what it says, apart from
// where it stands (SARIF fingerprints hash it). A byte order mark is not
// part of the text.
func StatementText(src *source.File, st Statement) string {
	var b strings.Builder
	for l := st.First; l <= st.Last; l++ {
		line := src.LineBytes(l)
		for _, c := range st.Comments {
			if c.Start.Line == l {
				line = line[:src.Offset(c.Start)-src.Offset(source.Pos{Line: l, Col: 1})]
			}
		}
		if l == 1 {
			line = bytes.TrimPrefix(line, []byte("\ufeff"))
		}
		b.Write(line)
		b.WriteByte(' ')
	}
	return strings.Join(strings.Fields(b.String()), " ")
}

// Suppression is an allow directive: `# datumlint: allow RULE -- reason`.
type Suppression struct {
	// Span is the directive's comment; Trailing is true when it ends a
	// line that also holds a statement.
	Span     source.Span
	Trailing bool
	// Rules are the identifiers it names, with where each is written.
	Rules     []string
	RuleSpans []source.Span
	Reason    string
	// Stmt is the index in Part.Statements of the statement it applies to
	// (the one it ends, or the one directly below it), or -1.
	Stmt int
}

// Part is the model of one file.
type Part struct {
	// Source is the file the part was read from.
	Source   *source.File
	Title    string
	Units    Units
	Standard Standard
	// Headers lists every header statement in order (for duplicate and
	// placement checks).
	Headers []HeaderLine

	// Basis says which nominal values are basic: DrawingBasis unless the
	// part is a model-based definition (ModelBasis).
	Basis Basis

	Features []*Feature
	Datums   []*Datum
	Frames   []*Frame
	Dims     []*Dimension
	// Targets are the datum targets, in file order.
	Targets []*DatumTarget

	// Duplicates are features declared under a name already taken.
	Duplicates []*Feature
	// Refs is every name reference, resolved or not, in file order.
	Refs []*Target
	// Problems are what the reader found wrong or left out, in the order
	// found.
	Problems []*Problem
	// Statements are the file's statements in order.
	Statements []Statement
	// Suppressions are the allow directives, in file order.
	Suppressions []*Suppression
	// NotText marks a file that is not text in the reader's format at all
	// (binary data): its one Syntax problem says so, and nothing is said
	// of what such a file lacks (no header-missing), so that it gets one
	// finding.
	NotText bool

	// Center and Scale describe the part's extent: the centre and the
	// diagonal of the box around all nominal points (at least 1).
	Center Vec
	Scale  float64

	byName   map[string]*Feature
	byLetter map[string]*Datum
	framesOn map[*Feature][]*Frame
	datumsOn map[*Feature][]*Datum
	widthOf  map[*Feature]*Feature

	// targets is where Lookup takes its next Target from: a file names
	// hundreds, and one allocation for each was a good part of reading
	// one.
	targets []Target
}

// FirstStatement returns the span of the first line of the file's first
// statement (where a missing header is reported), or the first character
// of the file when it has none.
func (p *Part) FirstStatement() source.Span {
	if len(p.Statements) == 0 {
		return source.Line(1)
	}
	sp := p.Statements[0].Span
	if sp.End.Line != sp.Start.Line {
		sp.End = source.Pos{Line: sp.Start.Line, Col: sp.Start.Col + 1}
	}
	return sp
}

// Feature returns the first feature declared with the name, or nil.
func (p *Part) Feature(name string) *Feature { return p.byName[name] }

// Datum returns the first datum declared with the letter, or nil.
func (p *Part) Datum(letter string) *Datum { return p.byLetter[letter] }

// DatumsOn returns the datums whose target is the feature (any member).
func (p *Part) DatumsOn(f *Feature) []*Datum { return p.datumsOn[f] }

// FramesOn returns the frames whose target is the feature or one of its members.
func (p *Part) FramesOn(f *Feature) []*Frame { return p.framesOn[f] }

// WidthOfFace returns the width (slot or tab) that names the plane as one
// of its faces in its 'between', or nil. Unlike FaceOf it is set also where
// the faces do not make a width (a geometry problem).
func (p *Part) WidthOfFace(f *Feature) *Feature {
	if f == nil || f.Kind != Plane {
		return nil
	}
	return p.widthOf[f]
}

// Tolerance returns a length tolerance relative to the part's size, for
// comparing nominal values (about 1e-6 of the part's size).
func (p *Part) Tolerance() float64 { return 1e-6 * p.Scale }
