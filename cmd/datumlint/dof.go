package main

import (
	"encoding/json"
	"fmt"
	"io"
	"os"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/dof"
	"github.com/datumlint/datumlint/rules/kinematics"
	"github.com/datumlint/datumlint/rules/lint"
	"github.com/datumlint/datumlint/rules/setup"
)

func newDofCmd() *cobra.Command {
	var format string
	cmd := &cobra.Command{
		Use:   "dof FILE",
		Short: "Show the degrees of freedom each datum reference removes, frame by frame",
		Long: `For every control frame of FILE, in file order: each datum reference with the motions it
removes (in precedence order), the motions the frame leaves free, and which of those move the
tolerance zone (for orientation tolerances, which free rotations turn it). With --format json
each frame also carries its inspection set-up under "simulators": the datum feature simulator
of each reference, its size at MMB or LMB, how it stands to those before it and the least
contact it needs.

Exit 0: every statement parsed; 1: the file has syntax errors (printed on stderr; the frames
that were read are still shown); 2: usage error or an unreadable file.`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			return runDof(cmd.OutOrStdout(), cmd.ErrOrStderr(), args[0], format)
		},
	}
	cmd.Flags().StringVar(&format, "format", "text", "output format: text or json")
	if err := cmd.RegisterFlagCompletionFunc("format", fixedValues("text", "one table per frame (the default)", "json", "one object per frame")); err != nil {
		panic(err)
	}
	return cmd
}

// dofRef is one datum reference in `dof --format json`: the contract's
// keys, and the motions it removes (an extension: docs/notation.md, "The
// dof output"), named as in free and zone_free.
type dofRef struct {
	Ref        string   `json:"ref"`
	Constrains int      `json:"constrains"`
	Removes    []string `json:"removes"`
}

// dofSegment is a composite lower segment (an extension of version 0:
// docs/notation.md, "The dof output").
type dofSegment struct {
	Line       int            `json:"line"`
	Datums     []dofRef       `json:"datums"`
	Free       []string       `json:"free"`
	ZoneFree   []string       `json:"zone_free"`
	Simulators []dofSimulator `json:"simulators"`
	Error      string         `json:"error,omitempty"`
}

// dofSimulator is the datum feature simulator of one reference, from
// rules/setup (an extension: docs/notation.md, "The dof output").
type dofSimulator struct {
	Ref         string          `json:"ref"`
	Precedence  string          `json:"precedence"`
	Boundary    string          `json:"boundary"`
	Kind        string          `json:"kind"`
	Description string          `json:"description"`
	Features    []dofSimFeature `json:"features"`
	Relations   []dofRelation   `json:"relations"`
	Constrains  int             `json:"constrains"`
	Contact     dofContact      `json:"contact"`
}

type dofSimFeature struct {
	Datum    string   `json:"datum"`
	Feature  string   `json:"feature"`
	Shape    string   `json:"shape"`
	Members  int      `json:"members"`
	Size     *float64 `json:"size,omitempty"`
	SizeFrom string   `json:"size_from,omitempty"`
}

type dofRelation struct {
	To          string   `json:"to"`
	Orientation string   `json:"orientation,omitempty"`
	Angle       *float64 `json:"angle,omitempty"`
	Distance    *float64 `json:"distance,omitempty"`
	Text        string   `json:"text"`
}

type dofContact struct {
	Points int    `json:"points"`
	Text   string `json:"text"`
}

// dofFrame is the contract's object for one frame; field order follows the
// contract.
type dofFrame struct {
	Feature        string         `json:"feature"`
	Line           int            `json:"line"`
	Characteristic string         `json:"characteristic"`
	Datums         []dofRef       `json:"datums"`
	Free           []string       `json:"free"`
	ZoneFree       []string       `json:"zone_free"`
	Simulators     []dofSimulator `json:"simulators"`
	Composite      []dofSegment   `json:"composite,omitempty"`
	Error          string         `json:"error,omitempty"`
}

func runDof(stdout, stderr io.Writer, path, format string) error {
	if format != "text" && format != "json" {
		return &exitError{2, fmt.Sprintf("unknown format %q: use text or json", format)}
	}
	info, err := os.Stat(path)
	if err != nil {
		return &exitError{2, fmt.Sprintf("cannot read %s: %v", path, unwrapPathErr(err))}
	}
	if info.IsDir() {
		return &exitError{2, fmt.Sprintf("%s is a folder: dof takes one .callouts file", path)}
	}
	if info.Size() > lint.DefaultMaxBytes {
		return &exitError{2, fmt.Sprintf("%s is larger than %d bytes", path, lint.DefaultMaxBytes)}
	}
	src, err := os.ReadFile(path)
	if err != nil {
		return &exitError{2, fmt.Sprintf("cannot read %s: %v", path, unwrapPathErr(err))}
	}
	part := lint.Read(path, src)
	kin := kinematics.Analyze(part)
	setups := setup.Analyze(part, kin)

	frames := make([]dofFrame, 0, len(part.Frames))
	for _, fr := range part.Frames {
		frames = append(frames, describeFrame(kin, setups, fr))
	}
	if format == "json" {
		enc := json.NewEncoder(stdout)
		enc.SetIndent("", "  ")
		if err := enc.Encode(frames); err != nil {
			return &exitError{2, err.Error()}
		}
	} else if err := writeDofText(stdout, part, kin); err != nil {
		return &exitError{2, err.Error()}
	}

	errs := 0
	for _, kind := range []model.ProblemKind{model.Syntax, model.Geometry} {
		for _, e := range part.Problems {
			if e.Kind == kind {
				fmt.Fprintf(stderr, "%s:%s: %s\n", path, e.Span.Start, e.Message)
				errs++
			}
		}
	}
	if errs > 0 {
		return &exitError{1, ""}
	}
	return nil
}

func unwrapPathErr(err error) error {
	if pe, ok := err.(*os.PathError); ok {
		return pe.Err
	}
	return err
}

func describeFrame(kin *kinematics.Result, setups *setup.Result, fr *model.Frame) dofFrame {
	out := dofFrame{Feature: fr.Target.Name, Line: fr.Span.Start.Line, Characteristic: string(fr.Characteristic)}
	segs := kin.Segments(fr)
	up := describeSegment(segs[0], setups)
	out.Datums, out.Free, out.ZoneFree, out.Simulators, out.Error = up.Datums, up.Free, up.ZoneFree, up.Simulators, up.Error
	for _, a := range segs[1:] {
		out.Composite = append(out.Composite, describeSegment(a, setups))
	}
	return out
}

func describeSegment(a *kinematics.Segment, setups *setup.Result) dofSegment {
	out := dofSegment{Line: a.Segment.Span.Start.Line, Datums: []dofRef{}, Free: names(a.Free()), ZoneFree: names(a.ZoneFree()),
		Simulators: simulators(setups.Of(a.Segment.Refs))}
	if !a.Resolved {
		out.Error = a.Problem
	}
	for _, st := range a.Steps() {
		out.Datums = append(out.Datums, dofRef{Ref: st.Name, Constrains: st.Constrains, Removes: names(st.Removed)})
	}
	return out
}

// simulators is a set-up in the JSON's shape: empty for a frame without
// datums or one whose datums could not be worked out.
func simulators(s *setup.Setup) []dofSimulator {
	out := []dofSimulator{}
	if s == nil {
		return out
	}
	for _, r := range s.References {
		sim := dofSimulator{Ref: r.Ref, Precedence: r.PrecedenceWord(), Boundary: r.BoundaryWord(), Kind: r.Kind(),
			Description: r.Describe(), Features: []dofSimFeature{}, Relations: []dofRelation{},
			Constrains: r.Constrains, Contact: dofContact{Points: r.Contact.Points, Text: r.Contact.Text}}
		for _, e := range r.Elements {
			f := dofSimFeature{Datum: e.Letter, Feature: e.Feature, Shape: e.Shape.String(), Members: e.Members, SizeFrom: e.From}
			if e.SizeKnown {
				f.Size = &e.Size
			}
			sim.Features = append(sim.Features, f)
		}
		for _, rel := range r.Relations {
			j := dofRelation{To: rel.To, Orientation: rel.Orientation, Text: rel.Text()}
			if rel.HasAngle {
				j.Angle = &rel.Angle
			}
			if rel.HasDistance {
				j.Distance = &rel.Distance
			}
			sim.Relations = append(sim.Relations, j)
		}
		out = append(out, sim)
	}
	return out
}

func names(ms []dof.Motion) []string {
	out := make([]string, 0, len(ms))
	for _, m := range ms {
		out = append(out, m.Name)
	}
	return out
}

// writeDofText prints one small table per frame.
func writeDofText(w io.Writer, part *model.Part, kin *kinematics.Result) error {
	if len(part.Frames) == 0 {
		_, err := fmt.Fprintln(w, "no control frames")
		return err
	}
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	for n, fr := range part.Frames {
		if n > 0 {
			fmt.Fprintln(tw)
		}
		for i, seg := range fr.Segments {
			a := kin.Segment(fr, i)
			if i == 0 {
				fmt.Fprintf(tw, "%s, line %d: %s %s\n", fr.Target.Name, fr.Span.Start.Line, fr.Characteristic, segmentLabel(seg))
			} else {
				fmt.Fprintf(tw, "  composite, line %d: %s\n", seg.Span.Start.Line, segmentLabel(seg))
			}
			if !a.Resolved {
				fmt.Fprintf(tw, "    not analysed: %s\n", a.Problem)
				continue
			}
			fmt.Fprintf(tw, "    datum\tremoves\tmotions\n")
			for _, st := range a.Steps() {
				fmt.Fprintf(tw, "    %s\t%d\t%s\n", st.Name, st.Constrains, motionList(st.Removed))
			}
			free := a.Free()
			fmt.Fprintf(tw, "    free\t%d\t%s\n", len(free), motionList(free))
			label := "moves zone"
			if fr.Characteristic.Category() == model.Orientation {
				label = "turns zone"
			}
			fmt.Fprintf(tw, "    %s\t%d\t%s\n", label, len(a.ZoneFree()), motionList(a.ZoneFree()))
		}
	}
	return tw.Flush()
}

func segmentLabel(seg *model.Segment) string {
	var b strings.Builder
	if seg.Zone != "" {
		b.WriteString(seg.Zone + " ")
	}
	fmt.Fprintf(&b, "%g", seg.Value)
	if seg.PerUnit != nil {
		b.WriteString("/" + seg.PerUnit.Text)
	}
	for _, m := range seg.Modifiers {
		b.WriteString(" (" + m.Letter + ")")
		if m.Letter == "P" || m.Letter == "U" {
			fmt.Fprintf(&b, " %g", m.Value)
		}
	}
	if len(seg.Refs) == 0 {
		b.WriteString(", no datums")
		return b.String()
	}
	b.WriteString(", datums ")
	for k, r := range seg.Refs {
		if k > 0 {
			b.WriteString(", ")
		}
		b.WriteString(r.Label())
	}
	return b.String()
}

// motionList names motions for the text table, in its words
// (dof.Phrase: "translation along x", "rotation about z through ...").
func motionList(ms []dof.Motion) string {
	if len(ms) == 0 {
		return "none"
	}
	out := make([]string, len(ms))
	for i, m := range ms {
		out[i] = dof.Phrase(m.Name)
	}
	return strings.Join(out, ", ")
}
