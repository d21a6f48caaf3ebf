package main

import (
	"fmt"
	"io"
	"strings"
	"unicode/utf8"

	"github.com/fatih/color"

	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/lint"
)

// autoNoColor is fatih/color's own choice, made when the program starts:
// no colour where NO_COLOR is set (and not empty), TERM is dumb or standard
// output is not a terminal.
var autoNoColor = color.NoColor

// setColor applies --color. The explicit flag wins over the environment
// (the convention of no-color.org: NO_COLOR is a user's default, which a
// flag given on the command line overrides): always colours even with
// NO_COLOR set; auto honours it.
func setColor(mode string) error {
	switch mode {
	case "auto":
		color.NoColor = autoNoColor
	case "always":
		color.NoColor = false
	case "never":
		color.NoColor = true
	default:
		return fmt.Errorf("--color takes auto, always or never, not %q", mode)
	}
	// A colour made while NO_COLOR is set remembers it; say again, to each,
	// what was decided.
	for _, c := range palette() {
		if color.NoColor {
			c.DisableColor()
		} else {
			c.EnableColor()
		}
	}
	return nil
}

// palette lists the colours of the text output.
func palette() []*color.Color {
	out := []*color.Color{posColor, ruleColor, caretColor}
	for _, c := range sevColor {
		out = append(out, c)
	}
	return out
}

var (
	sevColor = map[rules.Severity]*color.Color{
		rules.Error:   color.New(color.FgRed, color.Bold),
		rules.Warning: color.New(color.FgYellow, color.Bold),
		rules.Info:    color.New(color.FgCyan),
	}
	posColor   = color.New(color.Bold)
	ruleColor  = color.New(color.Faint)
	caretColor = color.New(color.FgGreen, color.Bold)
)

// writeText prints each finding as file:line:col: severity rule: message,
// then the source line and a caret underline of the span.
func writeText(w io.Writer, res *lint.Result) error {
	for _, d := range visible(res.Diagnostics()) {
		var src *source.File
		if f := res.File(d.File); f != nil {
			src = f.Source
		}
		sev := sevColor[d.Severity]
		if sev == nil {
			sev = color.New()
		}
		fmt.Fprintf(w, "%s %s %s %s\n",
			posColor.Sprintf("%s:%d:%d:", d.File, d.Span.Start.Line, d.Span.Start.Col),
			sev.Sprint(d.Severity.String()),
			ruleColor.Sprint(d.Rule+":"),
			d.Message)
		if src != nil && d.Span.Start.Line >= 1 && d.Span.Start.Line <= src.Lines() {
			line := strings.TrimRight(string(src.LineBytes(d.Span.Start.Line)), "\r")
			if d.Span.Start.Line == 1 {
				line = strings.TrimPrefix(line, "\ufeff")
			}
			if len(line) > 400 || !utf8.ValidString(line) || hasControl(line) {
				continue // an overlong or binary line helps no one on a terminal
			}
			fmt.Fprintf(w, "    %s\n", line)
			fmt.Fprintf(w, "    %s\n", caretColor.Sprint(underline(line, d.Span.Start.Col, d.Span.End.Col, d.Span.End.Line == d.Span.Start.Line)))
		}
	}
	return nil
}

// hasControl reports a control character other than a tab, which a
// terminal would act on rather than show.
func hasControl(s string) bool {
	for _, r := range s {
		if r < 0x20 && r != '\t' || r == 0x7f {
			return true
		}
	}
	return false
}

// underline builds "    ^^^^" under columns [from, to) of line, keeping
// tabs so that the carets line up.
func underline(line string, from, to int, sameLine bool) string {
	runes := []rune(line)
	if !sameLine || to <= from {
		to = len(runes) + 1
		if to <= from {
			to = from + 1
		}
	}
	var b strings.Builder
	for i := 1; i < from; i++ {
		if i-1 < len(runes) && runes[i-1] == '\t' {
			b.WriteByte('\t')
		} else {
			b.WriteByte(' ')
		}
	}
	b.WriteString(strings.Repeat("^", to-from))
	return b.String()
}
