package lsp

import (
	"context"
	"encoding/json"
	"errors"
	"io"
	"net/url"
	"path/filepath"
	"sync"
	"testing"
	"time"

	"github.com/sourcegraph/jsonrpc2"
	protocol "github.com/tliron/glsp/protocol_3_16"
)

// The tests drive the server as an editor does: JSON-RPC messages with
// Content-Length framing over an in-memory pipe. Notifications are decoded
// into the test's own types (plain JSON), not glsp's, so that the test
// reads what went over the wire.

type wireDiag struct {
	Range           protocol.Range `json:"range"`
	Severity        int            `json:"severity"`
	Code            any            `json:"code"`
	CodeDescription *struct {
		Href string `json:"href"`
	} `json:"codeDescription"`
	Source             string `json:"source"`
	Message            string `json:"message"`
	RelatedInformation []struct {
		Location protocol.Location `json:"location"`
		Message  string            `json:"message"`
	} `json:"relatedInformation"`
}

type wirePublish struct {
	URI         string     `json:"uri"`
	Version     *int       `json:"version"`
	Diagnostics []wireDiag `json:"diagnostics"`
}

type client struct {
	t    testing.TB
	srv  *server
	conn *jsonrpc2.Conn
	in   io.Writer // the server's input, for messages written by hand
	code chan int

	mu        sync.Mutex
	publishes []wirePublish
	logs      []protocol.LogMessageParams
	notified  chan struct{}
	version   map[string]int
}

type pipe struct {
	io.Reader
	io.Writer
}

func (p pipe) Close() error {
	p.Reader.(io.Closer).Close()
	p.Writer.(io.Closer).Close()
	return nil
}

// startServer runs a server over a pipe; s may be prepared by the test
// (nil: a new one with a short debounce).
func startServer(t testing.TB, s *server) *client {
	if s == nil {
		s = newServer(Options{Version: "test", Debounce: 5 * time.Millisecond})
	}
	sr, cw := io.Pipe()
	cr, sw := io.Pipe()
	c := &client{srv: s, code: make(chan int, 1), notified: make(chan struct{}, 1), version: map[string]int{}}
	c.t = t
	go func() {
		c.code <- s.serve(sr, sw)
	}()
	c.in = cw
	c.conn = jsonrpc2.NewConn(context.Background(), jsonrpc2.NewBufferedStream(pipe{cr, cw}, jsonrpc2.VSCodeObjectCodec{}),
		jsonrpc2.HandlerWithError(c.handle), jsonrpc2.SetLogger(discardLogger{}))
	t.Cleanup(func() { c.conn.Close() })
	return c
}

type discardLogger struct{}

func (discardLogger) Printf(string, ...any) {}

func (c *client) handle(_ context.Context, _ *jsonrpc2.Conn, req *jsonrpc2.Request) (any, error) {
	if req.Params == nil {
		return nil, nil
	}
	c.mu.Lock()
	switch req.Method {
	case "textDocument/publishDiagnostics":
		var p wirePublish
		if err := json.Unmarshal(*req.Params, &p); err == nil {
			c.publishes = append(c.publishes, p)
		}
	case "window/logMessage":
		var p protocol.LogMessageParams
		if err := json.Unmarshal(*req.Params, &p); err == nil {
			c.logs = append(c.logs, p)
		}
	}
	c.mu.Unlock()
	select {
	case c.notified <- struct{}{}:
	default:
	}
	return nil, nil
}

func (c *client) call(method string, params, result any) error {
	ctx, cancel := context.WithTimeout(context.Background(), 20*time.Second)
	defer cancel()
	return c.conn.Call(ctx, method, params, result)
}

// must calls and fails the test on an error.
func (c *client) must(method string, params, result any) {
	c.t.Helper()
	if err := c.call(method, params, result); err != nil {
		c.t.Fatalf("%s: %v", method, err)
	}
}

func (c *client) notify(method string, params any) {
	if err := c.conn.Notify(context.Background(), method, params); err != nil && c.t != nil {
		c.t.Fatalf("%s: %v", method, err)
	}
}

func (c *client) initialize() {
	c.t.Helper()
	var res map[string]any
	c.must("initialize", map[string]any{"processId": nil, "rootUri": nil, "capabilities": map[string]any{
		"textDocument": map[string]any{"hover": map[string]any{"contentFormat": []string{"markdown", "plaintext"}},
			"documentSymbol": map[string]any{"hierarchicalDocumentSymbolSupport": true}},
	}}, &res)
	c.notify("initialized", map[string]any{})
}

func (c *client) open(uri, text string) {
	c.mu.Lock()
	c.version[uri] = 1
	c.mu.Unlock()
	c.notify("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "callouts", "version": 1, "text": text}})
}

// change sends one incremental change and returns the new version.
func (c *client) change(uri string, rng protocol.Range, text string) int {
	c.mu.Lock()
	c.version[uri]++
	v := c.version[uri]
	c.mu.Unlock()
	c.notify("textDocument/didChange", map[string]any{
		"textDocument":   map[string]any{"uri": uri, "version": v},
		"contentChanges": []any{map[string]any{"range": rng, "text": text}},
	})
	return v
}

// waitPublish waits for the diagnostics of a document at a version.
func (c *client) waitPublish(uri string, version int) wirePublish {
	if c.t != nil {
		c.t.Helper()
	}
	deadline := time.After(20 * time.Second)
	for {
		c.mu.Lock()
		for i := len(c.publishes) - 1; i >= 0; i-- {
			p := c.publishes[i]
			if p.URI == uri && p.Version != nil && *p.Version == version {
				c.mu.Unlock()
				return p
			}
		}
		c.mu.Unlock()
		select {
		case <-c.notified:
		case <-time.After(50 * time.Millisecond):
		case <-deadline:
			if c.t != nil {
				c.t.Fatalf("no diagnostics for %s version %d", uri, version)
			}
			panic("no diagnostics")
		}
	}
}

func (c *client) shutdownExit() int {
	c.t.Helper()
	c.must("shutdown", nil, nil)
	c.notify("exit", nil)
	return c.exitCode()
}

func (c *client) exitCode() int {
	select {
	case code := <-c.code:
		return code
	case <-time.After(20 * time.Second):
		c.t.Fatal("the server did not stop")
	}
	return -1
}

func (c *client) logged() []protocol.LogMessageParams {
	c.mu.Lock()
	defer c.mu.Unlock()
	return append([]protocol.LogMessageParams(nil), c.logs...)
}

func fileURI(path string) string {
	abs, err := filepath.Abs(path)
	if err != nil {
		panic(err)
	}
	return (&url.URL{Scheme: "file", Path: filepath.ToSlash(abs)}).String()
}

func rpcCode(err error) int64 {
	var e *jsonrpc2.Error
	if errors.As(err, &e) {
		return e.Code
	}
	return 0
}

func pos(line, char int) protocol.Position {
	return protocol.Position{Line: protocol.UInteger(line), Character: protocol.UInteger(char)}
}

func rng(l1, c1, l2, c2 int) protocol.Range {
	return protocol.Range{Start: pos(l1, c1), End: pos(l2, c2)}
}
