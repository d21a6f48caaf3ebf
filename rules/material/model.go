package material

import (
	"fmt"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
)

// This file reads the part model: which features are features of size with
// limits, and which tolerances relate a datum feature to the datums before
// it in a frame.

// SizeOf returns a feature's limits of size, or false for a feature that is
// not a feature of size or has no readable size.
func SizeOf(f *model.Feature) (Size, bool) {
	if f == nil || !f.Kind.IsFOS() || f.Size == nil {
		return Size{}, false
	}
	s := Size{Internal: f.Kind.Internal(), Min: f.Size.Min(), Max: f.Size.Max()}
	if s.check() != nil {
		return Size{}, false
	}
	return s, true
}

// Relations lists the tolerances on a datum feature that bear on its
// boundary when it is referenced after the datums named in higher (their
// letters, in precedence order; empty for a primary reference):
//
//   - as primary, a straightness or flatness tolerance that carries a
//     material modifier, so that it controls the feature's axis or median
//     plane (ASME Y14.5-2018, form of a derived feature, from memory);
//   - as secondary or tertiary, an orientation or location tolerance whose
//     datum references all name letters of higher precedence (ASME
//     Y14.5-2018, MMB of a secondary or tertiary datum feature, from
//     memory).
//
// Every segment of a composite frame is looked at on its own.
func Relations(part *model.Part, feature *model.Feature, higher []string) []Relation {
	if part == nil || feature == nil {
		return nil
	}
	above := map[string]bool{}
	for _, l := range higher {
		above[l] = true
	}
	var out []Relation
	for _, fr := range part.FramesOn(feature) {
		cat := fr.Characteristic.Category()
		for _, seg := range fr.Segments {
			mat := RFS
			if m, ok := seg.Modifier("M"); ok {
				mat = ConditionOf(m.Letter)
			} else if m, ok := seg.Modifier("L"); ok {
				mat = ConditionOf(m.Letter)
			}
			switch {
			case len(higher) == 0:
				if cat != model.Form || mat == RFS ||
					(fr.Characteristic != "straightness" && fr.Characteristic != "flatness") {
					continue
				}
			default:
				if (cat != model.Orientation && cat != model.Location) || len(seg.Refs) == 0 || !allAbove(seg.Refs, above) {
					continue
				}
			}
			out = append(out, Relation{Tolerance: seg.Value, Material: mat, What: describe(fr, seg, mat)})
		}
	}
	return out
}

func allAbove(refs []*model.DatumRef, above map[string]bool) bool {
	for _, r := range refs {
		for _, l := range r.Letters {
			if !above[l] {
				return false
			}
		}
	}
	return true
}

// describe names a relation for a reader: "perpendicularity dia 0.05 (M) to
// A, line 14".
func describe(fr *model.Frame, seg *model.Segment, mat Condition) string {
	var b strings.Builder
	b.WriteString(string(fr.Characteristic))
	if seg.Zone != "" {
		b.WriteString(" " + seg.Zone)
	}
	fmt.Fprintf(&b, " %g", seg.Value)
	switch mat {
	case MMC:
		b.WriteString(" (M)")
	case LMC:
		b.WriteString(" (L)")
	}
	if len(seg.Refs) > 0 {
		names := make([]string, len(seg.Refs))
		for i, r := range seg.Refs {
			names[i] = strings.Join(r.Letters, "-")
		}
		b.WriteString(" to " + strings.Join(names, ", "))
	}
	fmt.Fprintf(&b, ", line %d", seg.Span.Start.Line)
	return b.String()
}
