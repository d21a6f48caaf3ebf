package qif

import (
	"fmt"
	"path/filepath"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
)

// flangeCallouts is the example part testdata/examples/bearing-flange.qif
// written in the notation (with the reader's names for what the QIF does
// not name validly).
const flangeCallouts = `part "Bearing flange BF-30"
units mm
standard asme-2018

feature back     plane normal -z at (0, 0, 0)
feature front    plane normal +z at (0, 0, 10)
feature pilot    pin size 30 +0 -0.021 axis +z at (0, 0, 0)
feature flat     plane normal -y at (0, -40, 5)
feature bore     hole size 20 +0.021 -0 axis +z at (0, 0, 0)
feature holes_55 hole 4x size 6.6 +-0.1 axis +z at (25, 25, 0) (-25, 25, 0) (-25, -25, 0) (25, -25, 0)

datum A on back
datum B on pilot
datum C on flat

frame back: flatness 0.02
frame front: parallelism 0.05 datums A
frame pilot: perpendicularity dia 0.02 datums A
frame flat: perpendicularity 0.05 datums A
frame bore: position dia 0.05 (M) datums A, B
frame holes_55: position dia 0.2 (M) datums A, B, C

basic 25 from pilot to holes_55.1 along +x
basic 25 from pilot to holes_55.1 along +y
basic 50 from holes_55.1 to holes_55.2 along +x
basic 50 from holes_55.2 to holes_55.3 along +y
basic 50 from holes_55.3 to holes_55.4 along +x
`

// summary writes what rules read of a part, reader-independently.
func summary(p *model.Part) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s %v %v\n", p.Title, p.Units, p.Standard)
	for _, f := range p.Features {
		fmt.Fprintf(&b, "feature %s %v pattern=%v dir=%v geometry=%v", f.Name, f.Kind, f.Pattern, f.Dir, f.HasGeometry)
		for _, m := range f.Members {
			fmt.Fprintf(&b, " %d:%v", m.Index, m.Point)
		}
		if s := f.Size; s != nil {
			// -0 (written "-0" in the notation) and 0 are one deviation.
			fmt.Fprintf(&b, " size %g %+g %+g %v %v", s.Nominal, s.Upper+0, s.Lower+0, s.Toleranced, s.Envelope)
		}
		b.WriteString("\n")
	}
	for _, d := range p.Datums {
		fmt.Fprintf(&b, "datum %s on %s\n", d.Letter, d.Target.Name)
	}
	for _, fr := range p.Frames {
		b.WriteString(frameText(fr) + "\n")
	}
	for _, d := range p.Dims {
		b.WriteString(dimText(d) + "\n")
	}
	fmt.Fprintf(&b, "centre %v scale %.9g\n", p.Center, p.Scale)
	return b.String()
}

// The shipped example reads into the same model as its notation twin.
func TestExampleMatchesNotation(t *testing.T) {
	res, _ := readPath(t, filepath.Join("..", "..", "testdata", "examples", "bearing-flange.qif"))
	if len(res.Part.Problems) != 0 {
		t.Errorf("notes on the example: %v", res.Part.Problems)
	}
	f := grammar.Parse("bearing-flange.callouts", []byte(flangeCallouts))
	if len(f.Errors) > 0 {
		t.Fatalf("the twin does not parse: %v", f.Errors)
	}
	want := summary(grammar.Resolve(f))
	if got := summary(res.Part); got != want {
		t.Errorf("the QIF example reads as\n%s\nits notation twin as\n%s", got, want)
	}
}
