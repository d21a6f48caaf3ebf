package main

import (
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/lint"
)

// GitHub Actions workflow commands: one annotation per finding, shown on
// the pull request's diff. Suppressed findings are left out.

func writeGitHub(w io.Writer, res *lint.Result) error {
	for _, d := range visible(res.Diagnostics()) {
		cmd := "error"
		switch d.Severity {
		case rules.Warning:
			cmd = "warning"
		case rules.Info:
			cmd = "notice"
		}
		props := []string{"file=" + ghProperty(filepath.ToSlash(d.File))}
		if sp := d.Span; sp.Start.Line >= 1 {
			props = append(props, fmt.Sprintf("line=%d", sp.Start.Line))
			endLine := max(sp.End.Line, sp.Start.Line)
			if endLine == sp.Start.Line {
				// Columns are accepted only on one line; the end column is
				// the last character covered (our spans end one past it).
				props = append(props, fmt.Sprintf("col=%d", sp.Start.Col),
					fmt.Sprintf("endLine=%d", endLine),
					fmt.Sprintf("endColumn=%d", max(sp.End.Col-1, sp.Start.Col)))
			} else {
				props = append(props, fmt.Sprintf("endLine=%d", endLine))
			}
		}
		props = append(props, "title="+ghProperty(d.Rule))
		if _, err := fmt.Fprintf(w, "::%s %s::%s\n", cmd, strings.Join(props, ","), ghData(d.Message)); err != nil {
			return err
		}
	}
	return nil
}

// ghDataEscaper escapes a workflow command's message: %, CR and LF.
var ghDataEscaper = strings.NewReplacer("%", "%25", "\r", "%0D", "\n", "%0A")

// ghPropertyEscaper escapes a property value: as data, plus ':' and ','
// which separate the properties.
var ghPropertyEscaper = strings.NewReplacer("%", "%25", "\r", "%0D", "\n", "%0A", ":", "%3A", ",", "%2C")

func ghData(s string) string     { return ghDataEscaper.Replace(s) }
func ghProperty(s string) string { return ghPropertyEscaper.Replace(s) }
