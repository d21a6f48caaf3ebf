// Package dof is datumlint's kinematic engine: it counts the degrees of
// freedom that each datum reference of a feature control frame removes, and
// finds which of the motions a frame leaves free would move a tolerance
// zone. The rules datum-redundant, frame-underconstrained, frame-unclocked
// and datum-unneeded, and the `datumlint dof` command, are built on it.
//
// # Why screw theory
//
// A datum reference frame is, kinematically, a set of surfaces that stop a
// part from moving (ASME Y14.5-2009 section 4 and ASME Y14.5-2018 section 7,
// "Datum Reference Frames"; ISO 5459:2011). Counting "3-2-1" by feature type
// breaks as soon as a secondary datum is tilted, a common datum A-B is used,
// or a pattern acts as one datum. Modelling each nominal surface by the
// small rigid motions that leave it unchanged — its invariance class in ISO
// 5459:2011, the TTRS model of Clément, Rivière, Serré and Valade (1994),
// formalised as symmetry subgroups by Srinivasan (V. Srinivasan, "A
// geometrical product specification language based on a classification of
// symmetry groups", Computer-Aided Design 31(11), 1999) — turns all of these
// into linear algebra on six-component twists (ω, v).
//
// # The method
//
// Each surface gives linear conditions on a twist (see Surface and the
// table on its conditions). The free space starts as all of R^6; for each
// reference in precedence order its conditions (those of all its surfaces,
// stacked) are restricted to an orthonormal basis of what is still free and
// the null space is taken by SVD (gonum). The drop in dimension is what the
// reference constrains. A zone has an invariance subspace Z the same way
// (plus any extra invariant twists the caller names), and the free motions
// that move it are what F adds to F ∩ Z.
//
// # Why normalise
//
// Rank decisions need a tolerance, and a tolerance only means something in
// known units. Every length is therefore measured from a centre of the part
// and divided by its size (Frame) before any SVD, so that the same part in
// millimetres or inches, at the origin or a kilometre from it, and exported
// with six significant digits, gives the same counts. Results are mapped
// back to the part's own coordinates before they are named.
//
// # Cost
//
// A check analyses every frame of every file, so the engine avoids work
// that cannot change an answer: a zone's invariance is prepared once
// (PreparedZone) and checked against any number of frames; each free space
// is split into translations and rotations once; counts that are certain
// without an SVD (no free motion, the whole space free, one free motion
// clearly on one side of the rank tolerance) are taken directly, and so
// are, in closed form, the spaces of a single plane and the turning
// directions of a one-surface orientation zone, where bounds written
// beside the code make the SVDs' answer certain (closedform.go,
// turningRows); and the remaining SVDs run through LAPACK in pooled
// buffers (svd.go). reference_test.go
// keeps the engine as it was before any of this, and the differential
// tests and FuzzFastMatchesReference hold the engine to it: the same
// counts and names, twists equal to rounding.
//
// # Names
//
// Motions are named as the command-line contract prints them (Frame.Name).
// Bases are chosen to read well: pure translations first, snapped to the
// part's axes when they are free, then rotations about axes through the
// point nearest the origin, in x, y, z order, so the output is stable.
package dof
