package lsp

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/tliron/glsp"
	protocol "github.com/tliron/glsp/protocol_3_16"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/basics"
	"github.com/datumlint/datumlint/rules/dof"
	"github.com/datumlint/datumlint/rules/kinematics"
	"github.com/datumlint/datumlint/rules/ruledoc"
)

// hover tells, at a finding, what the rule asks and why (its summary and
// rationale with the published source); on a feature's name its kind, size
// limits, MMC and LMC and the degrees of freedom its frames leave; on a
// datum letter the datum's feature and the frames that use it.
func (s *server) hover(_ *glsp.Context, p *protocol.HoverParams) (*protocol.Hover, error) {
	sn := s.current(p.TextDocument.URI)
	if sn == nil {
		return nil, nil
	}
	at := sn.pos.source(p.Position)
	var parts []string
	var rng source.Span
	for _, d := range sn.diags {
		if d.Span.Contains(at) || (at == d.Span.End && !d.Span.IsZero()) {
			parts = append(parts, findingText(d))
			rng = rng.Join(d.Span)
		}
	}
	_, part := sn.model()
	if sym, ok := symbolAt(part, at); ok {
		var t string
		switch {
		case sym.letter != "":
			t = sn.datumText(part, sym.letter)
		case sym.feature != nil:
			t = sn.featureText(part, sym.feature, sym.member)
		}
		if t != "" {
			parts = append(parts, t)
			if rng.IsZero() {
				rng = sym.span
			}
		}
	}
	if len(parts) == 0 {
		return nil, nil
	}
	text := strings.Join(parts, "\n\n---\n\n")
	s.mu.Lock()
	md := s.markdown
	s.mu.Unlock()
	kind := protocol.MarkupKindMarkdown
	if !md {
		kind, text = protocol.MarkupKindPlainText, strings.ReplaceAll(text, "`", "")
	}
	r := sn.pos.rng(rng)
	return &protocol.Hover{Contents: protocol.MarkupContent{Kind: kind, Value: text}, Range: &r}, nil
}

// findingText is a finding with its rule's documentation, rendered as
// docs/rules.md renders it (without the examples, which `datumlint explain`
// and the linked section show).
func findingText(d rules.Diagnostic) string {
	head := fmt.Sprintf("**%s** (%s): %s", d.Rule, d.Severity, d.Message)
	r := rules.Lookup(d.Rule)
	if r == nil {
		return head
	}
	short := *r
	short.Bad, short.Good = "", ""
	return head + "\n\n" + strings.TrimSpace(ruledoc.Markdown(&short)) + "\n\n" + ruledoc.URL(r.ID)
}

// kindText says what each kind of feature is, as the notation's feature
// table has it.
var kindText = map[model.Kind]string{
	model.Plane:     "one planar surface",
	model.Slot:      "an internal width: two opposed parallel faces, material outside",
	model.Tab:       "an external width: two opposed parallel faces, material inside",
	model.Hole:      "an internal cylinder",
	model.Pin:       "an external cylinder",
	model.Socket:    "an internal sphere",
	model.Ball:      "an external sphere",
	model.Cone:      "a conical surface",
	model.Extrusion: "a linear extruded shape",
	model.Surface:   "a complex (free-form) surface",
}

func (sn *snapshot) featureText(part *model.Part, f *model.Feature, m *model.Member) string {
	var b strings.Builder
	units := unitsOf(part)
	if m != nil {
		fmt.Fprintf(&b, "**%s.%d**: member %d of %d of the pattern %s, at %s\n\n", f.Name, m.Index, m.Index, len(f.Members), f.Name, vecText(m.Point))
	}
	fmt.Fprintf(&b, "**%s**: %s", f.Name, f.Kind)
	if f.Pattern {
		fmt.Fprintf(&b, " %dx", len(f.Members))
	}
	if t, ok := kindText[f.Kind]; ok {
		fmt.Fprintf(&b, ", %s", t)
	}
	if f.Kind.IsFOS() {
		b.WriteString("; a feature of size")
	}
	if f.Kind != model.KindUnknown {
		fmt.Fprintf(&b, "; a datum on it gives its %s", f.Kind.DatumGives())
	}
	b.WriteString("\n")
	if f.Size != nil {
		fmt.Fprintf(&b, "\nsize `%s`: from %s to %s%s", sn.textOf(f.Size.Span), basics.Num(f.Size.Min()), basics.Num(f.Size.Max()), units)
		if f.Kind.IsFOS() {
			fmt.Fprintf(&b, "; MMC %s%s, LMC %s%s", basics.Num(f.MMC()), units, basics.Num(f.LMC()), units)
		}
		if f.Size.Envelope {
			b.WriteString("; envelope requirement (E)")
		}
		b.WriteString("\n")
	} else if f.Kind.IsFOS() {
		b.WriteString("\nno size given\n")
	}
	for _, d := range part.DatumsOn(f) {
		fmt.Fprintf(&b, "\ndatum %s is on %s\n", d.Letter, d.Target.Name)
	}
	frames := part.FramesOn(f)
	if len(frames) == 0 {
		b.WriteString("\nno frame controls it\n")
		return b.String()
	}
	b.WriteString("\nframes on it, with the degrees of freedom their datums leave:\n")
	facts := sn.engines()
	for _, fr := range frames {
		for i, seg := range fr.Segments {
			fmt.Fprintf(&b, "\n- line %d `%s`", seg.Span.Start.Line, sn.lineText(seg.Span.Start.Line))
			b.WriteString(": " + dofText(facts.Segment(fr, i), fr, seg))
		}
	}
	return b.String()
}

// dofText summarises the kinematic analysis of one frame segment.
func dofText(a *kinematics.Segment, fr *model.Frame, seg *model.Segment) string {
	if a == nil || !a.Resolved {
		problem := "not analysed"
		if a != nil && a.Problem != "" {
			problem += ": " + a.Problem
		}
		return problem
	}
	var parts []string
	for k, st := range a.DRF.Steps() {
		if k < len(seg.Refs) {
			parts = append(parts, fmt.Sprintf("%s removes %d (%s)", seg.Refs[k].Name, st.Constrains, motions(st.Removed)))
		}
	}
	if len(parts) == 0 {
		parts = append(parts, "no datums")
	}
	moves := "move the zone"
	if fr.Characteristic.Category() == model.Orientation {
		moves = "turn the zone"
	}
	free := a.DRF.Free()
	return fmt.Sprintf("%s; %d free (%s), of which %d %s (%s)", strings.Join(parts, ", "), len(free), motions(free), len(a.Zone.Free), moves, motions(a.Zone.Free))
}

func motions(ms []dof.Motion) string {
	if len(ms) == 0 {
		return "none"
	}
	names := make([]string, len(ms))
	for i, m := range ms {
		names[i] = m.Name
	}
	return strings.Join(names, ", ")
}

var precedence = []string{"primary", "secondary", "tertiary"}

func (sn *snapshot) datumText(part *model.Part, letter string) string {
	var b strings.Builder
	d := part.Datum(letter)
	if d == nil {
		fmt.Fprintf(&b, "**datum %s** is not declared: add `datum %s on FEATURE`\n", letter, letter)
	} else {
		fmt.Fprintf(&b, "**datum %s** on %s", letter, d.Target.Name)
		if f := d.Target.Feature; f != nil {
			fmt.Fprintf(&b, " (%s", f.Kind)
			if f.Pattern && d.Target.Member == nil {
				fmt.Fprintf(&b, " %dx, the pattern as a whole", len(f.Members))
			}
			fmt.Fprintf(&b, "): the datum is its %s", f.Kind.DatumGives())
		} else if d.Target.Problem != "" {
			fmt.Fprintf(&b, ": %s", d.Target.Problem)
		}
		if d.Placement != "" {
			fmt.Fprintf(&b, "; placed %s", d.Placement)
		}
		b.WriteString("\n")
	}
	var uses []string
	for _, lr := range letterRefs(part) {
		if lr.letter != letter {
			continue
		}
		role := "reference"
		if lr.ref < len(precedence) {
			role = precedence[lr.ref]
		}
		if len(lr.segment.Refs[lr.ref].Letters) > 1 {
			role += ", in the common datum " + lr.segment.Refs[lr.ref].Name
		}
		if lr.segment.Composite {
			role += ", composite segment"
		}
		uses = append(uses, fmt.Sprintf("- line %d `%s` (%s)", lr.span.Start.Line, sn.lineText(lr.span.Start.Line), role))
	}
	if len(uses) == 0 {
		b.WriteString("\nno frame references it\n")
	} else {
		b.WriteString("\nused by:\n\n" + strings.Join(uses, "\n") + "\n")
	}
	return b.String()
}

func unitsOf(part *model.Part) string {
	switch part.Units {
	case model.MM:
		return " mm"
	case model.Inch:
		return " in"
	}
	return ""
}

// lineText is a line of the document, trimmed (for quoting a statement).
func (sn *snapshot) lineText(n int) string {
	return strings.TrimSpace(string(sn.pos.f.LineBytes(n)))
}

// textOf is the text of a span as written.
func (sn *snapshot) textOf(sp source.Span) string {
	from, to := sn.pos.f.Offset(sp.Start), sn.pos.f.Offset(sp.End)
	if to < from {
		return ""
	}
	return string(sn.pos.f.Src[from:to])
}

func featureDetail(f *model.Feature) string {
	d := f.Kind.String()
	if f.Pattern {
		d += " " + itoa(len(f.Members)) + "x"
	}
	return d
}

func vecText(v model.Vec) string {
	return "(" + basics.Num(v[0]) + ", " + basics.Num(v[1]) + ", " + basics.Num(v[2]) + ")"
}

func itoa(n int) string { return strconv.Itoa(n) }
