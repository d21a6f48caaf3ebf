package qif

import (
	"math"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// knownUnits are the SI factors of unit names in common use (metres or
// radians per unit; exact by definition: the inch is 25.4 mm, the foot
// 12 inches). They check the names FileUnits gives against its factors,
// and read a value whose label names no unit of the document.
var knownUnits = map[string]float64{
	"mm": 0.001, "millimeter": 0.001, "millimetre": 0.001, "cm": 0.01, "m": 1, "meter": 1, "metre": 1,
	"um": 1e-6, "micrometer": 1e-6, "micrometre": 1e-6, "micron": 1e-6, "km": 1000,
	"inch": 0.0254, "in": 0.0254, "ft": 0.3048, "foot": 0.3048, "mil": 2.54e-5, "uin": 2.54e-8, "mi": 1609.344,
	"radian": 1, "rad": 1, "degree": math.Pi / 180, "deg": math.Pi / 180, "revolution": 2 * math.Pi,
}

var angularNames = map[string]bool{"radian": true, "rad": true, "degree": true, "deg": true, "revolution": true}

// aliases are other names of one unit, so that counting labels does not
// take "in" and "inch" for two units.
var aliases = map[string]string{"in": "inch", "millimeter": "mm", "millimetre": "mm", "meter": "m", "metre": "m"}

// units converts the document's values into the model's units: lengths in
// mm or inches (the PMI unit where the document gives one, otherwise the
// geometry's), angles in degrees.
type units struct {
	m *mapper
	// model is the model's length unit and toSI its size in metres.
	model model.Units
	toSI  float64
	// known is false where the document gives no usable linear unit: values
	// are then read as written and the part has no units.
	known bool
	// scale divides lengths of the Features section (ScaleCoefficient).
	scale float64
	// labels counts the unit each length of Characteristics was read in,
	// for geometric tolerances and for sizes and dimensions apart.
	labels [2]map[string]int
	first  [2]map[string]source.Span
}

func sameFactor(a, b float64) bool { return math.Abs(a-b) <= 1e-6*math.Max(math.Abs(a), math.Abs(b)) }

func (u *units) init(m *mapper) {
	u.m = m
	d := m.doc
	u.scale = 1
	u.labels = [2]map[string]int{{}, {}}
	u.first = [2]map[string]source.Span{{}, {}}
	if s := d.Scale; s != nil {
		if s.V > 0 {
			u.scale = s.V
		} else {
			m.note(Inconsistent, s.Span, "the ScaleCoefficient %s is not positive: read as 1", s.Text)
		}
	}
	for _, x := range append([]*Unit{d.Units.Linear, d.Units.PMILinear, d.Units.Angular, d.Units.PMIAngular}, d.Units.Other...) {
		if x == nil {
			continue
		}
		if k, ok := knownUnits[strings.ToLower(x.Name)]; ok && !sameFactor(k, x.Factor) {
			m.note(Inconsistent, x.Span, "the unit named %q converts to SI with the factor %g, which is not the factor of %s (%g): values in it are read by the factor", x.Name, x.Factor, x.Name, k)
		}
	}
	lin := d.Units.PMILinear
	if lin == nil || !(sameFactor(lin.Factor, 0.001) || sameFactor(lin.Factor, 0.0254)) {
		if lin != nil {
			u.m.note(Unsupported, lin.Span, "the PMI unit %q is neither mm nor inch: the model is in %s", lin.Name, unitName(d.Units.Linear))
		}
		lin = d.Units.Linear
	}
	switch {
	case lin == nil:
		m.note(Inconsistent, d.Root, "the document gives no linear unit (FileUnits/PrimaryUnits/LinearUnit): lengths are read as written, in no unit")
		u.model, u.toSI = model.UnitsUnknown, 1
		return
	case sameFactor(lin.Factor, 0.0254):
		u.model, u.toSI = model.Inch, 0.0254
	default:
		// mm, or another metric unit converted to mm.
		u.model, u.toSI = model.MM, 0.001
	}
	u.known = true
	m.part.Units = u.model
	m.part.Headers = append(m.part.Headers, model.HeaderLine{Keyword: "units", Value: u.model.String(), Span: lin.Span})
}

func unitName(x *Unit) string {
	if x == nil {
		return "no unit"
	}
	return x.Name
}

// lookup finds the unit a label names: a unit of FileUnits, or a unit in
// common use (reported).
func (u *units) lookup(label string, at source.Span, angular bool) (float64, bool) {
	d := u.m.doc
	for _, x := range append([]*Unit{d.Units.Linear, d.Units.PMILinear, d.Units.Angular, d.Units.PMIAngular}, d.Units.Other...) {
		if x != nil && x.Name == label && (x.SI == "radian") == angular {
			return x.Factor, true
		}
	}
	if k, ok := knownUnits[strings.ToLower(label)]; ok && angularNames[strings.ToLower(label)] == angular {
		u.m.note(Inconsistent, at, "the unit %q is not defined in FileUnits: read as the %s of common use", label, label)
		return k, true
	}
	u.m.note(Inconsistent, at, "the unit %q is not defined in FileUnits and is not one the reader knows: the value is left out", label)
	return 0, false
}

// length converts a length. pmi selects the PMI unit (values of the
// Characteristics section); feature lengths are divided by the scale.
func (u *units) length(v *Value, pmi bool) (float64, bool) {
	if v == nil {
		return 0, false
	}
	f, ok := u.linearFactor(v.Unit, v.Span, pmi)
	if !ok {
		return 0, false
	}
	x := v.V * f / u.toSI
	if !pmi {
		x /= u.scale
	}
	return tidy(x), true
}

func (u *units) linearFactor(label string, at source.Span, pmi bool) (float64, bool) {
	if !u.known {
		return u.toSI, true
	}
	if label != "" {
		return u.lookup(label, at, false)
	}
	d := u.m.doc
	if pmi && d.Units.PMILinear != nil {
		return d.Units.PMILinear.Factor, true
	}
	return d.Units.Linear.Factor, true
}

// point converts a point of the Features section.
func (u *units) point(p *Vec3) (model.Vec, bool) { return u.pointScaled(p, u.scale) }

// zonePoint converts a point of FeatureZones, which ScaleCoefficient does
// not scale (it scales Product and Features only).
func (u *units) zonePoint(p *Vec3) (model.Vec, bool) { return u.pointScaled(p, 1) }

func (u *units) pointScaled(p *Vec3, scale float64) (model.Vec, bool) {
	if p == nil {
		return model.Vec{}, false
	}
	f, ok := u.linearFactor(p.Unit, p.Span, false)
	if !ok {
		return model.Vec{}, false
	}
	v := p.V.Scale(f / u.toSI / scale)
	return model.Vec{snap(v[0]), snap(v[1]), snap(v[2])}, true
}

// snap tidies a coordinate and makes one below a nanometre (or a billionth
// of an inch) zero: CAD systems write a coordinate meant to be zero as
// 4e-15, the rounding of their arithmetic.
func snap(x float64) float64 {
	if math.Abs(x) < 1e-9 {
		return 0
	}
	return tidy(x)
}

// decimals are the decimal places a point of the Features section says its
// coordinates have, in the model's unit: as written where it is read
// without conversion, otherwise -1 (a converted value has no decimals of
// its own).
func (u *units) decimals(p *Vec3) [3]int {
	none := [3]int{-1, -1, -1}
	if p == nil || u.scale != 1 {
		return none
	}
	if f, ok := u.linearFactor(p.Unit, source.Span{}, false); !ok || !sameFactor(f, u.toSI) {
		return none
	}
	return p.Places
}

// tolerance converts a length of Characteristics and counts its unit: kind
// 0 for geometric tolerances, 1 for sizes and dimensions.
func (u *units) tolerance(v *Value, kind int) (float64, bool) {
	x, ok := u.length(v, true)
	if ok && u.known {
		name := v.Unit
		if name == "" {
			name = unitName(u.m.doc.Units.PMILinear)
			if u.m.doc.Units.PMILinear == nil {
				name = unitName(u.m.doc.Units.Linear)
			}
		}
		if a, ok := aliases[strings.ToLower(name)]; ok {
			name = a
		}
		if u.labels[kind][name] == 0 {
			u.first[kind][name] = v.Span
		}
		u.labels[kind][name]++
	}
	return x, ok
}

// angle converts an angle to degrees; pmi selects the PMI angular unit. An
// angle without a unit where the document gives none is in radians (SI).
func (u *units) angle(v *Value, pmi bool) (float64, bool) {
	if v == nil {
		return 0, false
	}
	f := 1.0
	d := u.m.doc
	switch {
	case v.Unit != "":
		var ok bool
		if f, ok = u.lookup(v.Unit, v.Span, true); !ok {
			return 0, false
		}
	case pmi && d.Units.PMIAngular != nil:
		f = d.Units.PMIAngular.Factor
	case d.Units.Angular != nil:
		f = d.Units.Angular.Factor
	}
	return tidy(v.V * f * 180 / math.Pi), true
}

// tidy rounds a converted value to 12 significant digits, so that a value
// converted by a unit's factor reads as written (0.438 inch is 11.1252 mm,
// not 11.125200000000001). Values as written have fewer digits than that.
func tidy(x float64) float64 {
	if x == 0 || math.IsInf(x, 0) || math.IsNaN(x) {
		return x
	}
	e := math.Pow(10, 11-math.Floor(math.Log10(math.Abs(x))))
	if math.IsInf(e, 0) || e == 0 {
		return x
	}
	return math.Round(x*e) / e
}

// radians converts a raw angle of the Features section (a sweep's domain).
func (u *units) radians(x float64) float64 {
	if a := u.m.doc.Units.Angular; a != nil {
		return x * a.Factor
	}
	return x
}

// checkLabels reports characteristics that label geometric tolerances in
// one unit and sizes and dimensions in another: a drawing states its values
// in one unit (dual dimensioning aside), so one set of labels is likely
// wrong. Each value stays read in its own label.
func (u *units) checkLabels() {
	if len(u.labels[0]) != 1 || len(u.labels[1]) != 1 {
		return
	}
	var tol, size string
	for k := range u.labels[0] {
		tol = k
	}
	for k := range u.labels[1] {
		size = k
	}
	if tol == size {
		return
	}
	u.m.note(Inconsistent, u.first[0][tol], "the geometric tolerances are labelled %s (%d values) and the sizes and dimensions %s (%d values): a drawing gives its values in one unit, so one set of labels is likely wrong; each value is read in its own label",
		tol, u.labels[0][tol], size, u.labels[1][size])
}
