// Package draw draws the review report's pictures as SVG: feature control
// frames and datum feature symbols with the symbology of ASME Y14.5-2018
// and ISO 1101:2017, degrees-of-freedom charts, material-condition figures
// and orthographic views of the nominal geometry.
//
// Its input is plain data of its own (Frame, DatumSymbol, DOF,
// MaterialFigure, Views), so that drawing does not depend on how a part
// was written; the report package fills it from the part model. Symbols
// are vector paths, not font glyphs; text is real text in FontFamily, so
// it stays selectable, and every drawing has a <title>.
package draw

// Characteristic is a geometric characteristic's symbol.
type Characteristic int

const (
	UnknownCharacteristic Characteristic = iota
	Straightness
	Flatness
	Circularity
	Cylindricity
	LineProfile
	SurfaceProfile
	Angularity
	Perpendicularity
	Parallelism
	Position
	Concentricity
	Symmetry
	CircularRunout
	TotalRunout
)

var characteristicNames = [...]string{"unknown characteristic", "straightness", "flatness", "circularity",
	"cylindricity", "profile of a line", "profile of a surface", "angularity", "perpendicularity",
	"parallelism", "position", "concentricity", "symmetry", "circular runout", "total runout"}

// String names the characteristic in words.
func (c Characteristic) String() string {
	if c < 0 || int(c) >= len(characteristicNames) {
		return characteristicNames[0]
	}
	return characteristicNames[c]
}

// Zone is the shape sign written before a tolerance value.
type Zone int

const (
	NoZone            Zone = iota // two parallel lines or planes, or the characteristic's own shape
	Diameter                      // ⌀: a cylindrical zone
	SphericalDiameter             // S⌀: a spherical zone
)

// Modifier is a circled modifier after a tolerance value: Letter is one of
// M (maximum material), L (least material), F (free state), T (tangent
// plane), P (projected zone, Value its height), U (unequally disposed
// profile, Value its offset) or E (envelope). Value is text as written.
type Modifier struct {
	Letter string
	Value  string
}

// DatumLetter is one letter of a datum reference with its material
// boundary modifier: "" (RMB), "M" (MMB) or "L" (LMB).
type DatumLetter struct {
	Letter   string
	Material string
}

// DatumRef is one datum compartment: one letter, or several joined by a
// hyphen for a common datum (A-B).
type DatumRef struct {
	Letters []DatumLetter
}

// Segment is one row of a frame: its tolerance compartment and its datum
// compartments.
type Segment struct {
	Zone      Zone
	Value     string // the tolerance as written
	Modifiers []Modifier
	Datums    []DatumRef
}

// Frame is a feature control frame: one symbol compartment shared by every
// segment (a composite frame has two or more).
type Frame struct {
	// Line is the line of the frame's statement; the drawing carries it as
	// data-line.
	Line           int
	Target         string
	Characteristic Characteristic
	Segments       []Segment
	// Statement is the frame as written, shown as the drawing's title;
	// Describe(frame) stands in where it is empty.
	Statement string
}

// DatumSymbol is a datum feature symbol: a boxed letter on a leader ending
// in a filled triangle on the feature.
type DatumSymbol struct {
	Letter string
	Target string
	Line   int
	// Statement is the datum as written, shown as the title.
	Statement string
}
