package lint

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/rules"
)

// The NIST PMI test models (public test data, testdata/qif/nist, Boost
// Software License 1.0) checked as QIF documents, every finding triaged:
// real ones with why they are real, and false ones with what removes them.
// A false finding that is still reported is listed as known, and the test
// fails once it is gone, so that the list is kept honest.

// verdict is what a careful review calls a finding.
type verdict int

const (
	real       verdict = iota + 1 // the model has the problem the finding names
	knownFalse                    // the model is right; goesWith says what fixes the rule
)

type triaged struct {
	line    int
	rule    string
	re      string
	verdict verdict
	// why: for a real finding, what is wrong in the model; for a false one,
	// why it is false.
	why string
	// goesWith is the issue expected to remove a false finding.
	goesWith string
}

// counted is a rule triaged by count rather than one by one (the notes on
// what the reader left out: informational by definition).
type counted struct {
	rule string
	n    int
	why  string
}

const (
	issue11 = "issue 11 (rule correctness)"
	// qifFaces: reading which features share faces (EntityInternalIds), so
	// that a tolerance on a set of faces also relates each feature made of
	// some of them; not done yet.
	qifFaces = "the QIF reader relating features by their shared faces"
)

var nistTriage = []struct {
	model   string
	each    []triaged
	counted []counted
}{
	{model: "nist_ctc_01_asme1_ap242", each: []triaged{
		{166, "datum-unqualified", `^datum B is used as secondary to A but no tolerance relates 'hole_2156' to A`, real,
			"datum feature B (a hole) carries a size and nothing else: no orientation or location relates it to the primary A", ""},
		{172, "datum-unqualified", `^datum C is used as tertiary to A, B but no tolerance relates 'hole_2157'`, real,
			"datum feature C (a hole) likewise has no tolerance relating it to A or B", ""},
		{23833, "frame-underconstrained", `^the zone of surface_2173 is free to slide along x and y`, real,
			"the profile of the hexagonal boss references A only: nothing places the boss relative to B and C", ""},
	}, counted: []counted{
		{"qif-unsupported", 2, "an angular size and a tapered width, which the model has no place for"},
	}},
	{model: "nist_ctc_03_asme1_ap242", each: []triaged{
		{190, "datum-unused", `^datum F is declared but no frame references it`, real,
			"datum F is declared on hole 3066 and no datum reference frame uses it", ""},
		{33682, "datum-unneeded", `^B is not needed by this surface-profile`, real,
			"the profile of D, a plane parallel to the primary A: B and C constrain nothing of its zone (an info)", ""},
		{33682, "datum-unneeded", `^C is not needed by this surface-profile`, real,
			"as for B", ""},
		{33301, "qif-inconsistent", `^the geometric tolerances are labelled mm \(13 values\) and the sizes and dimensions inch \(25 values\)`, real,
			"the document labels its sizes in inches and its tolerances in mm while every value is in one unit system on the drawing", ""},
		{33670, "qif-inconsistent", `^the angularity's angle -1 is not an angle`, real,
			"an angularity's nominal angle of -1 is no angle", ""},
		{33410, "zone-shape", `^the position of the hole hole_3064 is toleranced in a zone of two parallel planes without their direction`, real,
			"an info: the document states a NonDiametricalZone (meant, beside a second frame with a diameter zone) but not the planes' direction", ""},
	}},
	{model: "nist_ftc_06_asme1_ap242", each: []triaged{
		{160, "datum-unqualified", `^datum A is used as secondary to E, and 'plane_3566' is related to E only the other way round`, real,
			"an info: A and E are related, but by E's profile to A, the reverse of the precedence of the frame that puts E first", ""},
		{39357, "datum-unneeded", `^B is not needed by this surface-profile`, real,
			"profiles of planes parallel to the primary A: B and C constrain nothing of their zones (an info)", ""},
		{39357, "datum-unneeded", `^C is not needed by this surface-profile`, real,
			"as for B", ""},
		{38924, "qif-inconsistent", `^the zone of datum target K2 \(feature zone 3743\) is 1\.002 in off the plane it names`, real,
			"the document puts target K2 on one face of the V and its zone on the other", ""},
		{38931, "qif-inconsistent", `^the zone of datum target J1 \(feature zone 3744\) is 1\.002 in off the plane it names`, real,
			"as for K2", ""},
		{199, "datum-unqualified", `^datum H is used as secondary to D but no tolerance relates 'cone_3636' to D`, knownFalse,
			"the composite profile 2426 is on surface 3611, whose faces include cone H's: it relates H to D, but the model has no feature that includes another", qifFaces},
		{205, "datum-unqualified", `^datum G is used as secondary to D but no tolerance relates 'cone_3637' to D`, knownFalse,
			"as for H: profile 2435 on surface 3617 includes cone G's faces", qifFaces},
	}, counted: []counted{
		{"qif-unsupported", 25, "20 cylindrical and spherical segments read as surfaces (no opposed points), two datum targets without a zone read as their whole cones, three radii"},
	}},
}

// Findings the reader or the rules already fixed, which must not come
// back: basic-missing on a model that is basic; a toleranced distance from
// D to four faces made basic-toleranced fire on D; a 0.56 written with two
// decimals against a nominal 0.5625 made basic-mismatch fire.
var nistGone = []struct{ model, rule string }{
	// The model is basic (basis model): basic-missing asks nothing of it.
	{"nist_ctc_01_asme1_ap242", "basic-missing"},
	{"nist_ctc_03_asme1_ap242", "basic-missing"},
	{"nist_ftc_06_asme1_ap242", "basic-missing"},
	{"nist_ctc_03_asme1_ap242", "basic-toleranced"},
	{"nist_ftc_06_asme1_ap242", "basic-toleranced"},
	{"nist_ftc_06_asme1_ap242", "basic-mismatch"},
}

func TestNISTTriage(t *testing.T) {
	for _, m := range nistTriage {
		t.Run(m.model, func(t *testing.T) {
			path := filepath.Join("..", "..", "testdata", "qif", "nist", m.model+".qif")
			src, err := os.ReadFile(path)
			if err != nil {
				t.Fatal(err)
			}
			ds := rules.Check(Read(path, src), nil)
			used := make([]bool, len(ds))
			for _, w := range m.each {
				if w.why == "" || (w.verdict == knownFalse) != (w.goesWith != "") {
					t.Errorf("line %d %s: a triaged finding says why, and a false one what removes it", w.line, w.rule)
				}
				re := regexp.MustCompile(w.re)
				found := false
				for i, d := range ds {
					if !used[i] && d.Rule == w.rule && d.Span.Start.Line == w.line && re.MatchString(d.Message) {
						used[i], found = true, true
						break
					}
				}
				switch {
				case !found && w.verdict == real:
					t.Errorf("line %d: the real %s finding (%s) is no longer reported", w.line, w.rule, w.why)
				case !found:
					t.Errorf("line %d: the false %s finding is gone (fixed by %s?): take it off the known-false list", w.line, w.rule, w.goesWith)
				}
			}
			for _, c := range m.counted {
				n := 0
				for i, d := range ds {
					if !used[i] && d.Rule == c.rule {
						used[i] = true
						n++
					}
				}
				if n != c.n {
					t.Errorf("%d %s findings, triaged %d (%s)", n, c.rule, c.n, c.why)
				}
			}
			for i, d := range ds {
				if !used[i] {
					t.Errorf("untriaged finding %s: %s %s: %s", d.Span.Start, d.Severity, d.Rule, d.Message)
				}
			}
			for _, g := range nistGone {
				for _, d := range ds {
					if g.model == m.model && d.Rule == g.rule {
						t.Errorf("a fixed false finding is back: %s %s: %s", d.Span.Start, d.Rule, d.Message)
					}
				}
			}
			// Every finding points at an element of the file: a start tag.
			for _, d := range ds {
				line := string(srcLine(src, d.Span.Start.Line))
				col := []rune(line)
				if d.Span.Start.Col < 1 || d.Span.Start.Col > len(col) || col[d.Span.Start.Col-1] != '<' {
					t.Errorf("%s %s does not point at an element: %q", d.Span.Start, d.Rule, strings.TrimSpace(line))
				}
			}
		})
	}
}

func srcLine(src []byte, n int) []byte {
	lines := strings.SplitN(string(src), "\n", n+1)
	if n < 1 || n > len(lines) {
		return nil
	}
	return []byte(lines[n-1])
}
