package qif

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// ID is a QIF id (QIFIdType: an unsigned integer, unique in the document).
type ID uint64

// Ref is a reference to an element by its id, where the reference is written.
type Ref struct {
	ID   ID
	Span source.Span
}

// Value is a number as written, with the unit label it carries itself
// (linearUnit or angularUnit; "" when it has none) and its decimalPlaces
// (-1 when not given).
type Value struct {
	V      float64
	Text   string
	Unit   string
	Places int
	Span   source.Span
}

// Vec3 is a point or direction as written ("x y z"), with its own unit
// label and the decimal places it says its coordinates have
// (decimalPlaces, or xDecimalPlaces ...; -1 where it says none).
type Vec3 struct {
	V      model.Vec
	Unit   string
	Places [3]int
	Span   source.Span
}

// Word is an enumerated value (MAXIMUM, ALL_AROUND, ...) or the name of a
// chosen element (DiametricalZone), where it is written.
type Word struct {
	Text string
	Span source.Span
}

// Elem is an element the document layer did not interpret, kept so that
// the mapping can say what it left out.
type Elem struct {
	Name string
	Text string
	Span source.Span
}

// Unit is a unit defined in FileUnits: a value in it times Factor (plus
// Offset first) is in SI units (metres, radians).
type Unit struct {
	Name   string
	SI     string
	Factor float64
	Offset float64
	Span   source.Span
}

// Units are the document's FileUnits: the primary units, the PMI units that
// override them in Characteristics, and the other units values may name.
type Units struct {
	Linear, PMILinear   *Unit
	Angular, PMIAngular *Unit
	Other               []*Unit
	Span                source.Span
}

// Standard is one entry of StandardsDefinitions.
type Standard struct {
	ID           ID
	Organization string // ASME, ISO, ... or the other organization's name
	Designator   string
	Year         string
	Span         source.Span
}

// FeatureDef is a feature definition: what like features share (the size,
// whether the feature is internal or external).
type FeatureDef struct {
	ID               ID
	Type             string // the element name without FeatureDefinition: Cylinder, Plane, ...
	InternalExternal *Word
	// Size-like values, by element name (Diameter, Width, HalfAngle, ...).
	Values map[string]*Value
	Span   source.Span
}

// FeatureNominal is a feature nominal: one feature's nominal geometry.
type FeatureNominal struct {
	ID       ID
	Type     string // Plane, Cylinder, ...
	Name     string
	NameSpan source.Span
	Def      *Ref
	// Geometry, by the path of the element that holds it: "Location",
	// "Normal", "Axis/AxisPoint", "Axis/Direction", "CenterPlane/Point",
	// "CenterPlane/Normal", "Direction", "AxisVector".
	Points map[string]*Vec3
	// Sweep domains, in the angular unit of the document: "Sweep/DomainAngle",
	// "LatitudeLongitudeSweep/DomainLatitude", ".../DomainLongitude".
	Domains map[string][2]float64
	// Members are the features of a group (GroupFeatureNominal and the
	// pattern features).
	Members []Ref
	// Faces is the number of model faces the feature is made of.
	Faces int
	Span  source.Span
}

// FeatureItem is a feature item: the link from a plan's feature to its nominal.
type FeatureItem struct {
	ID      ID
	Nominal *Ref
	Span    source.Span
}

// DatumDef is a datum definition: a letter on features or on datum targets.
type DatumDef struct {
	ID        ID
	Label     string
	LabelSpan source.Span
	Features  []Ref
	Targets   []Ref
	Span      source.Span
}

// DatumTarget is one datum target (A1, A2, ...): on a feature, in a zone.
type DatumTarget struct {
	ID        ID
	Label     string
	LabelSpan source.Span
	Feature   *Ref
	Zone      *Ref
	Movable   bool
	Span      source.Span
}

// Zone is a feature zone (FeatureZones): a point, a line, an area.
type Zone struct {
	ID   ID
	Type string // Point, CurveLine, AreaCircular, ...
	// Points are a point zone's point or a line zone's two ends.
	Points []*Vec3
	// A circular area: Center, Dia and Normal; a rectangular one: Corner,
	// Length along LengthDir, Width along WidthDir, and Normal.
	Center, Corner, Normal, LengthDir, WidthDir *Vec3
	Dia, Length, Width                          *Value
	Span                                        source.Span
}

// DRF is a datum reference frame.
type DRF struct {
	ID     ID
	Datums []*DRFDatum
	Span   source.Span
}

// DRFDatum is one datum reference of a frame, with its precedence.
type DRFDatum struct {
	// Kind is SimpleDatum, CompoundDatum, NominalDatumFeature or
	// MeasuredDatumFeature.
	Kind       string
	Members    []*SimpleDatum // one for a simple datum, two or more for a compound one
	Precedence *Word          // PRIMARY ... or OtherPrecedence's text
	Span       source.Span    // the Datum element
	KindSpan   source.Span    // the SimpleDatum/CompoundDatum/... element
}

// SimpleDatum is one datum of a reference: its definition and modifiers.
type SimpleDatum struct {
	Def      *Ref
	Material *Word
	// Unread holds the datum's modifiers the model has no place for
	// (translation, degrees of freedom, projected datum, ...).
	Unread []Elem
	Span   source.Span
}

// CharDef is a characteristic definition: a tolerance and its modifiers, or
// a size or dimension's tolerance, shared by the nominals that use it.
type CharDef struct {
	ID             ID
	Type           string // Position, Flatness, Diameter, DistanceBetween, ...
	ToleranceValue *Value
	PerUnit        *PerUnit
	DRF            *Ref
	Material       *Word
	Zone           *Word // DiametricalZone, SphericalZone, NonDiametricalZone, PlanarZone
	ZoneDir        *Vec3 // the zone's ZoneOrientationVector
	// Modifier values by element name: ProjectedToleranceZoneValue,
	// UnequallyDisposedZone, OuterDisposition, MaximumToleranceValue.
	Modifiers  map[string]*Value
	Extent     *Word
	Composites []*Composite
	// Flags are the boolean elements written true (FreeState, TangentPlane,
	// SeparateZone, ...), by name.
	Flags map[string]source.Span
	// Size and dimension characteristics.
	DimensionType *Word
	Tolerance     *Tolerance
	NonTolerance  *Word
	Unread        []Elem
	Span          source.Span
}

// PerUnit is a tolerance per unit area or length (ToleranceZonePerUnit...).
type PerUnit struct {
	Kind  string // Area, Length, Angle, ArcLength, PolarArea
	Value *Value
	// Unit are the sizes of the unit area or length (a rectangle's length
	// and width; a circle's diameter; a length).
	Unit []*Value
	Span source.Span
}

// Tolerance is a size or dimension tolerance: deviations, or limits.
type Tolerance struct {
	Max, Min *Value
	Limits   bool // DefinedAsLimit: Max and Min are limits, not deviations
	Span     source.Span
}

// Composite is a lower segment of a composite frame.
type Composite struct {
	Ordinal        int // 2, 3, 4
	DRF            *Ref
	ToleranceValue *Value
	Material       *Word
	Zone           *Word
	Projected      *Value
	Unread         []Elem
	Span           source.Span
}

// CharNominal is a characteristic nominal: one callout on features.
type CharNominal struct {
	ID             ID
	Type           string
	Def            *Ref
	Features       []Ref
	Zones          []Ref
	Name           string
	TargetValue    *Value
	Angle          *Value // angularity's nominal angle
	Pairs          [][2]Ref
	AnalysisVector *Vec3
	// OriginFeature or OriginDatum is what a DistanceFrom or AngleFrom is
	// measured from (OriginReference).
	OriginFeature *Ref
	OriginDatum   *Ref
	Span          source.Span
}

// CharItem is a characteristic item: the link from a plan's characteristic
// to its nominal and the feature items it is on.
type CharItem struct {
	ID           ID
	Nominal      *Ref
	FeatureItems []Ref
	Span         source.Span
}

// Display is a PMI display (the presentation of a characteristic or datum):
// its texts and the ids it presents.
type Display struct {
	Texts []string
	Refs  []ID
	Span  source.Span
}

// Document is what the reader reads of a QIF 3 document, with where each
// element is written.
type Document struct {
	File      *source.File
	Version   string
	Root      source.Span
	Title     string
	TitleSpan source.Span
	Units     Units
	// Scale is Product/Header/ScaleCoefficient (values of the Features
	// section are written times it); nil when absent.
	Scale          *Value
	Standards      []*Standard
	FormalStandard *Ref

	FeatureDefs     map[ID]*FeatureDef
	FeatureNominals []*FeatureNominal
	FeatureItems    map[ID]*FeatureItem
	Datums          []*DatumDef
	Targets         map[ID]*DatumTarget
	Zones           map[ID]*Zone
	DRFs            map[ID]*DRF
	CharDefs        map[ID]*CharDef
	CharNominals    []*CharNominal
	CharItems       []*CharItem
	Displays        map[ID][]*Display
	// Sections are the characteristics sections the reader does not map
	// (default tolerances, groups, simultaneous requirement groups).
	Sections []Elem

	// Notes are what the document layer found unreadable (a number that is
	// not one, an id that is not one).
	Notes []Note
	// Statements are the elements a finding can be about, in file order:
	// the root's start tag, FileUnits, each standard, datum definition and
	// target, datum reference frame, feature definition, nominal, item and
	// zone, characteristic definition, nominal and item, the part and its
	// PMI displays (model.Statement: Keyword the element's name; the text
	// that SARIF fingerprints hash is the element as written).
	Statements []model.Statement

	nominals map[ID]*FeatureNominal
}

// Nominal returns the feature nominal with the id, or nil.
func (d *Document) Nominal(id ID) *FeatureNominal { return d.nominals[id] }

// Decode reads a QIF 3 document's datums, frames, features and
// characteristics, streaming its XML within DefaultLimits.
func Decode(f *source.File) (*Document, error) { return decodeWith(f, DefaultLimits) }

func decodeWith(f *source.File, lim Limits) (*Document, error) {
	x, err := decodeXML(f, lim)
	if err != nil {
		return nil, err
	}
	r := &docReader{f: f, doc: &Document{
		File: f, FeatureDefs: map[ID]*FeatureDef{}, FeatureItems: map[ID]*FeatureItem{},
		Targets: map[ID]*DatumTarget{}, Zones: map[ID]*Zone{}, DRFs: map[ID]*DRF{},
		CharDefs: map[ID]*CharDef{}, Displays: map[ID][]*Display{}, nominals: map[ID]*FeatureNominal{},
	}}
	r.document(x.root)
	if x.ns == "" {
		r.notef(Inconsistent, x.root, "<QIFDocument> declares no namespace (QIF 3's is %q): read as QIF 3", Namespace)
	}
	return r.doc, nil
}

type docReader struct {
	f   *source.File
	doc *Document
}

func (r *docReader) span(n *node) source.Span {
	return source.Span{Start: r.f.Position(n.from), End: r.f.Position(n.to)}
}

func (r *docReader) notef(k model.ProblemKind, n *node, format string, args ...any) {
	r.doc.Notes = append(r.doc.Notes, Note{Kind: k, Span: r.span(n), Msg: fmt.Sprintf(format, args...)})
}

func (r *docReader) id(n *node) (ID, bool) {
	s, ok := n.attr("id")
	if !ok {
		r.notef(Inconsistent, n, "<%s> has no id: left out", n.name)
		return 0, false
	}
	v, err := strconv.ParseUint(strings.TrimSpace(s), 10, 64)
	if err != nil {
		r.notef(Inconsistent, n, "<%s> has the id %q, which is not a QIF id (an unsigned integer): left out", n.name, s)
		return 0, false
	}
	return ID(v), true
}

// ref reads an element whose text is an id.
func (r *docReader) ref(n *node) *Ref {
	if n == nil {
		return nil
	}
	v, err := strconv.ParseUint(n.text, 10, 64)
	if err != nil {
		r.notef(Inconsistent, n, "<%s> %q is not a QIF id (an unsigned integer): the reference is left out", n.name, clip(n.text))
		return nil
	}
	if _, ok := n.attr("asmPathId"); ok {
		r.notef(Unsupported, n, "<%s> refers into an assembly (asmPathId): the reader reads one part; the reference is left out", n.name)
		return nil
	}
	return &Ref{ID: ID(v), Span: r.span(n)}
}

// refs reads a list of ids (<Ids n="..."><Id>...</Id>...).
func (r *docReader) refs(n *node) []Ref {
	if n == nil {
		return nil
	}
	var out []Ref
	for _, k := range n.children("Id") {
		if x := r.ref(k); x != nil {
			out = append(out, *x)
		}
	}
	return out
}

func (r *docReader) value(n *node) *Value {
	if n == nil {
		return nil
	}
	v, err := strconv.ParseFloat(n.text, 64)
	if n.long || err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		r.notef(Inconsistent, n, "<%s> %q is not a finite number: left out", n.name, clip(n.text))
		return nil
	}
	out := &Value{V: v, Text: n.text, Places: -1, Span: r.span(n)}
	if u, ok := n.attr("linearUnit"); ok {
		out.Unit = strings.TrimSpace(u)
	}
	if u, ok := n.attr("angularUnit"); ok {
		out.Unit = strings.TrimSpace(u)
	}
	out.Places = places(n, "decimalPlaces")
	return out
}

func (r *docReader) vec(n *node) *Vec3 {
	if n == nil {
		return nil
	}
	f := strings.Fields(n.text)
	var v model.Vec
	ok := len(f) == 3 && !n.long
	for i := 0; ok && i < 3; i++ {
		x, err := strconv.ParseFloat(f[i], 64)
		ok = err == nil && !math.IsInf(x, 0) && !math.IsNaN(x)
		v[i] = x
	}
	if !ok {
		r.notef(Inconsistent, n, "<%s> %q is not three finite numbers: left out", n.name, clip(n.text))
		return nil
	}
	out := &Vec3{V: v, Span: r.span(n), Places: [3]int{-1, -1, -1}}
	if u, ok := n.attr("linearUnit"); ok {
		out.Unit = strings.TrimSpace(u)
	}
	all := places(n, "decimalPlaces")
	for i, a := range []string{"xDecimalPlaces", "yDecimalPlaces", "zDecimalPlaces"} {
		out.Places[i] = all
		if k := places(n, a); k >= 0 {
			out.Places[i] = k
		}
	}
	return out
}

// places reads a decimal places attribute: -1 where it is absent or not a
// small count.
func places(n *node, attr string) int {
	if p, ok := n.attr(attr); ok {
		if k, err := strconv.Atoi(strings.TrimSpace(p)); err == nil && k >= 0 && k < 30 {
			return k
		}
	}
	return -1
}

func (r *docReader) pair(n *node) ([2]float64, bool) {
	f := strings.Fields(n.text)
	var out [2]float64
	ok := len(f) == 2 && !n.long
	for i := 0; ok && i < 2; i++ {
		x, err := strconv.ParseFloat(f[i], 64)
		ok = err == nil && !math.IsInf(x, 0) && !math.IsNaN(x)
		out[i] = x
	}
	if !ok {
		r.notef(Inconsistent, n, "<%s> %q is not two finite numbers: left out", n.name, clip(n.text))
	}
	return out, ok
}

func (r *docReader) word(n *node) *Word {
	if n == nil {
		return nil
	}
	return &Word{Text: n.text, Span: r.span(n)}
}

// flag reads a boolean element: true or 1.
func flagTrue(n *node) bool { return n != nil && (n.text == "true" || n.text == "1") }

func clip(s string) string {
	if len(s) > 40 {
		return s[:40] + "..."
	}
	return s
}

func (r *docReader) elem(n *node) Elem {
	return Elem{Name: n.name, Text: clip(n.text), Span: r.span(n)}
}

func (r *docReader) document(root *node) {
	d := r.doc
	d.Root = r.span(root)
	d.Version, _ = root.attr("versionQIF")
	// The root's start tag is a statement of its own: where a finding
	// about the whole document (no units, no standard) stands.
	d.Statements = append(d.Statements, model.Statement{Keyword: root.name, Span: d.Root, First: d.Root.Start.Line,
		Last: d.Root.End.Line, Parsed: true})
	for _, n := range root.kids {
		switch n.name {
		case "FileUnits":
			r.stmt(n)
			r.units(n)
		case "StandardsDefinitions":
			for _, s := range n.children("Standard") {
				r.stmt(s)
				r.standard(s)
			}
		case "DatumDefinitions":
			for _, k := range n.children("DatumDefinition") {
				r.stmt(k)
				r.datumDef(k)
			}
		case "DatumTargetDefinitions":
			for _, k := range n.children("DatumTarget") {
				r.stmt(k)
				r.datumTarget(k)
			}
		case "DatumReferenceFrames":
			for _, k := range n.children("DatumReferenceFrame") {
				r.stmt(k)
				r.drf(k)
			}
		case "Product":
			r.product(n)
		case "Features":
			r.features(n)
		case "FeatureZones":
			for _, k := range n.kids {
				r.stmt(k)
				r.zone(k)
			}
		case "Characteristics":
			r.characteristics(n)
		}
	}
	sort.SliceStable(d.Statements, func(i, j int) bool { return d.Statements[i].First < d.Statements[j].First })
}

// stmt records an element as a statement: the whole element, from its
// start tag to its end.
func (r *docReader) stmt(n *node) {
	end := max(n.end, n.to)
	last := r.f.Position(max(end-1, n.from)).Line
	r.doc.Statements = append(r.doc.Statements, model.Statement{Keyword: n.name,
		Span: source.Span{Start: r.f.Position(n.from), End: r.f.Position(end)}, First: r.f.Position(n.from).Line, Last: last,
		Parsed: true})
}

func (r *docReader) unit(n *node) *Unit {
	if n == nil {
		return nil
	}
	u := &Unit{Name: n.path("UnitName").str(), SI: n.path("SIUnitName").str(), Factor: 1, Span: r.span(n)}
	if c := n.child("UnitConversion"); c != nil {
		if v := r.value(c.child("Factor")); v != nil {
			u.Factor = v.V
		}
		if v := r.value(c.child("Offset")); v != nil {
			u.Offset = v.V
		}
	}
	if u.Factor <= 0 {
		r.notef(Inconsistent, n, "the unit %q converts with a factor of %g, which is not positive: left out", u.Name, u.Factor)
		return nil
	}
	return u
}

func (r *docReader) units(n *node) {
	u := &r.doc.Units
	u.Span = r.span(n)
	p := n.child("PrimaryUnits")
	u.Linear = r.unit(p.child("LinearUnit"))
	u.PMILinear = r.unit(p.child("PMILinearUnit"))
	u.Angular = r.unit(p.child("AngularUnit"))
	u.PMIAngular = r.unit(p.child("PMIAngularUnit"))
	for _, k := range n.child("OtherUnits").all() {
		if k.name == "LinearUnit" || k.name == "AngularUnit" {
			if x := r.unit(k); x != nil {
				u.Other = append(u.Other, x)
			}
		}
	}
}

func (r *docReader) standard(n *node) {
	id, ok := r.id(n)
	if !ok {
		return
	}
	s := &Standard{ID: id, Span: r.span(n), Designator: n.path("Designator").str(), Year: n.path("Year").str()}
	o := n.child("Organization")
	s.Organization = o.path("StandardsOrganizationEnum").str()
	if s.Organization == "" {
		s.Organization = o.path("OtherStandardsOrganization").str()
	}
	r.doc.Standards = append(r.doc.Standards, s)
}

func (r *docReader) product(n *node) {
	if h := n.child("Header"); h != nil {
		r.stmt(h)
	}
	if p := n.path("PartSet", "Part"); p != nil {
		r.stmt(p)
	}
	if v := r.value(n.path("Header", "ScaleCoefficient")); v != nil {
		r.doc.Scale = v
	}
	if p := n.path("PartSet", "Part"); p != nil && r.doc.Title == "" {
		r.doc.TitleSpan = r.span(p)
		if l, ok := p.attr("label"); ok && strings.TrimSpace(l) != "" {
			r.doc.Title = strings.TrimSpace(l)
		} else if m := p.child("ModelNumber"); m != nil && m.text != "" {
			r.doc.Title = m.text
		} else if m := p.child("Name"); m != nil {
			r.doc.Title = m.text
		}
	}
	for _, k := range n.path("VisualizationSet", "PMIDisplaySet").children("PMIDisplay") {
		r.stmt(k)
		ds := &Display{Span: r.span(k)}
		for _, t := range k.child("Texts").children("Text") {
			ds.Texts = append(ds.Texts, t.path("Data").str())
		}
		for _, x := range r.refs(k.child("Reference")) {
			ds.Refs = append(ds.Refs, x.ID)
			r.doc.Displays[x.ID] = append(r.doc.Displays[x.ID], ds)
		}
	}
}

func (r *docReader) features(n *node) {
	for _, k := range n.child("FeatureDefinitions").all() {
		r.stmt(k)
		r.featureDef(k)
	}
	for _, k := range n.child("FeatureNominals").all() {
		r.stmt(k)
		r.featureNominal(k)
	}
	for _, k := range n.child("FeatureItems").all() {
		r.stmt(k)
		id, ok := r.id(k)
		if !ok {
			continue
		}
		r.doc.FeatureItems[id] = &FeatureItem{ID: id, Nominal: r.ref(k.child("FeatureNominalId")), Span: r.span(k)}
	}
}

// featureDefValues are the size-like values of feature definitions.
var featureDefValues = []string{"Diameter", "Width", "Length", "Depth", "Radius", "HalfAngle", "FullAngle",
	"TaperAngle", "DraftAngle", "LargeEndDistance", "SmallEndDistance", "MinorDiameter", "MajorDiameter"}

func (r *docReader) featureDef(n *node) {
	id, ok := r.id(n)
	if !ok {
		return
	}
	fd := &FeatureDef{ID: id, Type: strings.TrimSuffix(n.name, "FeatureDefinition"), Span: r.span(n), Values: map[string]*Value{}}
	fd.InternalExternal = r.word(n.child("InternalExternal"))
	for _, name := range featureDefValues {
		if v := r.value(n.child(name)); v != nil {
			fd.Values[name] = v
		}
	}
	r.doc.FeatureDefs[id] = fd
}

// nominalPoints are the elements of feature nominals that hold geometry.
var nominalPoints = [][]string{{"Location"}, {"Normal"}, {"Direction"}, {"AxisVector"}, {"Axis", "AxisPoint"},
	{"Axis", "Direction"}, {"CenterPlane", "Point"}, {"CenterPlane", "Normal"}, {"CenterLine", "StartPoint"}, {"CenterLine", "Vector"}}

var nominalDomains = [][]string{{"Sweep", "DomainAngle"}, {"LatitudeLongitudeSweep", "DomainLatitude"}, {"LatitudeLongitudeSweep", "DomainLongitude"}}

func (r *docReader) featureNominal(n *node) {
	id, ok := r.id(n)
	if !ok {
		return
	}
	fn := &FeatureNominal{ID: id, Type: strings.TrimSuffix(n.name, "FeatureNominal"), Span: r.span(n),
		Points: map[string]*Vec3{}, Domains: map[string][2]float64{}}
	if nm := n.child("Name"); nm != nil {
		fn.Name, fn.NameSpan = nm.text, r.span(nm)
	}
	fn.Def = r.ref(n.child("FeatureDefinitionId"))
	for _, p := range nominalPoints {
		if v := r.vec(n.path(p...)); v != nil {
			fn.Points[strings.Join(p, "/")] = v
		}
	}
	for _, p := range nominalDomains {
		if k := n.path(p...); k != nil {
			if v, ok := r.pair(k); ok {
				fn.Domains[strings.Join(p, "/")] = v
			}
		}
	}
	fn.Members = r.refs(n.child("FeatureNominalIds"))
	fn.Faces = len(n.path("EntityInternalIds").children("Id"))
	if _, dup := r.doc.nominals[id]; dup {
		r.notef(Inconsistent, n, "the id %d is used by an earlier feature nominal: this one is left out", id)
		return
	}
	r.doc.nominals[id] = fn
	r.doc.FeatureNominals = append(r.doc.FeatureNominals, fn)
}

func (r *docReader) zone(n *node) {
	id, ok := r.id(n)
	if !ok {
		return
	}
	z := &Zone{ID: id, Type: strings.TrimPrefix(n.name, "FeatureZone"), Span: r.span(n)}
	for _, p := range [][]string{{"Point"}, {"Line", "StartPoint"}, {"Line", "EndPoint"}} {
		if v := r.vec(n.path(p...)); v != nil {
			z.Points = append(z.Points, v)
		}
	}
	if c := n.child("Circle"); c != nil {
		z.Center, z.Dia, z.Normal = r.vec(c.child("CenterPoint")), r.value(c.child("Diameter")), r.vec(c.child("Normal"))
	}
	if c := n.child("Rectangle"); c != nil {
		z.Corner, z.Length, z.Width = r.vec(c.child("CornerPoint")), r.value(c.child("Length")), r.value(c.child("Width"))
		z.LengthDir, z.WidthDir, z.Normal = r.vec(c.child("LengthDirection")), r.vec(c.child("WidthDirection")), r.vec(c.child("Normal"))
	}
	r.doc.Zones[id] = z
}

func (r *docReader) datumDef(n *node) {
	id, ok := r.id(n)
	if !ok {
		return
	}
	d := &DatumDef{ID: id, Span: r.span(n)}
	if l := n.child("DatumLabel"); l != nil {
		d.Label, d.LabelSpan = l.text, r.span(l)
	}
	d.Features = r.refs(n.child("FeatureNominalIds"))
	d.Targets = r.refs(n.child("DatumTargetIds"))
	r.doc.Datums = append(r.doc.Datums, d)
}

func (r *docReader) datumTarget(n *node) {
	id, ok := r.id(n)
	if !ok {
		return
	}
	t := &DatumTarget{ID: id, Span: r.span(n), Movable: n.child("MovableDatumTarget") != nil}
	if l := n.child("DatumTargetLabel"); l != nil {
		t.Label, t.LabelSpan = l.text, r.span(l)
	}
	t.Feature = r.ref(n.child("FeatureNominalId"))
	t.Zone = r.ref(n.child("TargetZoneId"))
	r.doc.Targets[id] = t
}

// datumIgnorable are the children of a datum that change nothing the model
// holds when written as here (the default).
func datumIgnorable(k *node) bool {
	switch k.name {
	case "DatumDefinitionId", "MaterialModifier", "ReferencedComponent", "Attributes", "SubstituteFeatureAlgorithm", "SizeCharacteristicDefinitionId":
		return true
	case "DatumTranslation":
		return !flagTrue(k.child("DatumTranslationAllowed"))
	case "ContactingFeature", "DistanceVariable", "DatumFixed", "ConstrainOrientation", "ConstrainSubsequent":
		return !flagTrue(k)
	}
	return false
}

func (r *docReader) simpleDatum(n *node) *SimpleDatum {
	s := &SimpleDatum{Span: r.span(n), Def: r.ref(n.child("DatumDefinitionId")), Material: r.word(n.child("MaterialModifier"))}
	for _, k := range n.kids {
		if !datumIgnorable(k) {
			s.Unread = append(s.Unread, r.elem(k))
		}
	}
	return s
}

func (r *docReader) drf(n *node) {
	id, ok := r.id(n)
	if !ok {
		return
	}
	f := &DRF{ID: id, Span: r.span(n)}
	for _, k := range n.child("Datums").children("Datum") {
		dd := &DRFDatum{Span: r.span(k)}
		if p := k.child("Precedence"); p != nil {
			dd.Precedence = r.word(p.child("PrecedenceEnum"))
			if dd.Precedence == nil {
				dd.Precedence = r.word(p.child("OtherPrecedence"))
			}
		}
		for _, c := range k.kids {
			switch c.name {
			case "SimpleDatum":
				dd.Kind, dd.KindSpan = c.name, r.span(c)
				dd.Members = []*SimpleDatum{r.simpleDatum(c)}
			case "CompoundDatum":
				dd.Kind, dd.KindSpan = c.name, r.span(c)
				members := c.children("Datum")
				sort.SliceStable(members, func(i, j int) bool {
					a, _ := strconv.Atoi(members[i].path("SequenceNumber").str())
					b, _ := strconv.Atoi(members[j].path("SequenceNumber").str())
					return a < b
				})
				for _, m := range members {
					if s := m.child("SimpleDatum"); s != nil {
						dd.Members = append(dd.Members, r.simpleDatum(s))
					} else {
						r.notef(Unsupported, m, "a common datum made of common datums: the member is left out")
					}
				}
			case "NominalDatumFeature", "MeasuredDatumFeature":
				dd.Kind, dd.KindSpan = c.name, r.span(c)
			}
		}
		f.Datums = append(f.Datums, dd)
	}
	if _, dup := r.doc.DRFs[id]; dup {
		r.notef(Inconsistent, n, "the id %d is used by an earlier datum reference frame: this one is left out", id)
		return
	}
	r.doc.DRFs[id] = f
}

func (r *docReader) characteristics(n *node) {
	r.doc.FormalStandard = r.ref(n.child("FormalStandardId"))
	for _, k := range n.kids {
		switch k.name {
		case "FormalStandardId":
			r.stmt(k)
		case "CharacteristicDefinitions":
			for _, c := range k.kids {
				r.stmt(c)
				r.charDef(c)
			}
		case "CharacteristicNominals":
			for _, c := range k.kids {
				r.stmt(c)
				r.charNominal(c)
			}
		case "CharacteristicItems":
			for _, c := range k.kids {
				r.stmt(c)
				id, ok := r.id(c)
				if !ok {
					continue
				}
				r.doc.CharItems = append(r.doc.CharItems, &CharItem{ID: id, Span: r.span(c),
					Nominal: r.ref(c.child("CharacteristicNominalId")), FeatureItems: r.refs(c.child("FeatureItemIds"))})
			}
		default:
			r.stmt(k)
			r.doc.Sections = append(r.doc.Sections, r.elem(k))
		}
	}
}

// charDefIgnorable are children of characteristic definitions that change
// nothing a check reads (names, designators, statistics flags written false).
var charDefIgnorable = map[string]bool{"Name": true, "CharacteristicDesignator": true, "Attributes": true, "Description": true,
	"SizeCharacteristicDefinitionId": true}

// charDefFlags are boolean elements of characteristic definitions.
var charDefFlags = map[string]bool{"FreeState": true, "TangentPlane": true, "StatisticalCharacteristic": true, "CommonZone": true,
	"CommonTolerance": true, "MedianFeature": true, "EnvelopeRequirement": true, "Independency": true,
	"UnitedOrContinuousFeature": true, "SeparateZone": true, "OffsetZone": true, "VariableAngle": true,
	"OrientationOnly": true, "EachRadialElement": true, "EachElement": true, "NotConvex": true, "ControlledRadius": true}

var charDefModifiers = map[string]bool{"ProjectedToleranceZoneValue": true, "UnequallyDisposedZone": true,
	"OuterDisposition": true, "MaximumToleranceValue": true, "ToPointToleranceValue": true}

func (r *docReader) charDef(n *node) {
	id, ok := r.id(n)
	if !ok {
		return
	}
	c := &CharDef{ID: id, Type: strings.TrimSuffix(n.name, "CharacteristicDefinition"), Span: r.span(n),
		Modifiers: map[string]*Value{}, Flags: map[string]source.Span{}}
	for _, k := range n.kids {
		switch {
		case charDefIgnorable[k.name]:
		case k.name == "ToleranceValue":
			c.ToleranceValue = r.value(k)
		case strings.HasPrefix(k.name, "ToleranceZonePerUnit"):
			c.PerUnit = r.perUnit(k)
		case k.name == "DatumReferenceFrameId":
			c.DRF = r.ref(k)
		case k.name == "MaterialCondition":
			c.Material = r.word(k)
		case k.name == "ZoneShape":
			if len(k.kids) > 0 {
				z := k.kids[0]
				c.Zone = &Word{Text: z.name, Span: r.span(z)}
				c.ZoneDir = r.vec(z.child("ZoneOrientationVector"))
			}
		case charDefModifiers[k.name]:
			c.Modifiers[k.name] = r.value(k)
		case charDefFlags[k.name]:
			if flagTrue(k) {
				c.Flags[k.name] = r.span(k)
			}
		case k.name == "Extent":
			c.Extent = r.word(k.child("ExtentEnum"))
			if c.Extent == nil {
				c.Extent = r.word(k.child("OtherExtent"))
			}
		case strings.HasSuffix(k.name, "CompositeSegmentPositionDefinition"),
			strings.HasSuffix(k.name, "CompositeSegmentProfileDefinition"),
			strings.HasSuffix(k.name, "CompositeSegmentSymmetryDefinition"):
			c.Composites = append(c.Composites, r.composite(k))
		case k.name == "DimensionType":
			c.DimensionType = r.word(k)
		case k.name == "Tolerance":
			t := &Tolerance{Span: r.span(k), Max: r.value(k.child("MaxValue")), Min: r.value(k.child("MinValue")),
				Limits: flagTrue(k.child("DefinedAsLimit"))}
			for _, x := range k.kids {
				switch x.name {
				case "MaxValue", "MinValue", "DefinedAsLimit":
				default:
					c.Unread = append(c.Unread, r.elem(x))
				}
			}
			c.Tolerance = t
		case k.name == "NonTolerance":
			c.NonTolerance = r.word(k)
		default:
			c.Unread = append(c.Unread, r.elem(k))
		}
	}
	if _, dup := r.doc.CharDefs[id]; dup {
		r.notef(Inconsistent, n, "the id %d is used by an earlier characteristic definition: this one is left out", id)
		return
	}
	r.doc.CharDefs[id] = c
}

var ordinals = map[string]int{"Second": 2, "Third": 3, "Fourth": 4}

func (r *docReader) composite(n *node) *Composite {
	c := &Composite{Span: r.span(n)}
	for w, k := range ordinals {
		if strings.HasPrefix(n.name, w) {
			c.Ordinal = k
		}
	}
	for _, k := range n.kids {
		switch k.name {
		case "DatumReferenceFrameId":
			c.DRF = r.ref(k)
		case "ToleranceValue":
			c.ToleranceValue = r.value(k)
		case "MaterialCondition":
			c.Material = r.word(k)
		case "ZoneShape":
			if len(k.kids) > 0 {
				c.Zone = &Word{Text: k.kids[0].name, Span: r.span(k.kids[0])}
			}
		case "ProjectedToleranceZone":
			c.Projected = r.value(k)
		case "CharacteristicDesignator":
		default:
			c.Unread = append(c.Unread, r.elem(k))
		}
	}
	return c
}

func (r *docReader) perUnit(n *node) *PerUnit {
	p := &PerUnit{Kind: strings.TrimPrefix(n.name, "ToleranceZonePerUnit"), Span: r.span(n), Value: r.value(n.child("ToleranceValuePerUnit"))}
	for _, k := range n.kids {
		switch k.name {
		case "ToleranceValuePerUnit":
		case "RectangularUnitArea":
			for _, x := range k.kids {
				if v := r.value(x); v != nil {
					p.Unit = append(p.Unit, v)
				}
			}
		case "CircularUnitArea":
			for _, x := range k.kids {
				if v := r.value(x); v != nil {
					p.Unit = append(p.Unit, v)
				}
			}
		default:
			if v := r.value(k); v != nil {
				p.Unit = append(p.Unit, v)
			}
		}
	}
	return p
}

func (r *docReader) charNominal(n *node) {
	id, ok := r.id(n)
	if !ok {
		return
	}
	c := &CharNominal{ID: id, Type: strings.TrimSuffix(n.name, "CharacteristicNominal"), Span: r.span(n),
		Def: r.ref(n.child("CharacteristicDefinitionId")), Features: r.refs(n.child("FeatureNominalIds")),
		Zones: r.refs(n.child("FeatureZoneIds")), Name: n.path("Name").str(),
		TargetValue: r.value(n.child("TargetValue")), Angle: r.value(n.child("Angle")),
		AnalysisVector: r.vec(n.child("AnalysisVector"))}
	if o := n.child("OriginReference"); o != nil {
		c.OriginFeature = r.ref(o.child("FeatureNominalId"))
		c.OriginDatum = r.ref(o.child("DatumDefinitionId"))
	}
	for _, p := range n.child("FeatureNominalPairs").children("FeaturePair") {
		a, b := r.ref(p.child("FirstFeature")), r.ref(p.child("SecondFeature"))
		if a != nil && b != nil {
			c.Pairs = append(c.Pairs, [2]Ref{*a, *b})
		}
	}
	r.doc.CharNominals = append(r.doc.CharNominals, c)
}
