package main

import (
	"encoding/json"
	"io"

	"github.com/datumlint/datumlint/rules/lint"
)

// jsonFinding is the contract's JSON object for one finding.
type jsonFinding struct {
	File      string `json:"file"`
	Line      int    `json:"line"`
	Column    int    `json:"column"`
	EndLine   int    `json:"end_line"`
	EndColumn int    `json:"end_column"`
	Rule      string `json:"rule"`
	Severity  string `json:"severity"`
	Message   string `json:"message"`
	// Related (an extension of the contract's object, present only where
	// a finding speaks of another place).
	Related []jsonRelated `json:"related,omitempty"`
	// Fixes (an extension, present only where the finding offers one):
	// edits that would clear it, and whether they keep the meaning the
	// rule cares about (safe) or need the drafter's review.
	Fixes []jsonFix `json:"fixes,omitempty"`
}

type jsonFix struct {
	Message string     `json:"message"`
	Safe    bool       `json:"safe"`
	Edits   []jsonEdit `json:"edits"`
}

type jsonEdit struct {
	Line      int    `json:"line"`
	Column    int    `json:"column"`
	EndLine   int    `json:"end_line"`
	EndColumn int    `json:"end_column"`
	NewText   string `json:"new_text"`
}

type jsonRelated struct {
	Line      int    `json:"line"`
	Column    int    `json:"column"`
	EndLine   int    `json:"end_line"`
	EndColumn int    `json:"end_column"`
	Message   string `json:"message"`
}

// writeJSON prints a JSON array, one object per finding, sorted by file,
// line and column (suppressed findings are left out).
func writeJSON(w io.Writer, res *lint.Result) error {
	out := []jsonFinding{}
	for _, d := range visible(res.Diagnostics()) {
		f := jsonFinding{
			File: d.File, Line: d.Span.Start.Line, Column: d.Span.Start.Col,
			EndLine: d.Span.End.Line, EndColumn: d.Span.End.Col,
			Rule: d.Rule, Severity: d.Severity.String(), Message: d.Message,
		}
		for _, r := range d.Related {
			f.Related = append(f.Related, jsonRelated{Line: r.Span.Start.Line, Column: r.Span.Start.Col,
				EndLine: r.Span.End.Line, EndColumn: r.Span.End.Col, Message: r.Message})
		}
		for _, fx := range d.Fixes {
			jf := jsonFix{Message: fx.Message, Safe: fx.Safe, Edits: []jsonEdit{}}
			for _, e := range fx.Edits {
				jf.Edits = append(jf.Edits, jsonEdit{Line: e.Span.Start.Line, Column: e.Span.Start.Col,
					EndLine: e.Span.End.Line, EndColumn: e.Span.End.Col, NewText: e.NewText})
			}
			f.Fixes = append(f.Fixes, jf)
		}
		out = append(out, f)
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(out)
}
