package qif

import (
	"fmt"
	"math"
	"regexp"
	"sort"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// datums builds a model datum for every datum definition: on its feature,
// on the whole of a pattern, or, for a datum established by datum targets,
// on the feature its targets lie on (the model has no datum targets yet).
// A datum the model cannot place is kept as Broken, so that frames naming
// its letter do not report it undefined.
func (m *mapper) datums() {
	m.datumOf = map[ID]*model.Datum{}
	for _, dd := range m.doc.Datums {
		if dd.Label == "" {
			m.note(Inconsistent, dd.Span, "datum definition %d has no DatumLabel: left out", dd.ID)
			continue
		}
		d := &model.Datum{Letter: dd.Label, LetterSpan: dd.LabelSpan, Span: dd.Span}
		if d.LetterSpan.IsZero() {
			d.LetterSpan = dd.Span
		}
		refs := m.expand(dd.Features)
		if len(dd.Targets) > 0 {
			if t := m.targetFeatures(dd); len(refs) == 0 {
				refs = m.expand(t)
			}
		}
		ts, left := m.targets(refs)
		broken := func(why string) {
			d.Broken, d.Target = true, model.Target{Problem: why}
			m.note(Unsupported, dd.Span, "datum %s is left without its feature: %s", dd.Label, why)
		}
		switch {
		case len(refs) == 0:
			d.Broken, d.Target = true, model.Target{Problem: "on no feature"}
			m.note(Inconsistent, dd.Span, "datum %s is on no feature and no datum target", dd.Label)
		case len(left) > 0:
			broken(strings.Join(left, "; "))
		case len(ts) == 1:
			d.Target = ts[0].target()
		case sameGeometry(ts):
			d.Target = ts[0].target()
			m.note(Unsupported, dd.Span, "datum %s is on %d features that share one %s: the model holds one, %s", dd.Label, len(ts), shareWord(ts[0].f.Kind), d.Target.Name)
		default:
			names := []string{}
			for _, t := range ts {
				names = append(names, t.target().Name)
			}
			broken(fmt.Sprintf("it is on %d features (%s) that are neither a pattern nor one plane, axis or centre, and the model holds a datum on one", len(ts), strings.Join(names, ", ")))
		}
		m.part.AddDatum(d)
		m.datumOf[dd.ID] = d
		m.res.Origins.Datums[d] = dd.ID
		if d.Target.Resolved() {
			m.part.Refs = append(m.part.Refs, &d.Target)
		}
	}
}

func shareWord(k model.Kind) string {
	switch {
	case k == model.Plane || k.IsWidth():
		return "plane"
	case k.IsSphere():
		return "centre"
	}
	return "axis"
}

// sameGeometry reports whether features are coplanar planes, coaxial
// cylinders or concentric spheres: a datum on all of them is one datum on
// any of them.
func sameGeometry(ts []tgt) bool {
	first := placeOf(ts[0])
	if first.kind == 0 {
		return false
	}
	for _, t := range ts[1:] {
		p := placeOf(t)
		if p.kind != first.kind || p.kind != 3 && !model.Parallel(p.dir, first.dir, 1e-6) {
			return false
		}
		d, ok := distance(first, p)
		tol := 1e-6 * math.Max(1, math.Max(first.point.Norm(), p.point.Norm()))
		if !ok || d > tol {
			return false
		}
		if first.kind == 1 && math.Abs(p.point.Sub(first.point).Dot(first.dir)) > tol {
			return false
		}
	}
	return true
}

// targetFeatures returns the features a datum's targets are named on, and
// reads each target with a zone as a model datum target (a point, a line or
// an area, at its zone's place) on the feature it lies on; a target without
// a zone is the whole feature. Each target's zone is checked against the
// plane it names.
func (m *mapper) targetFeatures(dd *DatumDef) []Ref {
	var refs []Ref
	for _, tr := range dd.Targets {
		t := m.doc.Targets[tr.ID]
		if t == nil {
			m.note(Inconsistent, tr.Span, "datum %s names datum target %d, which is not in DatumTargetDefinitions", dd.Label, tr.ID)
			continue
		}
		var z *Zone
		if t.Zone != nil {
			if z = m.doc.Zones[t.Zone.ID]; z == nil {
				m.note(Inconsistent, t.Zone.Span, "datum target %s names feature zone %d, which is not in FeatureZones", t.Label, t.Zone.ID)
			}
		}
		if t.Feature == nil {
			m.note(Inconsistent, t.Span, "datum target %s is on no feature (FeatureNominalId): datum %s cannot use it", t.Label, dd.Label)
			continue
		}
		refs = append(refs, *t.Feature)
		if t.Movable {
			m.note(Unsupported, t.Span, "datum target %s is movable: the model has no movable datum targets; read as fixed", t.Label)
		}
		if z == nil {
			if t.Zone == nil {
				m.note(Unsupported, t.Span, "datum target %s has no target zone: read as the whole of its feature, datum %s on it", t.Label, dd.Label)
			}
			continue
		}
		on := t.Feature.ID
		if y := m.checkZone(t, z); y != nil {
			on = y.nom.ID
		}
		m.datumTarget(dd, t, z, on)
	}
	return refs
}

// targetLabelRE is a datum target's label as the model names one: its
// datum's letter and a number.
var targetLabelRE = regexp.MustCompile(`^([A-Z]{1,2})([0-9]+)$`)

// datumTarget adds a model datum target for a QIF target with a zone, on
// the feature nominal on, with the point or line feature that stands for
// it (named by its label, so that dimensions may reach it).
func (m *mapper) datumTarget(dd *DatumDef, t *DatumTarget, z *Zone, on ID) {
	x := m.feats[on]
	if !x.mapped() {
		m.note(Unsupported, t.Span, "datum target %s is on feature nominal %d, which the model leaves out: read as the whole feature", t.Label, on)
		return
	}
	if mm := targetLabelRE.FindStringSubmatch(t.Label); mm == nil || mm[1] != dd.Label {
		m.note(Unsupported, t.LabelSpan, "datum target %q of datum %s is not named by its datum's letter and a number: read as the whole of its feature", t.Label, dd.Label)
		return
	}
	if m.part.Feature(t.Label) != nil {
		m.note(Inconsistent, t.LabelSpan, "datum target %s has the name of a feature: read as the whole of its feature", t.Label)
		return
	}
	dt := &model.DatumTarget{Label: t.Label, LabelSpan: t.LabelSpan, Span: t.Span, Letter: dd.Label}
	if dt.LabelSpan.IsZero() {
		dt.LabelSpan = t.Span
	}
	dt.On = tgt{f: x.f, mem: x.mem, span: t.Feature.Span}.target()
	point := func(v *Vec3) (model.Vec, bool) { return m.u.zonePoint(v) }
	length := func(v *Value) (float64, bool) {
		l, ok := m.u.length(v, false)
		return tidy(l * m.u.scale), ok // zones are not scaled
	}
	ok := false
	switch {
	case z.Type == "Point" && len(z.Points) == 1:
		dt.Shape = model.TargetPoint
		dt.Point, ok = point(z.Points[0])
		dt.End = dt.Point
	case z.Type == "CurveLine" && len(z.Points) == 2:
		dt.Shape = model.TargetLine
		var ok2 bool
		dt.Point, ok = point(z.Points[0])
		dt.End, ok2 = point(z.Points[1])
		ok = ok && ok2 && dt.Point != dt.End
	case z.Type == "AreaCircular" && z.Center != nil && z.Dia != nil:
		dt.Shape = model.TargetArea
		var ok2 bool
		dt.Point, ok = point(z.Center)
		dt.Dia, ok2 = length(z.Dia)
		ok = ok && ok2 && dt.Dia > 0
		dt.End = dt.Point
	case z.Type == "AreaRectangular" && z.Corner != nil && z.Length != nil && z.Width != nil && z.LengthDir != nil && z.WidthDir != nil:
		dt.Shape = model.TargetArea
		corner, ok1 := point(z.Corner)
		l, ok2 := length(z.Length)
		w, ok3 := length(z.Width)
		ok = ok1 && ok2 && ok3 && l > 0 && w > 0 && z.LengthDir.V.Norm() > 0 && z.WidthDir.V.Norm() > 0
		if ok {
			dt.Width, dt.Height = l, w
			dt.Point = corner.Add(z.LengthDir.V.Unit().Scale(l / 2)).Add(z.WidthDir.V.Unit().Scale(w / 2))
			dt.End = dt.Point
		}
	default:
		m.note(Unsupported, z.Span, "the zone of datum target %s is a %s zone, which the model has no datum target for: read as the whole of its feature", t.Label, zoneWord(z.Type))
		return
	}
	if !ok {
		m.note(Inconsistent, z.Span, "the zone of datum target %s has no readable place or size: read as the whole of its feature", t.Label)
		return
	}
	if z.Normal != nil && z.Normal.V.Norm() > 0 {
		dt.Normal = z.Normal.V.Unit()
	}
	ft := &model.Feature{Name: t.Label, NameSpan: dt.LabelSpan, Span: t.Span, Kind: model.Point, HasGeometry: true, DirDecimals: [3]int{-1, -1, -1}, DatumTarget: dt}
	if dt.Shape == model.TargetLine {
		ft.Kind, ft.Dir = model.Line, dt.End.Sub(dt.Point).Unit()
	}
	ft.Members = []*model.Member{{Feature: ft, Index: 1, Point: dt.Point, Decimals: [3]int{-1, -1, -1}, Span: t.Span}}
	dt.Feature = ft
	m.part.Declare(ft)
	m.part.AddTarget(dt)
	m.part.Refs = append(m.part.Refs, &dt.On)
}

func zoneWord(t string) string {
	switch {
	case t == "Point":
		return "point"
	case strings.HasPrefix(t, "Curve"):
		return "line"
	case strings.HasPrefix(t, "Area"):
		return "area"
	}
	return strings.ToLower(t)
}

// checkZone reports a target zone whose points do not lie on the plane the
// target names, and returns the one plane of the part they lie on instead,
// where there is one (the target is read there).
func (m *mapper) checkZone(t *DatumTarget, z *Zone) *feat {
	x := m.feats[t.Feature.ID]
	if !x.mapped() || x.kind != model.Plane || !x.hasPoint || !x.hasDir {
		return nil
	}
	off := func(y *feat, pts []model.Vec) float64 {
		worst := 0.0
		for _, p := range pts {
			worst = math.Max(worst, math.Abs(p.Sub(y.point).Dot(y.dir)))
		}
		return worst
	}
	var pts []model.Vec
	for _, p := range append(append([]*Vec3(nil), z.Points...), z.Center) {
		if v, ok := m.u.zonePoint(p); ok {
			pts = append(pts, v)
		}
	}
	if len(pts) == 0 {
		return nil
	}
	tol := 1e-6 * math.Max(1, x.point.Norm())
	d := off(x, pts)
	if d <= tol {
		return nil
	}
	msg := fmt.Sprintf("the zone of datum target %s (feature zone %d) is %.4g %s off the plane it names, feature nominal %d", t.Label, z.ID, d, m.u.model, t.Feature.ID)
	if m.planes == nil {
		m.planes = []*feat{}
		for _, n := range m.doc.FeatureNominals {
			if y := m.feats[n.ID]; y.mapped() && y.kind == model.Plane && y.hasPoint && y.hasDir {
				m.planes = append(m.planes, y)
			}
		}
	}
	var on []*feat
	for i, y := range m.planes {
		if i == maxPlaneSearch {
			break
		}
		if y.nom.ID != t.Feature.ID && off(y, pts) <= tol {
			on = append(on, y)
		}
	}
	switch len(on) {
	case 0:
		m.note(Inconsistent, z.Span, "%s: the target is read as given", msg)
	case 1:
		m.note(Inconsistent, z.Span, "%s; it lies on feature nominal %d: the target is read there", msg, on[0].nom.ID)
		return on[0]
	default:
		var ids []string
		for _, y := range on {
			ids = append(ids, fmt.Sprint(y.nom.ID))
		}
		m.note(Inconsistent, z.Span, "%s; it lies on feature nominals %s: the target is read as given", msg, strings.Join(ids, ", "))
	}
	return nil
}

// maxPlaneSearch bounds the planes searched for the one a misplaced target
// zone lies on (a hostile document could have very many of both).
const maxPlaneSearch = 5000

var precedenceRank = map[string]int{"PRIMARY": 1, "SECONDARY": 2, "TERTIARY": 3, "QUATERNARY": 4, "QUINARY": 5, "SENARY": 6}

// material maps a material modifier to the model's letter, with a note for
// what the model has no place for (the reciprocity requirement).
func (m *mapper) material(w *Word, what string) string {
	if w == nil {
		return ""
	}
	switch w.Text {
	case "MAXIMUM":
		return "M"
	case "LEAST":
		return "L"
	case "MAXIMUM_RPR", "LEAST_RPR":
		m.note(Unsupported, w.Span, "%s: the reciprocity requirement (R) is left out; read as %s", what, strings.TrimSuffix(w.Text, "_RPR"))
		return w.Text[:1]
	case "NONE", "REGARDLESS", "":
		return ""
	}
	m.note(Inconsistent, w.Span, "%s: the material condition %q is not one QIF defines: read as none", what, w.Text)
	return ""
}

// ownRefs places a frame's datum references on its characteristic's
// element where their datum reference frame serves several
// characteristics: a finding about one frame's use of a datum (not needed,
// at a boundary it may not have) is then that frame's, as it is for the
// frames an import writes, rather than merged with the others' on the
// shared element.
func (m *mapper) ownRefs(refs []*model.DatumRef, drf *Ref, own source.Span) []*model.DatumRef {
	if drf == nil || m.drfUse[drf.ID] < 2 {
		return refs
	}
	out := make([]*model.DatumRef, len(refs))
	for i, r := range refs {
		c := *r
		c.Span = own
		if !c.FullSpan.IsZero() {
			c.FullSpan = own
		}
		if !c.MatSpan.IsZero() {
			c.MatSpan = own
		}
		if c.MatSpans != nil {
			c.MatSpans = append([]source.Span(nil), c.MatSpans...)
			for j := range c.MatSpans {
				if !c.MatSpans[j].IsZero() {
					c.MatSpans[j] = own
				}
			}
		}
		out[i] = &c
	}
	return out
}

// drfRefs builds a frame segment's datum references from a datum reference
// frame, in precedence order. It fails (false) where the frame cannot be
// read faithfully; the caller then leaves the characteristic out.
func (m *mapper) drfRefs(ref *Ref) ([]*model.DatumRef, bool) {
	if ref == nil {
		return nil, true
	}
	drf := m.doc.DRFs[ref.ID]
	if drf == nil {
		m.note(Inconsistent, ref.Span, "datum reference frame %d is not in DatumReferenceFrames", ref.ID)
		return nil, false
	}
	ds := append([]*DRFDatum(nil), drf.Datums...)
	rank := func(d *DRFDatum) int {
		if d.Precedence == nil {
			return 100
		}
		if r, ok := precedenceRank[d.Precedence.Text]; ok {
			return r
		}
		return 100
	}
	seen := map[int]bool{}
	for _, d := range ds {
		r := rank(d)
		switch {
		case d.Precedence == nil:
			m.note(Inconsistent, d.Span, "a datum of datum reference frame %d has no precedence: read in the order written", drf.ID)
		case r == 100:
			m.note(Unsupported, d.Precedence.Span, "the precedence %q is not read: the datum is read after the others", d.Precedence.Text)
		case seen[r]:
			m.note(Inconsistent, d.Precedence.Span, "datum reference frame %d has two %s datums", drf.ID, d.Precedence.Text)
		}
		seen[r] = true
	}
	sort.SliceStable(ds, func(i, j int) bool { return rank(ds[i]) < rank(ds[j]) })
	if len(ds) > 3 {
		m.note(Unsupported, ds[3].Span, "datum reference frame %d has %d datums: the model reads primary, secondary and tertiary; the rest are left out", drf.ID, len(ds))
		ds = ds[:3]
	}
	var out []*model.DatumRef
	for _, d := range ds {
		switch d.Kind {
		case "SimpleDatum", "CompoundDatum":
		case "":
			m.note(Inconsistent, d.Span, "a datum of datum reference frame %d names no datum", drf.ID)
			return nil, false
		default:
			m.note(Unsupported, d.KindSpan, "a %s (a datum feature without a datum definition) is not read: characteristics on datum reference frame %d are left out", d.Kind, drf.ID)
			return nil, false
		}
		r := &model.DatumRef{Span: d.KindSpan}
		mats := map[string]bool{}
		var each []string
		var eachSpan []source.Span
		for _, s := range d.Members {
			if s.Def == nil {
				m.note(Inconsistent, s.Span, "a datum of datum reference frame %d names no datum definition", drf.ID)
				return nil, false
			}
			dt := m.datumOf[s.Def.ID]
			if dt == nil {
				m.note(Inconsistent, s.Def.Span, "datum reference frame %d names datum definition %d, which is not in DatumDefinitions", drf.ID, s.Def.ID)
				return nil, false
			}
			r.Letters = append(r.Letters, dt.Letter)
			r.Datums = append(r.Datums, dt)
			mat := m.material(s.Material, "datum "+dt.Letter)
			mats[mat] = true
			each = append(each, mat)
			if mat != "" {
				eachSpan = append(eachSpan, s.Material.Span)
			} else {
				eachSpan = append(eachSpan, source.Span{})
			}
			if mat != "" && r.MatSpan.IsZero() {
				r.MatSpan = s.Material.Span
			}
			if len(d.Members) == 1 {
				r.Span = s.Def.Span
			}
			for _, e := range s.Unread {
				m.note(Unsupported, e.Span, "the datum modifier <%s> of datum %s is not read: the model has none", e.Name, dt.Letter)
			}
		}
		if len(r.Letters) == 0 {
			m.note(Inconsistent, d.Span, "a common datum of datum reference frame %d has no member", drf.ID)
			return nil, false
		}
		r.Name = strings.Join(r.Letters, "-")
		switch {
		case len(mats) == 1:
			for k := range mats {
				r.Material = k
			}
		default:
			// A boundary per member of a common datum, H(M)-J(M).
			r.MatSpan = source.Span{}
			r.Materials, r.MatSpans = each, eachSpan
		}
		if r.Material == "" {
			r.MatSpan = source.Span{}
		}
		out = append(out, r)
	}
	return out, true
}
