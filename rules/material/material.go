// Package material works out the boundaries of a feature of size whose
// geometric tolerance applies at maximum or least material condition, and
// the boundary a datum feature simulator is built to when a datum feature is
// referenced at maximum or least material boundary.
//
// The definitions are those of ASME Y14.5-2018, section 1 (maximum and
// least material condition, virtual condition, resultant condition) and
// section 7 (maximum and least material boundary); the clauses were not
// read for this package and are applied from memory. "Bonus tolerance" is
// the trade's name for the extra tolerance a feature gains as it departs
// from the stated material condition (common practice; the 2018 edition
// describes it without a defined term, from memory).
//
// The package is plain arithmetic on sizes; material/model.go reads the
// part model.
package material

import (
	"errors"
	"fmt"
	"math"
)

// Condition is a material condition: MMC or LMC (for a datum reference,
// MMB or LMB). RFS (regardless of feature size) is the zero value.
type Condition int

const (
	RFS Condition = iota
	MMC
	LMC
)

func (c Condition) String() string {
	switch c {
	case MMC:
		return "MMC"
	case LMC:
		return "LMC"
	}
	return "RFS"
}

// Boundary names the condition as a datum reference's boundary: MMB or LMB.
func (c Condition) Boundary() string {
	switch c {
	case MMC:
		return "MMB"
	case LMC:
		return "LMB"
	}
	return "RMB"
}

// ConditionOf reads a modifier letter: "M" is MMC, "L" is LMC, anything
// else RFS.
func ConditionOf(letter string) Condition {
	switch letter {
	case "M":
		return MMC
	case "L":
		return LMC
	}
	return RFS
}

// Size is a feature of size's limits. Internal is true where the material
// is outside the feature (a hole, a slot, a socket): its maximum material
// condition is its smallest size (ASME Y14.5-2018, definitions, from
// memory).
type Size struct {
	Internal bool
	Min, Max float64
}

// MMC is the size at which the feature holds the most material.
func (s Size) MMC() float64 {
	if s.Internal {
		return s.Min
	}
	return s.Max
}

// LMC is the size at which the feature holds the least material.
func (s Size) LMC() float64 {
	if s.Internal {
		return s.Max
	}
	return s.Min
}

// At returns the size at a material condition (MMC or LMC).
func (s Size) At(c Condition) float64 {
	if c == LMC {
		return s.LMC()
	}
	return s.MMC()
}

func (s Size) check() error {
	for _, x := range []float64{s.Min, s.Max} {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return errors.New("a limit of size is not a finite number")
		}
	}
	if s.Min > s.Max {
		return fmt.Errorf("the smaller limit %g is above the larger %g", s.Min, s.Max)
	}
	return nil
}

// Figures are the boundaries of a feature of size under a geometric
// tolerance at MMC or LMC.
type Figures struct {
	Condition Condition
	// Tolerance is the geometric tolerance as stated, which applies when the
	// feature is at the stated condition.
	Tolerance float64
	MMC, LMC  float64
	// Virtual is the virtual condition: the constant boundary from the
	// stated condition's size and the stated tolerance (ASME Y14.5-2018,
	// definitions, from memory). At MMC it is the boundary a fixed gauge
	// is built to.
	Virtual float64
	// Resultant is the resultant condition: the worst boundary on the other
	// side, from the opposite limit of size, the stated tolerance and the
	// whole bonus (ASME Y14.5-2018, definitions, from memory).
	Resultant float64
	// Bonus is the largest bonus tolerance: the size tolerance, gained when
	// the feature is at the opposite limit. The bonus ranges from 0 (at the
	// stated condition) to Bonus.
	Bonus float64
}

// MaxTolerance is the geometric tolerance available when the feature is at
// the opposite limit of size: the stated tolerance plus the whole bonus.
func (f Figures) MaxTolerance() float64 { return f.Tolerance + f.Bonus }

// Compute works out the figures of a feature of size whose tolerance tol
// applies at condition c (MMC or LMC). A zero tolerance is allowed (zero
// tolerancing at MMC); a negative one, unknown limits, or a condition other
// than MMC or LMC are errors.
//
// The virtual condition lies on the stated condition's side of the size
// range, outside the material by the tolerance: a hole at MMC has VC = MMC −
// t, a pin at MMC VC = MMC + t, a hole at LMC VC = LMC + t, a pin at LMC VC
// = LMC − t. The resultant condition lies on the other side, from the
// opposite limit by the tolerance and the whole bonus.
func Compute(s Size, tol float64, c Condition) (Figures, error) {
	if err := s.check(); err != nil {
		return Figures{}, err
	}
	if math.IsNaN(tol) || math.IsInf(tol, 0) || tol < 0 {
		return Figures{}, fmt.Errorf("the geometric tolerance %g is not a non-negative number", tol)
	}
	if c != MMC && c != LMC {
		return Figures{}, errors.New("virtual and resultant conditions need a tolerance at MMC or LMC")
	}
	f := Figures{Condition: c, Tolerance: tol, MMC: s.MMC(), LMC: s.LMC(), Bonus: s.Max - s.Min}
	// out is the direction, in size, that takes a boundary away from the
	// material at the stated condition: a hole at MMC grows smaller
	// (its virtual condition is a smaller pin that always enters it).
	out := 1.0
	if (s.Internal && c == MMC) || (!s.Internal && c == LMC) {
		out = -1
	}
	stated, opposite := s.At(c), s.At(opposite(c))
	f.Virtual = stated + out*tol
	f.Resultant = opposite - out*(tol+f.Bonus)
	return f, nil
}

func opposite(c Condition) Condition {
	if c == MMC {
		return LMC
	}
	return MMC
}

// Relation is a geometric tolerance that relates a datum feature to the
// datums of higher precedence (for a primary datum feature: a form
// tolerance of its axis or median plane), as it bears on the boundary of a
// reference at MMB or LMB.
type Relation struct {
	Tolerance float64
	// Material is the tolerance's own modifier (RFS, MMC or LMC).
	Material Condition
	// What names the tolerance for a reader ("perpendicularity ⌀0.05 (M)
	// to A, line 14").
	What string
}

// DatumBoundary is the size of a datum feature simulator for a reference
// at MMB or LMB.
type DatumBoundary struct {
	Condition Condition // MMC for MMB, LMC for LMB
	Size      float64
	// From names what set the size: "" for the feature's MMC or LMC alone,
	// or the relation whose virtual condition it is.
	From string
	// Ambiguous is set when several relations give different boundaries:
	// the drawing should state the boundary's value (ASME Y14.5-2018,
	// datum feature modifiers, from memory); Size is then the one that
	// takes the most material away from the simulator's side, which no
	// relation's part can fail to clear.
	Ambiguous bool
}

// BoundaryOf works out the boundary of a datum feature referenced at c (MMC
// for MMB, LMC for LMB). Without a relation it is the feature's MMC or LMC.
// With relations to the datums of higher precedence it is the virtual
// condition they produce: the stated condition's size moved outside the
// material by the tolerance (ASME Y14.5-2018, determining MMB and LMB,
// from memory). A relation at the other material condition does not bound
// this side and is left out; one regardless of feature size counts with its
// full value, as the worst-case boundary it produces at that size (from
// memory).
func BoundaryOf(s Size, c Condition, rel []Relation) (DatumBoundary, error) {
	if err := s.check(); err != nil {
		return DatumBoundary{}, err
	}
	if c != MMC && c != LMC {
		return DatumBoundary{}, errors.New("a datum boundary is at MMB or LMB")
	}
	b := DatumBoundary{Condition: c, Size: s.At(c)}
	found := false
	for _, r := range rel {
		if r.Material != RFS && r.Material != c {
			continue
		}
		f, err := Compute(s, r.Tolerance, c)
		if err != nil {
			return DatumBoundary{}, err
		}
		switch {
		case !found:
			b.Size, b.From, found = f.Virtual, r.What, true
		case f.Virtual != b.Size:
			b.Ambiguous = true
			// The boundary furthest outside the material on the stated side.
			if further(s, c, f.Virtual, b.Size) {
				b.Size, b.From = f.Virtual, r.What
			}
		}
	}
	return b, nil
}

// further reports whether boundary a lies further outside the material than
// b at condition c.
func further(s Size, c Condition, a, b float64) bool {
	if (s.Internal && c == MMC) || (!s.Internal && c == LMC) {
		return a < b
	}
	return a > b
}
