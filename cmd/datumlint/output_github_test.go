package main

import (
	"bytes"
	"testing"

	"github.com/datumlint/datumlint/grammar/source"

	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/lint"
)

func TestGitHubEscaping(t *testing.T) {
	at := func(l1, c1, l2, c2 int) source.Span {
		return source.Span{Start: source.Pos{Line: l1, Col: c1}, End: source.Pos{Line: l2, Col: c2}}
	}
	res := lint.Result{Files: []*lint.File{{Path: "many.callouts", Diagnostics: []rules.Diagnostic{
		{File: "a,b:c%d.callouts", Span: at(3, 5, 3, 9), Rule: "zone-shape", Severity: rules.Warning,
			Message: "50% of it: a, b\r\nnext line"},
		{File: "m.callouts", Span: at(4, 2, 6, 1), Rule: "datum-unused", Severity: rules.Info, Message: "spans lines"},
		{File: "s.callouts", Span: at(1, 1, 1, 2), Rule: "datum-unused", Severity: rules.Error, Message: "hidden", Suppressed: true},
	}}}}
	var out bytes.Buffer
	if err := writeGitHub(&out, &res); err != nil {
		t.Fatal(err)
	}
	want := "::warning file=a%2Cb%3Ac%25d.callouts,line=3,col=5,endLine=3,endColumn=8,title=zone-shape::50%25 of it: a, b%0D%0Anext line\n" +
		// Columns are left out of an annotation over several lines.
		"::notice file=m.callouts,line=4,endLine=6,title=datum-unused::spans lines\n"
	if out.String() != want {
		t.Errorf("got:\n%s\nwant:\n%s", out.String(), want)
	}
}
