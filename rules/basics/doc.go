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
// Bases are the part's axes wherever the geometry is aligned with them, so
// that on the usual part an implied zero or a basic dimension is a row
// "this variable equals that one". Those rows are eliminated exactly first
// (variables merged into classes, which is Gaussian elimination of rows with
// two equal and opposite coefficients); what remains — bolt circles, angles
// about an axis, tilted features — goes to gonum's SVD on the small
// connected block a question touches. Nothing is quadratic in the number of
// features: implied zeros come from sorting coordinates along each
// direction that occurs in the part, and implied angles from grouping
// parallel directions.
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
// # Cost
//
// A check builds one engine per file and asks it once per frame segment,
// so both are kept lean without changing a single floating-point
// operation that reaches an answer: relations are built in one arena and
// rewritten over the classes without maps, rows already over classes are
// not rewritten again, queries index by pooled slices, and what only a
// missing quantity needs (earlier references' motions, the moves' images)
// is worked out when one is found. The engine as it was before these
// changes is kept in rules/lint/internal/basicsref, which holds this one
// to it bit for bit on the repository's test data and on generated plates.
package basics
