package lsp

import (
	"errors"
	"fmt"
	"net/url"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"time"

	"github.com/tliron/glsp"
	protocol "github.com/tliron/glsp/protocol_3_16"

	"github.com/datumlint/datumlint/grammar/source"
)

// document is one open document: the editor's text, which may differ from
// the file on disk and is never written there.
type document struct {
	uri     protocol.DocumentUri
	path    string // the file's path for a file: URI, else ""
	version protocol.Integer
	text    []byte
	// gen counts the changes the server has applied; a check's result is
	// published only while gen is still the one it checked.
	gen     uint64
	checked uint64    // the gen whose findings were last published
	snap    *snapshot // the analysis of gen, once made

	// Scheduling of the check after a change (publish.go).
	timer   *time.Timer
	running bool // a check loop is running for this document
	closed  bool
	pubMu   sync.Mutex // orders publishing against didClose
}

// store holds the open documents. Handlers run one at a time on the
// connection's reading goroutine; the checks after a change run on their
// own, so every field of a document is read and written under mu.
type store struct {
	mu     sync.Mutex
	docs   map[protocol.DocumentUri]*document
	closed bool
}

func newStore() *store { return &store{docs: map[protocol.DocumentUri]*document{}} }

// get returns the open document with the URI, or nil.
func (st *store) get(uri protocol.DocumentUri) *document {
	st.mu.Lock()
	defer st.mu.Unlock()
	return st.docs[uri]
}

// closeAll stops every pending check (shutdown, or the connection ended).
func (st *store) closeAll() {
	st.mu.Lock()
	defer st.mu.Unlock()
	st.closed = true
	for _, d := range st.docs {
		d.closed = true
		if d.timer != nil {
			d.timer.Stop()
		}
	}
}

func (s *server) didOpen(_ *glsp.Context, p *protocol.DidOpenTextDocumentParams) error {
	td := p.TextDocument
	st := s.docs
	st.mu.Lock()
	defer st.mu.Unlock()
	if st.closed {
		return nil
	}
	d := st.docs[td.URI]
	if d == nil {
		d = &document{uri: td.URI, path: uriPath(td.URI)}
		st.docs[td.URI] = d
	}
	d.version, d.text, d.closed = td.Version, []byte(td.Text), false
	s.changedLocked(d)
	return nil
}

func (s *server) didChange(_ *glsp.Context, p *protocol.DidChangeTextDocumentParams) error {
	if warning := s.applyChange(p); warning != "" {
		// Logged once the store is unlocked: writing to the client never
		// waits with the lock held.
		s.logf(protocol.MessageTypeWarning, "%s", warning)
	}
	return nil
}

// applyChange applies a didChange to the store; it returns what is worth
// a warning.
func (s *server) applyChange(p *protocol.DidChangeTextDocumentParams) (warning string) {
	st := s.docs
	st.mu.Lock()
	defer st.mu.Unlock()
	if st.closed {
		return ""
	}
	d := st.docs[p.TextDocument.URI]
	if d == nil {
		// A change to a document that is not open: only a change that
		// gives the whole text can be taken as it is.
		whole, ok := wholeText(p.ContentChanges)
		if !ok {
			return fmt.Sprintf("didChange for %s, which is not open: ignored", p.TextDocument.URI)
		}
		d = &document{uri: p.TextDocument.URI, path: uriPath(p.TextDocument.URI), text: whole}
		st.docs[d.uri] = d
	} else {
		text, err := applyChanges(d.text, p.ContentChanges)
		if err != nil {
			warning = fmt.Sprintf("didChange for %s: %v", d.uri, err)
		}
		d.text = text
	}
	d.version = p.TextDocument.Version
	s.changedLocked(d)
	return warning
}

func (s *server) didClose(_ *glsp.Context, p *protocol.DidCloseTextDocumentParams) error {
	st := s.docs
	st.mu.Lock()
	d := st.docs[p.TextDocument.URI]
	if d != nil {
		delete(st.docs, d.uri)
		d.closed = true
		if d.timer != nil {
			d.timer.Stop()
		}
	}
	st.mu.Unlock()
	if d == nil {
		return nil
	}
	// The editor clears a closed document's findings when told so.
	d.pubMu.Lock()
	defer d.pubMu.Unlock()
	s.notify(string(protocol.ServerTextDocumentPublishDiagnostics), protocol.PublishDiagnosticsParams{URI: d.uri, Diagnostics: []protocol.Diagnostic{}})
	return nil
}

// wholeText returns the text of the last change that replaces the whole
// document, with the changes after it applied.
func wholeText(changes []any) ([]byte, bool) {
	for i := len(changes) - 1; i >= 0; i-- {
		if w, ok := changes[i].(protocol.TextDocumentContentChangeEventWhole); ok {
			text, _ := applyChanges([]byte(w.Text), changes[i+1:])
			return text, true
		}
	}
	return nil, false
}

// applyChanges applies a didChange's changes in order (LSP 3.17,
// "DidChangeTextDocumentParams"). A change's range is in UTF-16 code
// units; grammar/source converts it to byte offsets. A range that ends
// before it starts is read the other way round; one past the end of the
// document is clamped to it, as the protocol asks.
func applyChanges(text []byte, changes []any) ([]byte, error) {
	var bad error
	for _, c := range changes {
		switch c := c.(type) {
		case protocol.TextDocumentContentChangeEventWhole:
			text = []byte(c.Text)
		case protocol.TextDocumentContentChangeEvent:
			if c.Range == nil {
				text = []byte(c.Text)
				continue
			}
			f := source.NewFile("", text)
			from := f.Offset(f.FromUTF16(int(c.Range.Start.Line), int(c.Range.Start.Character)))
			to := f.Offset(f.FromUTF16(int(c.Range.End.Line), int(c.Range.End.Character)))
			if to < from {
				from, to = to, from
				bad = errors.New("a change's range ended before it started; applied from its end to its start")
			}
			out := make([]byte, 0, len(text)-(to-from)+len(c.Text))
			out = append(append(append(out, text[:from]...), c.Text...), text[to:]...)
			text = out
		}
	}
	return text, bad
}

// uriPath returns the local path of a file: URI, or "" for any other
// (an unsaved buffer's "untitled:" URI has no folder, so no configuration).
func uriPath(uri protocol.DocumentUri) string {
	u, err := url.Parse(string(uri))
	if err != nil || u.Scheme != "file" {
		return ""
	}
	p := u.Path
	if runtime.GOOS == "windows" {
		p = strings.TrimPrefix(p, "/") // file:///C:/x -> C:/x
	}
	return filepath.FromSlash(p)
}
