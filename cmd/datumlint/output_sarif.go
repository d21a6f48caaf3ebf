package main

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"io"
	"net/url"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"unicode"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"

	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/lint"
	"github.com/datumlint/datumlint/rules/ruledoc"
)

// SARIF 2.1.0 (OASIS Static Analysis Results Interchange Format), the
// subset that code-scanning services read. Field names and meanings follow
// the standard's sections cited beside them.

const (
	sarifSchema    = "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json"
	informationURI = "https://github.com/datumlint/datumlint"
	srcRoot        = "SRCROOT"
	// fingerprintKey names our partialFingerprints entry (SARIF §3.27.17:
	// a versioned name, so a change of method does not match old results).
	fingerprintKey = "datumlint/statement/v1"
)

type sarifLog struct {
	Schema  string     `json:"$schema"`
	Version string     `json:"version"`
	Runs    []sarifRun `json:"runs"`
}

type sarifRun struct {
	Tool               sarifTool                   `json:"tool"`
	Invocations        []sarifInvocation           `json:"invocations"`
	OriginalURIBaseIDs map[string]sarifArtifactLoc `json:"originalUriBaseIds,omitempty"`
	ColumnKind         string                      `json:"columnKind"`
	Results            []sarifResult               `json:"results"`
}

type sarifTool struct {
	Driver sarifDriver `json:"driver"`
}

type sarifDriver struct {
	Name           string      `json:"name"`
	Version        string      `json:"version"`
	InformationURI string      `json:"informationUri"`
	Rules          []sarifRule `json:"rules"`
}

type sarifText struct {
	Text     string `json:"text"`
	Markdown string `json:"markdown,omitempty"`
}

type sarifRule struct {
	ID                   string         `json:"id"`
	Name                 string         `json:"name,omitempty"`
	ShortDescription     sarifText      `json:"shortDescription"`
	FullDescription      sarifText      `json:"fullDescription"`
	Help                 sarifText      `json:"help"`
	HelpURI              string         `json:"helpUri,omitempty"`
	DefaultConfiguration sarifRuleConf  `json:"defaultConfiguration"`
	Properties           map[string]any `json:"properties,omitempty"`
}

type sarifRuleConf struct {
	Level string `json:"level"`
}

type sarifInvocation struct {
	ExecutionSuccessful        bool                `json:"executionSuccessful"`
	ToolExecutionNotifications []sarifNotification `json:"toolExecutionNotifications,omitempty"`
}

type sarifNotification struct {
	Level     string          `json:"level"`
	Message   sarifText       `json:"message"`
	Locations []sarifLocation `json:"locations,omitempty"`
}

type sarifResult struct {
	RuleID              string             `json:"ruleId"`
	RuleIndex           int                `json:"ruleIndex"`
	Level               string             `json:"level"`
	Message             sarifText          `json:"message"`
	Locations           []sarifLocation    `json:"locations"`
	RelatedLocations    []sarifLocation    `json:"relatedLocations,omitempty"`
	Fixes               []sarifFix         `json:"fixes,omitempty"`
	PartialFingerprints map[string]string  `json:"partialFingerprints"`
	Suppressions        []sarifSuppression `json:"suppressions,omitempty"`
}

// sarifLocation is a location (§3.28); a related location has an id unique
// within its result and a message (§3.27.22).
type sarifLocation struct {
	ID               *int          `json:"id,omitempty"`
	PhysicalLocation sarifPhysical `json:"physicalLocation"`
	Message          *sarifText    `json:"message,omitempty"`
}

type sarifPhysical struct {
	ArtifactLocation sarifArtifactLoc `json:"artifactLocation"`
	Region           *sarifRegion     `json:"region,omitempty"`
}

type sarifArtifactLoc struct {
	URI       string `json:"uri"`
	URIBaseID string `json:"uriBaseId,omitempty"`
}

type sarifRegion struct {
	StartLine   int `json:"startLine"`
	StartColumn int `json:"startColumn"`
	EndLine     int `json:"endLine"`
	EndColumn   int `json:"endColumn"`
}

// sarifFix is a proposed fix (§3.55): the edits of one artifact, each a
// replacement of a region (empty for an insertion) by new text.
type sarifFix struct {
	Description     sarifText      `json:"description"`
	ArtifactChanges []sarifChange  `json:"artifactChanges"`
	Properties      map[string]any `json:"properties,omitempty"`
}

type sarifChange struct {
	ArtifactLocation sarifArtifactLoc   `json:"artifactLocation"`
	Replacements     []sarifReplacement `json:"replacements"`
}

type sarifReplacement struct {
	DeletedRegion   sarifRegion      `json:"deletedRegion"`
	InsertedContent *sarifArtContent `json:"insertedContent,omitempty"`
}

type sarifArtContent struct {
	Text string `json:"text"`
}

type sarifSuppression struct {
	Kind          string `json:"kind"`
	Justification string `json:"justification,omitempty"`
}

// sarifLevel maps a severity to SARIF's result level (§3.27.10).
func sarifLevel(s rules.Severity) string {
	switch s {
	case rules.Error:
		return "error"
	case rules.Warning:
		return "warning"
	case rules.Info:
		return "note"
	}
	return "none"
}

// internalRule describes the internal-error pseudo rule, so that every
// result names a rule the driver lists.
var internalRule = &rules.Rule{
	ID:        rules.InternalRule,
	Summary:   "datumlint failed while checking a file (a bug in datumlint: please report it)",
	Rationale: "A rule stopped with an unexpected error on this file, so the file was not fully checked. The other rules still ran. This is never a finding about the part.",
	Source:    "datumlint itself",
	Severity:  rules.Error,
}

// writeSARIF prints one SARIF log with one run. Suppressed findings are
// kept, with an inSource suppression carrying the allow comment's reason.
func writeSARIF(w io.Writer, res *lint.Result) error {
	cwd, err := os.Getwd()
	if err != nil {
		return err
	}
	all := append(rules.All(), internalRule)
	index := map[string]int{}
	driver := sarifDriver{Name: "datumlint", Version: version, InformationURI: informationURI, Rules: []sarifRule{}}
	for i, r := range all {
		index[r.ID] = i
		driver.Rules = append(driver.Rules, sarifRuleOf(r))
	}
	run := sarifRun{
		Tool:               sarifTool{Driver: driver},
		OriginalURIBaseIDs: map[string]sarifArtifactLoc{srcRoot: {URI: fileURI(cwd, true)}},
		ColumnKind:         "unicodeCodePoints", // our columns count characters (notation contract)
		Results:            []sarifResult{},
	}
	inv := sarifInvocation{ExecutionSuccessful: len(res.Errors) == 0}
	for _, e := range res.Errors {
		inv.ToolExecutionNotifications = append(inv.ToolExecutionNotifications, sarifNotification{
			Level: "error", Message: sarifText{Text: e.Err.Error()},
			Locations: []sarifLocation{{PhysicalLocation: sarifPhysical{ArtifactLocation: artifactOf(cwd, e.Path)}}},
		})
	}
	run.Invocations = []sarifInvocation{inv}

	seen := map[string]int{}
	for _, d := range res.Diagnostics() {
		idx, ok := index[d.Rule]
		if !ok {
			// A finding under a rule the registry does not know would make an
			// invalid log; list it rather than drop the finding.
			idx = len(run.Tool.Driver.Rules)
			index[d.Rule] = idx
			run.Tool.Driver.Rules = append(run.Tool.Driver.Rules, sarifRule{
				ID: d.Rule, Name: friendlyName(d.Rule),
				ShortDescription:     sarifText{Text: d.Rule},
				FullDescription:      sarifText{Text: d.Rule},
				Help:                 sarifText{Text: d.Rule, Markdown: d.Rule},
				DefaultConfiguration: sarifRuleConf{Level: sarifLevel(d.Severity)},
			})
		}
		loc := artifactOf(cwd, d.File)
		r := sarifResult{
			RuleID: d.Rule, RuleIndex: idx, Level: sarifLevel(d.Severity),
			Message:   sarifText{Text: d.Message},
			Locations: []sarifLocation{{PhysicalLocation: sarifPhysical{ArtifactLocation: loc, Region: regionOf(d.Span)}}},
		}
		for _, fx := range d.Fixes {
			ch := sarifChange{ArtifactLocation: loc}
			for _, e := range fx.Edits {
				rp := sarifReplacement{DeletedRegion: sarifRegion{StartLine: e.Span.Start.Line, StartColumn: e.Span.Start.Col, EndLine: e.Span.End.Line, EndColumn: e.Span.End.Col}}
				if e.NewText != "" {
					rp.InsertedContent = &sarifArtContent{Text: e.NewText}
				}
				ch.Replacements = append(ch.Replacements, rp)
			}
			r.Fixes = append(r.Fixes, sarifFix{Description: sarifText{Text: fx.Message}, ArtifactChanges: []sarifChange{ch},
				Properties: map[string]any{"datumlint/safe": fx.Safe}})
		}
		for k, rel := range d.Related {
			id := k
			r.RelatedLocations = append(r.RelatedLocations, sarifLocation{ID: &id,
				PhysicalLocation: sarifPhysical{ArtifactLocation: loc, Region: regionOf(rel.Span)},
				Message:          &sarifText{Text: rel.Message}})
		}
		// The fingerprint survives edits that move the statement: it hashes
		// the rule, the file, the statement's text with its spacing and
		// comments normalised, and the message, not the line numbers. Equal
		// findings on equal statements are told apart by their order.
		key := strings.Join([]string{d.Rule, loc.URI, statementText(res.File(d.File), d.Span.Start.Line), d.Message}, "\x00")
		n := seen[key]
		seen[key]++
		sum := sha256.Sum256([]byte(fmt.Sprintf("%s\x00%d", key, n)))
		r.PartialFingerprints = map[string]string{fingerprintKey: hex.EncodeToString(sum[:16])}
		if d.Suppressed {
			r.Suppressions = []sarifSuppression{{Kind: "inSource", Justification: d.Justification}}
		}
		run.Results = append(run.Results, r)
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(sarifLog{Schema: sarifSchema, Version: "2.1.0", Runs: []sarifRun{run}})
}

func sarifRuleOf(r *rules.Rule) sarifRule {
	plain := strings.ReplaceAll(r.Summary, "`", "")
	text := plain + "\n\n" + r.Rationale + "\n\nSource: " + r.Source
	if r.Bad != "" {
		text = Explain(r) // what `datumlint explain` prints
	}
	out := sarifRule{
		ID:                   r.ID,
		Name:                 friendlyName(r.ID),
		ShortDescription:     sarifText{Text: plain, Markdown: r.Summary},
		FullDescription:      sarifText{Text: oneParagraph(r.Rationale)},
		Help:                 sarifText{Text: text, Markdown: ruledoc.Markdown(r)},
		DefaultConfiguration: sarifRuleConf{Level: sarifLevel(r.Severity)},
		Properties:           map[string]any{"source": r.Source},
	}
	if r != internalRule {
		out.HelpURI = ruledoc.URL(r.ID)
	}
	return out
}

// ruleName turns a kebab-case identifier into the CamelCase "friendly
// name" SARIF suggests (§3.49.7): datum-unused -> DatumUnused.
func ruleName(id string) string {
	var b strings.Builder
	for _, part := range strings.Split(id, "-") {
		for i, r := range part {
			if i == 0 {
				r = unicode.ToUpper(r)
			}
			b.WriteRune(r)
		}
	}
	return b.String()
}

// friendlyName is ruleName, left out where it would differ from the
// identifier only in case (syntax -> Syntax): SARIF asks that a name that
// is the identifier be omitted (§3.49.7).
func friendlyName(id string) string {
	if n := ruleName(id); !strings.EqualFold(n, id) {
		return n
	}
	return ""
}

func oneParagraph(s string) string { return strings.Join(strings.Fields(s), " ") }

// artifactOf locates a file relative to SRCROOT (the working folder);
// files outside it get an absolute file:// URI and no base.
func artifactOf(cwd, file string) sarifArtifactLoc {
	abs, err := filepath.Abs(file)
	if err != nil {
		abs = file
	}
	rel, err := filepath.Rel(cwd, abs)
	if err != nil || rel == ".." || strings.HasPrefix(rel, ".."+string(filepath.Separator)) || filepath.IsAbs(rel) {
		return sarifArtifactLoc{URI: fileURI(abs, false)}
	}
	u := (&url.URL{Path: filepath.ToSlash(rel)}).EscapedPath()
	if first, _, _ := strings.Cut(u, "/"); strings.Contains(first, ":") {
		u = "./" + u // not to be read as a scheme
	}
	return sarifArtifactLoc{URI: u, URIBaseID: srcRoot}
}

// fileURI is the file:// URI of an absolute path; a folder's ends in "/"
// as SARIF requires of a base URI (§3.14.14).
func fileURI(abs string, dir bool) string {
	p := filepath.ToSlash(abs)
	if !strings.HasPrefix(p, "/") {
		p = "/" + p // a Windows drive path
	}
	if dir && !strings.HasSuffix(p, "/") {
		p += "/"
	}
	return (&url.URL{Scheme: "file", Path: p}).String()
}

func regionOf(sp source.Span) *sarifRegion {
	if sp.Start.Line < 1 {
		return nil
	}
	r := &sarifRegion{StartLine: sp.Start.Line, StartColumn: max(sp.Start.Col, 1), EndLine: sp.End.Line, EndColumn: sp.End.Col}
	if r.EndLine < r.StartLine || (r.EndLine == r.StartLine && r.EndColumn <= r.StartColumn) {
		r.EndLine, r.EndColumn = r.StartLine, r.StartColumn+1
	}
	return r
}

// statementText gives the normalised text of the statement holding a line
// of a file (model.StatementText: comments removed, runs of spaces made
// one). A line outside every statement (a comment line, an empty file)
// stands for itself.
func statementText(f *lint.File, line int) string {
	if f == nil || f.Source == nil || line < 1 || line > f.Source.Lines() {
		return ""
	}
	st := f.Statements
	i := sort.Search(len(st), func(i int) bool { return st[i].Last >= line })
	if i < len(st) && st[i].First <= line {
		return model.StatementText(f.Source, st[i])
	}
	text := strings.TrimRight(string(f.Source.LineBytes(line)), "\r")
	if line == 1 {
		text = strings.TrimPrefix(text, "\ufeff")
	}
	return strings.Join(strings.Fields(text), " ")
}
