package main

import (
	"encoding/json"
	"fmt"
	"io"
	"os"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/dof"
	"github.com/datumlint/datumlint/rules/lint"
)

func init() { extraCommands = append(extraCommands, newDofCmd) }

func newDofCmd() *cobra.Command {
	var format string
	cmd := &cobra.Command{
		Use:   "dof FILE",
		Short: "Show the degrees of freedom each datum reference removes, frame by frame",
		Long: `For every control frame of FILE, in file order: each datum reference with the motions it
removes (in precedence order), the motions the frame leaves free, and which of those move the
tolerance zone (for orientation tolerances, which free rotations turn it).

Exit 0: every statement parsed; 1: the file has syntax errors (printed on stderr; the frames
that were read are still shown); 2: usage error or an unreadable file.`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			return runDof(cmd.OutOrStdout(), cmd.ErrOrStderr(), args[0], format)
		},
	}
	cmd.Flags().StringVar(&format, "format", "text", "output format: text or json")
	return cmd
}

// dofRef is one datum reference in `dof --format json`.
type dofRef struct {
	Ref        string `json:"ref"`
	Constrains int    `json:"constrains"`
}

// dofSegment is a composite lower segment (an extension of version 0:
// docs/notation.md, "The dof output").
type dofSegment struct {
	Line     int      `json:"line"`
	Datums   []dofRef `json:"datums"`
	Free     []string `json:"free"`
	ZoneFree []string `json:"zone_free"`
	Error    string   `json:"error,omitempty"`
}

// dofFrame is the contract's object for one frame; field order follows the
// contract.
type dofFrame struct {
	Feature        string       `json:"feature"`
	Line           int          `json:"line"`
	Characteristic string       `json:"characteristic"`
	Datums         []dofRef     `json:"datums"`
	Free           []string     `json:"free"`
	ZoneFree       []string     `json:"zone_free"`
	Composite      []dofSegment `json:"composite,omitempty"`
	Error          string       `json:"error,omitempty"`
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
	file := grammar.Parse(path, src)
	part := model.Resolve(file)
	facts := rules.NewFacts(part)

	frames := make([]dofFrame, 0, len(part.Frames))
	for _, fr := range part.Frames {
		frames = append(frames, describeFrame(facts, fr))
	}
	if format == "json" {
		enc := json.NewEncoder(stdout)
		enc.SetIndent("", "  ")
		if err := enc.Encode(frames); err != nil {
			return &exitError{2, err.Error()}
		}
	} else if err := writeDofText(stdout, part, facts); err != nil {
		return &exitError{2, err.Error()}
	}

	var errs []*grammar.SyntaxError
	errs = append(errs, file.Errors...)
	errs = append(errs, part.Errors...)
	errs = append(errs, part.GeometryErrors...)
	for _, e := range errs {
		fmt.Fprintf(stderr, "%s:%s: %s\n", path, e.Span.Start, e.Msg)
	}
	if len(errs) > 0 {
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

func describeFrame(facts *rules.Facts, fr *model.Frame) dofFrame {
	out := dofFrame{Feature: fr.Target.Name, Line: fr.Span.Start.Line, Characteristic: string(fr.Characteristic)}
	up := describeSegment(facts, fr, 0)
	out.Datums, out.Free, out.ZoneFree, out.Error = up.Datums, up.Free, up.ZoneFree, up.Error
	for i := 1; i < len(fr.Segments); i++ {
		out.Composite = append(out.Composite, describeSegment(facts, fr, i))
	}
	return out
}

func describeSegment(facts *rules.Facts, fr *model.Frame, i int) dofSegment {
	a := facts.DOF(fr, i)
	seg := fr.Segments[i]
	out := dofSegment{Line: seg.Span.Start.Line, Datums: []dofRef{}, Free: []string{}, ZoneFree: []string{}}
	var steps []dof.Step
	if a.Resolved {
		steps = a.DRF.Steps()
		out.Free = names(a.DRF.Free())
		out.ZoneFree = names(a.Zone.Free)
	} else {
		out.Error = a.Problem
	}
	for k, r := range seg.Refs {
		ref := dofRef{Ref: strings.Join(r.Letters, "-")}
		if k < len(steps) {
			ref.Constrains = steps[k].Constrains
		}
		out.Datums = append(out.Datums, ref)
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
func writeDofText(w io.Writer, part *model.Part, facts *rules.Facts) error {
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
			a := facts.DOF(fr, i)
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
			for k, st := range a.DRF.Steps() {
				fmt.Fprintf(tw, "    %s\t%d\t%s\n", strings.Join(seg.Refs[k].Letters, "-"), st.Constrains, motionList(st.Removed))
			}
			free := a.DRF.Free()
			fmt.Fprintf(tw, "    free\t%d\t%s\n", len(free), motionList(free))
			label := "moves zone"
			if fr.Characteristic.Category() == model.Orientation {
				label = "turns zone"
			}
			fmt.Fprintf(tw, "    %s\t%d\t%s\n", label, len(a.Zone.Free), motionList(a.Zone.Free))
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
		b.WriteString(strings.Join(r.Letters, "-"))
		if r.Material != "" {
			b.WriteString("(" + r.Material + ")")
		}
	}
	return b.String()
}

func motionList(ms []dof.Motion) string {
	if len(ms) == 0 {
		return "none"
	}
	return strings.Join(names(ms), ", ")
}
