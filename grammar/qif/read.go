package qif

import (
	"errors"
	"fmt"
	"sort"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// Unsupported and Inconsistent are the kinds of problem the reader records
// beside syntax: what the model cannot carry (reported by the rule
// qif-unsupported, info), and where the document contradicts itself or is
// incomplete (qif-inconsistent, warning). A document the reader refuses is
// one model.Syntax problem (the rule syntax).
const (
	Unsupported  = model.Unsupported
	Inconsistent = model.Inconsistent
)

// Note is something the document layer found it could not read as
// written, where it is written: it becomes a problem of the part.
type Note struct {
	Kind model.ProblemKind
	Span source.Span
	Msg  string
}

// Origins give the QIF ids each model element comes from, for an importer
// that writes them beside the statements.
type Origins struct {
	Features map[*model.Feature][]ID // the feature nominals, one per member
	Datums   map[*model.Datum]ID     // the datum definition
	Frames   map[*model.Frame]ID     // the characteristic nominal
	Dims     map[*model.Dimension]ID // the characteristic nominal
}

// Result is a read QIF document: the document layer, the part model built
// from it (what the model cannot carry is in Part.Problems), and where each
// model element comes from.
type Result struct {
	Doc     *Document
	Part    *model.Part
	Origins Origins
}

// Read reads a QIF 3 document into the part model: the reader that
// rules/lint chooses for .qif files. It never fails: a document it refuses
// (not XML, not QIF 3, truncated, over DefaultLimits) is a part with one
// model.Syntax problem at the place of the trouble, and no elements.
func Read(name string, src []byte) *model.Part {
	f := source.NewFile(name, src)
	res, err := ReadFile(f)
	if err != nil {
		p := model.NewPart(f)
		p.NotText = true // not a QIF 3 document: one finding, nothing said of what it lacks
		var e *Error
		if errors.As(err, &e) {
			p.Problemf(model.Syntax, e.Span, "%s", e.Msg)
		} else {
			p.Problemf(model.Syntax, source.Point(source.Pos{Line: 1, Col: 1}), "%v", err)
		}
		p.Finish()
		return p
	}
	return res.Part
}

// ReadFile reads a QIF 3 document with its document layer and origins. A
// document it refuses gives an *Error and no result.
func ReadFile(f *source.File) (*Result, error) {
	doc, err := Decode(f)
	if err != nil {
		return nil, err
	}
	return Map(doc), nil
}

// Map builds the part model of a decoded document.
func Map(doc *Document) *Result {
	m := &mapper{doc: doc, part: model.NewPart(doc.File), seen: map[noteKey]bool{}, sized: map[*model.Feature]sizedBy{},
		res: &Result{Doc: doc, Origins: Origins{Features: map[*model.Feature][]ID{}, Datums: map[*model.Datum]ID{},
			Frames: map[*model.Frame]ID{}, Dims: map[*model.Dimension]ID{}}}}
	m.res.Part = m.part
	m.part.Statements = doc.Statements
	for _, n := range doc.Notes {
		m.note(n.Kind, n.Span, "%s", n.Msg)
	}
	if doc.Title != "" {
		m.part.Title = doc.Title
		m.part.Headers = append(m.part.Headers, model.HeaderLine{Keyword: "part", Value: doc.Title, Span: doc.TitleSpan})
	}
	// A QIF document is a model-based definition: every nominal location
	// and angle of its model is basic (ASME Y14.41-2019, model values are
	// basic; from memory), as `basis model` says in the notation.
	m.part.Basis = model.ModelBasis
	m.part.Headers = append(m.part.Headers, model.HeaderLine{Keyword: "basis", Value: model.ModelBasis.String(), Span: doc.Root})
	m.u.init(m)
	m.standard()
	m.features()
	m.datums()
	m.characteristics()
	m.u.checkLabels()
	for _, s := range doc.Sections {
		m.note(Unsupported, s.Span, "<%s> is not read: the model has no default tolerances or characteristic groups", s.Name)
	}
	sort.SliceStable(m.part.Problems, func(i, j int) bool {
		return m.part.Problems[i].Span.Start.Before(m.part.Problems[j].Span.Start)
	})
	sort.SliceStable(m.part.Headers, func(i, j int) bool { return m.part.Headers[i].Span.Start.Before(m.part.Headers[j].Span.Start) })
	m.part.Finish()
	return m.res
}

type noteKey struct {
	at  source.Pos
	msg string
}

// mapper builds the model from the document.
type mapper struct {
	doc  *Document
	part *model.Part
	res  *Result
	seen map[noteKey]bool
	u    units

	feats   map[ID]*feat        // feature nominals by id
	inGroup map[ID]*pattern     // the pattern a nominal belongs to
	datumOf map[ID]*model.Datum // datum definitions by id
	sized   map[*model.Feature]sizedBy
	itemsOf map[ID][]*CharItem // characteristic items by nominal
	planes  []*feat            // the mapped planes, for datum target zones
	drfUse  map[ID]int         // how many frame segments each datum reference frame serves
}

// sizedBy is the size characteristic that gave a feature its size.
type sizedBy struct {
	id      ID
	nominal float64
}

// note records a problem once per place and message (a datum reference
// frame shared by many characteristics is reported once).
func (m *mapper) note(k model.ProblemKind, sp source.Span, format string, args ...any) {
	msg := fmt.Sprintf(format, args...)
	key := noteKey{sp.Start, msg}
	if m.seen[key] {
		return
	}
	m.seen[key] = true
	m.part.Problemf(k, sp, "%s", msg)
}

// standard sets the governing standard from FormalStandardId.
func (m *mapper) standard() {
	d := m.doc
	var s *Standard
	switch {
	case d.FormalStandard != nil:
		for _, x := range d.Standards {
			if x.ID == d.FormalStandard.ID {
				s = x
			}
		}
		if s == nil {
			m.note(Inconsistent, d.FormalStandard.Span, "FormalStandardId %d names no standard of StandardsDefinitions: the standard is unknown", d.FormalStandard.ID)
			return
		}
	case len(d.Standards) == 1:
		s = d.Standards[0]
		if len(d.CharNominals) > 0 {
			m.note(Unsupported, s.Span, "Characteristics name no FormalStandardId: read under the only standard defined, %s %s", s.Organization, s.Designator)
		}
	case len(d.Standards) > 1:
		m.note(Inconsistent, d.Standards[0].Span, "%d standards are defined and Characteristics name none (FormalStandardId): the standard is unknown", len(d.Standards))
		return
	default:
		return
	}
	std, why := standardOf(s)
	if std == model.StandardUnknown {
		m.note(Unsupported, s.Span, "the governing standard %s: %s", describe(s), why)
		return
	}
	m.part.Standard = std
	m.part.Headers = append(m.part.Headers, model.HeaderLine{Keyword: "standard", Value: std.String(), Span: s.Span})
}

func describe(s *Standard) string {
	out := s.Organization + " " + s.Designator
	if s.Year != "" {
		out += " (" + s.Year + ")"
	}
	return out
}

// standardOf maps a standard to the editions datumlint checks: ASME Y14.5
// of 2009 or 2018, or ISO (the GPS standards: ISO 1101, 5459, 8015).
func standardOf(s *Standard) (model.Standard, string) {
	switch s.Organization {
	case "ISO":
		return model.ISO, ""
	case "ASME":
		if !containsFold(s.Designator, "Y14.5") {
			return model.StandardUnknown, "not ASME Y14.5, the only ASME standard datumlint checks"
		}
		year := s.Year
		if year == "" {
			year = yearIn(s.Designator)
		}
		switch year {
		case "2009":
			return model.ASME2009, ""
		case "2018":
			return model.ASME2018, ""
		case "":
			return model.StandardUnknown, "the edition (year) is not given: datumlint checks asme-2009 and asme-2018"
		}
		return model.StandardUnknown, "the " + year + " edition is not one datumlint checks (asme-2009, asme-2018)"
	}
	return model.StandardUnknown, "datumlint checks ASME Y14.5 (2009, 2018) and ISO GPS only"
}
