package lsp

import (
	"fmt"
	"math/rand"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/tliron/glsp"
	protocol "github.com/tliron/glsp/protocol_3_16"

	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/rules"
)

// writeRaw sends one message as bytes, framed by hand (Content-Length),
// for what a well-behaved client library would not send.
func (c *client) writeRaw(body string) {
	c.t.Helper()
	if _, err := fmt.Fprintf(c.in, "Content-Length: %d\r\n\r\n%s", len(body), body); err != nil {
		c.t.Fatal(err)
	}
}

func hasCode(ds []wireDiag, code string, r protocol.Range) bool {
	for _, d := range ds {
		if d.Code == code && d.Range == r {
			return true
		}
	}
	return false
}

// alive fails the test unless the server still answers.
func (c *client) alive() {
	c.t.Helper()
	var syms []any
	c.must("textDocument/documentSymbol", map[string]any{"textDocument": map[string]any{"uri": "file:///none.callouts"}}, &syms)
}

// hasLog waits a while for a logMessage of the type holding part.
func hasLog(c *client, typ protocol.MessageType, part string) bool {
	deadline := time.Now().Add(10 * time.Second)
	for time.Now().Before(deadline) {
		for _, l := range c.logged() {
			if l.Type == typ && strings.Contains(l.Message, part) {
				return true
			}
		}
		time.Sleep(5 * time.Millisecond)
	}
	return false
}

func TestOddMessages(t *testing.T) {
	c := startServer(t, nil)
	// A notification before initialize is dropped.
	c.open("file:///early.callouts", "units mm\n")
	c.initialize()
	var res any
	if err := c.call("textDocument/hover", map[string]any{"textDocument": map[string]any{"uri": "file:///early.callouts"}, "position": pos(0, 0)}, &res); err != nil || res != nil {
		t.Errorf("hover on a document opened before initialize: %v %v", res, err)
	}
	// Requests for a document that is not open: empty answers, no error.
	doc := map[string]any{"uri": "file:///not/open.callouts"}
	for _, m := range []struct {
		method string
		params map[string]any
	}{
		{"textDocument/hover", map[string]any{"textDocument": doc, "position": pos(3, 4)}},
		{"textDocument/definition", map[string]any{"textDocument": doc, "position": pos(3, 4)}},
		{"textDocument/references", map[string]any{"textDocument": doc, "position": pos(3, 4), "context": map[string]any{"includeDeclaration": true}}},
		{"textDocument/documentSymbol", map[string]any{"textDocument": doc}},
		{"textDocument/completion", map[string]any{"textDocument": doc, "position": pos(0, 0)}},
		{"textDocument/formatting", map[string]any{"textDocument": doc, "options": map[string]any{"tabSize": 4, "insertSpaces": true}}},
		{"textDocument/codeAction", map[string]any{"textDocument": doc, "range": rng(0, 0, 9, 0), "context": map[string]any{"diagnostics": []any{}}}},
	} {
		var out any
		if err := c.call(m.method, m.params, &out); err != nil {
			t.Errorf("%s on a document that is not open: %v", m.method, err)
		}
	}
	// A change to a document that is not open: a range is ignored (and
	// logged), a whole text is taken.
	c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": "file:///late.callouts", "version": 3},
		"contentChanges": []any{map[string]any{"range": rng(0, 0, 0, 1), "text": "x"}}})
	c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": "file:///whole.callouts", "version": 4},
		"contentChanges": []any{map[string]any{"text": "units mm\n"}}})
	if d := c.waitPublish("file:///whole.callouts", 4).Diagnostics; len(d) != 1 || d[0].Code != "header-missing" {
		t.Errorf("a whole-text change to an unopened document: %+v", d)
	}
	if !hasLog(c, protocol.MessageTypeWarning, "file:///late.callouts, which is not open") {
		t.Errorf("the ignored change was not logged: %+v", c.logged())
	}
	// Unknown and malformed messages.
	if err := c.call("datumlint/unknown", map[string]any{}, &res); rpcCode(err) != -32601 {
		t.Errorf("an unknown method: %v, want MethodNotFound", err)
	}
	c.notify("$/unknownNotification", map[string]any{"x": 1})
	if err := c.call("textDocument/hover", map[string]any{"textDocument": doc, "position": "here"}, &res); rpcCode(err) != -32602 {
		t.Errorf("a hover with a bad position: %v, want InvalidParams", err)
	}
	if err := c.call("textDocument/hover", nil, &res); err == nil {
		t.Errorf("a hover without parameters answered %v", res)
	}
	c.notify("textDocument/didOpen", map[string]any{"textDocument": 42})
	c.writeRaw(`{"jsonrpc":"2.0","method":"textDocument/didChange","params":{"textDocument":{"uri":"file:///x.callouts","version":"two"},"contentChanges":7}}`)
	// A second initialize is answered again; open twice replaces the text.
	c.initialize()
	c.open("file:///twice.callouts", "units mm\n")
	c.open("file:///twice.callouts", "units mm\nstandard iso\n")
	if d := c.waitPublish("file:///twice.callouts", 1).Diagnostics; len(d) > 1 {
		t.Errorf("reopened document: %+v", d)
	}
	// Closing what is not open, twice.
	c.notify("textDocument/didClose", map[string]any{"textDocument": map[string]any{"uri": "file:///twice.callouts"}})
	c.notify("textDocument/didClose", map[string]any{"textDocument": map[string]any{"uri": "file:///twice.callouts"}})
	c.alive()
	if code := c.shutdownExit(); code != 0 {
		t.Errorf("exit code %d", code)
	}
}

// TestOddText: text that is not UTF-8, control characters, a byte-order
// mark, ranges past the end and backwards, and a document over the size
// limit.
func TestOddText(t *testing.T) {
	c := startServer(t, nil)
	c.initialize()
	// Invalid UTF-8 inside a JSON string (the decoder reads it as U+FFFD).
	c.writeRaw("{\"jsonrpc\":\"2.0\",\"method\":\"textDocument/didOpen\",\"params\":{\"textDocument\":{\"uri\":\"file:///latin1.callouts\",\"languageId\":\"callouts\",\"version\":1,\"text\":\"part \\\"Tr\xe4ger\\\"\\nunits mm\\nstandard iso\\nfeature b\xff plane normal +z at (0, 0, 0)\\nunits \\u0007\"}}}")
	if d := c.waitPublish("file:///latin1.callouts", 1).Diagnostics; !hasCode(d, "syntax", rng(3, 9, 3, 10)) || !hasCode(d, "syntax", rng(4, 6, 4, 7)) {
		t.Errorf("text with replacement and control characters: %+v", d)
	}
	// A byte-order mark kept in the editor's text: ranges on line 1 count it.
	c.open("file:///bom.callouts", "\ufeffunits mm mm\nstandard iso\n")
	if d := c.waitPublish("file:///bom.callouts", 1).Diagnostics; !hasCode(d, "syntax", rng(0, 10, 0, 12)) {
		t.Errorf("a finding after a byte-order mark: %+v", d)
	}
	// Ranges past the end and backwards.
	uri := "file:///ranges.callouts"
	c.open(uri, "units mm\n")
	c.waitPublish(uri, 1)
	v := c.change(uri, rng(99, 99, 120, 0), "standard iso\n")
	c.waitPublish(uri, v)
	v = c.change(uri, rng(0, 8, 0, 6), "in")
	c.waitPublish(uri, v)
	if got := string(c.snapshotOf(t, uri).text); got != "units in\nstandard iso\n" {
		t.Errorf("after odd ranges: %q", got)
	}
	if !hasLog(c, protocol.MessageTypeWarning, "ended before it started") {
		t.Errorf("the backwards range was not logged")
	}
	// A surrogate pair split by a change's position.
	v = c.change(uri, rng(1, 12, 1, 12), " # 𝜙𝜙")
	c.waitPublish(uri, v)
	v = c.change(uri, rng(1, 16, 1, 17), "x")
	c.waitPublish(uri, v)
	c.alive()
	// Over the size limit: one finding, no parse, no crash.
	big := strings.Repeat("feature f plane normal +z at (0, 0, 0)\n", (17<<20)/40)
	c.open("file:///big.callouts", big)
	d := c.waitPublish("file:///big.callouts", 1).Diagnostics
	if len(d) != 1 || d[0].Code != "syntax" || !strings.Contains(d[0].Message, "over the size limit") {
		t.Errorf("a document over the size limit: %+v", d)
	}
	var edits []protocol.TextEdit
	c.must("textDocument/formatting", map[string]any{"textDocument": map[string]any{"uri": "file:///big.callouts"}, "options": map[string]any{}}, &edits)
	if len(edits) != 0 {
		t.Errorf("a document over the size limit was formatted")
	}
	if h := hoverText(t, c, "file:///big.callouts", pos(0, 0)); !strings.Contains(h, "over the size limit") {
		t.Errorf("hover on the big document: %q", h)
	}
	if code := c.shutdownExit(); code != 0 {
		t.Errorf("exit code %d", code)
	}
}

// TestPanicIsLogged: a handler that panics is answered with an internal
// error and logged, and the server goes on; so is a check that panics.
func TestPanicIsLogged(t *testing.T) {
	s := newServer(Options{Debounce: 1})
	calls := 0
	s.handler.TextDocumentHover = func(*glsp.Context, *protocol.HoverParams) (*protocol.Hover, error) {
		calls++
		if calls == 1 {
			var m map[string]int
			m["boom"]++ // a nil map: a real runtime panic
		}
		return nil, nil
	}
	c := startServer(t, s)
	c.initialize()
	var res any
	hover := map[string]any{"textDocument": map[string]any{"uri": "file:///x.callouts"}, "position": pos(0, 0)}
	if err := c.call("textDocument/hover", hover, &res); rpcCode(err) != -32603 {
		t.Errorf("a panicking hover: %v, want InternalError", err)
	}
	if err := c.call("textDocument/hover", hover, &res); err != nil {
		t.Errorf("the next hover: %v", err)
	}
	if ok := s.safely("checking a test document", func() { panic("boom") }); ok {
		t.Error("safely reported a panic as success")
	}
	c.alive()
	if !hasLog(c, protocol.MessageTypeError, "internal error while handling textDocument/hover") || !hasLog(c, protocol.MessageTypeError, "internal error while checking a test document") {
		t.Errorf("panics not logged: %+v", c.logged())
	}
	if code := c.shutdownExit(); code != 0 {
		t.Errorf("exit code %d", code)
	}
}

// TestReviewFixTitle: a fix that is not safe is offered titled as needing
// review, and not preferred. (No rule has one yet; the snapshot is made
// here.)
func TestReviewFixTitle(t *testing.T) {
	s := newServer(Options{})
	uri := "file:///review.callouts"
	text := []byte("units mm\nstandard iso\nframe x: flatness 0.1 datums A\n")
	sp := source.Span{Start: source.Pos{Line: 3, Col: 23}, End: source.Pos{Line: 3, Col: 31}}
	sn := &snapshot{gen: 1, uri: uri, text: text, pos: newPositions(text), diags: []rules.Diagnostic{{
		Span: sp, Rule: "datums-forbidden", Severity: rules.Error, Message: "flatness takes no datums",
		Fixes: []rules.Fix{{Message: "remove the datums", Edits: []rules.Edit{{Span: source.Span{Start: source.Pos{Line: 3, Col: 22}, End: sp.End}}}}},
	}}}
	s.docs.docs[uri] = &document{uri: uri, text: text, gen: 1, checked: 1, snap: sn}
	c := startServer(t, s)
	c.initialize()
	var actions []struct {
		Title       string `json:"title"`
		IsPreferred bool   `json:"isPreferred"`
		Edit        struct {
			Changes map[string][]protocol.TextEdit `json:"changes"`
		} `json:"edit"`
	}
	c.must("textDocument/codeAction", map[string]any{"textDocument": map[string]any{"uri": uri}, "range": rng(2, 25, 2, 25), "context": map[string]any{"diagnostics": []any{}}}, &actions)
	if len(actions) != 1 || actions[0].Title != "Remove the datums (needs review: it changes what the drawing says)" || actions[0].IsPreferred {
		t.Fatalf("actions: %+v", actions)
	}
	if got := applyTextEdits(t, string(text), actions[0].Edit.Changes[uri]); got != "units mm\nstandard iso\nframe x: flatness 0.1\n" {
		t.Errorf("the fix gives %q", got)
	}
}

// TestAnyOrder sends a few hundred messages drawn at random (open, change
// with any range, close, every request at any position) over the test
// files; the server never fails a request, logs no internal error, and
// shuts down cleanly.
func TestAnyOrder(t *testing.T) {
	files := corpus(t)
	var texts []string
	for _, f := range files {
		b, _ := os.ReadFile(f)
		texts = append(texts, string(b))
	}
	c := startServer(t, newServer(Options{Debounce: 1}))
	c.initialize()
	r := rand.New(rand.NewSource(17))
	uris := []string{"file:///a.callouts", "file:///b.callouts", "untitled:c"}
	anyPos := func() protocol.Position { return pos(r.Intn(60), r.Intn(90)) }
	requests := []string{"textDocument/hover", "textDocument/definition", "textDocument/references", "textDocument/documentSymbol",
		"textDocument/completion", "textDocument/formatting", "textDocument/codeAction"}
	for i := 0; i < 400; i++ {
		uri := uris[r.Intn(len(uris))]
		switch k := r.Intn(10); {
		case k == 0:
			c.open(uri, texts[r.Intn(len(texts))])
		case k <= 3:
			a, b := anyPos(), anyPos()
			snippet := []string{"", "x", "\n", "frame ", "datums A, B", "𝜙", "\\\n", "composite dia 0.1", "#", ":"}[r.Intn(10)]
			c.notify("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": i},
				"contentChanges": []any{map[string]any{"range": protocol.Range{Start: a, End: b}, "text": snippet}}})
		case k == 4:
			c.notify("textDocument/didClose", map[string]any{"textDocument": map[string]any{"uri": uri}})
		default:
			m := requests[r.Intn(len(requests))]
			params := map[string]any{"textDocument": map[string]any{"uri": uri}, "position": anyPos(), "range": protocol.Range{Start: anyPos(), End: anyPos()},
				"context": map[string]any{"includeDeclaration": r.Intn(2) == 0, "diagnostics": []any{}}, "options": map[string]any{}}
			var out any
			if err := c.call(m, params, &out); err != nil {
				t.Fatalf("message %d, %s: %v", i, m, err)
			}
		}
	}
	c.alive()
	for _, l := range c.logged() {
		if l.Type == protocol.MessageTypeError {
			t.Errorf("logged: %s", l.Message)
		}
	}
	if code := c.shutdownExit(); code != 0 {
		t.Errorf("exit code %d", code)
	}
}

// TestNothingWritten: editing, formatting and fixing a file in the editor
// leave the file and its folder as they were.
func TestNothingWritten(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "part.callouts")
	if err := os.WriteFile(path, []byte(plate), 0o644); err != nil {
		t.Fatal(err)
	}
	c := startServer(t, nil)
	c.initialize()
	uri := fileURI(path)
	c.open(uri, plate)
	c.waitPublish(uri, 1)
	v := c.change(uri, rng(0, 0, 0, 0), "# edited\n")
	c.waitPublish(uri, v)
	var edits []protocol.TextEdit
	c.must("textDocument/formatting", map[string]any{"textDocument": map[string]any{"uri": uri}, "options": map[string]any{}}, &edits)
	var actions []any
	c.must("textDocument/codeAction", map[string]any{"textDocument": map[string]any{"uri": uri}, "range": rng(0, 0, 40, 0), "context": map[string]any{"diagnostics": []any{}}}, &actions)
	c.notify("textDocument/didClose", map[string]any{"textDocument": map[string]any{"uri": uri}})
	if code := c.shutdownExit(); code != 0 {
		t.Errorf("exit code %d", code)
	}
	got, _ := os.ReadFile(path)
	entries, _ := os.ReadDir(dir)
	if string(got) != plate || len(entries) != 1 {
		t.Errorf("the folder holds %d entries and the file changed: %v", len(entries), string(got) != plate)
	}
}
