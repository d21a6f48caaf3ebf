// Package report writes datumlint's review report: one self-contained HTML
// page per part (inline CSS and SVG, no script, nothing loaded from the
// network, print styles for A4 and Letter) and an index of the parts.
//
// A Page is plain data; Build (adapter.go) fills it from a checked file,
// and the pictures come from the draw package.
package report

import (
	_ "embed"
	"fmt"
	"html/template"
	"io"
	"strings"

	"github.com/datumlint/datumlint/cmd/datumlint/internal/report/draw"
)

// Caution is said on every page: the report advises, it does not certify.
const Caution = "datumlint advises; it does not certify. The governing standard edition, the drawing's notes, " +
	"local codes and qualified engineering judgement decide."

// Counts are findings by severity (suppressed findings are not counted).
type Counts struct{ Error, Warning, Info int }

// Total is the number of findings.
func (c Counts) Total() int { return c.Error + c.Warning + c.Info }

// Add returns the sum of two counts.
func (c Counts) Add(d Counts) Counts {
	return Counts{c.Error + d.Error, c.Warning + d.Warning, c.Info + d.Info}
}

// Page is one part's report.
type Page struct {
	Path string // the file as named on the command line
	// IndexHref links back to the index of a report ("" for a page on its
	// own: no link).
	IndexHref string
	Title     string // the part's name, or the file's stem
	Units     string
	Standard  string
	Counts    Counts

	Frames    []FrameEntry
	Datums    []draw.DatumSymbol
	Materials []MaterialEntry
	Setups    []SetupEntry
	Views     draw.Views

	Findings   []Finding
	Suppressed []Finding
}

// FrameEntry is one frame with its degrees of freedom, one chart per
// segment.
type FrameEntry struct {
	Frame     draw.Frame
	DOF       []draw.DOF
	Findings  int    // findings on the frame's statement
	FindingID string // the first of them
	// SetupIDs are the ids of each segment's inspection set-up ("" for a
	// segment without datums).
	SetupIDs []string
}

// SetupEntry is the inspection set-up of one datum reference frame.
type SetupEntry struct {
	ID      string // the element's id: setup-N
	Label   string // "A, B(M), C"
	Uses    []SetupUse
	Problem string // why it could not be worked out, or ""
	Figure  draw.Setup
	Rows    []SetupRow // one per reference, in precedence order
}

// SetupUse is a frame segment that uses a set-up.
type SetupUse struct {
	FrameLine int
	Text      string
}

// SetupRow is one reference's simulator in words.
type SetupRow struct {
	Ref, Precedence, Boundary, Kind, Describe string
	Sizes                                     []string // per fixed-size feature: its size and where it comes from
	Relations                                 []string
	Constrains, Points                        int
	Contact                                   string
	// Adjustable is set where the simulator adjusts its size to the
	// feature (a feature of size at RMB).
	Adjustable bool
}

// MaterialEntry is one material-condition figure.
type MaterialEntry struct {
	Line   int
	Figure draw.MaterialFigure
	Notes  []string
}

// Finding is one finding beside its statement.
type Finding struct {
	ID                      string // the element's id: finding-N, suppressed-N
	Line, Col               int
	Rule, Severity, Message string
	// Summary, Rationale and Source are the rule's documentation ("" for a
	// finding of no registered rule).
	Summary, Rationale, Source string
	Related, Fixes             []string
	Lines                      []SourceLine // the statement's lines
	FrameLine                  int          // the frame the finding is on, or 0
	Suppressed                 bool
	Justification              string
}

// SourceLine is a line of the file with the finding's span marked.
type SourceLine struct {
	N                     int
	Before, Marked, After string
}

//go:embed page.tmpl
var pageTemplate string

//go:embed style.css
var styleSheet string

// colour is a pair of text and background colours the style sheet uses;
// every pair is held to WCAG 2.1 AA contrast by the tests.
type colour struct {
	Name   string
	Fg, Bg string
}

// palette holds every colour of the style sheet, as CSS variables.
var palette = []colour{
	{"text", "#1a1a1a", "#ffffff"},
	{"muted", "#4d4d4d", "#ffffff"},
	{"link", "#0b4f8a", "#ffffff"},
	{"code", "#1a1a1a", "#f2f2f2"},
	{"mark", "#1a1a1a", "#ffe49a"},
	{"error", "#ffffff", "#a4161a"},
	{"warning", "#1a1a1a", "#f2b134"},
	{"info", "#ffffff", "#1d5c96"},
	{"caution", "#1a1a1a", "#fff4d6"},
	{"head", "#1a1a1a", "#e8edf3"},
}

func cssVariables() string {
	var b strings.Builder
	b.WriteString(":root{")
	for _, c := range palette {
		fmt.Fprintf(&b, "--%s-fg:%s;--%s-bg:%s;", c.Name, c.Fg, c.Name, c.Bg)
	}
	b.WriteString("}")
	return b.String()
}

func style() template.CSS { return template.CSS(cssVariables() + "\n" + styleSheet) }

var funcs = template.FuncMap{
	// The drawings are built from escaped text (draw escapes every string
	// it writes), so they are safe to inline.
	"frameSVG":    func(f draw.Frame) template.HTML { return template.HTML(draw.FrameSVG(f)) },
	"dofSVG":      func(d draw.DOF) template.HTML { return template.HTML(draw.DOFSVG(d)) },
	"datumSVG":    func(d draw.DatumSymbol) template.HTML { return template.HTML(draw.DatumSymbolSVG(d)) },
	"materialSVG": func(m draw.MaterialFigure) template.HTML { return template.HTML(draw.MaterialSVG(m)) },
	"viewsSVG":    func(v draw.Views) template.HTML { return template.HTML(draw.ViewsSVG(v)) },
	"setupSVG":    func(s draw.Setup) template.HTML { return template.HTML(draw.SetupSVG(s)) },
	"legend":      draw.Legend,
	"extentNote":  draw.ExtentNote,
	"describe":    draw.Describe,
	"number":      draw.Number,
	"names":       draw.MotionNames,
	"style":       style,
	"join":        strings.Join,
	"plural": func(n int, one, many string) string {
		if n == 1 {
			return fmt.Sprintf("%d %s", n, one)
		}
		return fmt.Sprintf("%d %s", n, many)
	},
	"caution": func() string { return Caution },
	"text":    text,
	"sum":     func(a, b float64) float64 { return a + b },
}

var templates = template.Must(template.New("page").Funcs(funcs).Parse(pageTemplate))

// text escapes only what HTML requires in element content (&, < and >),
// so that a finding's message reads in the page's source as it does in
// `datumlint check` (html/template would also write + and quotes as
// character references).
func text(s string) template.HTML {
	return template.HTML(strings.NewReplacer("&", "&amp;", "<", "&lt;", ">", "&gt;").Replace(s))
}

// WriteHTML writes the part's page.
func (p *Page) WriteHTML(w io.Writer) error {
	return templates.ExecuteTemplate(w, "part", p)
}

// IndexEntry is one part in the index.
type IndexEntry struct {
	Title  string
	Path   string // the file
	Href   string // the part's page, relative to the index
	Counts Counts
	Frames int
}

// Entry is the page's line in the index, linking to href.
func (p *Page) Entry(href string) IndexEntry {
	return IndexEntry{Title: p.Title, Path: p.Path, Href: href, Counts: p.Counts, Frames: len(p.Frames)}
}

// Index is the data of the index page.
type Index struct {
	Parts []IndexEntry
	Total Counts
}

// WriteIndex writes the index of the parts, in the order given.
func WriteIndex(w io.Writer, parts []IndexEntry) error {
	ix := Index{Parts: parts}
	for _, p := range parts {
		ix.Total = ix.Total.Add(p.Counts)
	}
	return templates.ExecuteTemplate(w, "index", ix)
}
