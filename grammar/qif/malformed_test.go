package qif

import (
	"errors"
	"fmt"
	"regexp"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar/source"
)

// refuse reads src with the limits and wants an *Error matching the
// pattern at the position.
func refuse(t *testing.T, src string, lim Limits, pattern string, line, col int) {
	t.Helper()
	_, err := decodeWith(source.NewFile("bad.qif", []byte(src)), lim)
	var e *Error
	if !errors.As(err, &e) {
		t.Fatalf("want an *Error, got %v", err)
	}
	if !regexp.MustCompile(pattern).MatchString(e.Msg) {
		t.Errorf("message %q does not match %q", e.Msg, pattern)
	}
	if e.Span.Start.Line != line || e.Span.Start.Col != col {
		t.Errorf("at %s, want %d:%d (%s)", e.Span.Start, line, col, e.Msg)
	}
}

const root = `<QIFDocument xmlns="http://qifstandards.org/xsd/qif3" versionQIF="3.0.0" idMax="1">`

func TestRefusesEmpty(t *testing.T) {
	refuse(t, "", DefaultLimits, "empty", 1, 1)
	refuse(t, " \n\t\n", DefaultLimits, "empty", 1, 1)
}

func TestRefusesText(t *testing.T) {
	refuse(t, "part \"Bracket\"\nunits mm\n", DefaultLimits, "starts with text, not an element: not an XML document", 1, 1)
}

func TestRefusesBinary(t *testing.T) {
	refuse(t, "<a>\xff\xfe</a>", DefaultLimits, "not UTF-8", 1, 4)
}

func TestRefusesIllFormedXML(t *testing.T) {
	refuse(t, root+"\n  <Features>\n  </Characteristics>\n</QIFDocument>", DefaultLimits, "not well-formed XML: element <Features> closed by </Characteristics>", 3, 21)
}

func TestRefusesOtherRoot(t *testing.T) {
	refuse(t, "<?xml version=\"1.0\"?>\n<svg xmlns=\"http://www.w3.org/2000/svg\"/>", DefaultLimits, `root element is <svg>, not <QIFDocument>`, 2, 1)
}

func TestRefusesOtherVersions(t *testing.T) {
	refuse(t, `<QIFDocument xmlns="http://qifstandards.org/xsd/qif2" versionQIF="2.1.0" idMax="1"/>`, DefaultLimits, `QIF version 2.1.0: the reader reads QIF 3.x`, 1, 1)
	refuse(t, `<QIFDocument xmlns="http://qifstandards.org/xsd/qif3" idMax="1"/>`, DefaultLimits, `does not say its QIF version`, 1, 1)
	refuse(t, `<QIFDocument xmlns="urn:other" versionQIF="3.0.0"/>`, DefaultLimits, `in the namespace "urn:other"`, 1, 1)
}

func TestAcceptsQIF3Minor(t *testing.T) {
	res, err := ReadFile(source.NewFile("t.qif", []byte(`<QIFDocument xmlns="http://qifstandards.org/xsd/qif3" versionQIF="3.1.0" idMax="1"/>`)))
	if err != nil || res.Doc.Version != "3.1.0" {
		t.Fatalf("QIF 3.1.0: %v", err)
	}
}

func TestRefusesTruncated(t *testing.T) {
	src := qdoc{fdefs: planeDef(1), fnoms: plane(2, 1, "", "0 0 0", "0 0 1")}.String()
	cut := src[:strings.Index(src, "<Location>")]
	f := source.NewFile("", []byte(cut))
	end := f.Position(len(cut))
	refuse(t, cut, DefaultLimits, `ends inside <PlaneFeatureNominal> \(opened at \d+:\d+\): the file is truncated`, end.Line, end.Col)
	// Cut inside a tag, and with nothing but the root open.
	refuse(t, root+"<Features><Feat", DefaultLimits, `truncated|not well-formed`, 1, len(root)+16)
	refuse(t, root, DefaultLimits, `ends inside <QIFDocument> \(opened at 1:1\): the file is truncated`, 1, len(root)+1)
}

// A document type declaration is refused before any entity could expand
// (the "billion laughs": each entity ten times the one before).
func TestRefusesEntities(t *testing.T) {
	laughs := `<?xml version="1.0"?>
<!DOCTYPE QIFDocument [
 <!ENTITY lol "lol">
 <!ENTITY lol2 "&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;">
 <!ENTITY lol3 "&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;">
]>
` + root + "<QPId>&lol3;</QPId></QIFDocument>"
	refuse(t, laughs, DefaultLimits, `document type declaration \(<!DOCTYPE\) is refused`, 2, 1)
	refuse(t, root+"<QPId>&lol;</QPId></QIFDocument>", DefaultLimits, `invalid character entity &lol;.*predefined entities`, 1, len(root)+12)
	refuse(t, `<!DOCTYPE x SYSTEM "file:///etc/passwd">`+root+"</QIFDocument>", DefaultLimits, `document type declaration`, 1, 1)
}

func TestRefusesDeepNesting(t *testing.T) {
	src := root + strings.Repeat("<Features>", 300) + strings.Repeat("</Features>", 300) + "</QIFDocument>"
	refuse(t, src, DefaultLimits, `nested more than 256 deep`, 1, len(root)+255*len("<Features>")+1)
}

func TestRefusesHugeText(t *testing.T) {
	lim := DefaultLimits
	lim.Text = 1000
	src := root + "\n<Features>" + strings.Repeat("x", 1001) + "</Features></QIFDocument>"
	refuse(t, src, lim, `a text of 1001 bytes, more than 1000`, 2, 11)
}

func TestRefusesManyElements(t *testing.T) {
	lim := DefaultLimits
	lim.Elements = 50
	src := root + strings.Repeat("<Features/>", 60) + "</QIFDocument>"
	refuse(t, src, lim, `more than 50 elements`, 1, len(root)+49*len("<Features/>")+1)
}

func TestRefusesManyKept(t *testing.T) {
	lim := DefaultLimits
	lim.Kept = 10
	// Skipped sections do not count; kept ones do.
	src := root + "<Plan>" + strings.Repeat("<x/>", 50) + "</Plan><Features>" + strings.Repeat("<FeatureNominals/>", 20) + "</Features></QIFDocument>"
	refuse(t, src, lim, `more than 10 elements in the sections the reader reads`, 1, len(root)+len("<Plan>")+50*4+len("</Plan><Features>")+9*len("<FeatureNominals/>")+1)
}

func TestRefusesManyAttributes(t *testing.T) {
	var b strings.Builder
	for i := 0; i < 300; i++ {
		b.WriteString(" a" + strings.Repeat("x", i%7) + string(rune('a'+i%26)) + string(rune('a'+i/26)) + `="1"`)
	}
	src := root + "\n  <Features" + b.String() + "/></QIFDocument>"
	refuse(t, src, DefaultLimits, `<Features> has 300 attributes, more than 256`, 2, 3)
}

func TestRefusesTwoRoots(t *testing.T) {
	refuse(t, root+"</QIFDocument>\n"+root+"</QIFDocument>", DefaultLimits, `after the end of the root element`, 2, 1)
	refuse(t, root+"</QIFDocument>\ntrailing", DefaultLimits, `text after the end of the root element`, 1, len(root)+15)
}

func TestRefusesOtherEncodings(t *testing.T) {
	refuse(t, `<?xml version="1.0" encoding="ISO-8859-1"?>`+root+"</QIFDocument>", DefaultLimits, `ISO-8859-1.*UTF-8 documents only`, 1, 1)
}

// A byte order mark before the declaration is not text.
func TestAcceptsByteOrderMark(t *testing.T) {
	if _, err := ReadFile(source.NewFile("t.qif", []byte("\ufeff<?xml version=\"1.0\"?>\n"+root+"</QIFDocument>"))); err != nil {
		t.Fatal(err)
	}
}

// Long text of elements the reader does not use is dropped; a value that
// long is unreadable, not read by its prefix.
func TestLongValueIsUnreadable(t *testing.T) {
	long := "1" + strings.Repeat("0", keptText)
	res := read(t, qdoc{fdefs: planeDef(1), fnoms: plane(2, 1, "", long+" 0 0", "0 0 1")}.String())
	wantNotes(t, res, `inconsistent: <Location> "" is not three finite numbers`, `feature nominal 2 has no readable Location: its geometry is unknown`)
}

// Groups of groups, each naming the next twice, cost their size to expand,
// not two to the power of their depth.
func TestNestedGroupsExpandOnce(t *testing.T) {
	var b strings.Builder
	b.WriteString(cyl(1000, 2, "", "0 0 0", "0 0 1") + cyl(1001, 2, "", "10 0 0", "0 0 1"))
	const depth = 60
	for i := 0; i < depth; i++ {
		next := []int{1000, 1001}
		if i < depth-1 {
			next = []int{2001 + i, 2001 + i}
		}
		fmt.Fprintf(&b, "<GroupFeatureNominal id=\"%d\"><FeatureDefinitionId>3</FeatureDefinitionId>%s</GroupFeatureNominal>", 2000+i, ids("FeatureNominalIds", next...))
	}
	q := qdoc{fdefs: cylDef(2, "INTERNAL", 5) + `<GroupFeatureDefinition id="3"/>`, fnoms: b.String(),
		cdefs: position(4, "0.1", 0, "NONE", "DiametricalZone", ""), cnoms: nominal("Position", 5, 4, "", 2000)}
	res := read(t, q.String())
	if len(res.Part.Frames) != 1 || !res.Part.Frames[0].Target.IsPattern() || len(res.Part.Frames[0].Target.Feature.Members) != 2 {
		t.Errorf("frames %+v", res.Part.Frames)
	}
}
