// Package basics is datumlint's basic-dimension engine. It decides whether
// the place of a feature (or of a pattern's members) that a feature control
// frame needs is fixed by basic dimensions relative to the frame's datum
// features, and measures each written dimension against the part's nominal
// geometry. The rules basic-missing, basic-mismatch and basic-toleranced,
// and the MMB/LMB check of modifier-illegal on planar datum features, are
// built on it.
//
// # Why linear algebra
//
// A position or located profile zone sits at the true position given by
// basic (theoretically exact) dimensions from the datums (ASME Y14.5-2018,
// basic dimensions and true position; ISO 1101:2017 and ISO 5458:2018,
// theoretically exact dimensions). Whether those dimensions are complete
// is a question about chains — left to bore, bolts.1 to bolts.3, bolts.3 to
// bolts.4 lined up with bolts.2 — and chains close, branch and run through
// bolt circles and angles. Searching for paths gets every one of those cases
// slightly wrong. Linearised, it is a rank question: give every feature small
// location and orientation variations; each basic dimension (and each
// implied one) says one combination of them is exactly zero; a quantity is
// fixed exactly when it is a combination of those rows and of the datum
// features' own variations, which the datum reference frame holds at zero.
//
// # Implied relations
//
// Implied basic zeros (axes, centres and mid-planes that coincide or line
// up; coplanar faces) and implied 0 and 90 degree angles are rows like any
// written dimension (ASME Y14.5-2018, implied basic relationships). They
// hold to every datum of a frame, the direction a clocking datum feature
// defines from a datum axis included: under A|B|C with C a hole off B's
// axis, a face or bore square to the line from B to C, and a hole a quarter
// turn around B from C, turn with C (impliedClocking). A pattern drawn
// centred on a datum's mid-plane or axis is centred on it (impliedCentring;
// common drafting practice).
//
// # Variables
//
// Each member of each feature has the variations its nominal geometry is
// sensitive to (its invariance class, ISO 5459:2011):
//
//	plane, mid-plane   1 translation (along its normal), 2 rotations
//	axis, extrusion    2 translations (across it),       2 rotations
//	centre             3 translations,                   0 rotations
//	cone apex          3 translations,                   2 rotations
//
// Bases are the part's own axes (its datum features' directions, the
// model's wherever the part is drawn along them) wherever the geometry is
// aligned with them, so that on the usual part an implied zero or a basic
// dimension is a row "this variable equals that one", even on a part drawn
// turned in its coordinates. Those rows are eliminated exactly first
// (variables merged into classes by union-find, which is Gaussian
// elimination of rows with two equal and opposite coefficients), and so are
// the rows that one relation states twice. What remains (bolt circles,
// angles about an axis, tilted features, the turn of a datum plane about
// its written point) are the general rows, over classes.
//
// # What a frame needs
//
// Given the motions of the part that the frame's datums leave free (from
// the kinematic engine rules/dof), the quantities the frame needs fixed are
// the combinations of the target's variations that no free motion changes:
// for a single feature with a full datum reference frame, all of them; for a
// pattern, also every member relative to the others; for a composite lower
// segment whose datums leave translations free, only the members relative to
// each other and their orientation to those datums (ASME Y14.5-2018,
// composite position tolerancing). Angularity needs only orientation.
//
// # Rank decisions
//
// A query holds its datum features' classes at zero and asks, for each
// candidate quantity, whether it lies in the span of the general rows (then
// basic dimensions fix it) or of what the query already found missing.
// Classes that a row fixes once the others are held (a hole located from a
// datum plane) are held too, once per set of datum features (holding). The
// span is decided by an orthogonal sparse elimination (factor.go): a
// Householder QR of the rows in approximate minimum degree order, each
// class substituted by its reduced form over the classes left free, the
// rank decided at rankTol as the SVD it replaced decided it.
//
// # Cost
//
// A check builds one engine per file and asks it once per frame segment.
// Nothing is factorised per query over the whole part: a query first takes
// only the rows near its target (those of its own classes, then breadth
// first up to a budget, not through a class that many features share).
// Rows near the target span part of what all rows span, so a query that
// finds nothing missing there finds nothing missing at all, and one whose
// search took every row connected to its target has the whole part's
// answer; only a query that finds something missing with rows left out
// falls back to the factor of all the part's rows, built once per set of
// datum features. On a clean part no query does, so a part of n located
// features costs about n times a part of one (docs/performance.md).
//
// # What holds the answers
//
// Properties that need no second copy of the engine
// (rules/lint/internal/basicsprop), on every test file, every generated
// shape and random cuts of their basic dimensions: adding a dimension the
// model implies never makes a located feature unlocated; removing one from
// a clean part either leaves it clean by the whole part's factor too or
// makes findings whose suggestions make it clean again; each suggested
// dimension, once added, clears its quantity (a suggestion is a promise,
// and the engine checks it against the rows the dimension would add before
// making it); and the rows near each target give the answer all the part's
// rows give (Missing against MissingWhole).
package basics
