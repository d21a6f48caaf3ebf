package model

// Kind is what sort of feature a feature is (the contract's feature table).
type Kind int

const (
	KindUnknown Kind = iota
	Plane
	Slot
	Tab
	Hole
	Pin
	Socket
	Ball
	Cone
	Extrusion
	Surface
	// Point, Line and Circle are elements of the part's geometry that
	// dimensions and datum targets reach (a vertex, a straight or a
	// circular edge, a line on a surface, a datum target point or line):
	// not surfaces and not features of size, with no frame requirements
	// of their own.
	Point
	Line
	Circle
)

var kindNames = []string{"unknown", "plane", "slot", "tab", "hole", "pin", "socket", "ball", "cone", "extrusion", "surface", "point", "line", "circle"}

// KindWords lists the feature kinds as written.
var KindWords = kindNames[1:]

func (k Kind) String() string { return kindNames[k] }

// ParseKind reads a kind word.
func ParseKind(w string) Kind {
	for i, n := range kindNames[1:] {
		if n == w {
			return Kind(i + 1)
		}
	}
	return KindUnknown
}

// IsFOS reports whether the kind is a feature of size (ASME Y14.5-2018,
// definitions: feature of size; ISO 14405-1 features of linear size).
func (k Kind) IsFOS() bool {
	switch k {
	case Slot, Tab, Hole, Pin, Socket, Ball:
		return true
	}
	return false
}

// IsElement reports whether the kind is a point, a line or a circle: an
// element of the geometry rather than a surface (see Point).
func (k Kind) IsElement() bool { return k == Point || k == Line || k == Circle }

// TakesSize reports whether a feature of the kind may be given a size: a
// feature of size, and a circle, whose size is its diameter.
func (k Kind) TakesSize() bool { return k.IsFOS() || k == Circle }

// Internal reports whether the material is outside the feature (a slot, a
// hole, a socket): its MMC is its smallest size.
func (k Kind) Internal() bool { return k == Slot || k == Hole || k == Socket }

// IsWidth reports whether the kind is two opposed parallel faces.
func (k Kind) IsWidth() bool { return k == Slot || k == Tab }

// IsCylinder reports whether the kind is a cylinder.
func (k Kind) IsCylinder() bool { return k == Hole || k == Pin }

// IsSphere reports whether the kind is a sphere.
func (k Kind) IsSphere() bool { return k == Socket || k == Ball }

// DatumGives names what a datum on this kind is: the contract's last column.
func (k Kind) DatumGives() string {
	switch k {
	case Plane:
		return "plane"
	case Slot, Tab:
		return "mid-plane"
	case Hole, Pin:
		return "axis"
	case Socket, Ball:
		return "centre point"
	case Cone:
		return "axis and apex point"
	case Extrusion:
		return "frame free along its direction"
	case Surface:
		return "full frame"
	case Point:
		return "point"
	case Line:
		return "line"
	case Circle:
		return "axis and centre"
	}
	return "unknown"
}

// Basis says which of the model's nominal values are basic.
type Basis int

const (
	// DrawingBasis: only what is written basic (a basic dimension, or an
	// implied basic zero, 0 or 90 degrees) is; the default.
	DrawingBasis Basis = iota
	// ModelBasis: every nominal location and angle of the model is basic,
	// as in a model-based definition (ASME Y14.41-2019, model values are
	// basic; from memory).
	ModelBasis
)

// BasisWords lists the bases as written.
var BasisWords = []string{"drawing", "model"}

func (b Basis) String() string { return BasisWords[b] }

// TargetShape is what a datum target is (ASME Y14.5-2018 and ISO
// 5459:2011, datum targets).
type TargetShape int

const (
	TargetShapeUnknown TargetShape = iota
	TargetPoint
	TargetLine
	TargetArea
)

var targetShapeNames = []string{"unknown", "point", "line", "area"}

// TargetShapeWords lists the target shapes as written.
var TargetShapeWords = targetShapeNames[1:]

func (t TargetShape) String() string { return targetShapeNames[t] }

// ParseTargetShape reads a target shape word.
func ParseTargetShape(w string) TargetShape {
	for i, n := range targetShapeNames[1:] {
		if n == w {
			return TargetShape(i + 1)
		}
	}
	return TargetShapeUnknown
}

// Extents of a profile tolerance (ASME Y14.5-2018, all around, all over,
// between; ISO 1101:2017, all around).
const (
	AllAround = "all-around"
	AllOver   = "all-over"
	Between   = "between"
)

// Thread diameters a tolerance on a screw thread may apply to; the pitch
// diameter is the default (ASME Y14.5-2018, screw threads; from memory).
const (
	MajorDiameter = "major-dia"
	MinorDiameter = "minor-dia"
	PitchDiameter = "pitch-dia"
)

// Units of the file.
type Units int

const (
	UnitsUnknown Units = iota
	MM
	Inch
)

func (u Units) String() string {
	switch u {
	case MM:
		return "mm"
	case Inch:
		return "in"
	}
	return "unknown"
}

// Standard is the governing standard edition.
type Standard int

const (
	StandardUnknown Standard = iota
	ASME2018
	ASME2009
	ISO
)

// StandardWords lists the editions as written.
var StandardWords = []string{"asme-2018", "asme-2009", "iso"}

func (s Standard) String() string {
	switch s {
	case ASME2018:
		return "asme-2018"
	case ASME2009:
		return "asme-2009"
	case ISO:
		return "iso"
	}
	return "unknown"
}

// IsASME reports whether an ASME edition governs (the envelope rule, Rule
// #1, is the default principle there; ISO 8015 independency otherwise).
func (s Standard) IsASME() bool { return s == ASME2018 || s == ASME2009 }

// Characteristic is a geometric characteristic, spelled as in the contract.
type Characteristic string

// The fourteen geometric characteristics (ASME Y14.5-2018 and ISO 1101:2017
// symbol tables), spelled as the notation writes them.
const (
	Straightness     Characteristic = "straightness"
	Flatness         Characteristic = "flatness"
	Circularity      Characteristic = "circularity"
	Cylindricity     Characteristic = "cylindricity"
	LineProfile      Characteristic = "line-profile"
	SurfaceProfile   Characteristic = "surface-profile"
	Angularity       Characteristic = "angularity"
	Perpendicularity Characteristic = "perpendicularity"
	Parallelism      Characteristic = "parallelism"
	Position         Characteristic = "position"
	Concentricity    Characteristic = "concentricity"
	Symmetry         Characteristic = "symmetry"
	CircularRunout   Characteristic = "circular-runout"
	TotalRunout      Characteristic = "total-runout"
)

// Characteristics lists them in the contract's order.
var Characteristics = []Characteristic{
	Straightness, Flatness, Circularity, Cylindricity,
	LineProfile, SurfaceProfile,
	Angularity, Perpendicularity, Parallelism,
	Position, Concentricity, Symmetry,
	CircularRunout, TotalRunout,
}

// Category groups characteristics as ASME Y14.5-2018 and ISO 1101 do.
type Category int

const (
	CategoryUnknown Category = iota
	Form
	Profile
	Orientation
	Location
	Runout
)

func (c Characteristic) Category() Category {
	switch c {
	case Straightness, Flatness, Circularity, Cylindricity:
		return Form
	case LineProfile, SurfaceProfile:
		return Profile
	case Angularity, Perpendicularity, Parallelism:
		return Orientation
	case Position, Concentricity, Symmetry:
		return Location
	case CircularRunout, TotalRunout:
		return Runout
	}
	return CategoryUnknown
}

func (c Category) String() string {
	return [...]string{"unknown", "form", "profile", "orientation", "location", "runout"}[c]
}

// Placements of a datum feature symbol on the sheet.
var PlacementWords = []string{"on-surface", "on-extension-line", "on-dimension-line", "on-frame"}
