package rules

import (
	"fmt"
	"sort"
	"strings"

	"github.com/datumlint/datumlint/grammar/source"

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

// Check runs every enabled rule over a part, whichever reader built it.
// Findings are sorted by line and column; suppressed findings are kept
// with Suppressed set.
func Check(part *model.Part, s *Settings) []Diagnostic {
	var out []Diagnostic
	fs := &facts{part: part}
	for _, r := range All() {
		sev := s.severity(r)
		if sev == Off {
			continue
		}
		var found []Diagnostic
		pass := &Pass{Rule: r, Part: part, facts: fs, out: &found}
		if err := runSafely(r, pass); err != "" {
			out = append(out, Diagnostic{File: part.Source.Name, Span: source.Line(1),
				Rule: InternalRule, Severity: Error,
				Message: fmt.Sprintf("internal error in rule %s while checking this file (please report it): %s", r.ID, err)})
		}
		for i := range found {
			// The configured severity applies to the rule's findings at its
			// default; one the rule reported lower (Inform) stays lower.
			if found[i].Severity == r.Severity || sev < found[i].Severity {
				found[i].Severity = sev
			}
		}
		out = append(out, found...)
	}
	out = applySuppressions(part, out, s)
	Sort(out)
	return dedupe(out)
}

// runSafely runs a rule, turning a panic into a message: one rule's bug
// must not lose the other rules' findings.
func runSafely(r *Rule, p *Pass) (msg string) {
	defer func() {
		if v := recover(); v != nil {
			msg = fmt.Sprint(v)
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

// applySuppressions marks the findings that an allow directive with a
// reason silences: on the statement it applies to, by rule identifier.
// Directives that silence nothing are reported as allow-unused.
func applySuppressions(part *model.Part, ds []Diagnostic, s *Settings) []Diagnostic {
	dirs := part.Suppressions
	if len(dirs) == 0 {
		return ds
	}
	// used[k][j]: rule j of directive k silenced a finding.
	used := make([][]bool, len(dirs))
	for k, dir := range dirs {
		used[k] = make([]bool, len(dir.Rules))
	}
	for i := range ds {
		d := &ds[i]
		if d.Rule == InternalRule || d.Rule == AllowUnused.ID {
			continue
		}
		for k, dir := range dirs {
			if dir.Stmt < 0 || dir.Reason == "" {
				continue
			}
			st := part.Statements[dir.Stmt]
			if d.Span.Start.Line < st.First || d.Span.Start.Line > st.Last {
				continue
			}
			for j, id := range dir.Rules {
				if id == d.Rule {
					d.Suppressed, d.Justification = true, dir.Reason
					used[k][j] = true
				}
			}
		}
	}
	sev := s.severity(AllowUnused)
	if sev == Off {
		return ds
	}
	for k, dir := range dirs {
		if dir.Reason == "" || len(dir.Rules) == 0 {
			continue // malformed ones are reported by the rule itself
		}
		unknown, allOff := false, true
		var idle []int // rules that silence nothing and could have
		for j, id := range dir.Rules {
			r := Lookup(id)
			unknown = unknown || r == nil
			if r != nil && s.severity(r) != Off {
				allOff = false // rules the configuration turned off could not report
				if !used[k][j] {
					idle = append(idle, j)
				}
			}
		}
		if unknown || allOff || len(idle) == 0 {
			continue
		}
		d := Diagnostic{File: part.Source.Name, Span: dir.Span, Rule: AllowUnused.ID, Severity: sev}
		switch {
		case dir.Stmt < 0:
			d.Message = "this allow comment applies to no statement: put it at the end of the statement's line or on the line directly above it"
			d.Fixes = []Fix{{Message: "remove the allow comment (it silences nothing where it stands)", Safe: true, Edits: []Edit{removeDirective(part.Source, dir)}}}
		case len(idle) == len(dir.Rules):
			d.Message = fmt.Sprintf("this allow comment silences nothing: no %s finding is reported on the statement it applies to; remove it", strings.Join(dir.Rules, " or "))
			d.Fixes = []Fix{{Message: "remove the allow comment", Safe: true, Edits: []Edit{removeDirective(part.Source, dir)}}}
		default:
			names := make([]string, len(idle))
			for i, j := range idle {
				names[i] = dir.Rules[j]
			}
			d.Span = dir.RuleSpans[idle[0]]
			d.Message = fmt.Sprintf("%s in this allow comment silences nothing: no such finding is reported on the statement it applies to; remove it from the list", strings.Join(names, " and "))
			d.Fixes = []Fix{{Message: "remove " + strings.Join(names, " and ") + " from the allow comment", Safe: true, Edits: removeRules(dir, idle)}}
		}
		ds = append(ds, d)
	}
	return ds
}

// removeDirective is the edit that deletes an allow directive: the whole
// line where the comment stands alone, else the comment and the blanks
// before it. Text from a second '#' on (another comment, which ends the
// directive) is kept.
func removeDirective(src *source.File, dir *model.Suppression) Edit {
	ln := dir.Span.Start.Line
	runes := []rune(string(src.LineBytes(ln)))
	start := min(dir.Span.Start.Col-1, len(runes)) // the directive's '#'
	end := len(runes)
	for k := start + 1; k < len(runes); k++ {
		if runes[k] == '#' {
			end = k
			break
		}
	}
	if end == len(runes) {
		if !dir.Trailing {
			return Edit{Span: source.Span{Start: source.Pos{Line: ln, Col: 1}, End: source.Pos{Line: ln + 1, Col: 1}}}
		}
		for start > 0 && (runes[start-1] == ' ' || runes[start-1] == '\t') {
			start--
		}
	}
	return Edit{Span: source.Span{Start: source.Pos{Line: ln, Col: start + 1}, End: source.Pos{Line: ln, Col: end + 1}}}
}

// removeRules deletes some of a directive's rule identifiers, each run of
// them with one separator: "A, B, C" without B is "A, C", without A and B
// "C". At least one identifier is kept (else the directive goes).
func removeRules(dir *model.Suppression, idle []int) []Edit {
	drop := make([]bool, len(dir.Rules))
	for _, j := range idle {
		drop[j] = true
	}
	sp := dir.RuleSpans
	var out []Edit
	for i := 0; i < len(sp); i++ {
		if !drop[i] {
			continue
		}
		j := i
		for j+1 < len(sp) && drop[j+1] {
			j++
		}
		if i > 0 {
			out = append(out, Edit{Span: source.Span{Start: sp[i-1].End, End: sp[j].End}})
		} else {
			out = append(out, Edit{Span: source.Span{Start: sp[i].Start, End: sp[j+1].Start}})
		}
		i = j
	}
	return out
}
