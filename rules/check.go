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
	used := make([]bool, len(dirs))
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
			for _, id := range dir.Rules {
				if id == d.Rule {
					d.Suppressed, d.Justification = true, dir.Reason
					used[k] = true
				}
			}
		}
	}
	sev := s.severity(AllowUnused)
	if sev == Off {
		return ds
	}
	for k, dir := range dirs {
		if dir.Reason == "" || len(dir.Rules) == 0 || used[k] {
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
		ds = append(ds, Diagnostic{File: part.Source.Name, Span: dir.Span, Rule: AllowUnused.ID, Severity: sev, Message: msg})
	}
	return ds
}
