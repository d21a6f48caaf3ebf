package grammar

import (
	"regexp"
	"sort"
	"strings"
	"unicode/utf8"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// allowRE matches an allow directive: `# datumlint: allow RULE -- reason`.
var allowRE = regexp.MustCompile(`^#+\s*datumlint:\s*allow\b(.*)$`)

// directives finds the allow comments of a file and the statement each
// applies to: the statement it ends, or the one directly below it (only
// comment lines may stand between).
func directives(f *File) []*model.Suppression {
	var out []*model.Suppression
	commentLines := map[int]bool{}
	for _, c := range f.Comments {
		if !c.Trailing {
			commentLines[c.Span.Start.Line] = true
		}
	}
	for _, c := range f.Comments {
		m := allowRE.FindStringSubmatchIndex(c.Text)
		if m == nil {
			continue
		}
		d := &model.Suppression{Span: c.Span, Trailing: c.Trailing, Stmt: -1}
		bodyAt := m[2]
		body := c.Text[bodyAt:m[3]]
		if i := strings.Index(body, "#"); i >= 0 {
			body = body[:i] // a second comment (e.g. a test's "# want") ends the directive
		}
		if i := strings.Index(body, "--"); i >= 0 {
			d.Reason = strings.TrimSpace(body[i+2:])
			body = body[:i]
		}
		isSep := func(r rune) bool { return r == ',' || r == ' ' || r == '\t' }
		for i := 0; i < len(body); {
			r, n := utf8.DecodeRuneInString(body[i:])
			if isSep(r) {
				i += n
				continue
			}
			j := i
			for j < len(body) {
				r, n := utf8.DecodeRuneInString(body[j:])
				if isSep(r) {
					break
				}
				j += n
			}
			col := c.Span.Start.Col + utf8.RuneCountInString(c.Text[:bodyAt+i])
			d.Rules = append(d.Rules, body[i:j])
			d.RuleSpans = append(d.RuleSpans, source.Span{
				Start: source.Pos{Line: c.Span.Start.Line, Col: col},
				End:   source.Pos{Line: c.Span.Start.Line, Col: col + utf8.RuneCountInString(body[i:j])},
			})
			i = j
		}
		line := c.Span.Start.Line
		if c.Trailing {
			// The statement whose lines hold the comment.
			i := sort.Search(len(f.Extents), func(i int) bool { return f.Extents[i].Last >= line })
			if i < len(f.Extents) && f.Extents[i].First <= line {
				d.Stmt = i
			}
		} else if i := sort.Search(len(f.Extents), func(i int) bool { return f.Extents[i].First > line }); i < len(f.Extents) {
			// The next statement, with only comment lines between.
			ok := true
			for l := line + 1; l < f.Extents[i].First && ok; l++ {
				ok = commentLines[l]
			}
			if ok {
				d.Stmt = i
			}
		}
		out = append(out, d)
	}
	return out
}
