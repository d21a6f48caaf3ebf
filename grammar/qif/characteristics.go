package qif

import (
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

type charType int

const (
	otherChar charType = iota
	geometric
	size
	dimension
)

// characteristicWords are QIF's geometric characteristics and the words of
// the model: the fourteen of ASME Y14.5 and ISO 1101.
var characteristicWords = map[string]model.Characteristic{
	"Straightness": "straightness", "Flatness": "flatness", "Circularity": "circularity", "Cylindricity": "cylindricity",
	"LineProfile": "line-profile", "SurfaceProfile": "surface-profile",
	"Angularity": "angularity", "Perpendicularity": "perpendicularity", "Parallelism": "parallelism",
	"Position": "position", "Concentricity": "concentricity", "Symmetry": "symmetry",
	"CircularRunout": "circular-runout", "TotalRunout": "total-runout",
}

// sizeTypes are the size characteristics the model holds as a feature's size.
var sizeTypes = map[string]bool{"Diameter": true, "SphericalDiameter": true, "Width": true, "Thickness": true,
	"Radius": true, "SphericalRadius": true, "Length": true, "Height": true, "Depth": true, "Square": true, "Chord": true}

var dimensionTypes = map[string]bool{"DistanceBetween": true, "DistanceFrom": true, "AngleBetween": true, "AngleFrom": true}

func charTypeOf(t string) charType {
	switch {
	case characteristicWords[t] != "":
		return geometric
	case sizeTypes[t]:
		return size
	case dimensionTypes[t]:
		return dimension
	}
	return otherChar
}

// flagNotes say what each boolean modifier the model has no place for means.
var flagNotes = map[string]string{
	"CommonZone":                "a common zone (CZ)",
	"CommonTolerance":           "a common tolerance",
	"StatisticalCharacteristic": "a statistical tolerance (ST)",
	"MedianFeature":             "a tolerance on the derived median feature",
	"UnitedOrContinuousFeature": "a united or continuous feature (UF, CF)",
	"OrientationOnly":           "an orientation-only requirement",
	"EachElement":               "an each-element requirement",
	"EachRadialElement":         "an each-radial-element requirement",
	"OffsetZone":                "an offset zone (OZ)",
	"VariableAngle":             "a variable angle (VA)",
	"NotConvex":                 "the not-convex modifier (NC)",
	"Independency":              "the independency principle on this size (I)",
	"ControlledRadius":          "a controlled radius (CR)",
}

// characteristics maps every characteristic nominal: geometric ones become
// frames, sizes the size of their features, distances and angles basic or
// toleranced dimensions.
func (m *mapper) characteristics() {
	m.drfUse = map[ID]int{}
	for _, c := range m.doc.CharNominals {
		if c.Def == nil || m.doc.CharDefs[c.Def.ID] == nil {
			continue
		}
		def := m.doc.CharDefs[c.Def.ID]
		if def.DRF != nil {
			m.drfUse[def.DRF.ID]++
		}
		for _, cs := range def.Composites {
			if cs.DRF != nil {
				m.drfUse[cs.DRF.ID]++
			}
		}
	}
	for _, c := range m.doc.CharNominals {
		if c.Def == nil {
			m.note(Inconsistent, c.Span, "characteristic nominal %d names no definition: left out", c.ID)
			continue
		}
		def := m.doc.CharDefs[c.Def.ID]
		switch {
		case def == nil:
			m.note(Inconsistent, c.Def.Span, "characteristic nominal %d names definition %d, which is not in CharacteristicDefinitions: left out", c.ID, c.Def.ID)
			continue
		case def.Type != c.Type:
			m.note(Inconsistent, c.Def.Span, "the %s nominal %d names a %s definition (%d): left out", c.Type, c.ID, def.Type, def.ID)
			continue
		}
		if len(c.Zones) > 0 {
			m.note(Unsupported, c.Span, "characteristic nominal %d applies to feature zones (part of a feature); the model has none: read on the whole features", c.ID)
		}
		switch charTypeOf(c.Type) {
		case geometric:
			m.frames(c, def)
		case size:
			m.sizes(c, def)
		case dimension:
			m.dimensions(c, def)
		default:
			what := "a " + c.Type + " characteristic"
			if c.Type == "Angle" {
				what = "an angular size (Angle)"
			}
			m.note(Unsupported, c.Span, "%s nominal %d is not read: the model has no such characteristic", what, c.ID)
		}
	}
}

func (m *mapper) leftOut(c *CharNominal, left []string) bool {
	if len(left) == 0 {
		return false
	}
	m.note(Unsupported, c.Span, "%s nominal %d is left out: %s", c.Type, c.ID, strings.Join(left, "; "))
	return true
}

// frames builds one frame per target of a geometric characteristic.
func (m *mapper) frames(c *CharNominal, def *CharDef) {
	ts, left := m.targets(m.featureRefs(c))
	if m.leftOut(c, left) {
		return
	}
	if len(ts) == 0 {
		m.note(Inconsistent, c.Span, "%s nominal %d is on no feature: left out", c.Type, c.ID)
		return
	}
	if len(ts) > 1 {
		m.note(Unsupported, c.Span, "%s nominal %d applies to %d features together that are not a pattern of like features: the model holds one frame per feature", c.Type, c.ID, len(ts))
	}
	char := characteristicWords[c.Type]
	for _, t := range ts {
		segs, ok := m.segments(c, def, t)
		if !ok {
			return
		}
		fr := &model.Frame{Target: t.target(), Characteristic: char, CharSpan: c.Span, Segments: segs, Span: c.Span}
		fr.Extent, fr.ExtentSpan = m.extent(def)
		m.part.Frames = append(m.part.Frames, fr)
		m.part.Refs = append(m.part.Refs, &fr.Target)
		m.res.Origins.Frames[fr] = c.ID
		if c.Type == "Angularity" {
			m.angularity(c, fr)
		}
	}
}

// segments builds the upper segment and the composite lower ones.
func (m *mapper) segments(c *CharNominal, def *CharDef, t tgt) ([]*model.Segment, bool) {
	upper := &model.Segment{Span: def.Span}
	tv := def.ToleranceValue
	if tv == nil && def.PerUnit != nil {
		tv = def.PerUnit.Value
		upper.PerUnit = m.perUnit(def.PerUnit, tv)
	}
	if tv == nil {
		m.note(Inconsistent, def.Span, "%s definition %d has no readable tolerance value: %s nominal %d is left out", def.Type, def.ID, c.Type, c.ID)
		return nil, false
	}
	v, ok := m.u.tolerance(tv, 0)
	if !ok {
		return nil, false
	}
	upper.Value, upper.ValueSpan = v, tv.Span
	m.zone(upper, def.Zone, def.ZoneDir)
	what := fmt.Sprintf("%s definition %d", def.Type, def.ID)
	if l := m.material(def.Material, what); l != "" {
		upper.Modifiers = append(upper.Modifiers, model.Modifier{Letter: l, Span: def.Material.Span})
	}
	for _, f := range []struct{ name, letter string }{{"FreeState", "F"}, {"TangentPlane", "T"}} {
		if sp, ok := def.Flags[f.name]; ok {
			upper.Modifiers = append(upper.Modifiers, model.Modifier{Letter: f.letter, Span: sp})
		}
	}
	for _, f := range []struct{ name, letter string }{{"ProjectedToleranceZoneValue", "P"}, {"OuterDisposition", "U"}} {
		if x := def.Modifiers[f.name]; x != nil {
			if h, ok := m.u.tolerance(x, 0); ok {
				upper.Modifiers = append(upper.Modifiers, model.Modifier{Letter: f.letter, Value: h, HasValue: true, Span: x.Span})
			}
		}
	}
	if x := def.Modifiers["UnequallyDisposedZone"]; x != nil {
		m.note(Unsupported, x.Span, "an unequally disposed zone offset of %s (ISO UZ): the model has the (U) of ASME Y14.5 only; left out", x.Text)
	}
	if x := def.Modifiers["MaximumToleranceValue"]; x != nil {
		m.note(Unsupported, x.Span, "a maximum tolerance of %s (MAX): the model has none; left out", x.Text)
	}
	if x := def.Modifiers["ToPointToleranceValue"]; x != nil {
		m.note(Unsupported, x.Span, "a non-uniform zone to %s: the model has none; left out", x.Text)
	}
	for name, sp := range def.Flags {
		if w, ok := flagNotes[name]; ok {
			m.note(Unsupported, sp, "%s: %s is left out; the model has no such modifier", what, w)
		}
	}
	if sp, ok := def.Flags["SeparateZone"]; ok {
		upper.Separate, upper.SeparateSpan = true, sp
	}
	for _, e := range def.Unread {
		m.note(Unsupported, e.Span, "%s: <%s> is not read", what, e.Name)
	}
	refs, ok := m.drfRefs(def.DRF)
	if !ok {
		m.note(Unsupported, c.Span, "%s nominal %d is left out: its datum reference frame cannot be read", c.Type, c.ID)
		return nil, false
	}
	upper.Refs = m.ownRefs(refs, def.DRF, c.Span)
	segs := []*model.Segment{upper}
	for _, cs := range def.Composites {
		seg := &model.Segment{Composite: true, Span: cs.Span}
		if cs.ToleranceValue == nil {
			m.note(Inconsistent, cs.Span, "a composite segment without a tolerance value: %s nominal %d is left out", c.Type, c.ID)
			return nil, false
		}
		if seg.Value, ok = m.u.tolerance(cs.ToleranceValue, 0); !ok {
			return nil, false
		}
		seg.ValueSpan = cs.ToleranceValue.Span
		m.zone(seg, cs.Zone, nil)
		if l := m.material(cs.Material, what); l != "" {
			seg.Modifiers = append(seg.Modifiers, model.Modifier{Letter: l, Span: cs.Material.Span})
		}
		if cs.Projected != nil {
			if h, ok := m.u.tolerance(cs.Projected, 0); ok {
				seg.Modifiers = append(seg.Modifiers, model.Modifier{Letter: "P", Value: h, HasValue: true, Span: cs.Projected.Span})
			}
		}
		for _, e := range cs.Unread {
			m.note(Unsupported, e.Span, "%s: <%s> of the composite segment is not read", what, e.Name)
		}
		if seg.Refs, ok = m.drfRefs(cs.DRF); !ok {
			m.note(Unsupported, c.Span, "%s nominal %d is left out: the datum reference frame of a composite segment cannot be read", c.Type, c.ID)
			return nil, false
		}
		seg.Refs = m.ownRefs(seg.Refs, cs.DRF, c.Span)
		segs = append(segs, seg)
	}
	return segs, true
}

// extent reads where a profile applies: all around or all over (ASME
// Y14.5-2018, all around and all over; ISO 1101:2017, all around). "This
// side" is read as the whole extent, with a note.
func (m *mapper) extent(def *CharDef) (string, source.Span) {
	e := def.Extent
	if e == nil {
		return "", source.Span{}
	}
	switch e.Text {
	case "ALL_AROUND":
		return model.AllAround, e.Span
	case "ALL_OVER":
		return model.AllOver, e.Span
	case "ALL_AROUND_THIS_SIDE", "ALL_OVER_THIS_SIDE":
		m.note(Unsupported, e.Span, "%s definition %d: the extent %s is read as %s; the model has no 'this side'", def.Type, def.ID,
			strings.ReplaceAll(strings.ToLower(e.Text), "_", " "), strings.TrimSuffix(strings.ReplaceAll(strings.ToLower(e.Text), "_", "-"), "-this-side"))
		return strings.TrimSuffix(strings.ReplaceAll(strings.ToLower(e.Text), "_", "-"), "-this-side"), e.Span
	case "UNDEFINED", "":
		return "", source.Span{}
	}
	m.note(Unsupported, e.Span, "%s definition %d: the extent %q is left out; the model has all around and all over", def.Type, def.ID, e.Text)
	return "", source.Span{}
}

// perUnit reads a tolerance per unit length or rectangular area (a
// flatness of 0.005 per any 25 x 25); a circular unit area or another
// unit is left out, with a note, and the tolerance read over the whole
// feature.
func (m *mapper) perUnit(p *PerUnit, tv *Value) *model.PerUnit {
	var unit []string
	var sizes []float64
	for _, v := range p.Unit {
		unit = append(unit, v.Text)
		if x, ok := m.u.length(v, true); ok {
			sizes = append(sizes, x)
		}
	}
	out := &model.PerUnit{Span: p.Span}
	num := func(x float64) string { return strconv.FormatFloat(x, 'f', -1, 64) }
	switch {
	case p.Kind == "Length" && len(sizes) == 1 && len(p.Unit) == 1:
		out.Length, out.Text = sizes[0], num(sizes[0])
		return out
	case p.Kind == "Area" && len(sizes) == 2 && len(p.Unit) == 2:
		out.Length, out.Width, out.Area = sizes[0], sizes[1], true
		out.Text = num(sizes[0]) + "x" + num(sizes[1])
		return out
	}
	m.note(Unsupported, p.Span, "a tolerance of %s per unit %s (%s): the model has tolerances per unit length and per rectangular area; read as %s over the whole feature",
		valueText(tv), strings.ToLower(p.Kind), strings.Join(unit, " x "), valueText(tv))
	return nil
}

// zone sets a segment's zone shape: dia (cylindrical), sdia (spherical) or
// none (parallel planes or lines, or the characteristic's own shape).
func (m *mapper) zone(s *model.Segment, z *Word, dir *Vec3) {
	if z == nil {
		return
	}
	switch z.Text {
	case "DiametricalZone":
		s.Zone, s.ZoneSpan = "dia", z.Span
	case "SphericalZone":
		s.Zone, s.ZoneSpan = "sdia", z.Span
	case "NonDiametricalZone":
		s.PlanesStated, s.ZoneSpan = true, z.Span
	}
	if dir != nil {
		if dir.V.Norm() == 0 {
			m.note(Inconsistent, dir.Span, "the zone's direction is the zero vector: left out")
			return
		}
		u := dir.V.Unit()
		s.ZoneDir, s.ZoneDirSpan = &u, dir.Span
	}
}

func valueText(v *Value) string {
	if v == nil {
		return "?"
	}
	return v.Text
}

// angularity adds the basic angle an angularity nominal gives, from the
// frame's primary datum feature to the toleranced feature.
func (m *mapper) angularity(c *CharNominal, fr *model.Frame) {
	a := c.Angle
	if a == nil {
		return
	}
	deg, ok := m.u.angle(a, true)
	if !ok {
		return
	}
	up := fr.Upper()
	if deg <= 0 || deg >= 180 {
		m.note(Inconsistent, a.Span, "the angularity's angle %s is not an angle between 0 and 180 degrees: no basic angle is read from it", a.Text)
		return
	}
	if len(up.Refs) == 0 || !up.Refs[0].Resolved() || up.Refs[0].Common() {
		m.note(Unsupported, a.Span, "the angularity's angle %s has no single primary datum feature to be measured from: left out", a.Text)
		return
	}
	from := up.Refs[0].Datums[0].Target
	d := &model.Dimension{Basic: true, Angle: true, Value: deg, ValueSpan: a.Span, From: from, To: fr.Target, Span: a.Span}
	m.addDim(d, c.ID)
}

func (m *mapper) addDim(d *model.Dimension, id ID) {
	m.part.Dims = append(m.part.Dims, d)
	m.part.Refs = append(m.part.Refs, &d.From, &d.To)
	m.res.Origins.Dims[d] = id
}

// tolerance reads a size or dimension's tolerance around its nominal (NaN:
// the mean of its limits, where no nominal is given). An angular one is read
// in degrees.
func (m *mapper) tolerance(def *CharDef, nominal float64, angular bool) (*model.Size, bool) {
	t := def.Tolerance
	conv := func(v *Value) (float64, bool) {
		if angular {
			return m.u.angle(v, true)
		}
		return m.u.tolerance(v, 1)
	}
	hi, okHi := conv(t.Max)
	lo, okLo := conv(t.Min)
	if !okHi || !okLo {
		m.note(Inconsistent, t.Span, "the tolerance of %s definition %d has no readable MaxValue or MinValue: left out", def.Type, def.ID)
		return nil, false
	}
	if math.IsNaN(nominal) {
		nominal = tidy((hi + lo) / 2)
		if !t.Limits {
			nominal = 0
		}
	}
	s := &model.Size{Nominal: nominal, Toleranced: true, Span: t.Span}
	if t.Limits {
		s.Upper, s.Lower = tidy(hi-nominal), tidy(lo-nominal)
	} else {
		s.Upper, s.Lower = hi, lo
	}
	if s.Upper < s.Lower {
		m.note(Inconsistent, t.Span, "the tolerance of %s definition %d has its MaxValue below its MinValue: read swapped", def.Type, def.ID)
		s.Upper, s.Lower = s.Lower, s.Upper
	}
	if _, ok := def.Flags["EnvelopeRequirement"]; ok {
		s.Envelope = true
	}
	return s, true
}

// sizes sets the size of the features a size characteristic is on.
func (m *mapper) sizes(c *CharNominal, def *CharDef) {
	ts, left := m.targets(m.featureRefs(c))
	if m.leftOut(c, left) {
		return
	}
	what := fmt.Sprintf("%s nominal %d", c.Type, c.ID)
	switch c.Type {
	case "Radius", "SphericalRadius", "Length", "Height", "Depth", "Square", "Chord":
		m.note(Unsupported, c.Span, "%s (%s) is not read: the model holds diameters and widths of features of size", what, valueText(c.TargetValue))
		return
	}
	for name, sp := range def.Flags {
		if w, ok := flagNotes[name]; ok {
			m.note(Unsupported, sp, "%s: %s is left out", what, w)
		}
	}
	for _, e := range def.Unread {
		m.note(Unsupported, e.Span, "%s definition %d: <%s> is not read", def.Type, def.ID, e.Name)
	}
	for _, t := range ts {
		f := t.f
		fits := (c.Type == "Diameter" || c.Type == "SphericalDiameter") && (f.Kind.IsCylinder() || f.Kind.IsSphere() || f.Kind == model.Circle) ||
			(c.Type == "Width" || c.Type == "Thickness") && f.Kind.IsWidth()
		if !fits {
			m.note(Unsupported, c.Span, "%s is on %s, a %s: a %s is not its size; left out", what, t.target().Name, f.Kind, strings.ToLower(c.Type))
			continue
		}
		m.setSize(c, def, t)
	}
}

func (m *mapper) setSize(c *CharNominal, def *CharDef, t tgt) {
	f := t.f
	what := fmt.Sprintf("%s nominal %d", c.Type, c.ID)
	limits := def.Tolerance != nil && def.Tolerance.Limits
	var nominal float64
	var ok bool
	switch {
	case c.TargetValue != nil:
		if nominal, ok = m.u.tolerance(c.TargetValue, 1); !ok {
			return
		}
	case limits:
		nominal = math.NaN() // the mean of the limits
	case f.Size != nil:
		nominal = f.Size.Nominal
	default:
		m.note(Inconsistent, c.Span, "%s gives no TargetValue and the feature's definition no size: left out", what)
		return
	}
	s := &model.Size{Nominal: nominal, Span: c.Span}
	switch {
	case def.DimensionType != nil && def.DimensionType.Text == "REFERENCE_OR_AUXILIARY":
		// A reference size is for information: checked against the model,
		// it gives the feature no size.
		sz := t.target()
		d := &model.Dimension{Reference: true, Value: s.Nominal, SizeOf: &sz, Span: c.Span, ValueSpan: c.Span}
		if c.TargetValue != nil {
			d.ValueSpan, d.ValueText = c.TargetValue.Span, c.TargetValue.Text
		}
		if math.IsNaN(d.Value) {
			m.note(Inconsistent, c.Span, "%s gives no TargetValue: left out", what)
			return
		}
		m.part.Dims = append(m.part.Dims, d)
		m.part.Refs = append(m.part.Refs, d.SizeOf)
		m.res.Origins.Dims[d] = c.ID
		return
	case def.DimensionType != nil && def.DimensionType.Text == "BASIC_OR_TED":
		m.note(Unsupported, def.DimensionType.Span, "%s is a basic size: read as the feature's nominal size, untoleranced", what)
	case def.Tolerance != nil:
		ts, ok := m.tolerance(def, nominal, false)
		if !ok {
			return
		}
		ts.Span = c.Span
		s = ts
	case def.NonTolerance != nil:
		m.note(Unsupported, def.NonTolerance.Span, "%s is not toleranced (%s): read as the feature's nominal size", what, def.NonTolerance.Text)
	}
	if math.IsNaN(s.Nominal) {
		m.note(Inconsistent, c.Span, "%s gives no TargetValue and no limits: left out", what)
		return
	}
	if first, ok := m.sized[f]; ok {
		if t.mem == nil || first.nominal != s.Nominal {
			m.note(Inconsistent, c.Span, "%s is a second size on %s (the first is nominal %d): left out", what, t.target().Name, first.id)
		}
		return
	}
	if f.Size != nil && c.TargetValue != nil {
		tol := 1e-6 * math.Max(1, math.Abs(s.Nominal))
		if x, ok := m.halfUnit(c.TargetValue, false); ok {
			tol = math.Max(tol, x)
		}
		if math.Abs(f.Size.Nominal-s.Nominal) > tol {
			m.note(Inconsistent, c.TargetValue.Span, "%s gives %s the size %s, but its feature definition says %.6g %s: the characteristic's size is read",
				what, f.Name, c.TargetValue.Text+labelOf(c.TargetValue), f.Size.Nominal, m.u.model)
		}
	}
	f.Size = s
	m.sized[f] = sizedBy{c.ID, s.Nominal}
	m.checkDisplay(c, def)
}

func labelOf(v *Value) string {
	if v.Unit == "" {
		return ""
	}
	return " " + v.Unit
}

// dimensions builds basic or toleranced dimensions from a distance or
// angle characteristic: one per pair of features.
func (m *mapper) dimensions(c *CharNominal, def *CharDef) {
	angular := strings.HasPrefix(c.Type, "Angle")
	what := fmt.Sprintf("%s nominal %d", c.Type, c.ID)
	basic := def.DimensionType != nil && def.DimensionType.Text == "BASIC_OR_TED"
	reference := def.DimensionType != nil && def.DimensionType.Text == "REFERENCE_OR_AUXILIARY"
	switch {
	case reference:
	case def.DimensionType != nil && !basic:
		m.note(Unsupported, def.DimensionType.Span, "%s is a %s dimension: left out", what, strings.ToLower(def.DimensionType.Text))
		return
	case !basic && def.Tolerance == nil:
		m.note(Unsupported, c.Span, "%s is neither basic nor toleranced (%s): left out", what, wordText(def.NonTolerance))
		return
	}
	if c.TargetValue == nil {
		m.note(Inconsistent, c.Span, "%s has no TargetValue: left out", what)
		return
	}
	var value float64
	var ok bool
	if angular {
		value, ok = m.u.angle(c.TargetValue, true)
	} else {
		value, ok = m.u.tolerance(c.TargetValue, 1)
	}
	if !ok {
		return
	}
	var tol *model.Size
	if def.Tolerance != nil {
		if tol, ok = m.tolerance(def, value, angular); !ok {
			return
		}
		switch {
		case basic:
			m.note(Inconsistent, def.Tolerance.Span, "%s is basic but carries a tolerance (%s/%s), as a display tolerance of a model dimension: read as basic, the tolerance left out",
				what, valueText(def.Tolerance.Max), valueText(def.Tolerance.Min))
			tol = nil
		case reference:
			m.note(Inconsistent, def.Tolerance.Span, "%s is a reference dimension but carries a tolerance (%s/%s): read as a reference, the tolerance left out",
				what, valueText(def.Tolerance.Max), valueText(def.Tolerance.Min))
			tol = nil
		}
	}
	for _, e := range def.Unread {
		m.note(Unsupported, e.Span, "%s definition %d: <%s> is not read", def.Type, def.ID, e.Name)
	}
	pairs, ok := m.pairs(c, value, angular)
	if !ok {
		return
	}
	var along *model.Vec
	if v := c.AnalysisVector; v != nil && !angular && v.V.Norm() > 0 {
		u := v.V.Unit()
		along = &u
	}
	for _, p := range pairs {
		v := m.unrounded(c.TargetValue, value, p, along, angular)
		d := &model.Dimension{Basic: basic, Reference: reference, Angle: angular, Value: v, ValueSpan: c.TargetValue.Span, ValueText: c.TargetValue.Text,
			From: p[0].target(), To: p[1].target(), Along: along, Span: c.Span}
		if tol != nil {
			t := *tol
			t.Nominal = v
			d.Tol = &t
		}
		m.addDim(d, c.ID)
	}
	m.checkDisplay(c, def)
}

// unrounded is a dimension's value between two features: the model's
// nominal where the value is that nominal rounded to the decimal places
// the document says it is given in (0.56 with decimalPlaces 2 for a
// nominal 0.5625), else the value as written. In a model-based definition
// the model's value is the basic one and the value shown is rounded for
// display (ASME Y14.41-2019, model values and their display precision,
// from memory), so a rounded display is no disagreement with the model.
func (m *mapper) unrounded(tv *Value, value float64, p [2]tgt, along *model.Vec, angular bool) float64 {
	half, ok := m.halfUnit(tv, angular)
	if !ok || along != nil {
		return value
	}
	if angular {
		a, b := p[0].f, p[1].f
		if !a.HasGeometry || !b.HasGeometry || a.Dir.Norm() == 0 || b.Dir.Norm() == 0 {
			return value
		}
		nom := model.AngleBetweenLines(a.Dir, b.Dir)
		for _, x := range []float64{nom, 180 - nom} {
			if math.Abs(x-value) <= half {
				return tidy(x)
			}
		}
		return value
	}
	nom, ok := distance(placeOf(p[0]), placeOf(p[1]))
	if ok && math.Abs(nom-math.Abs(value)) <= half {
		return tidy(math.Copysign(nom, value))
	}
	return value
}

// halfUnit is half a unit of the last decimal place a value is given in
// (decimalPlaces), in the model's units; false where it gives none.
func (m *mapper) halfUnit(v *Value, angular bool) (float64, bool) {
	if v == nil || v.Places < 0 {
		return 0, false
	}
	q := &Value{V: 0.5 * math.Pow(10, -float64(v.Places)), Unit: v.Unit, Places: -1, Span: v.Span}
	var x float64
	var ok bool
	if angular {
		x, ok = m.u.angle(q, true)
	} else {
		x, ok = m.u.length(q, true)
	}
	return x * (1 + 1e-9), ok
}

func wordText(w *Word) string {
	if w == nil {
		return "no tolerance"
	}
	return strings.ToLower(w.Text)
}

// pairs finds which features a dimension is between: its FeatureNominalPairs;
// its two features; for more, the one feature every other is at the value
// from, or consecutive pairs at the value (4x dimensions written on one
// characteristic). Anything else is left out with a note.
func (m *mapper) pairs(c *CharNominal, value float64, angular bool) ([][2]tgt, bool) {
	what := fmt.Sprintf("%s nominal %d", c.Type, c.ID)
	one := func(r Ref) (tgt, bool) {
		ts, left := m.targets([]Ref{r})
		if len(left) > 0 || len(ts) != 1 {
			m.note(Unsupported, c.Span, "%s is left out: %s", what, strings.Join(left, "; "))
			return tgt{}, false
		}
		return ts[0], true
	}
	var out [][2]tgt
	if len(c.Pairs) > 0 {
		for _, p := range c.Pairs {
			a, ok1 := one(p[0])
			b, ok2 := one(p[1])
			if !ok1 || !ok2 {
				return nil, false
			}
			out = append(out, [2]tgt{a, b})
		}
		return out, true
	}
	refs := m.featureRefs(c)
	if c.OriginFeature != nil || c.OriginDatum != nil {
		var origin tgt
		switch {
		case c.OriginFeature != nil:
			o, ok := one(*c.OriginFeature)
			if !ok {
				return nil, false
			}
			origin = o
		default:
			d := m.datumOf[c.OriginDatum.ID]
			if d == nil || !d.Target.Resolved() {
				m.note(Unsupported, c.OriginDatum.Span, "%s is measured from datum definition %d, which the model does not place: left out", what, c.OriginDatum.ID)
				return nil, false
			}
			origin = tgt{f: d.Target.Feature, mem: d.Target.Member, span: c.OriginDatum.Span}
		}
		for _, r := range refs {
			t, ok := one(r)
			if !ok {
				return nil, false
			}
			out = append(out, [2]tgt{origin, t})
		}
		return out, len(out) > 0
	}
	if len(refs) > 64 {
		m.note(Unsupported, c.Span, "%s is on %d features without pairs: left out", what, len(refs))
		return nil, false
	}
	var ts []tgt
	for _, r := range refs {
		t, ok := one(r)
		if !ok {
			return nil, false
		}
		ts = append(ts, t)
	}
	switch {
	case len(ts) < 2:
		m.note(Inconsistent, c.Span, "%s is on fewer than two features: left out", what)
		return nil, false
	case len(ts) == 2:
		return [][2]tgt{{ts[0], ts[1]}}, true
	}
	measure := func(a, b tgt) (float64, bool) {
		if angular {
			if !a.f.HasGeometry || !b.f.HasGeometry || a.f.Dir.Norm() == 0 || b.f.Dir.Norm() == 0 {
				return 0, false
			}
			return model.AngleBetweenLines(a.f.Dir, b.f.Dir), true
		}
		return distance(placeOf(a), placeOf(b))
	}
	tol := 1e-6 * math.Max(1, math.Abs(value))
	if x, ok := m.halfUnit(c.TargetValue, angular); ok {
		tol = math.Max(tol, x)
	}
	at := func(a, b tgt) bool {
		d, ok := measure(a, b)
		if angular && ok {
			return math.Abs(d-value) <= tol || math.Abs(180-d-value) <= tol
		}
		return ok && math.Abs(d-value) <= tol
	}
	var hubs []int
	for i := range ts {
		all := true
		for j := range ts {
			all = all && (i == j || at(ts[i], ts[j]))
		}
		if all {
			hubs = append(hubs, i)
		}
	}
	if len(hubs) == 1 {
		h := hubs[0]
		for j := range ts {
			if j != h {
				out = append(out, [2]tgt{ts[h], ts[j]})
			}
		}
		return out, true
	}
	if len(ts)%2 == 0 {
		okAll := true
		for i := 0; i < len(ts); i += 2 {
			okAll = okAll && at(ts[i], ts[i+1])
			out = append(out, [2]tgt{ts[i], ts[i+1]})
		}
		if okAll {
			return out, true
		}
	}
	m.note(Unsupported, c.Span, "%s is on %d features without FeatureNominalPairs, and the nominal geometry does not tell which pairs it is between: left out", what, len(ts))
	return nil, false
}

var (
	numberRE      = regexp.MustCompile(`[0-9]*\.?[0-9]+`)
	placeholderRE = regexp.MustCompile(`\{[A-Z_]+\}`)
	inchMarkRE    = regexp.MustCompile(`[0-9.](IN|")`)
	mmMarkRE      = regexp.MustCompile(`[0-9.]MM`)
)

// checkDisplay compares a size or dimension with its presentation (the PMI
// display texts that present the characteristic nominal): a presentation
// that shows neither the nominal nor the limits, or that writes a unit
// other than the value's label.
func (m *mapper) checkDisplay(c *CharNominal, def *CharDef) {
	want := []*Value{c.TargetValue}
	if t := def.Tolerance; t != nil && t.Limits {
		want = []*Value{t.Max, t.Min}
	}
	label := ""
	if v := want[0]; v != nil {
		label = strings.ToLower(v.Unit)
	}
	if a, ok := aliases[label]; ok {
		label = a
	}
	for _, ds := range m.doc.Displays[c.ID] {
		text := strings.Join(ds.Texts, " ")
		plain := strings.ToUpper(placeholderRE.ReplaceAllString(text, " "))
		switch {
		case inchMarkRE.MatchString(plain) && label == "mm":
			m.note(Inconsistent, ds.Span, "%s nominal %d is labelled mm, but its presentation %q writes inches", c.Type, c.ID, text)
		case mmMarkRE.MatchString(plain) && label == "inch":
			m.note(Inconsistent, ds.Span, "%s nominal %d is labelled inch, but its presentation %q writes mm", c.Type, c.ID, text)
		}
		var shown []string
		for _, v := range want {
			if v == nil {
				continue
			}
			found := false
			for _, t := range numberRE.FindAllString(plain, -1) {
				x, err := strconv.ParseFloat(t, 64)
				places := 0
				if i := strings.IndexByte(t, '.'); i >= 0 {
					places = len(t) - i - 1
				}
				found = found || err == nil && math.Abs(x-math.Abs(v.V)) <= 0.5*math.Pow(10, -float64(places))*(1+1e-9)
			}
			if !found {
				shown = append(shown, v.Text)
			}
		}
		if len(shown) > 0 {
			m.note(Inconsistent, ds.Span, "%s nominal %d has the value %s, but its presentation %q does not show it", c.Type, c.ID, strings.Join(shown, " and "), text)
		}
	}
}
