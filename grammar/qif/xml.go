package qif

import (
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"strings"
	"unicode/utf8"

	"github.com/datumlint/datumlint/grammar/source"
)

// Namespace is the XML namespace of QIF 3 documents.
const Namespace = "http://qifstandards.org/xsd/qif3"

// Limits bounds what the reader walks and holds, so that a hostile or
// broken file costs bounded time and memory. A document over a limit is
// refused with a positioned Error.
type Limits struct {
	// Depth is the deepest element nesting read (QIF 3 documents nest about
	// fifteen deep).
	Depth int
	// Elements is the most elements a document may have (a 4 MB model has
	// about 30,000).
	Elements int
	// Kept is the most elements the reader keeps (those of the sections it
	// reads; a 4 MB model keeps about 8,000).
	Kept int
	// Attrs is the most attributes one element may carry.
	Attrs int
	// Text is the longest text of one element, in bytes (a model's longest
	// text, a face's point list, is some tens of kilobytes).
	Text int
}

// DefaultLimits are the limits of Read and Decode.
var DefaultLimits = Limits{Depth: 256, Elements: 4_000_000, Kept: 1_000_000, Attrs: 256, Text: 16 << 20}

// keptText is the longest text the reader keeps for an element it reads;
// longer text (point lists, which the reader does not use) is dropped and
// marked, so that a value that long reads as unreadable, not as a prefix.
const keptText = 4096

// Error is a document the reader refuses: not XML, not a QIF 3 document,
// truncated, or over a limit. Span is where the problem was found.
type Error struct {
	Span source.Span
	Msg  string
}

func (e *Error) Error() string { return e.Span.Start.String() + ": " + e.Msg }

// node is an element the reader keeps: its local name, attributes, text (for
// leaves) and children, with the byte offsets of its start tag.
type node struct {
	name     string
	attrs    []xml.Attr
	text     string
	long     bool // the text was longer than keptText and was dropped
	kids     []*node
	from, to int // the start tag, [from, to)
	end      int // the end of the element (its end tag, or the empty tag)
}

func (n *node) attr(name string) (string, bool) {
	for _, a := range n.attrs {
		if a.Name.Local == name && a.Name.Space == "" {
			return a.Value, true
		}
	}
	return "", false
}

func (n *node) child(name string) *node {
	if n == nil {
		return nil
	}
	for _, k := range n.kids {
		if k.name == name {
			return k
		}
	}
	return nil
}

func (n *node) children(name string) []*node {
	if n == nil {
		return nil
	}
	var out []*node
	for _, k := range n.kids {
		if k.name == name {
			out = append(out, k)
		}
	}
	return out
}

// str returns the element's text; "" for no element.
func (n *node) str() string {
	if n == nil {
		return ""
	}
	return n.text
}

// all returns the element's children; none for no element.
func (n *node) all() []*node {
	if n == nil {
		return nil
	}
	return n.kids
}

// path returns the descendant along the names, or nil.
func (n *node) path(names ...string) *node {
	for _, s := range names {
		n = n.child(s)
	}
	return n
}

// topLevel lists the children of QIFDocument that the reader keeps; every
// other section (plans, results, statistics, resources, rules) is walked
// and skipped.
var topLevel = map[string]bool{
	"FileUnits": true, "StandardsDefinitions": true, "DatumDefinitions": true,
	"DatumTargetDefinitions": true, "DatumReferenceFrames": true, "Product": true,
	"Features": true, "FeatureZones": true, "Characteristics": true,
}

// productKept lists, by parent, what the reader keeps of Product: the
// header's scale, the part's name and the PMI presentation texts. The
// geometry and topology (the B-rep, most of a model's bytes) are skipped.
var productKept = map[string]map[string]bool{
	"Product":          {"Header": true, "PartSet": true, "VisualizationSet": true},
	"Header":           {"ScaleCoefficient": true},
	"PartSet":          {"Part": true},
	"Part":             {"Name": true, "ModelNumber": true},
	"VisualizationSet": {"PMIDisplaySet": true},
	"PMIDisplaySet":    {"PMIDisplay": true},
	"PMIDisplay":       {"Texts": true, "Reference": true},
	"Texts":            {"Text": true},
	"Text":             {"Data": true},
	"Reference":        {"Id": true},
}

// keep reports whether the element name, under the kept path, is read.
func keep(path []*node, name string) bool {
	switch name {
	case "Attributes", "PointList", "NominalPointSets":
		return false
	}
	if len(path) == 1 {
		return topLevel[name]
	}
	if path[1].name == "Product" {
		kept := productKept[path[len(path)-1].name]
		return kept[name]
	}
	return true
}

// decoded is the kept tree of a document, with the namespace it is in.
type decoded struct {
	root *node
	ns   string
}

// decodeXML streams the document token by token and keeps the elements
// the reader uses. It refuses what is not a well-formed QIF 3 document
// within the limits.
func decodeXML(f *source.File, lim Limits) (*decoded, error) {
	src := f.Src
	fail := func(off int, format string, args ...any) error {
		p := f.Position(off)
		sp := source.Point(p)
		if off >= len(src) || src[off] == '\n' || src[off] == '\r' {
			sp.End = p // at the end of the file or of a line: no character to mark
		}
		return &Error{Span: sp, Msg: fmt.Sprintf(format, args...)}
	}
	if len(bytes.TrimSpace(src)) == 0 {
		return nil, fail(0, "the file is empty: a QIF document starts with <QIFDocument>")
	}
	if !utf8.Valid(src) {
		off := 0
		for off < len(src) {
			r, n := utf8.DecodeRune(src[off:])
			if r == utf8.RuneError && n <= 1 {
				break
			}
			off += n
		}
		return nil, fail(off, "the file is not UTF-8 text (a byte that is no character): not a QIF document")
	}
	d := xml.NewDecoder(bytes.NewReader(src))
	d.Strict = true
	var (
		stack    []*node // kept elements open, root first
		open     []openTag
		skip     int // depth of skipped elements open under the last kept one
		elements int
		kept     int
		out      decoded
		rootDone bool
	)
	for {
		from := int(d.InputOffset())
		tok, err := d.Token()
		to := int(d.InputOffset())
		if err == io.EOF {
			break
		}
		if err != nil {
			var se *xml.SyntaxError
			switch {
			case len(open) > 0 && (errors.Is(err, io.ErrUnexpectedEOF) || errors.As(err, &se) && strings.Contains(se.Msg, "unexpected EOF")):
				o := open[len(open)-1]
				return nil, fail(len(src), "the document ends inside <%s> (opened at %s): the file is truncated", o.name, f.Position(o.from))
			case errors.As(err, &se) && strings.Contains(se.Msg, "invalid character entity"):
				return nil, fail(to, "%s: a QIF document uses only the predefined entities (&amp; &lt; &gt; &quot; &apos;) and character references", se.Msg)
			case errors.As(err, &se):
				return nil, fail(to, "not well-formed XML: %s", se.Msg)
			case strings.Contains(err.Error(), "CharsetReader"):
				return nil, fail(from, "%s: the reader reads UTF-8 documents only (save the file as UTF-8)", strings.TrimPrefix(err.Error(), "xml: "))
			}
			return nil, fail(to, "not well-formed XML: %v", err)
		}
		switch t := tok.(type) {
		case xml.Directive:
			return nil, fail(from, "a document type declaration (<!%s) is refused: QIF documents have none, and its entities could expand without bound", firstWord(t))
		case xml.StartElement:
			elements++
			if elements > lim.Elements {
				return nil, fail(from, "more than %d elements: the document is refused", lim.Elements)
			}
			if len(open) >= lim.Depth {
				return nil, fail(from, "elements nested more than %d deep: the document is refused", lim.Depth)
			}
			if len(t.Attr) > lim.Attrs {
				return nil, fail(from, "<%s> has %d attributes, more than %d: the document is refused", t.Name.Local, len(t.Attr), lim.Attrs)
			}
			if len(open) == 0 {
				if rootDone {
					return nil, fail(from, "<%s> after the end of the root element: a document has one root", t.Name.Local)
				}
				if err := checkRoot(f, t, from, to); err != nil {
					return nil, err
				}
				out.ns = t.Name.Space
				out.root = &node{name: t.Name.Local, attrs: t.Attr, from: from, to: to}
				stack = append(stack, out.root)
				open = append(open, openTag{t.Name.Local, from})
				continue
			}
			open = append(open, openTag{t.Name.Local, from})
			if skip > 0 || t.Name.Space != out.ns || !keep(stack, t.Name.Local) {
				skip++
				continue
			}
			if kept++; kept > lim.Kept {
				return nil, fail(from, "more than %d elements in the sections the reader reads: the document is refused", lim.Kept)
			}
			n := &node{name: t.Name.Local, attrs: t.Attr, from: from, to: to}
			parent := stack[len(stack)-1]
			parent.kids = append(parent.kids, n)
			parent.text = "" // an element with children keeps no text
			stack = append(stack, n)
		case xml.EndElement:
			open = open[:len(open)-1]
			switch {
			case skip > 0:
				skip--
			default:
				n := stack[len(stack)-1]
				n.text = strings.TrimSpace(n.text)
				n.end = to
				stack = stack[:len(stack)-1]
			}
			if len(open) == 0 {
				rootDone = true
			}
		case xml.CharData:
			if len(t) > lim.Text {
				return nil, fail(from, "a text of %d bytes, more than %d: the document is refused", len(t), lim.Text)
			}
			if len(open) == 0 {
				if s := strings.TrimLeft(string(t), "\ufeff"); strings.TrimSpace(s) != "" {
					if rootDone {
						return nil, fail(from, "text after the end of the root element: not a QIF document")
					}
					return nil, fail(from, "the file starts with text, not an element: not an XML document")
				}
				continue
			}
			if skip > 0 {
				continue
			}
			n := stack[len(stack)-1]
			if n.long || len(n.kids) > 0 {
				continue
			}
			if len(n.text)+len(t) > keptText {
				n.text, n.long = "", true
				continue
			}
			n.text += string(t)
		}
	}
	if out.root == nil {
		return nil, fail(len(src), "no element: not a QIF document")
	}
	if len(open) > 0 {
		o := open[len(open)-1]
		return nil, fail(len(src), "the document ends inside <%s> (opened at %s): the file is truncated", o.name, f.Position(o.from))
	}
	return &out, nil
}

type openTag struct {
	name string
	from int
}

// checkRoot accepts a QIFDocument root of version 3.
func checkRoot(f *source.File, t xml.StartElement, from, to int) error {
	sp := source.Span{Start: f.Position(from), End: f.Position(to)}
	if t.Name.Local != "QIFDocument" {
		return &Error{Span: sp, Msg: fmt.Sprintf("the root element is <%s>, not <QIFDocument>: not a QIF document", t.Name.Local)}
	}
	var version string
	for _, a := range t.Attr {
		if a.Name.Local == "versionQIF" && a.Name.Space == "" {
			version = strings.TrimSpace(a.Value)
		}
	}
	switch {
	case version == "":
		return &Error{Span: sp, Msg: "<QIFDocument> does not say its QIF version (versionQIF): the reader reads QIF 3.x"}
	case !strings.HasPrefix(version, "3.") && version != "3":
		return &Error{Span: sp, Msg: fmt.Sprintf("QIF version %s: the reader reads QIF 3.x (ANSI/DMSC QIF 3.0, ISO 23952:2020)", version)}
	case t.Name.Space != Namespace && t.Name.Space != "":
		return &Error{Span: sp, Msg: fmt.Sprintf("<QIFDocument> is in the namespace %q, not QIF 3's %q", t.Name.Space, Namespace)}
	}
	return nil
}

func firstWord(d xml.Directive) string {
	s := strings.TrimSpace(string(d))
	if i := strings.IndexAny(s, " \t\r\n["); i > 0 {
		s = s[:i]
	}
	if len(s) > 20 {
		s = s[:20]
	}
	return s
}
