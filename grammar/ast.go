package grammar

import "github.com/datumlint/datumlint/grammar/source"

// This file is the tree. The tags are the grammar (participle builds the
// parser from them); each statement kind has its own root so that the parser
// can be chosen from the statement's first word.

// Stmt is one statement: a logical line of the file.
type Stmt interface {
	Node
	// Keyword is the statement's leading word ("feature", "frame", ...).
	Keyword() string
	stmt()
}

// Name is an identifier as written, with its span.
type Name struct {
	node
	Value string `parser:"@(Ident | Member)"`
}

// Word is a keyword-like value (a kind, a characteristic, a unit) that may
// also be written as a Unicode symbol.
type Word struct {
	node
	Value string `parser:"@(Ident | Symbol | Dia | SDia)"`
}

// Number is a numeric literal kept as written, so the formatter can keep
// the drafter's digits; the model converts it.
type Number struct {
	node
	Text string `parser:"@Number"`
}

// Vector is a parenthesised triple: a point or a direction vector.
type Vector struct {
	node
	X *Number `parser:"'(' @@ ','"`
	Y *Number `parser:"@@ ','"`
	Z *Number `parser:"@@ ')'"`
}

// Direction is a signed axis (+x ... -z) or a vector.
type Direction struct {
	node
	Axis   string  `parser:"  @Dir"`
	Vector *Vector `parser:"| @@"`
}

// Modifier is a parenthesised modifier such as (M), with the value that
// (P) and (U) take.
type Modifier struct {
	node
	Symbol string  `parser:"@Modifier"`
	Value  *Number `parser:"@@?"`
}

// RefModifier is a material boundary modifier on a datum reference.
type RefModifier struct {
	node
	Symbol string `parser:"@Modifier"`
}

// Size is a size or a toleranced dimension value in any written form.
type Size struct {
	node
	Nominal   *Number      `parser:"@@"`
	Deg       bool         `parser:"@'deg'?"`
	PlusMinus *Number      `parser:"( PlusMinus @@"`
	Upper     *Number      `parser:"| @@"`
	Slash     bool         `parser:"  @'/'?"`
	Lower     *Number      `parser:"  @@"`
	Limit     *Number      `parser:"| Range @@ )?"`
	Envelope  *RefModifier `parser:"@@?"`
}

// Count is a pattern count: 4x or 4 x.
type Count struct {
	node
	N *Number `parser:"@@ ('x' | 'X')"`
}

// Geometry is a feature's nominal geometry. The grammar here is loose on
// purpose (any order of direction, 'at', points and names after the leading
// word); check.go then says precisely what is missing or misplaced, which
// reads better to a drafter than a parser's list of expected tokens.
type Geometry struct {
	node
	Word   *GeomWord  `parser:"@@"`
	Dir    *Direction `parser:"@@?"`
	At     *AtWord    `parser:"@@?"`
	Points []*Vector  `parser:"@@*"`
	Faces  []*Name    `parser:"@@*"`
}

// GeomWord is the word that opens a geometry.
type GeomWord struct {
	node
	Value string `parser:"@('normal' | 'axis' | 'along' | 'at' | 'between')"`
}

// AtWord is the 'at' that introduces points after a direction.
type AtWord struct {
	node
	Value string `parser:"@'at'"`
}

// --- statements -----------------------------------------------------------

// PartStmt: part "name".
type PartStmt struct {
	node
	Title string `parser:"'part' @String"`
}

// UnitsStmt: units mm|in.
type UnitsStmt struct {
	node
	Unit *Word `parser:"'units' @@"`
}

// StandardStmt: standard asme-2018|asme-2009|iso.
type StandardStmt struct {
	node
	Standard *Word `parser:"'standard' @@"`
}

// FeatureStmt declares a feature of the model.
type FeatureStmt struct {
	node
	Name     *Name        `parser:"'feature' @@"`
	Kind     *Word        `parser:"@@"`
	Count    *Count       `parser:"@@?"`
	Size     *Size        `parser:"( 'size' @@ )?"`
	Thread   *Thread      `parser:"@@?"`
	Cbore    *Counterbore `parser:"@@?"`
	Csink    *Countersink `parser:"@@?"`
	Geometry *Geometry    `parser:"@@?"`
}

// Thread is a screw thread's designation, as written on the drawing, in
// double quotes (extension).
type Thread struct {
	node
	Designation string `parser:"'thread' @String"`
}

// Counterbore is a hole's counterbore: its diameter and depth (extension).
type Counterbore struct {
	node
	Diameter *Size `parser:"'cbore' @@"`
	Depth    *Size `parser:"'depth' @@"`
}

// Countersink is a hole's countersink: its diameter at the surface and its
// included angle (extension).
type Countersink struct {
	node
	Diameter *Size `parser:"'csink' @@"`
	Angle    *Size `parser:"'angle' @@"`
}

// DatumStmt attaches a datum feature symbol.
type DatumStmt struct {
	node
	Letter    *Name `parser:"'datum' @@"`
	Target    *Name `parser:"'on' @@"`
	Placement *Word `parser:"( 'placed' @@ )?"`
}

// Tolerance is one segment of a control frame.
type Tolerance struct {
	node
	Zone      *Word       `parser:"@@?"`
	Value     *Number     `parser:"@@"`
	PerUnit   *PerUnit    `parser:"@@?"`
	Modifiers []*Modifier `parser:"@@*"`
	Along     *Direction  `parser:"( 'along' @@ )?"`
	Datums    []*DatumRef `parser:"( 'datums' @@ ( ',' @@ )* )?"`
	Notes     []*Note     `parser:"@@*"`
}

// PerUnit is a tolerance per unit length or area, after the value and a
// slash: 0.01/25, 0.005/25x25 (extension).
type PerUnit struct {
	node
	Area   string  `parser:"'/' ( @Area"`
	Length *Number `parser:"| @@ )"`
}

// Note is a word written after a frame's datums that says more about the
// frame (extension): the extent of a profile (all-around, all-over, or
// between two points), a separate requirement, or the diameter of a screw
// thread the tolerance applies to.
type Note struct {
	node
	Word string `parser:"  @('all-around' | 'all-over' | 'separate' | 'major-dia' | 'minor-dia' | 'pitch-dia')"`
	From *Name  `parser:"| 'between' @@"`
	To   *Name  `parser:"  @@"`
}

// DatumRef is one datum reference: a letter or a common datum (A-B),
// optionally at MMB or LMB; the members of a common datum may carry a
// modifier each, H(M)-J(M) (extension).
type DatumRef struct {
	node
	Name      string         `parser:"@Ident"`
	Modifiers []*RefModifier `parser:"@@*"`
	More      []*RefMember   `parser:"@@*"`
}

// RefMember is a further member of a common datum written after a
// modifier: "-J(M)" in H(M)-J(M), the dash included. A letter X, Y or Z
// after the dash reads as a direction token ("-X"), which the grammar
// takes as the letter.
type RefMember struct {
	node
	Name      string         `parser:"@(Dash | '-X' | '-Y' | '-Z' | '-x' | '-y' | '-z')"`
	Modifiers []*RefModifier `parser:"@@*"`
}

// Composite is the lower segment of a composite frame.
type Composite struct {
	node
	Tolerance *Tolerance `parser:"'composite' @@"`
}

// FrameStmt is a feature control frame.
type FrameStmt struct {
	node
	Target         *Name        `parser:"'frame' @@ ':'"`
	Characteristic *Word        `parser:"@@"`
	Tolerance      *Tolerance   `parser:"@@"`
	Composites     []*Composite `parser:"@@*"`
}

// BoltCircle is the notation's extension for a basic diameter of the
// circle through a pattern's axes about a datum axis.
type BoltCircle struct {
	node
	Zone    *Word   `parser:"@@"`
	Value   *Number `parser:"@@"`
	Pattern *Name   `parser:"'through' @@"`
	About   *Name   `parser:"'about' @@"`
}

// BasisStmt says what is basic: `basis model` (every nominal location
// and angle of the model is basic) or `basis drawing` (only what is
// written basic, the default). Extension.
type BasisStmt struct {
	node
	Basis *Word `parser:"'basis' @@"`
}

// TargetStmt is a datum target: a point, a line or an area on a feature,
// named by its datum's letter and a number (A1). Extension.
type TargetStmt struct {
	node
	Label  *Name       `parser:"'target' @@"`
	Shape  *Word       `parser:"@@"`
	Area   *TargetArea `parser:"@@?"`
	On     *Name       `parser:"'on' @@"`
	At     *Vector     `parser:"( 'at' @@"`
	From   *Vector     `parser:"| 'from' @@"`
	To     *Vector     `parser:"  'to' @@ )"`
	Normal *Direction  `parser:"( 'normal' @@ )?"`
}

// TargetArea is the size of an area target: dia D (circular) or WxH
// (rectangular).
type TargetArea struct {
	node
	Dia   string  `parser:"( @('dia' | Dia)"`
	Value *Number `parser:"  @@"`
	Rect  string  `parser:"| @Area )"`
}

// RefStmt is a reference dimension (extension): a distance or an angle
// between two features, or a feature's size, given for information;
// checked against the model, it locates and tolerances nothing.
type RefStmt struct {
	node
	Size  *Number    `parser:"'ref' ( 'size' @@"`
	Of    *Name      `parser:"  'of' @@"`
	Value *Number    `parser:"| @@"`
	Deg   bool       `parser:"  @'deg'?"`
	From  *Name      `parser:"  'from' @@"`
	To    *Name      `parser:"  'to' @@"`
	Along *Direction `parser:"  ( 'along' @@ )?"`
	About *Name      `parser:"  ( 'about' @@ )? )"`
}

// BasicStmt is a basic (theoretically exact) dimension.
type BasicStmt struct {
	node
	Circle *BoltCircle `parser:"'basic' ( @@"`
	Value  *Number     `parser:"| @@"`
	Deg    bool        `parser:"  @'deg'?"`
	From   *Name       `parser:"  'from' @@"`
	To     *Name       `parser:"  'to' @@"`
	Along  *Direction  `parser:"  ( 'along' @@ )?"`
	About  *Name       `parser:"  ( 'about' @@ )? )"`
}

// DimStmt is a directly toleranced dimension.
type DimStmt struct {
	node
	Size  *Size      `parser:"'dim' @@"`
	From  *Name      `parser:"'from' @@"`
	To    *Name      `parser:"'to' @@"`
	Along *Direction `parser:"( 'along' @@ )?"`
}

// BadStmt is a statement that did not parse. It keeps what could be
// recovered (the first words) so that later checks do not cascade.
type BadStmt struct {
	node
	Word string // the leading word, if any
	// Meant is the keyword a misspelt leading word stands for ("featur"
	// for "feature"), where one is near; "" otherwise.
	Meant string
	Name  string // the declared name or letter, if it could be read
	Text  string
	Err   *SyntaxError
	// Words are the names written in the statement, so that a datum letter
	// named only in a broken frame does not also read as unused.
	Words []string
}

// Declares reports whether the statement was meant as one of the keyword
// kw (written so, or misspelt), so that the name it declares still counts
// as declared.
func (b *BadStmt) Declares(kw string) bool { return b.Name != "" && (b.Word == kw || b.Meant == kw) }

func (*PartStmt) Keyword() string     { return "part" }
func (*UnitsStmt) Keyword() string    { return "units" }
func (*StandardStmt) Keyword() string { return "standard" }
func (*FeatureStmt) Keyword() string  { return "feature" }
func (*DatumStmt) Keyword() string    { return "datum" }
func (*FrameStmt) Keyword() string    { return "frame" }
func (*BasicStmt) Keyword() string    { return "basic" }
func (*DimStmt) Keyword() string      { return "dim" }
func (*BasisStmt) Keyword() string    { return "basis" }
func (*TargetStmt) Keyword() string   { return "target" }
func (*RefStmt) Keyword() string      { return "ref" }
func (b *BadStmt) Keyword() string    { return b.Word }

func (*PartStmt) stmt()     {}
func (*UnitsStmt) stmt()    {}
func (*StandardStmt) stmt() {}
func (*FeatureStmt) stmt()  {}
func (*DatumStmt) stmt()    {}
func (*FrameStmt) stmt()    {}
func (*BasicStmt) stmt()    {}
func (*DimStmt) stmt()      {}
func (*BasisStmt) stmt()    {}
func (*TargetStmt) stmt()   {}
func (*RefStmt) stmt()      {}
func (*BadStmt) stmt()      {}

// Comment is a # comment, kept for the formatter and for suppressions.
type Comment struct {
	Span source.Span
	Text string // including the leading #
	// Trailing is true when the comment ends a line that also holds code.
	Trailing bool
}

// File is a parsed .callouts file.
type File struct {
	Name     string
	Src      []byte
	Stmts    []Stmt
	Comments []*Comment
	Errors   []*SyntaxError
	// Binary is true for a file that holds binary data (a NUL byte near
	// its start); it has one error and no statements.
	Binary bool
	// Lines maps each statement to the physical lines it spans.
	Extents []Extent
}

// Extent is the range of physical lines (1-based, inclusive) a statement spans.
type Extent struct {
	First, Last int
}

// SyntaxError is a positioned error in what was written.
type SyntaxError struct {
	Span source.Span
	Msg  string
}

func (e *SyntaxError) Error() string { return e.Span.Start.String() + ": " + e.Msg }
