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

// feat is a feature nominal and what it became in the model.
type feat struct {
	nom      *FeatureNominal
	def      *FeatureDef
	kind     model.Kind
	dir      model.Vec
	hasDir   bool
	point    model.Vec
	hasPoint bool
	// places and dirPlaces are the decimals the document says the point's
	// and the direction's coordinates have (model.Member.Decimals).
	places, dirPlaces [3]int
	// size is the definition's nominal size (diameter, width), in model units.
	size     float64
	hasSize  bool
	sizeSpan source.Span
	// why is set where the feature is left out of the model.
	why       string
	kindOfWhy model.ProblemKind
	// group holds the members of a group or pattern nominal.
	group   []ID
	isGroup bool
	f       *model.Feature
	mem     *model.Member
}

func (x *feat) mapped() bool { return x != nil && x.why == "" && !x.isGroup }

// pattern is a set of like features that one characteristic or datum
// applies to together, made one pattern feature of the model.
type pattern struct {
	ids  []ID
	name string // a QIF group's name, when it came from one
	f    *model.Feature
}

// curveTypes are feature nominals that are curves the model has no kind
// for (it has lines, circles and points): they are left out.
var curveTypes = map[string]string{"CircularArc": "an arc", "Ellipse": "an ellipse",
	"EllipticalArc": "an elliptical arc", "ElongatedCircle": "an elongated circle", "OppositeParallelLines": "a pair of parallel lines",
	"OppositeAngledLines": "a pair of angled lines", "OtherCurve": "a curve", "PointDefinedCurve": "a curve", "Marking": "a marking"}

var groupTypes = map[string]bool{"Group": true, "PatternFeatureLinear": true, "PatternFeatureCircle": true,
	"PatternFeatureCircularArc": true, "PatternFeatureParallelogram": true}

func needsDir(k model.Kind) bool {
	switch k {
	case model.Plane, model.Slot, model.Tab, model.Hole, model.Pin, model.Cone, model.Extrusion, model.Line, model.Circle:
		return true
	}
	return false
}

// classify reads a feature nominal's kind and geometry.
func (m *mapper) classify(n *FeatureNominal) *feat {
	x := &feat{nom: n, kindOfWhy: Unsupported, places: [3]int{-1, -1, -1}, dirPlaces: [3]int{-1, -1, -1}}
	if groupTypes[n.Type] {
		x.isGroup = true
		for _, r := range n.Members {
			x.group = append(x.group, r.ID)
		}
		return x
	}
	switch n.Type {
	case "Line", "Point", "EdgePoint", "Circle":
		// Elements that dimensions and datum targets reach: a straight or
		// circular edge, a line on a surface, a point. Their definitions
		// say nothing the model needs but a circle's diameter.
		x.def = m.doc.FeatureDefs[refID(n.Def)]
		switch n.Type {
		case "Line":
			x.kind = model.Line
			m.geometry(x, "Location", "Direction")
		case "Circle":
			x.kind = model.Circle
			m.geometry(x, "Location", "Normal")
			if x.def != nil {
				m.defSize(x, "Diameter")
			}
		default:
			x.kind = model.Point
			m.geometry(x, "Location", "")
		}
		return x
	}
	if what, ok := curveTypes[n.Type]; ok {
		x.why = what + " is not a feature kind of the model yet"
		return x
	}
	if n.Def == nil {
		x.why, x.kindOfWhy = "it names no feature definition", Inconsistent
		return x
	}
	x.def = m.doc.FeatureDefs[n.Def.ID]
	switch {
	case x.def == nil:
		x.why, x.kindOfWhy = fmt.Sprintf("its definition %d is not in FeatureDefinitions", n.Def.ID), Inconsistent
		return x
	case x.def.Type != n.Type:
		x.why, x.kindOfWhy = fmt.Sprintf("it is a %s nominal with a %s definition (%d)", n.Type, x.def.Type, n.Def.ID), Inconsistent
		return x
	}
	side := ""
	if x.def.InternalExternal != nil {
		side = x.def.InternalExternal.Text
	}
	sized := func(in, ext model.Kind) bool {
		switch side {
		case "INTERNAL":
			x.kind = in
		case "EXTERNAL":
			x.kind = ext
		default:
			x.why, x.kindOfWhy = fmt.Sprintf("its definition does not say whether it is internal or external (%q)", side), Inconsistent
			return false
		}
		return true
	}
	switch n.Type {
	case "Plane":
		x.kind = model.Plane
		m.geometry(x, "Location", "Normal")
	case "Cylinder", "CylindricalSegment", "Threaded":
		if !sized(model.Hole, model.Pin) {
			return x
		}
		m.geometry(x, "Axis/AxisPoint", "Axis/Direction")
		m.defSize(x, "Diameter")
		if n.Type == "Threaded" {
			m.note(Unsupported, n.Span, "%s is a threaded feature: read as a plain %s (thread specifications are not read)", m.label(x), x.kind)
		}
		if d, ok := n.Domains["Sweep/DomainAngle"]; ok && m.u.radians(d[1]-d[0]) < math.Pi-1e-6 {
			m.asSurface(x, fmt.Sprintf("a cylindrical segment of %.4g degrees", m.u.radians(d[1]-d[0])*180/math.Pi))
		}
	case "OppositeParallelPlanes":
		if !sized(model.Slot, model.Tab) {
			return x
		}
		m.geometry(x, "CenterPlane/Point", "CenterPlane/Normal")
		m.defSize(x, "Width")
	case "ElongatedCylinder":
		if !sized(model.Slot, model.Tab) {
			return x
		}
		m.geometry(x, "CenterPlane/Point", "CenterPlane/Normal")
		m.defSize(x, "Diameter")
	case "Sphere", "SphericalSegment":
		if !sized(model.Socket, model.Ball) {
			return x
		}
		m.geometry(x, "Location", "")
		m.defSize(x, "Diameter")
		lat, okLat := n.Domains["LatitudeLongitudeSweep/DomainLatitude"]
		lon, okLon := n.Domains["LatitudeLongitudeSweep/DomainLongitude"]
		if okLat && okLon {
			// The solid angle of the latitude-longitude patch; a full sphere is 4 pi.
			omega := m.u.radians(lon[1]-lon[0]) * (math.Sin(m.u.radians(lat[1])) - math.Sin(m.u.radians(lat[0])))
			if omega < 2*math.Pi-1e-6 {
				m.asSurface(x, fmt.Sprintf("a spherical segment of %.2g of a sphere", omega/(4*math.Pi)))
			}
		}
	case "Cone", "ConicalSegment":
		x.kind = model.Cone
		m.geometry(x, "Axis/AxisPoint", "Axis/Direction")
		m.apex(x)
	case "ExtrudedCrossSection":
		x.kind = model.Extrusion
		m.geometry(x, "", "Direction")
		m.note(Unsupported, n.Span, "%s: an extruded shape's location is its cross section, which the reader does not read: the extrusion has a direction but no place", m.label(x))
	case "Torus", "ToroidalSegment":
		x.kind = model.Surface
		m.geometry(x, "Location", "")
	case "SurfaceOfRevolution":
		x.kind = model.Surface
		m.geometry(x, "Axis/AxisPoint", "")
	case "OppositeAngledPlanes":
		x.kind = model.Surface
		m.geometry(x, "CenterPlane/Point", "")
		m.note(Unsupported, n.Span, "%s is two opposed angled planes (a tapered width): read as a surface; the model has no tapered width", m.label(x))
	case "OtherShape", "OtherSurface", "OtherNonShape", "PointDefinedSurface":
		x.kind = model.Surface
	default:
		x.why = fmt.Sprintf("a %s feature is not a kind the reader knows", n.Type)
	}
	return x
}

// asSurface reads a partial cylinder or sphere that has no opposed points
// as a surface: a feature of size has opposed points (ASME Y14.5-2009,
// definitions: regular feature of size, from memory); a segment covering
// less than half of its full surface has none (our reading).
func (m *mapper) asSurface(x *feat, what string) {
	m.note(Unsupported, x.nom.Span, "%s is %s, which has no opposed points: read as a surface, not a feature of size", m.label(x), what)
	x.kind, x.hasDir, x.dir, x.hasSize, x.dirPlaces = model.Surface, false, model.Vec{}, false, [3]int{-1, -1, -1}
}

// label names a feature nominal in notes.
func (m *mapper) label(x *feat) string {
	if x.f != nil {
		return fmt.Sprintf("%s (feature nominal %d)", x.f.Name, x.nom.ID)
	}
	return fmt.Sprintf("feature nominal %d", x.nom.ID)
}

func (m *mapper) geometry(x *feat, point, dir string) {
	n := x.nom
	if point != "" {
		if p, ok := n.Points[point]; ok {
			x.point, x.hasPoint = m.u.point(p)
			x.places = m.u.decimals(p)
		}
	}
	if dir != "" {
		if v, ok := n.Points[dir]; ok {
			if v.V.Norm() == 0 {
				m.note(Inconsistent, v.Span, "the direction of %s is the zero vector: left out", m.label(x))
			} else {
				x.dir, x.hasDir = v.V.Unit(), true
				if v.V.Norm() == 1 {
					x.dirPlaces = v.Places // a unit vector as written
				}
			}
		}
	}
	missing := []string{}
	if point != "" && !x.hasPoint {
		missing = append(missing, point)
	}
	if dir != "" && !x.hasDir {
		missing = append(missing, dir)
	}
	if len(missing) > 0 {
		m.note(Inconsistent, n.Span, "%s has no readable %s: its geometry is unknown", m.label(x), strings.Join(missing, " or "))
	}
}

func (m *mapper) defSize(x *feat, name string) {
	v := x.def.Values[name]
	if v == nil {
		return
	}
	if s, ok := m.u.length(v, false); ok {
		x.size, x.hasSize, x.sizeSpan = s, true, v.Span
	}
}

// apex works out a cone's apex from its definition: the locating point has
// the definition's Diameter, the axis points into the expanding end and the
// half angle is between the side and the axis (QIF 3, ConeFeatureDefinition).
func (m *mapper) apex(x *feat) {
	if !x.hasPoint || !x.hasDir {
		return
	}
	d := x.def
	var half float64
	switch {
	case d.Values["HalfAngle"] != nil:
		half, _ = m.u.angle(d.Values["HalfAngle"], false)
	case d.Values["FullAngle"] != nil:
		half, _ = m.u.angle(d.Values["FullAngle"], false)
		half /= 2
	}
	dia, okDia := m.u.length(d.Values["Diameter"], false)
	if half <= 0 || half >= 90 || !okDia {
		m.note(Inconsistent, d.Span, "the cone definition %d has no half angle between 0 and 90 degrees (read %.4g) or no diameter: the apex of %s is unknown", d.ID, half, m.label(x))
		x.hasPoint = false
		return
	}
	dist := dia / 2 / math.Tan(half*math.Pi/180)
	x.point = x.point.Sub(x.dir.Scale(dist))
	x.places = [3]int{-1, -1, -1} // worked out, not written
}

// validName is a name the notation accepts.
var validName = regexp.MustCompile(`^[A-Za-z_][A-Za-z0-9_-]*$`)

// features classifies every feature nominal, groups like features under
// one characteristic or datum into patterns, and builds the model features.
func (m *mapper) features() {
	m.feats = map[ID]*feat{}
	m.inGroup = map[ID]*pattern{}
	for _, n := range m.doc.FeatureNominals {
		m.feats[n.ID] = m.classify(n)
	}
	m.findPatterns()
	names := m.names()
	for _, n := range m.doc.FeatureNominals {
		x := m.feats[n.ID]
		if x.isGroup {
			continue
		}
		if !x.mapped() {
			m.note(x.kindOfWhy, n.Span, "feature nominal %d (%s) is left out: %s", n.ID, n.Type, x.why)
			continue
		}
		if p := m.inGroup[n.ID]; p != nil {
			if p.f == nil {
				m.buildPattern(p, names[p.ids[0]])
			}
			continue
		}
		f := &model.Feature{Name: names[n.ID], Kind: x.kind, Span: n.Span, NameSpan: n.Span, Dir: x.dir, DirDecimals: x.dirPlaces}
		if n.Name != "" {
			f.NameSpan = n.NameSpan
		}
		f.Members = []*model.Member{{Feature: f, Index: 1, Point: x.point, Decimals: x.places, Span: n.Span}}
		f.HasGeometry = x.hasPoint && (x.hasDir || !needsDir(x.kind))
		if x.kind == model.Surface {
			f.Dir = model.Vec{}
		}
		if x.hasSize && x.kind.TakesSize() {
			f.Size = &model.Size{Nominal: x.size, Span: x.sizeSpan}
		}
		x.f = f
		m.part.Declare(f)
		m.res.Origins.Features[f] = []ID{n.ID}
	}
}

func (m *mapper) buildPattern(p *pattern, name string) {
	first := m.feats[p.ids[0]]
	f := &model.Feature{Name: name, Kind: first.kind, Span: first.nom.Span, NameSpan: first.nom.Span, Dir: first.dir, DirDecimals: first.dirPlaces, Pattern: true}
	f.HasGeometry = true
	for i, id := range p.ids {
		x := m.feats[id]
		mem := &model.Member{Feature: f, Index: i + 1, Point: x.point, Decimals: x.places, Span: x.nom.Span}
		f.Members = append(f.Members, mem)
		x.f, x.mem = f, mem
		f.HasGeometry = f.HasGeometry && x.hasPoint && (x.hasDir || !needsDir(x.kind))
	}
	if first.hasSize {
		f.Size = &model.Size{Nominal: first.size, Span: first.sizeSpan}
	}
	p.f = f
	m.part.Declare(f)
	m.res.Origins.Features[f] = append([]ID(nil), p.ids...)
}

// expand resolves references to features: a group's members stand for the
// group, and a characteristic written on feature items stands for their
// nominals.
func (m *mapper) expand(refs []Ref) []Ref {
	var out []Ref
	expanded := map[ID]bool{} // each group once: groups of groups cost their size, not its power
	var walk func(r Ref)
	walk = func(r Ref) {
		x := m.feats[r.ID]
		if x != nil && x.isGroup {
			if !expanded[r.ID] {
				expanded[r.ID] = true
				for _, id := range x.group {
					walk(Ref{ID: id, Span: r.Span})
				}
			}
			return
		}
		out = append(out, r)
	}
	for _, r := range refs {
		walk(r)
	}
	return out
}

// featureRefs are the features a characteristic nominal is on.
func (m *mapper) featureRefs(c *CharNominal) []Ref {
	if len(c.Features) > 0 {
		return m.expand(c.Features)
	}
	if m.itemsOf == nil {
		m.itemsOf = map[ID][]*CharItem{}
		for _, it := range m.doc.CharItems {
			if it.Nominal != nil {
				m.itemsOf[it.Nominal.ID] = append(m.itemsOf[it.Nominal.ID], it)
			}
		}
	}
	var out []Ref
	for _, it := range m.itemsOf[c.ID] {
		for _, fi := range it.FeatureItems {
			if item := m.doc.FeatureItems[fi.ID]; item != nil && item.Nominal != nil {
				out = append(out, Ref{ID: item.Nominal.ID, Span: fi.Span})
			}
		}
	}
	return m.expand(out)
}

// like reports whether two features can be members of one pattern: features
// of size of one kind and size whose axes or mid-planes are parallel.
func (m *mapper) like(a, b *feat) bool {
	if !a.mapped() || !b.mapped() || a.kind != b.kind || !a.kind.IsFOS() {
		return false
	}
	if a.hasSize != b.hasSize || a.hasSize && math.Abs(a.size-b.size) > 1e-6*math.Max(1, math.Abs(a.size)) {
		return false
	}
	if a.hasDir != b.hasDir || a.hasDir && !model.Parallel(a.dir, b.dir, 1e-6) {
		return false
	}
	return true
}

// proposal is a set of features a characteristic or datum applies to together.
type proposal struct {
	ids   []ID
	order int
	name  string
}

func dedupe(refs []Ref) []ID {
	seen := map[ID]bool{}
	var out []ID
	for _, r := range refs {
		if !seen[r.ID] {
			seen[r.ID] = true
			out = append(out, r.ID)
		}
	}
	return out
}

// findPatterns makes patterns of like features that a group, a geometric or
// size characteristic or a datum applies to together. Groups come first,
// then the larger sets; a set that overlaps an accepted pattern without
// being it stays single features.
func (m *mapper) findPatterns() {
	var props []proposal
	add := func(ids []ID, name string) {
		if len(ids) < 2 {
			return
		}
		for _, id := range ids[1:] {
			if !m.like(m.feats[ids[0]], m.feats[id]) {
				return
			}
		}
		props = append(props, proposal{ids: ids, order: len(props), name: name})
	}
	for _, n := range m.doc.FeatureNominals {
		if x := m.feats[n.ID]; x.isGroup {
			add(dedupe(m.expand([]Ref{{ID: n.ID}})), n.Name)
		}
	}
	groups := len(props)
	for _, c := range m.doc.CharNominals {
		if t := charTypeOf(c.Type); t == geometric || t == size {
			add(dedupe(m.featureRefs(c)), "")
		}
	}
	for _, d := range m.doc.Datums {
		add(dedupe(m.expand(d.Features)), "")
	}
	sort.SliceStable(props, func(i, j int) bool {
		gi, gj := props[i].order < groups, props[j].order < groups
		if gi != gj {
			return gi
		}
		return len(props[i].ids) > len(props[j].ids)
	})
	for _, pr := range props {
		free := true
		for _, id := range pr.ids {
			free = free && m.inGroup[id] == nil
		}
		if !free {
			continue
		}
		p := &pattern{ids: pr.ids, name: pr.name}
		for _, id := range pr.ids {
			m.inGroup[id] = p
		}
	}
}

// names gives every model feature its name: the QIF name where it is a
// valid notation name and unique, otherwise the kind and the QIF id
// (hole_2156; holes_3057 for a pattern, by its first member).
func (m *mapper) names() map[ID]string {
	count := map[string]int{}
	want := map[ID]string{}
	for _, n := range m.doc.FeatureNominals {
		x := m.feats[n.ID]
		if !x.mapped() {
			continue
		}
		if p := m.inGroup[n.ID]; p != nil {
			if p.ids[0] == n.ID {
				want[n.ID] = p.name
				count[p.name]++
			}
			continue
		}
		want[n.ID] = n.Name
		count[n.Name]++
	}
	out := map[ID]string{}
	taken := map[string]bool{}
	var generated []ID
	for _, n := range m.doc.FeatureNominals {
		w, ok := want[n.ID]
		if !ok {
			continue
		}
		if validName.MatchString(w) && count[w] == 1 && !strings.Contains(w, ".") {
			out[n.ID], taken[w] = w, true
		} else {
			generated = append(generated, n.ID)
		}
	}
	for _, id := range generated {
		x := m.feats[id]
		base := fmt.Sprintf("%s_%d", x.kind, id)
		if m.inGroup[id] != nil {
			base = fmt.Sprintf("%ss_%d", x.kind, id)
		}
		name := base
		for i := 2; taken[name]; i++ {
			name = fmt.Sprintf("%s_%d", base, i)
		}
		out[id], taken[name] = name, true
	}
	return out
}

// tgt is where a characteristic or datum applies in the model: a feature,
// or one member of a pattern.
type tgt struct {
	f    *model.Feature
	mem  *model.Member
	ids  []ID
	span source.Span
}

func (t tgt) target() model.Target {
	out := model.Target{Name: t.f.Name, Span: t.span, Feature: t.f, Member: t.mem}
	if t.mem != nil {
		out.Name = fmt.Sprintf("%s.%d", t.f.Name, t.mem.Index)
	}
	return out
}

// targets resolves feature references: the whole of a pattern where they
// are its members, otherwise each feature or pattern member. left lists
// the references the model does not hold, and why.
func (m *mapper) targets(refs []Ref) (out []tgt, left []string) {
	ids := dedupe(refs)
	if len(ids) == 0 {
		return nil, nil
	}
	if p := m.inGroup[ids[0]]; p != nil && sameSet(p.ids, ids) {
		return []tgt{{f: p.f, ids: ids, span: refs[0].Span}}, nil
	}
	seen := map[*feat]bool{}
	for _, r := range refs {
		x := m.feats[r.ID]
		switch {
		case x == nil:
			left = append(left, fmt.Sprintf("%d is no feature nominal", r.ID))
		case !x.mapped():
			left = append(left, fmt.Sprintf("feature nominal %d is left out (%s)", r.ID, x.why))
		case !seen[x]:
			seen[x] = true
			out = append(out, tgt{f: x.f, mem: x.mem, ids: []ID{r.ID}, span: r.Span})
		}
	}
	return out, left
}

func sameSet(a, b []ID) bool {
	if len(a) != len(b) {
		return false
	}
	in := map[ID]bool{}
	for _, x := range a {
		in[x] = true
	}
	for _, x := range b {
		if !in[x] {
			return false
		}
	}
	return true
}

// place is a feature's nominal geometry as a plane, a line or a point, for
// telling which features a dimension over several features is between.
type place struct {
	kind  int // 0 none, 1 plane, 2 line, 3 point
	point model.Vec
	dir   model.Vec
}

func placeOf(t tgt) place {
	f := t.f
	if !f.HasGeometry {
		return place{}
	}
	p := f.Point()
	if t.mem != nil {
		p = t.mem.Point
	}
	switch {
	case f.Kind == model.Plane || f.Kind.IsWidth():
		return place{1, p, f.Dir}
	case f.Kind.IsCylinder() || f.Kind == model.Cone || f.Kind == model.Line:
		return place{2, p, f.Dir}
	}
	return place{3, p, model.Vec{}}
}

// distance is the nominal distance between two places as the notation
// measures a linear dimension (docs/notation.md, dimensions), or false.
func distance(a, b place) (float64, bool) {
	if a.kind == 0 || b.kind == 0 {
		return 0, false
	}
	if b.kind == 1 && a.kind != 1 {
		a, b = b, a
	}
	d := b.point.Sub(a.point)
	switch {
	case a.kind == 1:
		if b.kind == 1 && !model.Parallel(a.dir, b.dir, 1e-6) {
			return 0, false
		}
		return math.Abs(d.Dot(a.dir)), true
	case a.kind == 2 && b.kind == 2:
		if !model.Parallel(a.dir, b.dir, 1e-6) {
			return 0, false
		}
		return d.Sub(a.dir.Scale(d.Dot(a.dir))).Norm(), true
	case a.kind == 2:
		return d.Sub(a.dir.Scale(d.Dot(a.dir))).Norm(), true
	case b.kind == 2:
		return d.Sub(b.dir.Scale(d.Dot(b.dir))).Norm(), true
	}
	return d.Norm(), true
}

func refID(r *Ref) ID {
	if r == nil {
		return 0
	}
	return r.ID
}
