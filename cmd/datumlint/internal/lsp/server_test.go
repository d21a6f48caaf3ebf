package lsp

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf16"

	protocol "github.com/tliron/glsp/protocol_3_16"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/ruledoc"
)

// corpus is every .callouts file of the repository's test data.
func corpus(t testing.TB) []string {
	var out []string
	for _, g := range []string{"../../../../testdata/examples/*.callouts", "../../../../rules/testdata/*.callouts", "testdata/*.callouts", "testdata/*/*.callouts"} {
		m, err := filepath.Glob(g)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, m...)
	}
	if len(out) < 20 {
		t.Fatalf("only %d test files found", len(out))
	}
	return out
}

const plate = `part "Test plate TP-1"
units mm
standard asme-2018

feature base  plane normal -z at (0, 0, 0)
feature rear  plane normal -y at (0, 0, 0)
feature left  plane normal -x at (0, 0, 0)
feature bore  hole size 25 +0.05 -0 axis +z at (60, 40, 0)
feature bolts hole 4x size 8.4 +-0.1 axis +z at (15, 15, 0) (105, 15, 0) (15, 65, 0) (105, 65, 0)

datum A on base
datum B on rear
datum C on left

frame base: flatness 0.02
frame rear: perpendicularity 0.05 datums A
frame left: perpendicularity 0.05 datums A, B
frame bore: position dia 0.1 (M) datums A, B, C
frame bolts: position dia 0.4 (M) datums A, B, C
    composite dia 0.1 (M) datums A

basic 40 from rear to bore
basic 15 from left to bolts.1
basic 15 from rear to bolts.1
basic 90 from bolts.1 to bolts.2
basic 50 from bolts.1 to bolts.3
basic 90 from bolts.3 to bolts.4
`

// cleanPlate is the plate with every basic dimension it needs.
var cleanPlate = strings.Replace(plate, "basic 40 from rear to bore\n", "basic 40 from rear to bore\nbasic 60 from left to bore\n", 1)

// at returns the protocol position of the n-th occurrence (0-based) of
// what in text, plus off characters (ASCII text).
func at(t *testing.T, text, what string, n, off int) protocol.Position {
	t.Helper()
	lines := strings.Split(text, "\n")
	for i, l := range lines {
		for j := 0; ; {
			k := strings.Index(l[j:], what)
			if k < 0 {
				break
			}
			if n == 0 {
				return pos(i, j+k+off)
			}
			n--
			j += k + 1
		}
	}
	t.Fatalf("%q not found", what)
	return protocol.Position{}
}

func TestLifecycle(t *testing.T) {
	c := startServer(t, nil)
	var res any
	// Before initialize a request is refused as the protocol says.
	err := c.call("textDocument/hover", map[string]any{"textDocument": map[string]any{"uri": "file:///x.callouts"}, "position": pos(0, 0)}, &res)
	if rpcCode(err) != -32002 {
		t.Errorf("hover before initialize: %v, want ServerNotInitialized (-32002)", err)
	}
	var init struct {
		Capabilities struct {
			TextDocumentSync struct {
				OpenClose bool `json:"openClose"`
				Change    int  `json:"change"`
			} `json:"textDocumentSync"`
			HoverProvider              bool      `json:"hoverProvider"`
			DefinitionProvider         bool      `json:"definitionProvider"`
			ReferencesProvider         bool      `json:"referencesProvider"`
			DocumentSymbolProvider     bool      `json:"documentSymbolProvider"`
			DocumentFormattingProvider bool      `json:"documentFormattingProvider"`
			CompletionProvider         *struct{} `json:"completionProvider"`
			CodeActionProvider         struct {
				CodeActionKinds []string `json:"codeActionKinds"`
			} `json:"codeActionProvider"`
		} `json:"capabilities"`
		ServerInfo struct {
			Name string `json:"name"`
		} `json:"serverInfo"`
	}
	c.must("initialize", map[string]any{"processId": 1, "rootUri": nil, "capabilities": map[string]any{}}, &init)
	caps := init.Capabilities
	if !caps.TextDocumentSync.OpenClose || caps.TextDocumentSync.Change != 2 || !caps.HoverProvider || !caps.DefinitionProvider ||
		!caps.ReferencesProvider || !caps.DocumentSymbolProvider || !caps.DocumentFormattingProvider || caps.CompletionProvider == nil ||
		len(caps.CodeActionProvider.CodeActionKinds) != 1 || init.ServerInfo.Name != "datumlint" {
		t.Errorf("capabilities: %+v", init)
	}
	c.notify("initialized", map[string]any{})
	c.must("shutdown", nil, nil)
	// After shutdown only exit is accepted.
	if err := c.call("textDocument/hover", map[string]any{"textDocument": map[string]any{"uri": "file:///x.callouts"}, "position": pos(0, 0)}, &res); rpcCode(err) != -32600 {
		t.Errorf("hover after shutdown: %v, want InvalidRequest", err)
	}
	c.notify("exit", nil)
	if code := c.exitCode(); code != 0 {
		t.Errorf("exit code after shutdown and exit = %d, want 0", code)
	}
}

func TestExitWithoutShutdown(t *testing.T) {
	c := startServer(t, nil)
	c.initialize()
	c.notify("exit", nil)
	if code := c.exitCode(); code != 1 {
		t.Errorf("exit without shutdown = %d, want 1 (LSP 3.17, exit)", code)
	}
	c = startServer(t, nil)
	c.initialize()
	c.conn.Close() // the input ends
	if code := c.exitCode(); code != 1 {
		t.Errorf("end of input = %d, want 1", code)
	}
}

// utf16Col converts a 1-based character column of a line into the
// protocol's UTF-16 offset, independently of grammar/source.
func utf16Col(line string, col int) int {
	rs := []rune(line)
	if col-1 <= len(rs) {
		return len(utf16.Encode(rs[:col-1]))
	}
	return len(utf16.Encode(rs)) + col - 1 - len(rs)
}

type checkFinding struct {
	File      string `json:"file"`
	Line      int    `json:"line"`
	Column    int    `json:"column"`
	EndLine   int    `json:"end_line"`
	EndColumn int    `json:"end_column"`
	Rule      string `json:"rule"`
	Severity  string `json:"severity"`
	Message   string `json:"message"`
}

// TestDiagnosticsAsCheck opens every test file and compares what the
// server publishes with what `datumlint check --format json` prints for
// the file on disk, with the configuration found above it: the same
// findings in the same order, ranges converted to UTF-16, code, link,
// severity and source.
func TestDiagnosticsAsCheck(t *testing.T) {
	bin := datumlintBinary(t)
	c := startServer(t, nil)
	c.initialize()
	sev := map[string]int{"error": 1, "warning": 2, "info": 3}
	total := 0
	tmp := t.TempDir()
	var paths []string
	for i, path := range corpus(t) {
		// Each file as it is, and with CR LF line ends and a byte-order mark.
		src, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		crlf := filepath.Join(tmp, fmt.Sprintf("%d-%s", i, filepath.Base(path)))
		os.WriteFile(crlf, []byte("\ufeff"+strings.ReplaceAll(string(src), "\n", "\r\n")), 0o644)
		paths = append(paths, path, crlf)
	}
	for _, path := range paths {
		src, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		out, _ := runCommand(bin, "check", "--format", "json", path)
		var want []checkFinding
		if err := json.Unmarshal(out, &want); err != nil {
			t.Fatalf("%s: check --format json: %v\n%s", path, err, out)
		}
		uri := fileURI(path)
		c.open(uri, string(src))
		got := c.waitPublish(uri, 1).Diagnostics
		text := strings.ReplaceAll(string(src), "\r\n", "\n")
		bom := 0
		if strings.HasPrefix(text, "\ufeff") {
			// check's columns count after the mark; the editor's text holds it.
			text, bom = strings.TrimPrefix(text, "\ufeff"), 1
		}
		lines := strings.Split(text, "\n")
		if len(got) != len(want) {
			t.Errorf("%s: %d diagnostics, check has %d", path, len(got), len(want))
			continue
		}
		for i, w := range want {
			g := got[i]
			total++
			wr := rng(w.Line-1, utf16Col(lines[w.Line-1], w.Column), w.EndLine-1, utf16Col(lines[min(w.EndLine, len(lines))-1], w.EndColumn))
			if w.Line == 1 {
				wr.Start.Character += protocol.UInteger(bom)
			}
			if w.EndLine == 1 {
				wr.End.Character += protocol.UInteger(bom)
			}
			if g.Range != wr || g.Code != w.Rule || g.Message != w.Message || g.Severity != sev[w.Severity] || g.Source != "datumlint" {
				t.Errorf("%s: diagnostic %d = %+v\nwant %s %v %s %s", path, i, g, w.Rule, wr, w.Severity, w.Message)
			}
			if g.CodeDescription == nil || g.CodeDescription.Href != ruledoc.URL(w.Rule) {
				t.Errorf("%s: diagnostic %d links %+v, want %s", path, i, g.CodeDescription, ruledoc.URL(w.Rule))
			}
		}
	}
	if total < 200 {
		t.Errorf("only %d findings compared", total)
	}
	if code := c.shutdownExit(); code != 0 {
		t.Errorf("exit code %d", code)
	}
}

// TestConfiguration: the folder's .datumlint.toml applies as in check
// (one rule off, one raised to error).
func TestConfiguration(t *testing.T) {
	c := startServer(t, nil)
	c.initialize()
	path := filepath.Join("testdata", "config", "part.callouts")
	src, _ := os.ReadFile(path)
	uri := fileURI(path)
	c.open(uri, string(src))
	got := c.waitPublish(uri, 1).Diagnostics
	var rules []string
	for _, d := range got {
		rules = append(rules, fmt.Sprintf("%v:%d", d.Code, d.Severity))
		if d.Code == "datum-unused" {
			t.Errorf("datum-unused is off in the configuration: %+v", d)
		}
	}
	if strings.Join(rules, " ") != "frame-underconstrained:1" {
		t.Errorf("findings %v, want frame-underconstrained as an error", rules)
	}
	// The same text under a URI with no folder gets the default severities.
	c.open("untitled:part", string(src))
	var def []string
	for _, d := range c.waitPublish("untitled:part", 1).Diagnostics {
		def = append(def, fmt.Sprintf("%v:%d", d.Code, d.Severity))
	}
	if !strings.Contains(strings.Join(def, " "), "datum-unused:2") || !strings.Contains(strings.Join(def, " "), "frame-underconstrained:2") {
		t.Errorf("without configuration: %v", def)
	}
}

// TestEditBreaksAndUndo edits line 1 so that it no longer parses, then
// undoes the edit: a syntax finding appears on line 1 and goes again.
func TestEditBreaksAndUndo(t *testing.T) {
	c := startServer(t, nil)
	c.initialize()
	uri := "file:///tmp/datumlint-lsp-test/plate.callouts"
	text := cleanPlate
	c.open(uri, text)
	if d := c.waitPublish(uri, 1).Diagnostics; len(d) != 0 {
		t.Fatalf("the plate is clean, got %+v", d)
	}
	v := c.change(uri, rng(0, 0, 0, 4), "prat")
	d := c.waitPublish(uri, v).Diagnostics
	if len(d) == 0 || d[0].Code != "syntax" || d[0].Range.Start.Line != 0 {
		t.Fatalf("after breaking line 1: %+v", d)
	}
	v = c.change(uri, rng(0, 0, 0, 4), "part")
	if d := c.waitPublish(uri, v).Diagnostics; len(d) != 0 {
		t.Fatalf("after undoing: %+v", d)
	}
	// Several changes in one notification apply in order; a multi-line
	// insertion and a deletion across lines.
	c.mu.Lock()
	c.version[uri]++
	v = c.version[uri]
	c.mu.Unlock()
	c.notify("textDocument/didChange", map[string]any{
		"textDocument": map[string]any{"uri": uri, "version": v},
		"contentChanges": []any{
			map[string]any{"range": rng(1, 0, 1, 0), "text": "# one\n# two\n"},
			map[string]any{"range": rng(1, 0, 3, 0), "text": ""},
			map[string]any{"range": rng(1, 6, 1, 8), "text": "in"},
		},
	})
	c.waitPublish(uri, v)
	sn := c.snapshotOf(t, uri)
	if !strings.HasPrefix(string(sn.text), "part \"Test plate TP-1\"\nunits in\nstandard") {
		t.Errorf("after three changes the text starts %q", string(sn.text[:60]))
	}
}

// snapshotOf reads the server's current text of a document (through the
// same path as a hover).
func (c *client) snapshotOf(t *testing.T, uri string) *snapshot {
	t.Helper()
	sn := c.srv.current(uri)
	if sn == nil {
		t.Fatalf("%s is not open", uri)
	}
	return sn
}

// TestNewestVersionWins sends a burst of changes; every publication is of
// a version no older than the one before, each one's findings are those of
// its own text, and the last is of the last version.
func TestNewestVersionWins(t *testing.T) {
	c := startServer(t, newServer(Options{Debounce: 1}))
	c.initialize()
	uri := "file:///tmp/datumlint-lsp-test/burst.callouts"
	c.open(uri, cleanPlate)
	c.waitPublish(uri, 1)
	var v int
	c0 := at(t, cleanPlate, "datums A, B, C", 0, 13)
	letter := rng(int(c0.Line), int(c0.Character), int(c0.Line), int(c0.Character)+1)
	for i := 0; i < 40; i++ {
		// Toggle the reference to C into one to the undefined D and back.
		if i%2 == 0 {
			v = c.change(uri, letter, "D")
		} else {
			v = c.change(uri, letter, "C")
		}
	}
	last := c.waitPublish(uri, v)
	if len(last.Diagnostics) != 0 {
		t.Errorf("the last version is clean but has %+v", last.Diagnostics)
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	prev := 0
	for _, p := range c.publishes {
		if p.URI != uri {
			continue
		}
		if *p.Version < prev {
			t.Errorf("version %d published after %d", *p.Version, prev)
		}
		prev = *p.Version
		// Even versions carry the undefined datum D.
		undefined := len(p.Diagnostics) == 1 && p.Diagnostics[0].Code == "datum-undefined"
		if (*p.Version%2 == 0) != undefined {
			t.Errorf("version %d published %+v", *p.Version, p.Diagnostics)
		}
	}
}

func hoverText(t *testing.T, c *client, uri string, p protocol.Position) string {
	t.Helper()
	var h *struct {
		Contents struct {
			Kind  string `json:"kind"`
			Value string `json:"value"`
		} `json:"contents"`
		Range *protocol.Range `json:"range"`
	}
	c.must("textDocument/hover", map[string]any{"textDocument": map[string]any{"uri": uri}, "position": p}, &h)
	if h == nil {
		return ""
	}
	return h.Contents.Value
}

func TestHover(t *testing.T) {
	c := startServer(t, nil)
	c.initialize()
	uri := "file:///tmp/datumlint-lsp-test/hover.callouts"
	c.open(uri, plate)
	c.waitPublish(uri, 1)

	// On a finding: basic-missing on bore's frame.
	h := hoverText(t, c, uri, at(t, plate, "frame bore: position", 0, 13))
	for _, want := range []string{"**basic-missing** (error)", "left", "Position and located profile", "Source: ASME Y14.5-2018", ruledoc.URL("basic-missing")} {
		if !strings.Contains(h, want) {
			t.Errorf("hover on the finding lacks %q:\n%s", want, h)
		}
	}
	// On a feature name: kind, limits, MMC/LMC and the frames' freedoms.
	h = hoverText(t, c, uri, at(t, plate, "feature bore", 0, 9))
	for _, want := range []string{"**bore**: hole", "feature of size", "from 25 to 25.05 mm", "MMC 25 mm, LMC 25.05 mm", "line 18", "A removes 3", "B removes 2", "C removes 1", "0 free (none)"} {
		if !strings.Contains(h, want) {
			t.Errorf("hover on bore lacks %q:\n%s", want, h)
		}
	}
	h = hoverText(t, c, uri, at(t, plate, "bolts.2", 0, 6))
	for _, want := range []string{"**bolts.2**: member 2 of 4", "(105, 15, 0)", "hole 4x", "MMC 8.3 mm, LMC 8.5 mm", "line 20", "composite"} {
		if !strings.Contains(h, want) {
			t.Errorf("hover on bolts.2 lacks %q:\n%s", want, h)
		}
	}
	// On a datum letter: its feature and the frames that use it.
	h = hoverText(t, c, uri, at(t, plate, "datums A, B, C", 1, 10))
	for _, want := range []string{"**datum B** on rear (plane)", "line 17", "line 18 `frame bore: position dia 0.1 (M) datums A, B, C` (secondary)", "line 19"} {
		if !strings.Contains(h, want) {
			t.Errorf("hover on B lacks %q:\n%s", want, h)
		}
	}
	if h := hoverText(t, c, uri, at(t, plate, "units", 0, 1)); h != "" {
		t.Errorf("hover on a keyword: %q", h)
	}
	// A document that is not open.
	if h := hoverText(t, c, "file:///not/open.callouts", pos(0, 0)); h != "" {
		t.Errorf("hover on a closed document: %q", h)
	}
}

func TestDefinitionAndReferences(t *testing.T) {
	c := startServer(t, nil)
	c.initialize()
	uri := "file:///tmp/datumlint-lsp-test/nav.callouts"
	c.open(uri, plate)
	c.waitPublish(uri, 1)
	def := func(p protocol.Position) *protocol.Location {
		var loc *protocol.Location
		c.must("textDocument/definition", map[string]any{"textDocument": map[string]any{"uri": uri}, "position": p}, &loc)
		return loc
	}
	// From a frame's target to the feature.
	if loc := def(at(t, plate, "frame bore:", 0, 7)); loc == nil || loc.Range != rng(7, 8, 7, 12) {
		t.Errorf("definition of bore: %+v", loc)
	}
	// The end of the name counts too (the cursor after a typed word).
	if loc := def(at(t, plate, "frame bore:", 0, 10)); loc == nil || loc.Range != rng(7, 8, 7, 12) {
		t.Errorf("definition at the end of bore: %+v", loc)
	}
	// A pattern member: its point.
	if loc := def(at(t, plate, "to bolts.2", 0, 9)); loc == nil || loc.Range != (protocol.Range{Start: at(t, plate, "(105, 15, 0)", 0, 0), End: at(t, plate, "(105, 15, 0)", 0, 12)}) {
		t.Errorf("definition of bolts.2: %+v", loc)
	}
	// A datum letter in a frame: the datum feature symbol.
	if loc := def(at(t, plate, "datums A, B, C", 0, 13)); loc == nil || loc.Range != rng(12, 6, 12, 7) {
		t.Errorf("definition of C: %+v", loc)
	}
	if loc := def(pos(2, 3)); loc != nil {
		t.Errorf("definition on a keyword: %+v", loc)
	}
	refs := func(p protocol.Position, decl bool) []protocol.Range {
		var locs []protocol.Location
		c.must("textDocument/references", map[string]any{"textDocument": map[string]any{"uri": uri}, "position": p, "context": map[string]any{"includeDeclaration": decl}}, &locs)
		var out []protocol.Range
		for _, l := range locs {
			out = append(out, l.Range)
		}
		return out
	}
	// A: five frame segments (the composite one too) and its declaration.
	if r := refs(at(t, plate, "datum A", 0, 6), true); len(r) != 6 || r[0] != rng(10, 6, 10, 7) || r[5] != rng(19, 33, 19, 34) {
		t.Errorf("references of A with its declaration: %v", r)
	}
	if r := refs(at(t, plate, "datum A", 0, 6), false); len(r) != 5 {
		t.Errorf("references of A: %v", r)
	}
	// bolts: the frame, and eight names of members in five dimensions.
	if r := refs(at(t, plate, "feature bolts", 0, 9), false); len(r) != 9 {
		t.Errorf("references of bolts: %v", r)
	}
	if r := refs(at(t, plate, "bolts.3", 0, 1), false); len(r) != 2 {
		t.Errorf("references of bolts.3: %v", r)
	}
}

func TestDocumentSymbol(t *testing.T) {
	c := startServer(t, nil)
	c.initialize()
	uri := "file:///tmp/datumlint-lsp-test/outline.callouts"
	c.open(uri, plate)
	var syms []struct {
		Name     string         `json:"name"`
		Kind     int            `json:"kind"`
		Range    protocol.Range `json:"range"`
		Children []struct {
			Name string `json:"name"`
		} `json:"children"`
	}
	c.must("textDocument/documentSymbol", map[string]any{"textDocument": map[string]any{"uri": uri}}, &syms)
	var names []string
	for _, s := range syms {
		n := s.Name
		if len(s.Children) > 0 {
			n += fmt.Sprintf("(%d)", len(s.Children))
		}
		names = append(names, n)
	}
	want := "base rear left bore bolts(4) datum A datum B datum C frame base: flatness frame rear: perpendicularity frame left: perpendicularity frame bore: position frame bolts: position(1)"
	if got := strings.Join(names, " "); got != want {
		t.Errorf("outline:\n%s\nwant\n%s", got, want)
	}
}

func completionLabels(t *testing.T, c *client, uri string, p protocol.Position) []string {
	t.Helper()
	var list struct {
		Items []struct {
			Label    string            `json:"label"`
			TextEdit protocol.TextEdit `json:"textEdit"`
		} `json:"items"`
	}
	c.must("textDocument/completion", map[string]any{"textDocument": map[string]any{"uri": uri}, "position": p}, &list)
	var out []string
	for _, it := range list.Items {
		out = append(out, it.Label)
	}
	return out
}

// TestCompletionOfExtensions: the notation's extensions are offered where
// the grammar takes them.
func TestCompletionOfExtensions(t *testing.T) {
	c := startServer(t, nil)
	c.initialize()
	uri := "file:///tmp/datumlint-lsp-test/extensions.callouts"
	lines := []string{"feature tap hole ", "feature rim circle ", "basis ", "target A1 ", "target A1 line on ",
		"target A1 line on base ", "target A1 point on base at (1, 2, 3) ", "ref size 10 ", "frame bore: position dia 0.2 datums A "}
	text := plate + strings.Join(lines, "\n") + "\n"
	c.open(uri, text)
	first := strings.Count(plate, "\n")
	for i, want := range []string{"size thread cbore csink axis", "size axis", "drawing model", "point line area",
		"base rear left bore bolts bolts.1 bolts.2 bolts.3 bolts.4 tap", "from", "normal", "of",
		"(M) (L) all-around all-over between separate major-dia minor-dia"} {
		at := pos(first+i, len(lines[i]))
		if got := strings.Join(completionLabels(t, c, uri, at), " "); got != want {
			t.Errorf("completion after %q:\n got %s\nwant %s", lines[i], got, want)
		}
	}
}

func TestCompletion(t *testing.T) {
	c := startServer(t, nil)
	c.initialize()
	uri := "file:///tmp/datumlint-lsp-test/complete.callouts"
	text := plate + "frame \nframe bore: \nframe bore: position dia 0.2 \nframe bore: position dia 0.2 datums A, \n" +
		"feature web \nfeature web tab \nfeature web tab size 5 +-0.1 normal \nbasic 60 from left to bore along \ndatum D \ndatum D on bore placed \nunits \nstandard \n\ncomposite \nbasic dia 80 through \n"
	c.open(uri, text)
	line := func(prefix string) protocol.Position {
		lines := strings.Split(text, "\n")
		for i, l := range lines {
			if l == prefix {
				return pos(i, len(l))
			}
		}
		t.Fatalf("no line %q", prefix)
		return protocol.Position{}
	}
	cases := []struct {
		at   protocol.Position
		want string // labels, joined
	}{
		{line(""), "part units standard basis feature target datum frame basic dim ref composite"},
		{line("frame "), "base rear left bore bolts bolts.1 bolts.2 bolts.3 bolts.4 web"},
		{line("frame bore: "), strings.Join(grammar.CharacteristicWords, " ")},
		{line("frame bore: position dia 0.2 "), "(M) (L) (F) (T) (P) (U) along datums"},
		{line("frame bore: position dia 0.2 datums A, "), "B C"},
		{line("feature web "), "plane slot tab hole pin socket ball cone extrusion surface point line circle"},
		{line("feature web tab "), "size normal between"},
		{line("feature web tab size 5 +-0.1 normal "), "+x -x +y -y +z -z"},
		{line("basic 60 from left to bore along "), "+x -x +y -y +z -z"},
		{line("datum D "), "on"},
		{line("datum D on bore placed "), "on-surface on-extension-line on-dimension-line on-frame"},
		{line("units "), "mm in"},
		{line("standard "), "asme-2018 asme-2009 iso"},
		{line("composite "), "dia sdia"},
		{line("basic dia 80 through "), "bolts"},
		{at(t, text, "basic 90 from bolts.1", 0, 14), "base rear left bore bolts bolts.1 bolts.2 bolts.3 bolts.4 web"},
		{at(t, text, "frame base:", 0, 8), "base rear left bore bolts bolts.1 bolts.2 bolts.3 bolts.4 web"},
	}
	for _, k := range cases {
		if got := strings.Join(completionLabels(t, c, uri, k.at), " "); got != k.want {
			t.Errorf("completion at %v:\n got %s\nwant %s", k.at, got, k.want)
		}
	}
	// The edit replaces the typed part of the word.
	var list struct {
		Items []struct {
			Label    string            `json:"label"`
			TextEdit protocol.TextEdit `json:"textEdit"`
		} `json:"items"`
	}
	p := at(t, text, "frame bolts:", 0, 9)
	c.must("textDocument/completion", map[string]any{"textDocument": map[string]any{"uri": uri}, "position": p}, &list)
	if len(list.Items) == 0 || list.Items[0].TextEdit.Range != (protocol.Range{Start: pos(int(p.Line), 6), End: p}) {
		t.Errorf("completion edit: %+v", list.Items)
	}
}

// applyTextEdits applies edits to a text as an editor does (UTF-16
// positions; the edits do not overlap).
func applyTextEdits(t *testing.T, text string, edits []protocol.TextEdit) string {
	t.Helper()
	offset := func(p protocol.Position) int {
		lines := strings.SplitAfter(text, "\n")
		off := 0
		for i := 0; i < int(p.Line) && i < len(lines); i++ {
			off += len(lines[i])
		}
		if int(p.Line) >= len(lines) {
			return len(text)
		}
		l := strings.TrimRight(lines[p.Line], "\r\n")
		u := utf16.Encode([]rune(l))
		n := min(int(p.Character), len(u))
		return off + len(string(utf16.Decode(u[:n])))
	}
	// Apply from the last edit to the first; inserts at one place keep
	// their order.
	for i := len(edits) - 1; i >= 0; i-- {
		e := edits[i]
		from, to := offset(e.Range.Start), offset(e.Range.End)
		text = text[:from] + e.NewText + text[to:]
	}
	return text
}

// TestFormatting: applying the edits gives exactly what `datumlint fmt`
// prints, for every test file; a file that does not parse gets no edit.
func TestFormatting(t *testing.T) {
	bin := datumlintBinary(t)
	c := startServer(t, nil)
	c.initialize()
	formatted, refused := 0, 0
	for _, path := range corpus(t) {
		src, _ := os.ReadFile(path)
		for _, variant := range []string{"", "unformatted"} {
			text := string(src)
			if variant != "" {
				// Spoil the layout: extra spaces, and a blank-line run.
				text = strings.ReplaceAll(strings.ReplaceAll(text, " ", "  "), "\n\n", "\n\n\n")
			}
			tmp := filepath.Join(t.TempDir(), "f.callouts")
			os.WriteFile(tmp, []byte(text), 0o644)
			want, err := runCommand(bin, "fmt", tmp)
			uri := fileURI(path) + "#" + variant
			c.open(uri, text)
			var edits []protocol.TextEdit
			c.must("textDocument/formatting", map[string]any{"textDocument": map[string]any{"uri": uri}, "options": map[string]any{"tabSize": 4, "insertSpaces": true}}, &edits)
			if err != nil {
				refused++
				if len(edits) != 0 {
					t.Errorf("%s %s does not parse but got edits %+v", path, variant, edits)
				}
				continue
			}
			formatted++
			if got := applyTextEdits(t, text, edits); got != string(want) {
				t.Errorf("%s %s: formatting gives\n%s\nfmt gives\n%s", path, variant, got, want)
			}
		}
	}
	if formatted < 20 || refused < 2 {
		t.Errorf("formatted %d, refused %d", formatted, refused)
	}
}

// TestCodeActionBasicMissing: the quick fix for basic-missing inserts the
// basic dimension, and the finding is gone after it.
func TestCodeActionBasicMissing(t *testing.T) {
	c := startServer(t, nil)
	c.initialize()
	uri := "file:///tmp/datumlint-lsp-test/fix.callouts"
	c.open(uri, plate)
	diags := c.waitPublish(uri, 1).Diagnostics
	if len(diags) != 1 || diags[0].Code != "basic-missing" {
		t.Fatalf("want one basic-missing finding, got %+v", diags)
	}
	var actions []struct {
		Title       string     `json:"title"`
		Kind        string     `json:"kind"`
		IsPreferred bool       `json:"isPreferred"`
		Diagnostics []wireDiag `json:"diagnostics"`
		Edit        struct {
			Changes map[string][]protocol.TextEdit `json:"changes"`
		} `json:"edit"`
	}
	// The client sends the diagnostics it shows, as it received them.
	c.must("textDocument/codeAction", map[string]any{"textDocument": map[string]any{"uri": uri}, "range": diags[0].Range,
		"context": map[string]any{"diagnostics": diags}}, &actions)
	if len(actions) != 1 || actions[0].Kind != "quickfix" || !actions[0].IsPreferred || actions[0].Title != "Insert `basic 60 from left to bore`" ||
		len(actions[0].Diagnostics) != 1 || actions[0].Diagnostics[0].Code != "basic-missing" {
		t.Fatalf("code actions: %+v", actions)
	}
	edits := actions[0].Edit.Changes[uri]
	fixed := applyTextEdits(t, plate, edits)
	if !strings.Contains(fixed, "basic 40 from rear to bore\nbasic 60 from left to bore\n") {
		t.Errorf("the fix inserted:\n%s", fixed)
	}
	// The editor applies the edit; the finding goes.
	v := 1
	for i := len(edits) - 1; i >= 0; i-- {
		v = c.change(uri, edits[i].Range, edits[i].NewText)
	}
	if d := c.waitPublish(uri, v).Diagnostics; len(d) != 0 {
		t.Errorf("after the fix: %+v", d)
	}
	// Asking for other kinds gives nothing; a range without findings too.
	c.must("textDocument/codeAction", map[string]any{"textDocument": map[string]any{"uri": uri}, "range": diags[0].Range,
		"context": map[string]any{"diagnostics": []any{}, "only": []string{"refactor"}}}, &actions)
	if len(actions) != 0 {
		t.Errorf("refactor actions: %+v", actions)
	}
}

// TestBrokenConfiguration: a .datumlint.toml that does not load is shown
// on the document (check reports the file as not checked, exit 2).
func TestBrokenConfiguration(t *testing.T) {
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, ".datumlint.toml"), []byte("[rules]\nno-such-rule = \"off\"\n"), 0o644)
	c := startServer(t, nil)
	c.initialize()
	uri := fileURI(filepath.Join(dir, "part.callouts"))
	c.open(uri, plate)
	d := c.waitPublish(uri, 1).Diagnostics
	if len(d) != 1 || !strings.Contains(d[0].Message, "not checked: the configuration does not load") || !strings.Contains(d[0].Message, "no-such-rule") || d[0].Severity != 1 {
		t.Errorf("with a broken configuration: %+v", d)
	}
}

// TestRelatedInformation: a finding's related places go out as
// relatedInformation, in the document's UTF-16 positions.
func TestRelatedInformation(t *testing.T) {
	text := []byte("part \"𝜙\"\nunits mm\n")
	sn := &snapshot{uri: "file:///r.callouts", text: text, pos: newPositions(text)}
	d := sn.lspDiagnostic(rules.Diagnostic{Rule: "header-duplicate", Severity: rules.Warning, Message: "twice",
		Span:    source.Span{Start: source.Pos{Line: 2, Col: 1}, End: source.Pos{Line: 2, Col: 6}},
		Related: []rules.Related{{Span: source.Span{Start: source.Pos{Line: 1, Col: 8}, End: source.Pos{Line: 1, Col: 9}}, Message: "first here"}}})
	if len(d.RelatedInformation) != 1 || d.RelatedInformation[0].Message != "first here" || d.RelatedInformation[0].Location.URI != sn.uri ||
		d.RelatedInformation[0].Location.Range != rng(0, 8, 0, 9) || *d.Severity != protocol.DiagnosticSeverityWarning {
		t.Errorf("%+v", d)
	}
}
