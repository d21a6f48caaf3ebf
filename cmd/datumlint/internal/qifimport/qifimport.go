// Package qifimport writes a QIF 3 document's part in the callout notation,
// for `datumlint import`: the QIF reader (grammar/qif) builds the part model,
// the notation's writer (grammar.FromModel) turns the model into the
// notation's tree and the printer (grammar.Format) lays it out. This
// package adds only the comments: where each statement comes from in the
// QIF document, and what the document says that the file does not carry.
// The part is written under `basis model`: in a model-based definition
// every nominal location and angle is basic.
//
// The file written, checked, gives the findings that checking the QIF
// document gives, except the findings about the QIF document as such (the
// rules qif-unsupported and qif-inconsistent), which it lists as comments
// at its end.
package qifimport

import (
	"fmt"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/qif"
	"github.com/datumlint/datumlint/grammar/source"
)

// Import reads a QIF document and returns the part written in the
// notation. A document the QIF reader refuses gives its *qif.Error.
func Import(name string, src []byte) ([]byte, error) {
	res, err := qif.ReadFile(source.NewFile(name, src))
	if err != nil {
		return nil, err
	}
	f := grammar.FromModel(res.Part, notes(name, res))
	return grammar.Format(f)
}

func notes(name string, res *qif.Result) grammar.Notes {
	o := res.Origins
	nominals := map[qif.ID]*qif.CharNominal{}
	for _, c := range res.Doc.CharNominals {
		nominals[c.ID] = c
	}
	names := map[qif.ID]string{}
	for _, n := range res.Doc.FeatureNominals {
		names[n.ID] = n.Name
	}
	n := grammar.Notes{
		Head: []string{
			fmt.Sprintf("%s: imported by datumlint from the QIF %s document %s.", titleOr(res.Part.Title, "the part"), res.Doc.Version, filepath.Base(name)),
			"The comment after each statement gives the QIF ids it comes from (feature nominals,",
			"datum definitions, characteristic nominals); what the document says that this file",
			"does not carry, if anything, is listed at its end.",
		},
		After: func(el any) string {
			switch x := el.(type) {
			case *model.Feature:
				return featureNote(o.Features[x], x, names)
			case *model.Datum:
				if id, ok := o.Datums[x]; ok {
					return fmt.Sprintf("QIF %d", id)
				}
			case *model.Frame:
				if id, ok := o.Frames[x]; ok {
					return fmt.Sprintf("QIF %d", id)
				}
			case *model.Dimension:
				if id, ok := o.Dims[x]; ok {
					return fmt.Sprintf("QIF %d", id) + writtenNote(x, nominals[id])
				}
			}
			return ""
		},
	}
	n.Tail = tail(res.Part)
	return n
}

func titleOr(t, other string) string {
	if t == "" {
		return other
	}
	return t
}

// featureNote gives a feature's QIF ids, with its QIF name where it is not
// the name written (and says more than "Nominal ID").
func featureNote(ids []qif.ID, f *model.Feature, names map[qif.ID]string) string {
	if len(ids) == 0 {
		return ""
	}
	s := make([]string, len(ids))
	for i, id := range ids {
		s[i] = strconv.FormatUint(uint64(id), 10)
		if nm := strings.TrimSpace(names[id]); nm != "" && nm != f.Name && !f.Pattern && nm != fmt.Sprintf("Nominal %d", id) {
			s[i] += fmt.Sprintf(" %q", nm)
		}
	}
	if len(ids) > 1 {
		return "QIF " + strings.Join(s, ", ") + " (members in order)"
	}
	return "QIF " + s[0]
}

// writtenNote says how the QIF document writes a dimension's value where
// the file writes it otherwise: in another unit, or rounded for display.
func writtenNote(d *model.Dimension, c *qif.CharNominal) string {
	if c == nil || c.TargetValue == nil {
		return ""
	}
	tv := c.TargetValue
	if v, err := strconv.ParseFloat(tv.Text, 64); err == nil && v == d.Value && tv.Unit == "" {
		return ""
	}
	out := "; written " + tv.Text
	if tv.Unit != "" {
		out += " " + tv.Unit
	}
	if tv.Places >= 0 {
		out += fmt.Sprintf(" with %d decimal places", tv.Places)
	}
	return out
}

// tail lists what the document says that the model does not carry, and
// where it contradicts itself, by line of the QIF document.
func tail(p *model.Part) []string {
	var out []string
	ps := append([]*model.Problem(nil), p.Problems...)
	sort.SliceStable(ps, func(i, j int) bool { return ps[i].Span.Start.Before(ps[j].Span.Start) })
	for _, e := range ps {
		var kind string
		switch e.Kind {
		case model.Unsupported:
			kind = "not carried"
		case model.Inconsistent:
			kind = "inconsistent"
		default:
			kind = "not read"
		}
		out = append(out, fmt.Sprintf("line %d: %s: %s", e.Span.Start.Line, kind, e.Message))
	}
	if len(out) > 0 {
		out = append([]string{"What the QIF document says that this file does not carry, and where it",
			"contradicts itself (datumlint check on the QIF file reports each, as qif-unsupported",
			"or qif-inconsistent):"}, out...)
	}
	return out
}
