package rules

import (
	"math"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/dof"
)

// This file holds rules on where a characteristic applies: runout needs a
// datum axis to turn about, and ASME position needs a feature of size.

// RunoutAxisMissing reports a runout frame whose datums give no axis.
var RunoutAxisMissing = Register(&Rule{
	ID:       "runout-axis-missing",
	Summary:  "a runout tolerance whose datums do not establish an axis for the part to turn about",
	Severity: Info,
	Rationale: `Runout is read by an indicator while the part is turned a full revolution about a datum
axis. The datum reference frame must therefore leave exactly one rotation free, about a line
that stays put: a cylinder or cone (alone or after a face), a common datum of two coaxial
diameters (A-B), or a sphere pair. A plane alone lets the part slide as it turns, two planes or
a width stop it turning at all, a single sphere lets it turn about any line, and a common datum
of two diameters that are not coaxial locks it. The check uses the degrees-of-freedom engine:
it takes the motions the datums leave free and asks for one rotation and no translation across
its axis. It is not one of the notation's core rules, so it reports at info by default and does
not fail a check; a project that wants it to block a release raises it in .datumlint.toml
([rules] runout-axis-missing = "error").`,
	Source: "ASME Y14.5-2018, runout (datum axis established by the datum features); ISO 1101:2017, run-out tolerances",
	Bad: `feature base plane normal -z at (0, 0, 0)
feature face plane normal +z at (0, 0, 20)
datum A on base
frame face: total-runout 0.05 datums A`,
	Good: `feature base plane normal -z at (0, 0, 0)
feature face plane normal +z at (0, 0, 20)
feature hub pin size 30 +-0.02 axis +z at (0, 0, 0)
datum A on base
datum B on hub
frame face: total-runout 0.05 datums A, B`,
	Run: func(p *Pass) {
		for _, fr := range p.Part.Frames {
			if fr.Characteristic.Category() != model.Runout || len(fr.Upper().Refs) == 0 {
				continue // datums-required reports a runout without datums
			}
			an := p.Kinematics().Segment(fr, 0)
			if !an.Resolved {
				continue // names and datums that do not resolve are reported elsewhere
			}
			if _, ok := turningAxis(an.DRF.Free()); ok {
				continue
			}
			var kinds []string
			for _, r := range fr.Upper().Refs {
				var ks []string
				for _, d := range r.Datums {
					ks = append(ks, d.Target.Feature.Kind.String())
				}
				kinds = append(kinds, r.Name+" ("+strings.Join(ks, "-")+")")
			}
			p.Report(fr.Upper().RefsSpan(), "%s is read while the part turns about a datum axis, but datums %s establish no axis to turn about: reference a cylinder or cone the part turns on (e.g. `datums A, B` with B a diameter), or a common datum of two coaxial diameters (`datums A-B`)",
				fr.Characteristic, strings.Join(kinds, ", "))
		}
	},
})

// turningAxis decides whether free motions leave exactly one rotation, about
// a fixed line: the rotation parts of the basis span one direction a, and
// every free motion without rotation is a translation along a (a part that
// slides along its own axis still turns about it). It returns a.
func turningAxis(free []dof.Motion) (model.Vec, bool) {
	k, big := -1, 0.0
	for i, m := range free {
		if n := model.Vec(m.Twist.W).Norm(); n > big {
			k, big = i, n
		}
	}
	if k < 0 || big < 1e-9 {
		return model.Vec{}, false // nothing turns
	}
	wk := model.Vec(free[k].Twist.W)
	vk := model.Vec(free[k].Twist.V)
	a := wk.Unit()
	for i, m := range free {
		if i == k {
			continue
		}
		w, v := model.Vec(m.Twist.W), model.Vec(m.Twist.V)
		if w.Cross(a).Norm() > 1e-6*math.Max(w.Norm(), big) {
			return model.Vec{}, false // a second independent rotation
		}
		// Remove the rotation: what is left is a pure translation.
		c := w.Dot(wk) / wk.Dot(wk)
		t := v.Sub(vk.Scale(c))
		if n := t.Norm(); n > 1e-9 && t.Cross(a).Norm() > 1e-6*n {
			return model.Vec{}, false // the axis itself can slide sideways
		}
	}
	return a, true
}

// PositionOnSurface reports, under ASME, a position tolerance on a feature
// that is not a feature of size.
var PositionOnSurface = Register(&Rule{
	ID:       "position-on-surface",
	Summary:  "under ASME, a position tolerance on a feature that is not a feature of size (use profile)",
	Severity: Info,
	Rationale: `In ASME Y14.5 position locates features of size: the axis of a hole or pin, the
mid-plane of a slot or tab, the centre of a sphere. A plane, cone, extruded shape or
free-form surface has no size and no derived axis or mid-plane for position to locate; ASME
locates such a surface with profile of a surface to the same datums. ISO 1101 does allow the
position of a plane, so the rule is silent under iso. It is a suggestion, reported at info.`,
	Source: "ASME Y14.5-2018, position (applies to features of size) and profile (locating surfaces); ISO 1101:2017, position of a flat surface",
	Bad: `feature top plane normal +z at (0, 0, 10)
frame top: position 0.1 datums A`,
	Good: `feature top plane normal +z at (0, 0, 10)
frame top: surface-profile 0.1 datums A`,
	Run: func(p *Pass) {
		if !p.Part.Standard.IsASME() {
			return
		}
		for _, fr := range p.Part.Frames {
			f := fr.Target.Feature
			if fr.Characteristic != model.Position || !fr.Target.Known() || f.Kind.IsFOS() || f.Kind.IsElement() {
				continue // a point, line or circle is not a surface for profile to take
			}
			sugg := "surface-profile " + fr.Upper().ValueText
			if refs := fr.Upper().Refs; len(refs) > 0 {
				names := make([]string, len(refs))
				for i, r := range refs {
					names[i] = r.Name
				}
				sugg += " datums " + strings.Join(names, ", ")
			}
			p.Report(fr.CharSpan, "under %s position locates features of size, and the %s '%s' is not one: locate it with profile instead, e.g. `frame %s: %s` (ISO 1101 allows the position of a plane; ASME does not)",
				p.Part.Standard, f.Kind, f.Name, fr.Target.Name, sugg)
		}
	},
})
