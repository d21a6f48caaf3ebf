// Package lsp is datumlint's language server: the Language Server Protocol
// (3.17, whose base the protocol types of github.com/tliron/glsp cover)
// over a byte stream, usually standard input and output. It keeps the open
// documents in memory (nothing is ever written to disk), checks each after
// every change with the same rules and configuration as `datumlint check`,
// and answers hovers, navigation, completion, formatting and quick fixes
// from the same parse and part model.
//
// The protocol's types and method dispatch are glsp's (protocol_3_16), and
// the JSON-RPC 2.0 connection with its Content-Length framing is
// github.com/sourcegraph/jsonrpc2, the transport glsp itself uses. glsp's
// own server package is not used: it serves only the process's standard
// input and output (so a test could not drive it over a pipe) and gives no
// way to notify the client outside a request; the connection is set up
// here, in the few lines of glsp's server/handle.go, with every handler
// recovered.
package lsp

import (
	"context"
	"encoding/json"
	"fmt"
	"io"
	"log"
	"runtime/debug"
	"slices"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"github.com/sourcegraph/jsonrpc2"
	"github.com/tliron/glsp"
	protocol "github.com/tliron/glsp/protocol_3_16"
)

// Options configure a server.
type Options struct {
	// Version is reported to the client in serverInfo.
	Version string
	// Debounce is how long a document must rest after a change before it
	// is checked (0: DefaultDebounce). Changes that come while a check runs
	// are taken together by the next one.
	Debounce time.Duration
	// Stderr receives what the transport itself has to say (a message it
	// could not read); nil discards it. Standard output is the protocol's.
	Stderr io.Writer
}

// DefaultDebounce is short: a check of a 1,000-line file takes a few
// milliseconds, and diagnostics should follow a change within 50 ms.
const DefaultDebounce = 15 * time.Millisecond

// Serve speaks the protocol over in and out until the client sends exit or
// the input ends. It returns the process's exit code as the protocol
// defines it (LSP 3.17, "exit"): 0 when shutdown came before, else 1 (an
// input that ends after shutdown counts as exit).
func Serve(in io.Reader, out io.Writer, opt Options) int {
	s := newServer(opt)
	return s.serve(in, out)
}

// server is one connection's state.
type server struct {
	opt     Options
	handler protocol.Handler
	docs    *store

	conn        *jsonrpc2.Conn
	initialized atomic.Bool
	shutdown    atomic.Bool

	// What the client said it supports (set by initialize).
	mu           sync.Mutex
	markdown     bool
	hierarchical bool
}

func newServer(opt Options) *server {
	if opt.Debounce <= 0 {
		opt.Debounce = DefaultDebounce
	}
	s := &server{opt: opt, docs: newStore(), markdown: true, hierarchical: true}
	s.handler = protocol.Handler{
		Initialized:                     func(*glsp.Context, *protocol.InitializedParams) error { return nil },
		Shutdown:                        s.onShutdown,
		SetTrace:                        func(*glsp.Context, *protocol.SetTraceParams) error { return nil },
		CancelRequest:                   func(*glsp.Context, *protocol.CancelParams) error { return nil },
		WorkspaceDidChangeConfiguration: s.onConfigurationChange,
		WorkspaceDidChangeWatchedFiles:  s.onWatchedFiles,
		TextDocumentDidOpen:             s.didOpen,
		TextDocumentDidChange:           s.didChange,
		TextDocumentDidClose:            s.didClose,
		TextDocumentDidSave:             func(*glsp.Context, *protocol.DidSaveTextDocumentParams) error { return nil },
		TextDocumentWillSave:            func(*glsp.Context, *protocol.WillSaveTextDocumentParams) error { return nil },
		TextDocumentHover:               s.hover,
		TextDocumentDefinition:          s.definition,
		TextDocumentReferences:          s.references,
		TextDocumentDocumentSymbol:      s.documentSymbol,
		TextDocumentCompletion:          s.completion,
		TextDocumentFormatting:          s.formatting,
		TextDocumentCodeAction:          s.codeAction,
	}
	// glsp's handler refuses every request before initialize; this server
	// answers initialize itself (handle below) and tells it.
	s.handler.SetInitialized(true)
	return s
}

// rwc joins the two halves of the stream; closing it closes whichever of
// them can be closed.
type rwc struct {
	io.Reader
	io.Writer
}

func (c rwc) Close() error {
	if cl, ok := c.Reader.(io.Closer); ok {
		cl.Close()
	}
	if cl, ok := c.Writer.(io.Closer); ok {
		cl.Close()
	}
	return nil
}

func (s *server) serve(in io.Reader, out io.Writer) int {
	logw := s.opt.Stderr
	if logw == nil {
		logw = io.Discard
	}
	stream := jsonrpc2.NewBufferedStream(rwc{in, out}, jsonrpc2.VSCodeObjectCodec{})
	conn := jsonrpc2.NewConn(context.Background(), stream, jsonrpc2.HandlerWithError(s.handle),
		jsonrpc2.SetLogger(log.New(logw, "datumlint lsp: ", 0)))
	s.mu.Lock()
	s.conn = conn
	s.mu.Unlock()
	<-conn.DisconnectNotify()
	s.docs.closeAll()
	if s.shutdown.Load() {
		return 0
	}
	return 1
}

// handle is every message's way in: the lifecycle the protocol requires
// (nothing but initialize before it, nothing but exit after shutdown),
// then glsp's dispatch, with any panic recovered, logged and answered as
// an internal error so that the server goes on.
func (s *server) handle(ctx context.Context, conn *jsonrpc2.Conn, req *jsonrpc2.Request) (result any, err error) {
	defer func() {
		if v := recover(); v != nil {
			s.logf(protocol.MessageTypeError, "internal error while handling %s (please report it): %v\n%s", req.Method, v, debug.Stack())
			result, err = nil, &jsonrpc2.Error{Code: jsonrpc2.CodeInternalError, Message: fmt.Sprintf("internal error in datumlint: %v", v)}
		}
	}()
	var params json.RawMessage
	if req.Params != nil {
		params = *req.Params
	}
	switch {
	case req.Method == string(protocol.MethodExit):
		// glsp's server closes the connection on exit; so does this one.
		conn.Close()
		return nil, nil
	case s.shutdown.Load():
		return nil, &jsonrpc2.Error{Code: jsonrpc2.CodeInvalidRequest, Message: "the server is shutting down: only exit may follow shutdown"}
	case req.Method == string(protocol.MethodInitialize):
		return s.initialize(params)
	case !s.initialized.Load():
		// LSP 3.17: before initialize, requests fail with
		// ServerNotInitialized (-32002) and notifications are dropped.
		return nil, &jsonrpc2.Error{Code: -32002, Message: "the server is not initialized: send initialize first"}
	}
	gctx := &glsp.Context{
		Method: req.Method,
		Params: params,
		Notify: s.notify,
		Call:   func(string, any, any) {}, // the server asks the client nothing
	}
	r, validMethod, validParams, err := s.handler.Handle(gctx)
	switch {
	case !validMethod:
		if req.Notif && strings.HasPrefix(req.Method, "$/") {
			return nil, nil // optional notifications may be ignored (LSP 3.17, "$ Notifications")
		}
		return nil, &jsonrpc2.Error{Code: jsonrpc2.CodeMethodNotFound, Message: "method not supported: " + req.Method}
	case !validParams:
		msg := "invalid parameters for " + req.Method
		if err != nil {
			msg += ": " + err.Error()
		}
		if req.Notif {
			s.logf(protocol.MessageTypeWarning, "%s", msg)
		}
		return nil, &jsonrpc2.Error{Code: jsonrpc2.CodeInvalidParams, Message: msg}
	case err != nil:
		if req.Notif {
			s.logf(protocol.MessageTypeWarning, "%s: %v", req.Method, err)
		}
		return nil, &jsonrpc2.Error{Code: jsonrpc2.CodeInvalidRequest, Message: err.Error()}
	}
	return r, nil
}

// notify sends a notification; a closed connection is not an error worth
// reporting (the client has gone).
func (s *server) notify(method string, params any) {
	s.mu.Lock()
	conn := s.conn
	s.mu.Unlock()
	if conn == nil {
		return
	}
	if err := conn.Notify(context.Background(), method, params); err != nil && err != jsonrpc2.ErrClosed && s.opt.Stderr != nil {
		fmt.Fprintf(s.opt.Stderr, "datumlint lsp: %s: %v\n", method, err)
	}
}

// logf sends window/logMessage.
func (s *server) logf(typ protocol.MessageType, format string, args ...any) {
	s.notify(string(protocol.ServerWindowLogMessage), protocol.LogMessageParams{Type: typ, Message: fmt.Sprintf(format, args...)})
}

// safely runs f, logging a panic instead of ending the server; it is for
// work done outside a handler (the checks after a change).
func (s *server) safely(what string, f func()) (ok bool) {
	defer func() {
		if v := recover(); v != nil {
			s.logf(protocol.MessageTypeError, "internal error while %s (please report it): %v\n%s", what, v, debug.Stack())
			ok = false
		}
	}()
	f()
	return true
}

// clientCaps is the part of the client's capabilities the server reads,
// decoded on its own so that a client whose other capabilities glsp's
// types do not expect (a newer protocol) is still served.
type clientCaps struct {
	Capabilities struct {
		TextDocument struct {
			Hover struct {
				ContentFormat []string `json:"contentFormat"`
			} `json:"hover"`
			DocumentSymbol struct {
				Hierarchical *bool `json:"hierarchicalDocumentSymbolSupport"`
			} `json:"documentSymbol"`
		} `json:"textDocument"`
	} `json:"capabilities"`
}

func (s *server) initialize(params json.RawMessage) (any, error) {
	var caps clientCaps
	if len(params) > 0 {
		if err := json.Unmarshal(params, &caps); err != nil {
			s.logf(protocol.MessageTypeWarning, "initialize: the client's capabilities could not be read (%v); assuming the protocol's defaults", err)
		}
	}
	s.mu.Lock()
	hc := caps.Capabilities.TextDocument.Hover.ContentFormat
	s.markdown = len(hc) == 0 || slices.Contains(hc, string(protocol.MarkupKindMarkdown))
	h := caps.Capabilities.TextDocument.DocumentSymbol.Hierarchical
	s.hierarchical = h != nil && *h
	s.mu.Unlock()
	s.initialized.Store(true)

	yes := true
	incremental := protocol.TextDocumentSyncKindIncremental
	version := s.opt.Version
	return protocol.InitializeResult{
		Capabilities: protocol.ServerCapabilities{
			TextDocumentSync: protocol.TextDocumentSyncOptions{OpenClose: &yes, Change: &incremental, Save: false},
			HoverProvider:    true,
			CompletionProvider: &protocol.CompletionOptions{
				TriggerCharacters: []string{".", ":", ",", "("},
			},
			DefinitionProvider:         true,
			ReferencesProvider:         true,
			DocumentSymbolProvider:     true,
			DocumentFormattingProvider: true,
			CodeActionProvider: protocol.CodeActionOptions{
				CodeActionKinds: []protocol.CodeActionKind{protocol.CodeActionKindQuickFix},
			},
		},
		ServerInfo: &protocol.InitializeResultServerInfo{Name: "datumlint", Version: &version},
	}, nil
}

func (s *server) onShutdown(*glsp.Context) error {
	s.shutdown.Store(true)
	s.docs.closeAll()
	return nil
}

// A configuration may have changed: check every open document again.
func (s *server) onConfigurationChange(*glsp.Context, *protocol.DidChangeConfigurationParams) error {
	s.recheckAll()
	return nil
}

func (s *server) onWatchedFiles(*glsp.Context, *protocol.DidChangeWatchedFilesParams) error {
	s.recheckAll()
	return nil
}
