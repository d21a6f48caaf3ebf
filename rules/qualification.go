package rules

import (
	"fmt"
	"math"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
)

// DatumUnqualified reports a datum feature that lacks the control its
// precedence needs: form as primary, a relation to the datums above it as
// secondary or tertiary.
var DatumUnqualified = Register(&Rule{
	ID:       "datum-unqualified",
	Summary:  "a datum feature without the control its precedence needs: form as primary, a relation to the datums above it as secondary or tertiary",
	Severity: Warning,
	Rationale: `A datum is only as good as the feature that gives it. The primary datum feature is what
the part rests on, so its form must be controlled: flatness for a plane; cylindricity, or
circularity with straightness, for a cylinder; and so on by kind. A surface profile (with or
without datums) and, on a plane, an orientation tolerance or total runout also limit form and
are accepted (common practice). A feature of size has its form limited by the envelope
principle under ASME (Rule #1, ASME Y14.5-2018), but under ISO the independency principle
(ISO 8015:2011) leaves form uncontrolled unless the size carries the envelope requirement (E)
(ISO 14405-1) or the feature has an explicit form tolerance. A secondary or tertiary datum
feature is set up against the datums of higher precedence, so something must relate it to at
least one of them: a tolerance on it (orientation, position, profile or runout) that references
one of them; or, through a datum above both, a tolerance on it and one on the higher datum's
feature that reference the same datum (B and D both controlled to A are related through A);
or, the other way round, a tolerance on the higher datum's feature that references it (the
plane D profiled to A, B, C relates B and D). The last relates the two as well, but in the
reverse of the precedence that the frame uses, so it is reported as information only; only a
datum feature that none of these relates is a warning (ASME Y14.5-2018, datum feature
controls; from memory, section 7). For a common datum (A-B) each feature of the pair is
checked as if it were that datum (common practice).

Checked per use: a letter that is primary in one frame and secondary in another must meet
both requirements. A datum established by datum targets needs neither: the targets, at their
basic places, are what the part is set up on (extension).`,
	Source: "datum feature qualification, common practice; ASME Y14.5-2018, datum feature controls (from memory, section 7) and Rule #1 (envelope principle); ISO 8015:2011, independency principle; ISO 14405-1:2016, envelope requirement (E)",
	Bad: `feature base plane normal -z at (0, 0, 0)
feature rear plane normal -y at (0, 0, 0)
feature top plane normal +z at (0, 0, 10)
datum A on base
datum B on rear
frame base: flatness 0.02
frame top: parallelism 0.05 datums A, B`,
	Good: `feature base plane normal -z at (0, 0, 0)
feature rear plane normal -y at (0, 0, 0)
feature top plane normal +z at (0, 0, 10)
datum A on base
datum B on rear
frame base: flatness 0.02
frame rear: perpendicularity 0.05 datums A
frame top: parallelism 0.05 datums A, B`,
	Run: runDatumUnqualified,
})

// datumUse is one appearance of a datum in a frame segment's references.
type datumUse struct {
	frame  *model.Frame
	index  int               // 0 primary, 1 secondary, 2 tertiary
	ref    *model.DatumRef   // the reference it appears in (A-B for a common datum)
	higher []*model.DatumRef // the references before it
}

var precedenceWords = []string{"primary", "secondary", "tertiary"}

func precedenceWord(i int) string {
	if i < len(precedenceWords) {
		return precedenceWords[i]
	}
	return fmt.Sprintf("reference %d", i+1)
}

func runDatumUnqualified(p *Pass) {
	// Only upper segments set precedence: a well-formed composite lower
	// segment repeats a prefix of them, and a malformed one is
	// composite-invalid's finding, not a new precedence to qualify.
	uses := map[*model.Datum][]datumUse{}
	for _, fr := range p.Part.Frames {
		seg := fr.Upper()
		for i, r := range seg.Refs {
			for _, d := range r.Datums {
				if d != nil {
					uses[d] = append(uses[d], datumUse{frame: fr, index: i, ref: r, higher: seg.Refs[:i]})
				}
			}
		}
	}
	for _, d := range p.Part.Datums {
		f := d.Target.Feature
		if !d.Usable() || len(uses[d]) == 0 || p.facts.brokenMentions()[f.Name] {
			continue
		}
		if len(d.Targets) > 0 || f.Kind.IsElement() {
			// A datum established by datum targets is qualified by the
			// targets' basic places, not by a control of the whole
			// surface (ASME Y14.5-2018, datum targets; from memory); a
			// point, line or circle has no frame requirements of its own.
			continue
		}
		var problems []string
		var note *relationNote
		primary, related := false, false
		for _, u := range uses[d] {
			switch {
			case u.index == 0 && !primary:
				primary = true
				if msg := primaryProblem(p, d, u.ref); msg != "" {
					problems = append(problems, msg)
				}
			case u.index > 0 && !related:
				msg, n := relationProblem(p, d, u)
				if msg != "" {
					related = true // one finding per datum is enough to act on
					problems = append(problems, msg)
				} else if n != nil && note == nil {
					note = n
				}
			}
		}
		if len(problems) > 0 {
			p.Report(d.LetterSpan, "%s", strings.Join(problems, "; also, "))
		}
		if note != nil && !related {
			p.Inform(d.LetterSpan, note.related, "%s", note.message)
		}
	}
}

// relationNote is information about a secondary or tertiary datum feature
// that is related to a higher-precedence datum only the other way round: a
// frame on the higher datum's feature references it.
type relationNote struct {
	message string
	related []Related
}

// framesOnDatum returns the frames that control the datum's target: frames
// on the feature itself, or, for a datum on one member, on that member.
// A frame on one member does not control a whole pattern.
func framesOnDatum(part *model.Part, t *model.Target) []*model.Frame {
	var out []*model.Frame
	for _, fr := range part.FramesOn(t.Feature) {
		if fr.Target.Member != nil && fr.Target.Member != t.Member {
			continue
		}
		out = append(out, fr)
	}
	return out
}

// formChars lists, per kind, the characteristics that control a feature's
// form on their own, and pairs that do together.
//
//   - plane: flatness; surface profile and orientation tolerances of a
//     planar surface also limit its flatness (ASME Y14.5-2018, profile and
//     orientation tolerances; from memory), as does total runout of a face
//     (ASME Y14.5-2018, total runout).
//   - cylinder: cylindricity, or circularity with straightness (common
//     practice); surface profile; total runout limits cylindricity.
//   - sphere: circularity applied to a sphere (ASME Y14.5-2018, circularity
//     of a sphere), or surface profile.
//   - width: flatness or surface profile of the width (ISO 1101 flatness of
//     the median feature is not enough on its own; common practice takes
//     flatness of the width, or of both its faces).
//   - cone: surface profile, or circularity with straightness.
//   - extrusion: surface profile, or line profile with straightness.
//   - surface: surface profile.
var formChars = map[model.Kind]struct {
	alone []model.Characteristic
	pairs [][2]model.Characteristic
	hint  string
}{
	model.Plane:     {alone: []model.Characteristic{model.Flatness, model.SurfaceProfile, model.Perpendicularity, model.Parallelism, model.Angularity, model.TotalRunout}, hint: "flatness %s"},
	model.Slot:      {alone: []model.Characteristic{model.Flatness, model.SurfaceProfile}, hint: "flatness %s"},
	model.Tab:       {alone: []model.Characteristic{model.Flatness, model.SurfaceProfile}, hint: "flatness %s"},
	model.Hole:      {alone: []model.Characteristic{model.Cylindricity, model.SurfaceProfile, model.TotalRunout}, pairs: [][2]model.Characteristic{{model.Circularity, model.Straightness}}, hint: "cylindricity %s"},
	model.Pin:       {alone: []model.Characteristic{model.Cylindricity, model.SurfaceProfile, model.TotalRunout}, pairs: [][2]model.Characteristic{{model.Circularity, model.Straightness}}, hint: "cylindricity %s"},
	model.Socket:    {alone: []model.Characteristic{model.Circularity, model.SurfaceProfile}, hint: "circularity %s"},
	model.Ball:      {alone: []model.Characteristic{model.Circularity, model.SurfaceProfile}, hint: "circularity %s"},
	model.Cone:      {alone: []model.Characteristic{model.SurfaceProfile}, pairs: [][2]model.Characteristic{{model.Circularity, model.Straightness}}, hint: "surface-profile %s"},
	model.Extrusion: {alone: []model.Characteristic{model.SurfaceProfile}, pairs: [][2]model.Characteristic{{model.LineProfile, model.Straightness}}, hint: "surface-profile %s"},
	model.Surface:   {alone: []model.Characteristic{model.SurfaceProfile}, hint: "surface-profile %s"},
}

// hasFormControl reports whether the target carries a form control for its
// kind. Frames that reference the datum's own letter do not count (a
// feature cannot be controlled relative to itself: datum-self-reference),
// except form frames: a form tolerance wrongly given datums still controls
// form, and datums-forbidden alone reports the datums (one mistake, one
// finding).
func hasFormControl(part *model.Part, t *model.Target, letter string) bool {
	fc, ok := formChars[t.Feature.Kind]
	if !ok {
		return true
	}
	have := map[model.Characteristic]bool{}
	for _, fr := range framesOnDatum(part, t) {
		if letter != "" && fr.RefersTo(letter) && fr.Characteristic.Category() != model.Form {
			continue
		}
		have[fr.Characteristic] = true
	}
	for _, c := range fc.alone {
		if have[c] {
			return true
		}
	}
	for _, pr := range fc.pairs {
		if have[pr[0]] && have[pr[1]] {
			return true
		}
	}
	// A width given between two faces: form control of both faces.
	// (Faces that are not planes are a geometry error; skipping them also
	// keeps a width named among its own faces from recursing.)
	fa, fb := t.Feature.Faces[0], t.Feature.Faces[1]
	if t.Feature.Kind.IsWidth() && fa.Resolved() && fb.Resolved() && fa.Feature.Kind == model.Plane && fb.Feature.Kind == model.Plane {
		return hasFormControl(part, fa, letter) && hasFormControl(part, fb, letter)
	}
	return false
}

// primaryProblem says what a datum used as primary lacks, or "".
func primaryProblem(p *Pass, d *model.Datum, ref *model.DatumRef) string {
	f := d.Target.Feature
	as := "primary"
	if ref.Common() {
		as = "primary (in the common datum " + ref.Name + ")"
	}
	if f.Kind.IsFOS() {
		// ASME Y14.5-2018, Rule #1: the envelope at MMC limits the form of
		// a feature of size. Under ISO 8015:2011 independency, only (E)
		// (ISO 14405-1) or an explicit form tolerance does. An unknown
		// standard is reported by header-missing; it is not guessed at here.
		if p.Part.Standard != model.ISO {
			return ""
		}
		if f.Size == nil || f.Size.Envelope {
			return "" // size-missing reports a size that is not there
		}
		if hasFormControl(p.Part, &d.Target, d.Letter) {
			return ""
		}
		return fmt.Sprintf("datum %s is used as %s but the %s '%s' has no form control: under ISO 8015 independency its size does not limit its form; add the envelope requirement (E) to its size (ISO 14405-1), e.g. `size %s (E)`, or a form tolerance, e.g. `frame %s: %s`",
			d.Letter, as, f.Kind, f.Name, sizeText(f.Size), d.Target.Name, fmt.Sprintf(formChars[f.Kind].hint, exampleValue(p.Part, "0.02")))
	}
	if hasFormControl(p.Part, &d.Target, d.Letter) {
		return ""
	}
	return fmt.Sprintf("datum %s is used as %s but has no form control: add e.g. `frame %s: %s`",
		d.Letter, as, d.Target.Name, fmt.Sprintf(formChars[f.Kind].hint, exampleValue(p.Part, "0.02")))
}

// relationProblem says what a datum used as secondary or tertiary lacks,
// or "" where something relates it to a datum before it in this use
// (ASME Y14.5-2018, datum feature controls; from memory, section 7):
//
//   - a frame on it (orientation, location, profile or runout) that
//     references one of the datums before it: the usual qualification;
//   - through a datum above both: a frame on it and a frame on the
//     feature of a datum before it reference one same datum (B and D both
//     to A relate B and D through A's datum reference frame);
//   - the other way round: a frame on the feature of a datum before it
//     references this datum (the plane D profiled to A|B|C relates B and
//     D). That relates them too, but in the reverse of the precedence this
//     frame uses, so it is returned as a note (information), not a problem.
//
// Only a datum feature that none of these relates gets a problem.
func relationProblem(p *Pass, d *model.Datum, u datumUse) (string, *relationNote) {
	higher := map[string]bool{}
	var names []string
	var above []*model.Datum
	for _, r := range u.higher {
		if !r.Resolved() {
			return "", nil // datum-undefined or name-undefined reports it
		}
		for _, hd := range r.Datums {
			if hd == d {
				return "", nil // a letter repeated in one frame: datum-duplicate reports it
			}
			above = append(above, hd)
		}
		names = append(names, r.Name)
		for _, l := range r.Letters {
			higher[l] = true
		}
	}
	mine := relatedLetters(p.Part, &d.Target)
	for l := range mine {
		if higher[l] {
			return "", nil
		}
	}
	for _, hd := range above {
		if !hd.Usable() {
			continue
		}
		for l := range relatedLetters(p.Part, &hd.Target) {
			if mine[l] && l != d.Letter && l != hd.Letter {
				return "", nil // through a datum above both
			}
		}
	}
	for _, hd := range above {
		if !hd.Usable() {
			continue
		}
		if fr := relatingFrame(p.Part, &hd.Target, d.Letter); fr != nil {
			return "", &relationNote{
				message: fmt.Sprintf("datum %s is used as %s to %s, and '%s' is related to %s only the other way round, by the %s of '%s' (datum %s) to %s on line %d: the two are related, so this is not a warning, but the order of that control is the reverse of this frame's precedence; to state it in this order, add e.g. `frame %s: %s datums %s`",
					d.Letter, precedenceWord(u.index), strings.Join(names, ", "), d.Target.Name, hd.Letter, fr.Characteristic, hd.Target.Name, hd.Letter, d.Letter, fr.Span.Start.Line,
					d.Target.Name, relationHint(p.Part, d, u.higher[0]), strings.Join(names, ", ")),
				related: []Related{{fr.CharSpan, fmt.Sprintf("the %s that relates %s to %s", fr.Characteristic, hd.Letter, d.Letter)}},
			}
		}
	}
	return fmt.Sprintf("datum %s is used as %s to %s but no tolerance relates '%s' to %s; add e.g. `frame %s: %s datums %s`",
		d.Letter, precedenceWord(u.index), strings.Join(names, ", "), d.Target.Name, orList(names),
		d.Target.Name, relationHint(p.Part, d, u.higher[0]), strings.Join(names, ", ")), nil
}

// relates reports whether a frame can relate its feature to the datums it
// references: orientation, location, profile or runout.
func relates(fr *model.Frame) bool {
	switch fr.Characteristic.Category() {
	case model.Orientation, model.Location, model.Profile, model.Runout:
		return true
	}
	return false
}

// relatedLetters returns the datum letters that frames on the target relate
// it to.
func relatedLetters(part *model.Part, t *model.Target) map[string]bool {
	out := map[string]bool{}
	for _, fr := range framesOnDatum(part, t) {
		if !relates(fr) {
			continue
		}
		for _, seg := range fr.Segments {
			for _, r := range seg.Refs {
				for _, l := range r.Letters {
					out[l] = true
				}
			}
		}
	}
	return out
}

// relatingFrame returns the first frame on the target that relates it to
// the letter, or nil.
func relatingFrame(part *model.Part, t *model.Target, letter string) *model.Frame {
	for _, fr := range framesOnDatum(part, t) {
		if relates(fr) && fr.RefersTo(letter) {
			return fr
		}
	}
	return nil
}

func orList(names []string) string {
	if len(names) == 1 {
		return names[0]
	}
	return "any of " + strings.Join(names, ", ")
}

// relationHint suggests a typical control of a secondary or tertiary datum
// feature relative to the primary: orientation for planes, widths and
// cylinders by their nominal angle; position for a cylinder whose axis is
// parallel to a datum axis and for a sphere; profile otherwise.
func relationHint(part *model.Part, d *model.Datum, primary *model.DatumRef) string {
	f := d.Target.Feature
	v := func(mm string) string { return exampleValue(part, mm) }
	var ref *model.Feature
	if len(primary.Datums) > 0 && primary.Datums[0] != nil {
		ref = primary.Datums[0].Target.Feature
	}
	switch {
	case f.Kind.IsSphere():
		return "position sdia " + v("0.1")
	case f.Kind == model.Cone || f.Kind == model.Extrusion || f.Kind == model.Surface:
		return "surface-profile " + v("0.1")
	case ref == nil || ref.Dir.Norm() == 0 || f.Dir.Norm() == 0:
		return "surface-profile " + v("0.1")
	}
	axial := func(k model.Kind) bool { return k.IsCylinder() || k == model.Cone }
	ang := model.AngleBetweenLines(f.Dir, ref.Dir)
	// Directions are normals for planes and widths, axes for cylinders:
	// "parallel directions" means perpendicular features when exactly one
	// of the two is an axis.
	mixed := axial(f.Kind) != axial(ref.Kind)
	switch {
	case ang < 1e-6 && axial(f.Kind) && axial(ref.Kind):
		return "position dia " + v("0.1")
	case ang < 1e-6 && f.Kind.IsCylinder() && mixed:
		return "perpendicularity dia " + v("0.05")
	case ang < 1e-6 && mixed, ang > 90-1e-6 && !mixed:
		return "perpendicularity " + v("0.05")
	case ang < 1e-6 || ang > 90-1e-6:
		return "parallelism " + v("0.05")
	}
	return "angularity " + v("0.05")
}

// exampleValue gives a suggested tolerance in the file's units.
func exampleValue(part *model.Part, mm string) string {
	if part.Units != model.Inch {
		return mm
	}
	return map[string]string{"0.01": "0.0005", "0.02": "0.001", "0.05": "0.002", "0.1": "0.004"}[mm]
}

// sizeText writes a size back in the notation, for a suggestion.
func sizeText(s *model.Size) string {
	g := func(x float64) string { return strings.TrimSuffix(strings.TrimRight(fmt.Sprintf("%.6f", x), "0"), ".") }
	switch {
	case !s.Toleranced:
		return g(s.Nominal)
	case s.Upper == -s.Lower:
		return g(s.Nominal) + " +-" + g(s.Upper)
	}
	// A zero deviation keeps the sign it is written with by convention:
	// +0 above, -0 below.
	upper, lower := "+"+g(math.Abs(s.Upper)), "-"+g(math.Abs(s.Lower))
	if s.Upper < 0 {
		upper = "-" + g(-s.Upper)
	}
	if s.Lower > 0 {
		lower = "+" + g(s.Lower)
	}
	return g(s.Nominal) + " " + upper + " " + lower
}
