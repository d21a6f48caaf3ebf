package rules

import (
	"fmt"
	"github.com/datumlint/datumlint/grammar/source"
	"regexp"
	"runtime/debug"
	"sort"
	"strings"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
)

// Settings chooses which rules run and at what severity.
type Settings struct {
	// Severity overrides a rule's default; Off disables it.
	Severity map[string]Severity
}

func (s *Settings) severity(r *Rule) Severity {
	if s != nil {
		if v, ok := s.Severity[r.ID]; ok {
			return v
		}
	}
	return r.Severity
}

// InternalRule is the identifier of findings about datumlint itself: a
// rule that panicked. It is not a registered rule and cannot be disabled.
const InternalRule = "internal-error"

// Check parses, resolves and checks one file. Findings are sorted by line
// and column; suppressed findings are kept with Suppressed set.
func Check(name string, src []byte, s *Settings) []Diagnostic {
	f := grammar.Parse(name, src)
	return CheckFile(f, model.Resolve(f), s)
}

// CheckFile runs every enabled rule over a resolved part.
func CheckFile(f *grammar.File, part *model.Part, s *Settings) []Diagnostic {
	var out []Diagnostic
	facts := newFacts(part)
	for _, r := range All() {
		sev := s.severity(r)
		if sev == Off {
			continue
		}
		var found []Diagnostic
		pass := &Pass{Rule: r, Part: part, File: f, Facts: facts, out: &found}
		if err := runSafely(r, pass); err != "" {
			out = append(out, Diagnostic{File: f.Name, Span: source.Span{Start: source.Pos{Line: 1, Col: 1}, End: source.Pos{Line: 1, Col: 2}},
				Rule: InternalRule, Severity: Error,
				Message: fmt.Sprintf("internal error in rule %s while checking this file (please report it): %s", r.ID, err)})
		}
		for i := range found {
			found[i].Severity = sev
		}
		out = append(out, found...)
	}
	out = applySuppressions(f, out, s)
	Sort(out)
	return dedupe(out)
}

func runSafely(r *Rule, p *Pass) (msg string) {
	defer func() {
		if v := recover(); v != nil {
			msg = fmt.Sprint(v)
			if testing := strings.Contains(string(debug.Stack()), "testing.tRunner"); testing {
				msg += "\n" + string(debug.Stack())
			}
		}
	}()
	r.Run(p)
	return ""
}

// Sort orders findings by file, line, column, then rule.
func Sort(ds []Diagnostic) {
	sort.SliceStable(ds, func(i, j int) bool {
		a, b := ds[i], ds[j]
		if a.File != b.File {
			return a.File < b.File
		}
		if a.Span.Start != b.Span.Start {
			return a.Span.Start.Before(b.Span.Start)
		}
		if a.Rule != b.Rule {
			return a.Rule < b.Rule
		}
		return a.Message < b.Message
	})
}

func dedupe(ds []Diagnostic) []Diagnostic {
	out := ds[:0]
	for i, d := range ds {
		if i > 0 {
			p := ds[i-1]
			if p.Span == d.Span && p.Rule == d.Rule && p.Message == d.Message {
				continue
			}
		}
		out = append(out, d)
	}
	return out
}

// --- suppressions ---------------------------------------------------------

var allowRE = regexp.MustCompile(`^#+\s*datumlint:\s*allow\b(.*)$`)

// Directive is a parsed "# datumlint: allow RULE -- reason" comment.
type Directive struct {
	Comment *grammar.Comment
	Rules   []string
	Reason  string
	// Stmt is the index of the statement it applies to, or -1.
	Stmt int
	used bool
}

// Directives finds the allow comments of a file and the statement each
// applies to: the statement it ends, or the one directly below it (only
// comment lines may stand between).
func Directives(f *grammar.File) []*Directive {
	var out []*Directive
	commentLines := map[int]bool{}
	for _, c := range f.Comments {
		if !c.Trailing {
			commentLines[c.Span.Start.Line] = true
		}
	}
	for _, c := range f.Comments {
		m := allowRE.FindStringSubmatch(c.Text)
		if m == nil {
			continue
		}
		d := &Directive{Comment: c, Stmt: -1}
		body := m[1]
		if i := strings.Index(body, "#"); i >= 0 {
			body = body[:i] // a second comment (e.g. a test's "# want") ends the directive
		}
		if i := strings.Index(body, "--"); i >= 0 {
			d.Reason = strings.TrimSpace(body[i+2:])
			body = body[:i]
		}
		for _, id := range strings.FieldsFunc(body, func(r rune) bool { return r == ',' || r == ' ' || r == '\t' }) {
			d.Rules = append(d.Rules, id)
		}
		line := c.Span.Start.Line
		for i, e := range f.Extents {
			if c.Trailing && e.First <= line && line <= e.Last {
				d.Stmt = i
				break
			}
			if !c.Trailing && e.First > line {
				ok := true
				for l := line + 1; l < e.First; l++ {
					ok = ok && commentLines[l]
				}
				if ok {
					d.Stmt = i
				}
				break
			}
		}
		out = append(out, d)
	}
	return out
}

func applySuppressions(f *grammar.File, ds []Diagnostic, s *Settings) []Diagnostic {
	dirs := Directives(f)
	if len(dirs) == 0 {
		return ds
	}
	for i := range ds {
		d := &ds[i]
		if d.Rule == InternalRule || d.Rule == AllowUnused.ID {
			continue
		}
		for _, dir := range dirs {
			if dir.Stmt < 0 || dir.Reason == "" {
				continue
			}
			e := f.Extents[dir.Stmt]
			if d.Span.Start.Line < e.First || d.Span.Start.Line > e.Last {
				continue
			}
			for _, id := range dir.Rules {
				if id == d.Rule {
					d.Suppressed, d.Justification = true, dir.Reason
					dir.used = true
				}
			}
		}
	}
	sev := s.severity(AllowUnused)
	if sev == Off {
		return ds
	}
	for _, dir := range dirs {
		if dir.Reason == "" || len(dir.Rules) == 0 || dir.used {
			continue // malformed ones are reported by the rule itself
		}
		unknown := false
		for _, id := range dir.Rules {
			unknown = unknown || (Lookup(id) == nil)
		}
		if unknown {
			continue
		}
		allOff := true // rules the configuration turned off could not report
		for _, id := range dir.Rules {
			allOff = allOff && s.severity(Lookup(id)) == Off
		}
		if allOff {
			continue
		}
		msg := fmt.Sprintf("this allow comment silences nothing: no %s finding is reported on the statement it applies to; remove it", strings.Join(dir.Rules, " or "))
		if dir.Stmt < 0 {
			msg = "this allow comment applies to no statement: put it at the end of the statement's line or on the line directly above it"
		}
		ds = append(ds, Diagnostic{File: f.Name, Span: dir.Comment.Span, Rule: AllowUnused.ID, Severity: sev, Message: msg})
	}
	return ds
}
