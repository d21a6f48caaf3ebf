package grammar

import (
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar/source"
)

const header = "units mm\nstandard asme-2018\n"

// TestParsesContractForms: every written form of the contract's notation
// parses without error.
func TestParsesContractForms(t *testing.T) {
	for _, src := range []string{
		`part "Mounting plate MP-40"`,
		"units in",
		"standard iso",
		"feature base plane normal -z at (0, 0, 0)",
		"feature b plane normal (0, 0.6, 0.8) at (1.5, -2, 1e-3)",
		"feature w slot size 12 +-0.05 normal +x at (0, 0, 0)",
		"feature w slot size 12 ±0.05 normal +x at (0, 0, 0)",
		"feature w tab size 12 +0.1 -0 normal +x at (0, 0, 0)",
		"feature w tab size 12 +0.1/-0 normal +x at (0, 0, 0)",
		"feature w tab size 16 -0 -0.02 normal +x at (0, 0, 0)",
		"feature w tab size 10 +0.05 +0.02 normal +x at (0, 0, 0)",
		"feature w tab size 10 +0.05 0 normal +x at (0, 0, 0)",
		"feature w slot size 11.95..12.05 normal +x at (0, 0, 0)",
		"feature w slot size 11.95..12.05 (E) between f1 f2",
		"feature w slot size .5 +-.01 (E) between f1 f2",
		"feature bolts hole 4x size 8.4 +-0.1 axis +z at (15,15,0) (105,15,0) (15,65,0) (105,65,0)",
		"feature bolts hole 2 x size 8.4 +-0.1 axis +z at (15,15,0) (105,15,0)",
		"feature s socket size 10 +-0.1 at (0, 0, 0)",
		"feature s ball 3x size 10 +-0.1 at (0, 0, 0) (1, 0, 0) (2, 0, 0)",
		"feature c cone axis -z at (0, 0, 5)",
		"feature e extrusion along +y at (0, 0, 0)",
		"feature f surface at (1, 2, 3)",
		"feature f surface",
		"datum A on base",
		"datum AB on bolts placed on-dimension-line",
		"datum D on bolts.2 placed on-surface",
		"frame base: flatness 0.02",
		"frame bore: position dia 0.1 (M) datums A, B, C",
		"frame bore: position ⌀0.1 Ⓜ datums A, B(M), C (L)",
		"frame bore: ⌖ ⌀ 0.1 Ⓜ datums A-B, C",
		"frame bolts.2: position dia 0 (M) (P) 12 datums A, B, C",
		"frame s: position sdia 0.2 datums A",
		"frame s: position S⌀0.2 datums A",
		"frame p: surface-profile 0.4 (U) 0.1 datums A, B, C",
		"frame p: ⌓ 0.4 (F) datums A",
		"frame p: perpendicularity 0.05 (T) datums A",
		"frame bolts: position dia 0.4 (M) datums A, B, C\n    composite dia 0.1 (M) datums A",
		"frame bolts: position dia 0.4 (M) datums A, B, C\n# a comment between\n    composite dia 0.1 (M) datums A",
		"frame bore: position dia 0.1 \\\n    datums A, B, C",
		"basic 60 from left to bore",
		"basic 30deg from base to ramp",
		"basic 150 deg from base to ramp",
		"basic 90 from bolts.1 to bolts.4 along +x",
		"basic -3.5 from a to b along (1, 1, 0)",
		"basic dia 80 through bolts about hub",
		"basic ⌀80 through bolts about hub",
		"basic 45deg from bolts.1 to C about hub",
		"dim 40 +-0.1 from rear to bore",
		"dim 40 +0.2 -0.1 from rear to bore along +y",
		"dim 39.9..40.1 from rear to bore",
		"dim 30deg +-0.5 from base to ramp",
	} {
		f := Parse("t.callouts", []byte(src+"\n"))
		if len(f.Errors) > 0 {
			t.Errorf("%q: %v", src, f.Errors[0])
		}
		if len(f.Stmts) != 1 {
			t.Errorf("%q: %d statements, want 1", src, len(f.Stmts))
		}
	}
}

// TestParsesExtensionForms: every written form the notation adds to the
// contract (docs/notation.md, marked extension) parses without error.
func TestParsesExtensionForms(t *testing.T) {
	for _, src := range []string{
		"basis model",
		"basis drawing",
		"feature tip point at (1, 2, 3)",
		"feature marks point 2x at (1, 2, 3) (4, 5, 6)",
		"feature e1 line along +z at (400, -175, 0)",
		"feature rim circle size 25 axis +y at (76.2, 66.04, -158.75)",
		"feature rim circle axis (0, 1, 0) at (0, 0, 0)",
		`feature tap hole thread "M8x1.25-6H" axis -z at (10, 10, 0)`,
		`feature taps hole 4x size 6.8 +0.1 -0 thread "1/4-20 UNC-2B" axis -z at (1, 1, 0) (2, 1, 0) (1, 2, 0) (2, 2, 0)`,
		`feature stud pin thread "M6" axis +z at (0, 0, 0)`,
		"feature cb hole size 6.6 +-0.1 cbore 11 +0.2 -0 depth 6.5 +-0.2 axis -z at (20, 20, 10)",
		"feature cs hole size 6.6 +-0.1 csink 12.5 +-0.2 angle 90deg +-1 axis -z at (20, 20, 10)",
		"feature cc hole size 6.6 +-0.1 cbore 11 depth 6.5 csink 13 angle 82 deg axis -z at (20, 20, 10)",
		"target A1 point on base at (10, 10, 0)",
		"target A2 area dia 6 on base at (90, 10, 0)",
		"target A3 area ⌀6 on base at (50, 70, 0)",
		"target B1 line on rear from (0, 0, 5) to (80, 0, 5)",
		"target C1 area 10x20 on left at (0, 20, 5) normal -x",
		"target C2 area 10X20.5 on left at (0, 20, 5)",
		"target G1 point on taper at (1, 2, 3) normal (0.9, 0.1, 0)",
		"target AB12 point on skin at (1, 2, 3) normal +Z",
		"frame base: flatness 0.005/25x25",
		"frame base: flatness 0.005 / 25x25",
		"frame edge: straightness 0.01/25",
		"frame top: parallelism 0.02/100 datums A",
		"frame bore: position 0.1 along +x datums A, B, C",
		"frame bore: position 0.1 (M) along (1, 0, 0) datums A, B, C",
		"frame boss: surface-profile 0.5 datums A, B all-around",
		"frame skin: surface-profile 0.4 all-over",
		"frame edge: line-profile 0.1 datums A between P Q",
		"frame bolts: position dia 0.4 (M) datums A, B(M) separate",
		"frame bolts: position dia 0.4 (M) datums A, B(M)\n    composite dia 0.1 (M) datums A separate",
		"frame tap: position dia 0.2 (M) datums A, B, C major-dia",
		"frame tap: position dia 0.2 (M) datums A, B, C minor-dia separate",
		"frame tap: position dia 0.2 (M) datums A, B, C pitch-dia",
		"frame bore: position dia 0.1 (M) datums A, H(M)-J(M)",
		"frame bore: position dia 0.1 (M) datums A, H (M)-J (M)",
		"frame bore: position dia 0.1 (M) datums A, H(M)-X(M), C",
		"frame bore: position dia 0.1 (M) datums A, H(L)-J-K(M)",
		"frame bore: position dia 0.1 (M) datums A, H(M) -J",
		"frame p: surface-profile 0.4 datums A, B, C all-around\n    composite 0.1 datums A",
		"ref 60 from left to bore",
		"ref 30deg from base to ramp",
		"ref 1.106 from e1 to e2 along +x",
		"ref 45deg from bolts.1 to flat about hub",
		"ref size 25 of rim",
		"basic 20 from left to A1",
	} {
		f := Parse("t.callouts", []byte(src+"\n"))
		if len(f.Errors) > 0 {
			t.Errorf("%q: %v", src, f.Errors[0])
		}
		if len(f.Stmts) != 1 {
			t.Errorf("%q: %d statements, want 1", src, len(f.Stmts))
		}
	}
}

// TestSyntaxErrors: each bad statement gives one positioned message that
// says what was expected, and the statements around it still parse.
func TestSyntaxErrors(t *testing.T) {
	for _, c := range []struct {
		src  string
		pos  string
		want string
	}{
		{"feature bore hole size 25 +0.05 -0 axis at (60, 40, 0)", "1:41", "expected a direction such as +z or (0, 0, 1) after 'axis'"},
		{"feature base plane normal -z (0, 0, 0)", "1:30", "expected 'at'"},
		{"feature base plane normal -z at", "1:32", "expected a point"},
		{"feature b plane normal (0, 0 at (0,0,0)", "1:30", "expected ',' or ')'"},
		{"featur base plane normal -z at (0,0,0)", "1:1", "did you mean 'feature'"},
		{"datum A base", "1:9", "expected 'on'"},
		{"frame bore position dia 0.1", "1:12", "expected ':'"},
		{"frame bore: position dia 0.1 datums", "1:36", "expected a datum reference"},
		{"frame bore: position dia 0.1 datums A,", "1:39", "expected a datum reference"},
		{"frame bore: position dia 0.1 @", "1:30", "unexpected character '@'"},
		{"frame bore: position dia 0.1 (X)", "1:30", "unknown modifier (X)"},
		{"frame bore: position dia 0.1 (P)", "1:30", "(P) takes a value"},
		{"frame bore: position dia 0.1 datums A(F)", "1:38", "only (M)"},
		{"basic 40 rear to bore", "1:10", "expected 'from'"},
		{"units", "1:6", "expected mm or in"},
		{"composite dia 0.1", "1:1", "lower segment of a frame"},
		{"feature x plane normal +z at (0,0,0) (1,1,1) extra", "1:46", "unexpected 'extra'"},
		{"feature a plane normal +w at (0,0,0)", "1:24", "unknown direction '+w'"},
		{"feature b plane normal +z at (0, 0)", "1:35", "three coordinates"},
		{`part "unterminated`, "1:6", "string is not closed"},
		{"basic 30° from a to b", "1:9", "30deg"},
		{"frame a: flatness 0.1 datums A - B", "1:32", "without spaces"},
		{"feature x hole size 10 +-0.1 at (0,0,0)", "", ""},
		{"basis", "1:6", "expected model or drawing after 'basis'"},
		{"target A1 point base at (0, 0, 0)", "1:17", "expected 'on'"},
		{"target A1 point on base (0, 0, 0)", "1:25", "expected 'at' and the target's point"},
		{"target A1 point on base at (0, 0, 0) along +x", "1:38", "expected 'normal'"},
		{"target A1 line on base from (0, 0, 0) (1, 0, 0)", "1:39", "expected 'to'"},
		{"target", "1:7", "expected the target's name"},
		{"frame a: flatness 0.005/ datums A", "1:26", "expected the unit length or area after '/'"},
		{"frame a: position 0.1 along datums A", "1:29", "expected a direction"},
		{"frame a: surface-profile 0.1 datums A all-round", "1:39", "unknown note 'all-round'; did you mean 'all-around'?"},
		{"frame a: surface-profile 0.1 datums A xyzzy", "1:39", "unknown note 'xyzzy' after the datum references"},
		{"frame a: surface-profile 0.1 xyzzy", "1:30", "a note (all-around"},
		{"frame a: surface-profile 0.1 datums A between P", "1:48", "two points the profile runs between"},
		{"frame a: surface-profile 0.1 datums A all-around all-over", "1:50", "one extent"},
		{"frame a: surface-profile 0.1 all-around all-around", "1:41", "written twice"},
		{"frame a: position 0.1 datums A major-dia minor-dia", "1:42", "one diameter of a thread"},
		{"frame a: position 0.1 datums -B", "1:30", "unexpected '-B'"},
		{"frame a: position 0.1 datums A, B -C", "1:35", "write a common datum as one word"},
		{"frame a: position 0.1 datums A, B(M)- C", "1:37", "without spaces"},
		{"frame a: position 0.1 datums A, B(F)-C(M)", "1:34", "only (M)"},
		{"frame a: position 0.1 datums A, B(M)-C(E)", "1:39", "only (M)"},
		{"feature a plane normal -w at (0,0,0)", "1:24", "unknown direction '-w'"},
		{"feature a hole size 6 cbore 11 axis +z at (0, 0, 0)", "1:32", "the counterbore's depth"},
		{"feature a hole size 6 cbore depth 3 axis +z at (0, 0, 0)", "1:29", "expected the counterbore's diameter"},
		{"feature a hole size 6 csink 11 axis +z at (0, 0, 0)", "1:32", "the countersink's included angle"},
		{"feature a hole size 6 csink 11 (E) angle 90deg axis +z at (0, 0, 0)", "1:32", "takes no modifier"},
		{"feature a hole thread M8 axis +z at (0, 0, 0)", "1:23", "in double quotes"},
		{"ref 40 rear to bore", "1:8", "expected 'from'"},
		{"ref size 25 rim", "1:13", "expected 'of'"},
		{"ref", "1:4", "expected a reference value"},
	} {
		f := Parse("t.callouts", []byte(c.src))
		if c.want == "" {
			if len(f.Errors) != 0 {
				t.Errorf("%q: unexpected %v", c.src, f.Errors)
			}
			continue
		}
		if len(f.Errors) != 1 {
			t.Errorf("%q: %d errors %v, want 1", c.src, len(f.Errors), f.Errors)
			continue
		}
		e := f.Errors[0]
		if e.Span.Start.String() != c.pos || !strings.Contains(e.Msg, c.want) {
			t.Errorf("%q:\n got %s: %s\nwant %s: ...%s...", c.src, e.Span.Start, e.Msg, c.pos, c.want)
		}
	}
}

// TestEveryBadStatementReported: one typo does not hide the rest.
func TestEveryBadStatementReported(t *testing.T) {
	src := header + "featur a plane\nfeature b plane normal +z at (0,0,0)\ndatum A b\ndatum B on b\nframe b flatness 0.1\n"
	f := Parse("t", []byte(src))
	if len(f.Errors) != 3 {
		t.Fatalf("got %d errors, want 3: %v", len(f.Errors), f.Errors)
	}
	for i, line := range []int{3, 5, 7} {
		if f.Errors[i].Span.Start.Line != line {
			t.Errorf("error %d on line %d, want %d", i, f.Errors[i].Span.Start.Line, line)
		}
	}
	if _, ok := f.Stmts[3].(*FeatureStmt); !ok {
		t.Errorf("statement after a bad one did not parse: %T", f.Stmts[3])
	}
}

// TestSpansCountCharacters: columns count characters, not bytes, and
// continuation lines keep their own line numbers.
func TestSpansCountCharacters(t *testing.T) {
	src := "frame bore: ⌖ ⌀0.1 Ⓜ datums A, \\\n   B(M), C\n"
	f := Parse("t", []byte(src))
	if len(f.Errors) > 0 {
		t.Fatal(f.Errors)
	}
	fr := f.Stmts[0].(*FrameStmt)
	if got := fr.Tolerance.Value.Span(); got.String() != "1:16-1:19" {
		t.Errorf("value span %s, want 1:16-1:19", got)
	}
	b := fr.Tolerance.Datums[1]
	if got := b.Span(); got.Start.String() != "2:4" {
		t.Errorf("datum B at %s, want 2:4", got.Start)
	}
	if f.Extents[0] != (Extent{1, 2}) {
		t.Errorf("extent %v, want {1 2}", f.Extents[0])
	}
}

func TestComments(t *testing.T) {
	src := "part \"A # B\" # trailing\n# own line\nunits mm\r\n"
	f := Parse("t", []byte("\xef\xbb\xbf"+src))
	if len(f.Errors) > 0 {
		t.Fatal(f.Errors)
	}
	if len(f.Comments) != 2 || !f.Comments[0].Trailing || f.Comments[1].Trailing {
		t.Fatalf("comments: %+v", f.Comments)
	}
	if f.Comments[0].Span.Start.String() != "1:14" {
		t.Errorf("trailing comment at %s, want 1:14", f.Comments[0].Span.Start)
	}
	if got := f.Stmts[0].(*PartStmt).Title; got != `"A # B"` {
		t.Errorf("title %s", got)
	}
}

func TestHostileInputNeverPanics(t *testing.T) {
	inputs := [][]byte{
		nil,
		[]byte("\x00\x01\x02"),
		[]byte("feature a plane normal +z at (0,0,0) \xff\xfe\n"),
		[]byte(strings.Repeat("(", 100000)),
		[]byte("frame a: position " + strings.Repeat("9", 400) + "\n"),
		[]byte("basic 1e309 from a to b\n"),
		[]byte("\\\n\\\n\\"),
		[]byte("composite\ncomposite\n"),
		[]byte(strings.Repeat("feature a plane normal +z at (0,0,0)\n", 1000)),
	}
	for _, in := range inputs {
		f := Parse("t", in)
		for _, e := range f.Errors {
			if e.Span.Start.Line < 1 || e.Span.Start.Col < 1 {
				t.Errorf("error without position: %v", e)
			}
		}
	}
}

// TestOverlongStatement: a statement too long for the error path is one
// positioned finding, not a parse that takes seconds and gigabytes.
func TestOverlongStatement(t *testing.T) {
	src := "units mm\nfeature base plane normal -z at (0,0,0) " + strings.Repeat("a @ ", MaxStmtBytes/4+1) + "\nunits in\n"
	f := Parse("t", []byte(src))
	if len(f.Errors) != 1 || f.Errors[0].Span.Start != (source.Pos{Line: 2, Col: 1}) || !strings.Contains(f.Errors[0].Msg, "bytes long") {
		t.Fatalf("errors %v", f.Errors)
	}
	if len(f.Stmts) != 3 {
		t.Errorf("the statements around it were not kept: %d", len(f.Stmts))
	}
}
