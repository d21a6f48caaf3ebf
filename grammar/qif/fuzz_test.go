package qif

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// inFile reports whether a span lies in the file: lines and columns that
// exist (a column one past a line's end is where the line ends).
func inFile(f *source.File, sp source.Span) bool {
	for _, p := range []source.Pos{sp.Start, sp.End} {
		if p.Line < 1 || p.Line > f.Lines() || p.Col < 1 || p.Col > utf8.RuneCount(f.LineBytes(p.Line))+1 {
			return false
		}
	}
	return !sp.End.Before(sp.Start)
}

// FuzzRead: whatever the bytes, Read returns a positioned *Error or a part
// whose every note, feature, datum, frame and dimension points into the
// file; it never panics.
//
//	go test -run '^$' -fuzz '^FuzzRead$' -fuzztime 3m -fuzzminimizetime 5s ./grammar/qif/
func FuzzRead(f *testing.F) {
	for _, c := range constructs {
		f.Add(c.doc.String())
	}
	if src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "examples", "bearing-flange.qif")); err == nil {
		f.Add(string(src))
	}
	for _, s := range []string{"", "x", root, root + "</QIFDocument>", "<!DOCTYPE a>" + root, root + "<Features><Feat",
		root + "<QPId>&x;</QPId></QIFDocument>", "\ufeff" + root + "</QIFDocument>"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, src string) {
		file := source.NewFile("fuzz.qif", []byte(src))
		res, err := ReadFile(file)
		if err != nil {
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("not an *Error: %v", err)
			}
			if !inFile(file, e.Span) || e.Msg == "" {
				t.Fatalf("error outside the file or empty: %v", e)
			}
			if q := Read("fuzz.qif", []byte(src)); len(q.Problems) != 1 || q.Problems[0].Kind != model.Syntax || len(q.Statements) != 0 {
				t.Fatalf("a refused document reads as %+v", q.Problems)
			}
			return
		}
		if res.Part == nil || res.Doc == nil {
			t.Fatal("no part")
		}
		for _, n := range res.Part.Problems {
			if !inFile(file, n.Span) || strings.TrimSpace(n.Message) == "" {
				t.Fatalf("note outside the file or empty: %v", n)
			}
		}
		p := res.Part
		for _, ft := range p.Features {
			if !inFile(file, ft.Span) || !inFile(file, ft.NameSpan) || len(ft.Members) == 0 || p.Feature(ft.Name) != ft {
				t.Fatalf("feature %q", ft.Name)
			}
		}
		for _, d := range p.Datums {
			if !inFile(file, d.Span) || !inFile(file, d.LetterSpan) || !d.Broken && !d.Target.Resolved() {
				t.Fatalf("datum %q", d.Letter)
			}
		}
		for _, dt := range p.Targets {
			if !inFile(file, dt.Span) || !dt.On.Resolved() || dt.Feature == nil || dt.Feature.DatumTarget != dt || p.Feature(dt.Label) != dt.Feature {
				t.Fatalf("datum target %+v", dt)
			}
		}
		for _, fr := range p.Frames {
			if !inFile(file, fr.Span) || !inFile(file, fr.CharSpan) || !fr.Target.Resolved() || len(fr.Segments) == 0 {
				t.Fatalf("frame on %q", fr.Target.Name)
			}
			for _, s := range fr.Segments {
				if !inFile(file, s.ValueSpan) {
					t.Fatalf("segment value span %v", s.ValueSpan)
				}
				for _, r := range s.Refs {
					if !inFile(file, r.Span) || len(r.Letters) != len(r.Datums) {
						t.Fatalf("ref %+v", r)
					}
				}
			}
		}
		for _, d := range p.Dims {
			if d.SizeOf != nil && (!d.Reference || !d.SizeOf.Resolved() || !inFile(file, d.Span)) {
				t.Fatalf("reference size %+v", d)
			}
			if d.SizeOf == nil && (!inFile(file, d.Span) || !d.From.Resolved() || !d.To.Resolved()) {
				t.Fatalf("dimension %+v", d)
			}
		}
		// Statements are in file order and do not overlap, as SARIF
		// fingerprints and suppressions read them.
		for i, st := range p.Statements {
			if st.First < 1 || st.Last < st.First || st.Last > file.Lines() || !inFile(file, st.Span) {
				t.Fatalf("statement %+v", st)
			}
			if i > 0 && st.First < p.Statements[i-1].First {
				t.Fatalf("statements out of order: %+v after %+v", st, p.Statements[i-1])
			}
		}
		// The lint reader gives the same part, or one syntax problem.
		if q := Read("fuzz.qif", []byte(src)); len(q.Features) != len(p.Features) || len(q.Frames) != len(p.Frames) {
			t.Fatal("Read and ReadFile disagree")
		}
	})
}
