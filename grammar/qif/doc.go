// Package qif reads QIF 3 documents (ANSI/DMSC QIF 3.0, ISO 23952:2020)
// into datumlint's part model, beside the notation's reader: a model-based
// definition exported by a CAD system is checked as it is, not as retyped.
//
// # Two layers
//
// Decode streams the XML with encoding/xml, token by token, and keeps only
// what a tolerancing check reads: FileUnits, StandardsDefinitions, the
// datum definitions and datum targets, the datum reference frames, the
// feature definitions, nominals and items, the feature zones, the
// characteristic definitions, nominals and items, and from Product its
// ScaleCoefficient, the part's name and the PMI display texts. The B-rep,
// plans, results and statistics are walked and dropped. The Document it
// returns keeps, for every element it holds, the span of the element's start
// tag (lines and columns in characters), so that a finding can point at the
// characteristic, datum definition, datum reference frame or feature
// nominal it is about.
//
// Map builds a model.Part from a Document, with problems on what the model
// cannot carry and Origins that give each model element's QIF ids.
// ReadFile does both; Read is the reader rules/lint chooses for .qif files,
// and records a refused document as one syntax problem.
//
// The part's Statements are the elements a finding can be about (the
// root's start tag, FileUnits, each standard, datum definition, target and
// reference frame, feature definition, nominal and item, characteristic
// definition, nominal and item, the part and its PMI displays), each with
// its lines (SARIF fingerprints hash the element as written); Headers
// are the part's name, units and standard in file order; Member.Decimals are the decimal places a point says it has
// (decimalPlaces, xDecimalPlaces ...) where it is read unconverted, else -1.
//
// # Refused documents and limits
//
// A file that is empty, not UTF-8, not well-formed XML, whose root is not
// QIFDocument, whose versionQIF is not 3.x or is missing, that is
// truncated, that declares a document type (entity declarations are refused
// rather than expanded: QIF documents have none) or that uses an entity
// other than the five predefined ones, gives an *Error with the position of
// the problem, never a panic. So does a document over DefaultLimits: more
// than 256 levels of nesting, more than 4,000,000 elements, more than
// 1,000,000 of them in the sections the reader keeps, more than 256
// attributes on one element, or one text over 16 MiB. Text is kept only for
// elements the reader uses and only up to 4 KiB each (longer text, such as
// a face's point list, is dropped and a value written that long reads as
// unreadable). Memory is the input, the decoder's buffer for the current
// token and the kept elements (about 150 bytes each, plus their text, which
// is never more than the input). Work after decoding is linear in what is
// kept, but for two bounded searches: the pairs of a dimension over several
// features (at most 64 features) and the plane a misplaced datum target
// zone lies on (at most 5,000 planes).
//
// # Units
//
// The model is in the document's PMI linear unit where it gives one that is
// mm or inch (FileUnits/PrimaryUnits/PMILinearUnit), otherwise in its
// linear unit (LinearUnit; another metric unit is converted to mm). Every
// value is read in the unit it names itself (linearUnit, angularUnit), else
// in the primary unit of its section: PMI units in Characteristics,
// LinearUnit and AngularUnit elsewhere (QIF 3, PrimaryUnitsType). Angles of
// feature definitions without a unit are radians, SI's unit, where the
// document gives no AngularUnit. Lengths of the Features section are
// divided by ScaleCoefficient. Labels that disagree are reported, never
// resolved by a guess: a unit whose name does not match its factor, a label
// no unit of FileUnits defines (read as the unit of common use of that
// name, or left out), geometric tolerances labelled in one unit while sizes
// and dimensions are labelled in another, and a presentation text that
// writes another unit or another value than the semantic value.
//
// # The standard
//
// Characteristics/FormalStandardId names the governing standard in
// StandardsDefinitions: ASME Y14.5 of 2009 or 2018 (by Year, or the year in
// the designator) or any ISO standard (ISO GPS) map to asme-2009, asme-2018
// and iso; anything else leaves the standard unknown, with a note.
//
// # Features
//
// Every feature nominal becomes a model feature, named by its QIF name where
// that is a valid notation name ([A-Za-z_][A-Za-z0-9_-]*) used once, else by
// its kind and id (hole_2156). The kind follows the nominal's type and its
// definition's InternalExternal:
//
//	Plane                                   plane (Location, Normal)
//	OppositeParallelPlanes, ElongatedCylinder  slot / tab (CenterPlane)
//	Cylinder, CylindricalSegment, Threaded  hole / pin (Axis)
//	Sphere, SphericalSegment                socket / ball (Location)
//	Cone, ConicalSegment                    cone (the apex, from the
//	                                        definition's diameter and angle)
//	ExtrudedCrossSection                    extrusion (Direction; no place)
//	OtherShape, OtherSurface, OtherNonShape,
//	PointDefinedSurface, Torus, ToroidalSegment,
//	SurfaceOfRevolution, OppositeAngledPlanes  surface
//
// A cylindrical or spherical segment covering less than half of its full
// surface has no opposed points and is read as a surface, not a feature of
// size (ASME Y14.5-2009, definitions: regular feature of size, from memory;
// the half is our reading). Lines, circles (with their definition's
// diameter) and points become the model's line, circle and point; arcs,
// ellipses and other curves are left out with a note. A feature of size takes its definition's nominal size,
// untoleranced, until a size characteristic gives its tolerance.
//
// Like features (features of size of one kind and size with parallel axes
// or mid-planes) that a QIF group, a geometric or size characteristic or a
// datum applies to together become one pattern feature, named by its first
// member (holes_3057); a characteristic or datum on one of them applies to
// that member. A set that overlaps a pattern without being it stays single
// features.
//
// # Datums, frames and dimensions
//
// A datum definition gives a datum on its feature, on a whole pattern, or
// on one of several coplanar, coaxial or concentric features (noted). A
// datum established by datum targets is read on the feature its targets
// name, and each target with a point, line, circular or rectangular area
// zone becomes a model datum target (with the point or line feature of
// its label), on the plane its zone lies on where that is not the plane it
// names (noted); a target without a zone is its whole feature (noted). A
// datum the model cannot place is kept Broken, so that the frames naming
// it do not report it undefined.
//
// The fourteen geometric characteristics of ASME Y14.5 and ISO 1101 become
// frames: the tolerance (per unit length or rectangular area), the zone
// (DiametricalZone dia, SphericalZone sdia, a zone's direction), the
// material condition ((M), (L)), free state (F), tangent plane (T),
// projected zone (P), the outer disposition of a profile (U), all around
// and all over, a separate requirement, composite segments with their own
// datum reference frames, and the datum references in precedence order
// with their material boundaries (one per member of a common datum where
// they differ). What the model lacks is noted: a tolerance per circular
// area, the reciprocity requirement, maximum tolerances, datum modifiers
// other than the material boundary, more than three datums, and the
// statistical and other modifiers.
//
// Diameter, SphericalDiameter, Width and Thickness give the size of the
// features of size (and circles) they are on (deviations, or limits around
// TargetValue); a reference size is a reference dimension of the feature,
// a basic one the untoleranced nominal (noted). DistanceBetween,
// DistanceFrom, AngleBetween and AngleFrom become basic dimensions
// (DimensionType BASIC_OR_TED), reference ones (REFERENCE_OR_AUXILIARY) or
// toleranced ones (a Tolerance); a basic one that also carries a tolerance
// is reported as such, not hidden. A value shown rounded to its
// decimalPlaces reads as the model's nominal. A dimension on more than two
// features without FeatureNominalPairs is read as the pairs the nominal
// geometry bears out: one feature every other is at the value from, or
// consecutive pairs.
//
// The part is read under basis model: in a model-based definition every
// nominal location and angle is basic.
//
// # Problems
//
// Nothing the model cannot carry is dropped silently: every such thing is a
// problem on the element it is written in. model.Unsupported problems say
// what the model does not hold yet (the rule qif-unsupported, info);
// model.Inconsistent ones say where the document contradicts itself or is
// incomplete (qif-inconsistent, warning). A refused document (an *Error
// from ReadFile) is a model.Syntax problem (the rule syntax).
package qif
