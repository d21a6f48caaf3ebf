package rules

import (
	"fmt"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
)

// CompositeInvalid reports a malformed composite lower segment.
var CompositeInvalid = Register(&Rule{
	ID:       "composite-invalid",
	Summary:  "a composite lower segment that adds datums or reorders those of the upper",
	Severity: Error,
	Rationale: `A composite frame has one characteristic symbol and two (or more) segments. The upper
segment locates the pattern to its datums; each lower segment is a smaller zone that relates
the members of the pattern to each other and, through the datums it repeats, orients them.
datumlint implements these conditions:

- only position and profile have composite frames;
- each lower segment's tolerance is smaller than that of the segment above it (otherwise the
  lower zone refines nothing);
- a lower segment's datums repeat those of the upper segment in the same order of precedence,
  starting with the primary, or fewer of them (the primary; primary and secondary; or all),
  or none: a datum the upper segment does not have, a different order, or a repeat that skips
  a datum before it (B alone, or A, C, under A, B, C) is reported;
- composite position on a single feature is information only. ASME Y14.5-2009 and -2018 describe
  composite positional tolerancing for patterns, where the lower segment relates the members to
  each other; as far as datumlint knows (from memory) neither forbids it on one feature, and
  expert-drafted models use it there: with no members to relate, the lower segment refines the
  orientation of the feature's zone to the datums it repeats, which a separate orientation
  tolerance says more plainly (with no datums repeated it limits only the form of the axis).
  Composite profile of a single feature is a recognised form (the lower segment refines form
  and orientation) and is left alone.

Every problem of one lower segment is reported in one finding on its composite line.`,
	Source: "ASME Y14.5-2018, composite positional tolerancing and composite profile tolerancing (lower segments repeat the upper segment's datums in the same order of precedence; from memory, sections 10 and 11); ASME Y14.5-2009, composite positional tolerancing of patterns (from memory, 7.5.1)",
	Bad: `feature bolts hole 4x size 8.4 +-0.1 axis +z at (15, 15, 0) (105, 15, 0) (15, 65, 0) (105, 65, 0)
frame bolts: position dia 0.4 (M) datums A, B, C
    composite dia 0.1 (M) datums B, A`,
	Good: `feature bolts hole 4x size 8.4 +-0.1 axis +z at (15, 15, 0) (105, 15, 0) (15, 65, 0) (105, 65, 0)
frame bolts: position dia 0.4 (M) datums A, B, C
    composite dia 0.1 (M) datums A, B`,
	Run: runCompositeInvalid,
})

func runCompositeInvalid(p *Pass) {
	for _, fr := range p.Part.Frames {
		if len(fr.Segments) < 2 {
			continue
		}
		c := fr.Characteristic
		for k := 1; k < len(fr.Segments); k++ {
			lower, upper := fr.Segments[k], fr.Segments[k-1]
			if c.Category() != model.Location && c.Category() != model.Profile || c == model.Concentricity || c == model.Symmetry {
				if c.Category() == model.CategoryUnknown {
					break // the unknown characteristic is a syntax finding
				}
				p.Report(lower.Span, "only position and profile have composite frames, not %s: remove the composite line, or write a second %s frame", c, c)
				break
			}
			var problems []string
			if lower.Named != "" && lower.Named != c {
				problems = append(problems, fmt.Sprintf("it names %s, but a composite frame has one characteristic, the frame's %s: remove the word, or write a separate %s frame", lower.Named, c, lower.Named))
			}
			if lower.Value >= upper.Value {
				problems = append(problems, fmt.Sprintf("its tolerance %g is not smaller than the %g above it, so it refines nothing: give the lower segment the smaller zone", lower.Value, upper.Value))
			}
			if msg := compositeDatumProblem(fr.Segments[0], lower); msg != "" {
				problems = append(problems, msg)
			}
			if len(problems) > 0 {
				p.Report(lower.Span, "composite lower segment: %s", strings.Join(problems, "; "))
				continue
			}
			if c == model.Position && !fr.Target.IsPattern() && fr.Target.Known() {
				p.Inform(lower.Span, nil, "%s", singleCompositeNote(fr, lower))
			}
		}
	}
}

// compositeDatumProblem checks that the lower segment's references are the
// upper segment's first n references, in order (ASME Y14.5-2018, composite
// tolerancing; material boundary modifiers are not compared).
func compositeDatumProblem(upper, lower *model.Segment) string {
	pos := map[string]int{}
	var names []string
	for i, r := range upper.Refs {
		pos[r.Name] = i
		names = append(names, r.Name)
	}
	var added []string
	for _, r := range lower.Refs {
		if _, ok := pos[r.Name]; !ok {
			added = append(added, r.Name)
		}
	}
	if len(added) > 0 {
		word := "datum"
		if len(added) > 1 {
			word = "datums"
		}
		return fmt.Sprintf("it adds %s %s, which the upper segment does not reference: a lower segment may only repeat the upper segment's datums (%s), in that order", word, strings.Join(added, ", "), strings.Join(names, ", "))
	}
	prev := -1
	for _, r := range lower.Refs {
		if pos[r.Name] < prev {
			return fmt.Sprintf("it lists its datums in a different order of precedence from the upper segment (%s): repeat them in that order", strings.Join(names, ", "))
		}
		prev = pos[r.Name]
	}
	in := map[string]bool{}
	for _, r := range lower.Refs {
		in[r.Name] = true
	}
	for _, r := range lower.Refs {
		var skipped []string
		for _, n := range names[:pos[r.Name]] {
			if !in[n] {
				skipped = append(skipped, n)
			}
		}
		if len(skipped) > 0 {
			return fmt.Sprintf("it repeats %s without %s, which precedes it in the upper segment: repeat the upper segment's datums from the primary on (e.g. `datums %s`), or none", r.Name, strings.Join(skipped, ", "), strings.Join(names[:pos[r.Name]+1], ", "))
		}
	}
	return ""
}

// singleCompositeNote explains what a composite lower segment does on a
// single feature: it orients the zone to the datums it repeats, or, with
// none, limits only the form of the axis; and names the plainer frame.
func singleCompositeNote(fr *model.Frame, lower *model.Segment) string {
	head := fmt.Sprintf("composite position on the single feature '%s': with no pattern members to relate", fr.Target.Name)
	tol := lower.ValueText
	if lower.Zone != "" {
		tol = lower.Zone + " " + tol
	}
	for _, m := range lower.Modifiers {
		if m.Letter == "M" || m.Letter == "L" {
			tol += " (" + m.Letter + ")"
		}
	}
	if len(lower.Refs) == 0 {
		return fmt.Sprintf("%s and no datums repeated, the lower segment limits only the form of its axis, as `frame %s: straightness %s` says plainly (legal, as far as datumlint knows)", head, fr.Target.Name, tol)
	}
	names := refNamesWithMaterial(lower.Refs)
	c := model.Perpendicularity
	if fe, de := elementOf(fr.Target.Feature), refElement(lower.Refs[0]); fe.exists && de.exists {
		switch ang := fe.angleTo(de); {
		case ang <= fe.slack+de.slack:
			c = model.Parallelism
		case ang < 90-fe.slack-de.slack:
			c = model.Angularity
		}
	}
	return fmt.Sprintf("%s, the lower segment refines only the orientation of its zone to %s (legal, as far as datumlint knows); a separate orientation tolerance says the same plainly: `frame %s: %s %s datums %s` in place of the composite line",
		head, strings.Join(names, ", "), fr.Target.Name, c, tol, strings.Join(names, ", "))
}
