package lsp

import (
	"bytes"
	"fmt"
	"path/filepath"
	"sync"

	protocol "github.com/tliron/glsp/protocol_3_16"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/config"
	"github.com/datumlint/datumlint/rules/kinematics"
	"github.com/datumlint/datumlint/rules/lint"
	"github.com/datumlint/datumlint/rules/ruledoc"
)

// snapshot is what the server knows of one version of a document: its
// findings, and (made on first use, for hovers and navigation) its parse
// and part model.
type snapshot struct {
	gen     uint64
	version protocol.Integer
	uri     protocol.DocumentUri
	text    []byte
	pos     positions
	// diags are the findings `check` would print (suppressed ones are left
	// out, as the text outputs leave them out).
	diags []rules.Diagnostic
	// notice, when set, is why the document was not checked (its
	// configuration does not load); it is shown as one finding.
	notice string
	// tooBig is set when the document is over the size limit: it is not
	// parsed for anything else either.
	tooBig bool

	// part is the model the check read; file (the notation's tree, for
	// formatting) and kin (the kinematic result, for hovers) are made on
	// first use.
	part *model.Part
	once sync.Once
	file *grammar.File
	kin  *kinematics.Result
}

// checkText is the one call of the driver: the reader the file's name
// chooses (lint.Read, as check does) and rules.Check, so that the server
// follows the driver when it changes.
func checkText(name string, src []byte, settings *rules.Settings) (*model.Part, []rules.Diagnostic) {
	part := lint.Read(name, src)
	return part, rules.Check(part, settings)
}

// settingsFor returns what `datumlint check` would use for the file at
// path: the nearest .datumlint.toml above it (rules/config's Finder), with
// no command-line overrides. It is read again for every check, so that an
// edit of the configuration applies at the next change of the document.
func settingsFor(path string) (*rules.Settings, int64, error) {
	if path == "" {
		return nil, lint.DefaultMaxBytes, nil
	}
	var f config.Finder
	c, err := f.Find(filepath.Dir(path))
	if err != nil {
		return nil, 0, err
	}
	limit := int64(lint.DefaultMaxBytes)
	if c != nil && c.MaxBytes > 0 {
		limit = c.MaxBytes
	}
	return c.Settings(config.Overrides{}), limit, nil
}

// analyse checks one version of a document.
func analyse(uri protocol.DocumentUri, path string, text []byte, gen uint64, version protocol.Integer) *snapshot {
	sn := &snapshot{gen: gen, version: version, uri: uri, text: text, pos: newPositions(text)}
	name := path
	if name == "" {
		name = uri
	}
	settings, limit, err := settingsFor(path)
	if err != nil {
		// check reports the file as not checked (exit 2); the editor
		// shows why on the document itself.
		sn.notice = fmt.Sprintf("not checked: the configuration does not load: %v", err)
		return sn
	}
	if int64(len(text)) > limit {
		sn.tooBig = true
		sn.diags = []rules.Diagnostic{{File: name, Rule: rules.Syntax.ID, Severity: rules.Error,
			Span:    source.Line(1),
			Message: fmt.Sprintf("the document is %d bytes, over the size limit of %d bytes; it was not checked (max-bytes in %s sets the limit)", len(text), limit, config.FileName)}}
		return sn
	}
	part, ds := checkText(name, text, settings)
	sn.part = part
	for _, d := range ds {
		if !d.Suppressed {
			sn.diags = append(sn.diags, d)
		}
	}
	return sn
}

// model returns the document's parse and part model, made on first use;
// nil for a document over the size limit or one that was not checked.
func (sn *snapshot) model() (*grammar.File, *model.Part) {
	if sn.tooBig || sn.notice != "" {
		return nil, nil
	}
	sn.once.Do(func() {
		sn.file = grammar.Parse(string(sn.uri), sn.text)
		sn.kin = kinematics.Analyze(sn.part)
	})
	return sn.file, sn.part
}

// engines returns the kinematic result of the document's part.
func (sn *snapshot) engines() *kinematics.Result {
	sn.model()
	return sn.kin
}

// lspDiagnostics converts the findings for publishDiagnostics.
func (sn *snapshot) lspDiagnostics() []protocol.Diagnostic {
	out := make([]protocol.Diagnostic, 0, len(sn.diags)+1)
	if sn.notice != "" {
		sev := protocol.DiagnosticSeverityError
		src := "datumlint"
		out = append(out, protocol.Diagnostic{Range: sn.pos.rng(source.Line(1)), Severity: &sev, Source: &src, Message: sn.notice})
	}
	for _, d := range sn.diags {
		out = append(out, sn.lspDiagnostic(d))
	}
	return out
}

func (sn *snapshot) lspDiagnostic(d rules.Diagnostic) protocol.Diagnostic {
	sev := severity(d.Severity)
	src := "datumlint"
	out := protocol.Diagnostic{
		Range:    sn.pos.rng(d.Span),
		Severity: &sev,
		Code:     &protocol.IntegerOrString{Value: d.Rule},
		Source:   &src,
		Message:  d.Message,
	}
	if rules.Lookup(d.Rule) != nil {
		out.CodeDescription = &protocol.CodeDescription{HRef: ruledoc.URL(d.Rule)}
	}
	for _, r := range d.Related {
		out.RelatedInformation = append(out.RelatedInformation, protocol.DiagnosticRelatedInformation{
			Location: protocol.Location{URI: sn.uri, Range: sn.pos.rng(r.Span)},
			Message:  r.Message,
		})
	}
	return out
}

// severity maps a rule's severity onto the protocol's.
func severity(s rules.Severity) protocol.DiagnosticSeverity {
	switch s {
	case rules.Error:
		return protocol.DiagnosticSeverityError
	case rules.Warning:
		return protocol.DiagnosticSeverityWarning
	}
	return protocol.DiagnosticSeverityInformation
}

// positions converts between the notation's positions (1-based, columns
// in characters, counted after a byte-order mark as the parser counts
// them) and the protocol's (0-based, UTF-16 code units, the mark being a
// character of the editor's text if the editor kept it).
type positions struct {
	f   *source.File
	bom int
}

var byteOrderMark = []byte("\xef\xbb\xbf")

func newPositions(text []byte) positions {
	p := positions{f: source.NewFile("", text)}
	if bytes.HasPrefix(text, byteOrderMark) {
		p = positions{source.NewFile("", text[len(byteOrderMark):]), 1}
	}
	// A snapshot is read by the check that publishes it and by requests
	// at once: make the file's line index now, so that later uses only
	// read it.
	p.f.Lines()
	return p
}

func (p positions) lsp(q source.Pos) protocol.Position {
	if q.Line < 1 {
		return protocol.Position{}
	}
	line, char := p.f.UTF16(q)
	if line == 0 {
		char += p.bom
	}
	return protocol.Position{Line: protocol.UInteger(line), Character: protocol.UInteger(char)}
}

func (p positions) rng(sp source.Span) protocol.Range {
	if sp.End.Line == 0 || sp.End.Before(sp.Start) {
		sp.End = sp.Start
	}
	return protocol.Range{Start: p.lsp(sp.Start), End: p.lsp(sp.End)}
}

// source converts a protocol position into the notation's.
func (p positions) source(q protocol.Position) source.Pos {
	char := int(q.Character)
	if q.Line == 0 {
		char = max(0, char-p.bom)
	}
	return p.f.FromUTF16(int(q.Line), char)
}

// end is the protocol position of the end of the text.
func (p positions) end() protocol.Position {
	return p.lsp(p.f.Position(len(p.f.Src)))
}
