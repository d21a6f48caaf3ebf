// Package rules holds datumlint's checks. A rule is a value: an identifier,
// a one-line summary, a rationale with its published source, a bad and a
// good example, a default severity and a Run function over a Pass.
package rules

import (
	"fmt"
	"sort"
	"strings"

	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/grammar/spell"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/basics"
	"github.com/datumlint/datumlint/rules/kinematics"
)

// Severity of a finding. Off disables a rule.
type Severity int

const (
	Off Severity = iota
	Info
	Warning
	Error
)

func (s Severity) String() string {
	switch s {
	case Info:
		return "info"
	case Warning:
		return "warning"
	case Error:
		return "error"
	}
	return "off"
}

// ParseSeverity reads "error", "warning", "info" or "off".
func ParseSeverity(s string) (Severity, error) {
	switch strings.ToLower(s) {
	case "error":
		return Error, nil
	case "warning":
		return Warning, nil
	case "info":
		return Info, nil
	case "off":
		return Off, nil
	}
	return Off, fmt.Errorf("unknown severity %q: use error, warning, info or off", s)
}

// Rule is one check.
type Rule struct {
	ID        string   // kebab-case identifier, part of the contract
	Summary   string   // one line
	Rationale string   // why it matters, in prose
	Source    string   // the published source (or "common practice", "from memory")
	Bad, Good string   // callout examples: Bad triggers the rule, Good does not
	Severity  Severity // default severity
	// Fix says what the rule's suggested fix does, "" where it offers
	// none; FixSafe whether that fix keeps the meaning the rule cares
	// about (check --fix applies it) or needs review (--fix-all).
	Fix     string
	FixSafe bool
	// ReviewFix says what a second fix, one that needs review, does where
	// a rule with a safe fix also offers one (check --fix-all takes it
	// first).
	ReviewFix string
	Run       func(*Pass)
}

// FixText describes a rule's fix for documentation: what it does and how
// it is applied, or that there is none.
func (r *Rule) FixText() string {
	switch {
	case r.Fix == "":
		return "none"
	case r.FixSafe && r.ReviewFix != "":
		return r.Fix + " (safe: `check --fix` applies it); or " + r.ReviewFix + " (needs review: `check --fix-all` applies it)"
	case r.FixSafe:
		return r.Fix + " (safe: `check --fix` applies it)"
	}
	return r.Fix + " (needs review: `check --fix-all` applies it)"
}

// Diagnostic is one finding: plain data, as go/analysis has it, so that
// every output (text, JSON, SARIF, the report, the language server) shows
// the same thing.
type Diagnostic struct {
	File     string
	Span     source.Span
	Rule     string
	Severity Severity
	Message  string
	// Related are other places the finding speaks of ("already declared
	// here").
	Related []Related
	// Fixes are edits that would clear the finding.
	Fixes []Fix
	// Suppressed is set when an allow comment silenced the finding; the
	// text outputs leave it out, SARIF carries it as a suppression.
	Suppressed    bool
	Justification string
}

// Related is another place a finding speaks of.
type Related struct {
	Span    source.Span
	Message string
}

// Fix is a suggested fix: edits of the checked file that clear the finding.
// Safe marks a fix that keeps the meaning the rule cares about (inserting
// a basic dimension with the model's value); a fix that is not safe changes
// what the drawing says and needs the drafter's review (dropping a datum
// reference).
type Fix struct {
	Message string
	Edits   []Edit
	Safe    bool
}

// Edit replaces the text of Span with NewText; an empty span inserts.
type Edit struct {
	Span    source.Span
	NewText string
}

// Pass is what a rule sees: the part, the engines' results for it, and a
// way to report.
type Pass struct {
	Rule  *Rule
	Part  *model.Part
	facts *facts
	out   *[]Diagnostic
}

// Kinematics returns the part's kinematic result (rules/kinematics),
// computed once per part and shared by every rule.
func (p *Pass) Kinematics() *kinematics.Result { return p.facts.kinematics() }

// Basics returns the part's basic-dimension result (rules/basics),
// computed once per part and shared by every rule.
func (p *Pass) Basics() *basics.Analysis { return p.facts.basics() }

// Report records a finding at a span.
func (p *Pass) Report(sp source.Span, format string, args ...any) {
	p.ReportDiagnostic(Diagnostic{Span: sp, Message: fmt.Sprintf(format, args...)})
}

// ReportRelated records a finding that speaks of another place too.
func (p *Pass) ReportRelated(sp source.Span, related []Related, format string, args ...any) {
	p.ReportDiagnostic(Diagnostic{Span: sp, Related: related, Message: fmt.Sprintf(format, args...)})
}

// Inform records a finding at info severity, whatever the rule's default:
// an advisory finding of a rule whose other findings are warnings or
// errors (a refinement that is legal but unusual). The configuration can
// lower it further or turn the rule off, never raise it above info.
func (p *Pass) Inform(sp source.Span, related []Related, format string, args ...any) {
	p.ReportDiagnostic(Diagnostic{Span: sp, Related: related, Severity: Info, Message: fmt.Sprintf(format, args...)})
}

// ReportDiagnostic records a finding given as data (with related places
// and fixes); the file and rule are the pass's. Its severity is the
// rule's default unless the rule set a lower one (see Inform).
func (p *Pass) ReportDiagnostic(d Diagnostic) {
	sp := d.Span
	if sp.End.Line == 0 || sp.End.Before(sp.Start) {
		sp.End = source.Pos{Line: sp.Start.Line, Col: sp.Start.Col + 1}
	}
	if d.Severity == Off || d.Severity > p.Rule.Severity {
		d.Severity = p.Rule.Severity
	}
	d.Span, d.File, d.Rule = sp, p.Part.Source.Name, p.Rule.ID
	*p.out = append(*p.out, d)
}

var registry = map[string]*Rule{}

// Register adds a rule; rule files call it from init. A duplicate or
// incomplete rule is a programming error caught by the registry test.
func Register(r *Rule) *Rule {
	if _, dup := registry[r.ID]; dup {
		panic("rules: duplicate rule " + r.ID)
	}
	registry[r.ID] = r
	return r
}

// All returns every rule, sorted by identifier.
func All() []*Rule {
	out := make([]*Rule, 0, len(registry))
	for _, r := range registry {
		out = append(out, r)
	}
	sort.Slice(out, func(i, j int) bool { return out[i].ID < out[j].ID })
	return out
}

// Lookup returns the rule with the identifier, or nil.
func Lookup(id string) *Rule { return registry[id] }

// IDs returns every rule identifier, sorted.
func IDs() []string {
	all := All()
	out := make([]string, len(all))
	for i, r := range all {
		out[i] = r.ID
	}
	return out
}

// Suggest returns the rule identifier that an unknown one probably meant,
// or "": the same words in another case or joined by '_' or spaces
// (Basic-Missing, basic_missing), or a typo of at most two edits
// (basic-missng). Every place that takes a rule identifier (explain,
// --enable and --disable, allow comments, .datumlint.toml) offers it.
func Suggest(id string) string {
	norm := strings.NewReplacer("_", "-", " ", "-").Replace(strings.ToLower(strings.TrimSpace(id)))
	if Lookup(norm) != nil {
		return norm
	}
	if norm == "" {
		return ""
	}
	return spell.Nearest(norm, IDs())
}

// Validate reports what is missing from a rule's documentation.
func Validate(r *Rule) error {
	var miss []string
	if r.ID == "" || strings.ToLower(r.ID) != r.ID || strings.ContainsAny(r.ID, " _") {
		miss = append(miss, "a kebab-case ID")
	}
	if r.Summary == "" || strings.Contains(r.Summary, "\n") {
		miss = append(miss, "a one-line summary")
	}
	if r.Rationale == "" {
		miss = append(miss, "a rationale")
	}
	if r.Source == "" {
		miss = append(miss, "a source")
	}
	if r.Bad == "" || r.Good == "" {
		miss = append(miss, "bad and good examples")
	}
	if r.Severity == Off {
		miss = append(miss, "a default severity")
	}
	if r.Run == nil {
		miss = append(miss, "a Run function")
	}
	if len(miss) > 0 {
		return fmt.Errorf("rule %q lacks %s", r.ID, strings.Join(miss, ", "))
	}
	return nil
}
