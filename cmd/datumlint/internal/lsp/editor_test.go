package lsp

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"
)

// These tests run the real command: `datumlint check` and `datumlint fmt`
// to compare against, and `datumlint lsp` under a real editor.

var (
	buildOnce sync.Once
	buildDir  string
	binPath   string
	buildErr  error
)

func TestMain(m *testing.M) {
	code := m.Run()
	if buildDir != "" {
		os.RemoveAll(buildDir)
	}
	os.Exit(code)
}

// datumlintBinary builds cmd/datumlint once per test run.
func datumlintBinary(t *testing.T) string {
	t.Helper()
	goTool, err := exec.LookPath("go")
	if err != nil {
		t.Skip("no go command to build datumlint with")
	}
	buildOnce.Do(func() {
		buildDir, buildErr = os.MkdirTemp("", "datumlint-lsp-test-")
		if buildErr != nil {
			return
		}
		binPath = filepath.Join(buildDir, "datumlint")
		out, err := exec.Command(goTool, "build", "-o", binPath, "github.com/datumlint/datumlint/cmd/datumlint").CombinedOutput()
		if err != nil {
			buildErr = &buildError{err, out}
		}
	})
	if buildErr != nil {
		t.Fatalf("building datumlint: %v", buildErr)
	}
	return binPath
}

type buildError struct {
	err error
	out []byte
}

func (e *buildError) Error() string { return e.err.Error() + "\n" + string(e.out) }

// runCommand runs the command and returns its standard output; err is set
// for a non-zero exit.
func runCommand(bin string, args ...string) ([]byte, error) {
	var out bytes.Buffer
	cmd := exec.Command(bin, args...)
	cmd.Stdout = &out
	err := cmd.Run()
	return out.Bytes(), err
}

// nvimScript starts `datumlint lsp` with Neovim's built-in client
// (vim.lsp.start where the version has it, start_client before 0.8), waits
// for the diagnostics of the buffer, asks for a hover on the first one,
// stops the client (shutdown, exit) and writes what it saw as JSON.
const nvimScript = `
local bin, file, out = os.getenv("DATUMLINT_BIN"), os.getenv("DATUMLINT_FILE"), os.getenv("DATUMLINT_OUT")
vim.cmd("edit " .. vim.fn.fnameescape(file))
local buf = vim.api.nvim_get_current_buf()
local exit_code
local config = {
  name = "datumlint",
  cmd = { bin, "lsp" },
  root_dir = vim.fn.fnamemodify(file, ":h"),
  on_exit = function(code) exit_code = code end,
}
local id
if vim.lsp.start then
  id = vim.lsp.start(config)
else
  id = vim.lsp.start_client(config)
  vim.lsp.buf_attach_client(buf, id)
end
local seen = vim.wait(20000, function() return #vim.diagnostic.get(buf) > 0 end, 20)
local result = { seen = seen, diagnostics = {} }
for _, d in ipairs(vim.diagnostic.get(buf)) do
  local lsp = (d.user_data or {}).lsp or {}
  table.insert(result.diagnostics, {
    lnum = d.lnum, col = d.col, end_lnum = d.end_lnum, end_col = d.end_col,
    severity = d.severity, message = d.message, source = d.source, code = d.code or lsp.code,
  })
end
local client = vim.lsp.get_client_by_id(id)
if #result.diagnostics > 0 then
  local d = result.diagnostics[1]
  local resp = client.request_sync("textDocument/hover",
    { textDocument = { uri = vim.uri_from_bufnr(buf) }, position = { line = d.lnum, character = d.col } }, 10000, buf)
  if resp and resp.result and resp.result.contents then
    result.hover = resp.result.contents.value
  end
end
client.stop()
vim.wait(20000, function() return exit_code ~= nil end, 20)
result.exit_code = exit_code
local f = io.open(out, "w")
f:write(vim.fn.json_encode(result))
f:close()
vim.cmd("qall!")
`

// TestNeovim opens a file with a known mistake in headless Neovim and
// reads the diagnostics back from the editor.
func TestNeovim(t *testing.T) {
	nvim, err := exec.LookPath("nvim")
	if err != nil {
		t.Skip("nvim is not installed (Debian: apt-get install neovim)")
	}
	if testing.Short() {
		t.Skip("starts an editor")
	}
	bin := datumlintBinary(t)
	dir := t.TempDir()
	file := filepath.Join(dir, "bracket.callouts")
	text := strings.Replace(plate, "datums A, B, C\n    composite", "datums A, B, E\n    composite", 1)
	if err := os.WriteFile(file, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	script := filepath.Join(dir, "test.lua")
	os.WriteFile(script, []byte(nvimScript), 0o644)
	out := filepath.Join(dir, "out.json")

	cmd := exec.Command(nvim, "--headless", "-u", "NONE", "-i", "NONE", "-n", "--noplugin", "-c", "luafile "+script)
	cmd.Env = append(os.Environ(), "DATUMLINT_BIN="+bin, "DATUMLINT_FILE="+file, "DATUMLINT_OUT="+out, "HOME="+dir, "XDG_STATE_HOME="+dir, "XDG_CACHE_HOME="+dir)
	cmd.Dir = dir
	done := make(chan error, 1)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	go func() { done <- cmd.Wait() }()
	select {
	case err := <-done:
		if err != nil {
			t.Fatalf("nvim: %v\n%s", err, stderr.Bytes())
		}
	case <-time.After(90 * time.Second):
		cmd.Process.Kill()
		t.Fatalf("nvim did not finish\n%s", stderr.Bytes())
	}
	raw, err := os.ReadFile(out)
	if err != nil {
		t.Fatalf("nvim wrote no result: %v\n%s", err, stderr.Bytes())
	}
	var res struct {
		Seen        bool `json:"seen"`
		Diagnostics []struct {
			Lnum     int    `json:"lnum"`
			Col      int    `json:"col"`
			EndCol   int    `json:"end_col"`
			Severity int    `json:"severity"`
			Message  string `json:"message"`
			Source   string `json:"source"`
			Code     string `json:"code"`
		} `json:"diagnostics"`
		Hover    string `json:"hover"`
		ExitCode *int   `json:"exit_code"`
	}
	if err := json.Unmarshal(raw, &res); err != nil {
		t.Fatalf("%v: %s", err, raw)
	}
	t.Logf("Neovim saw: %s", raw)
	// What check says of the same file.
	chk, _ := runCommand(bin, "check", "--format", "json", file)
	var want []checkFinding
	if err := json.Unmarshal(chk, &want); err != nil {
		t.Fatal(err)
	}
	if !res.Seen || len(res.Diagnostics) != len(want) || len(want) < 2 {
		t.Fatalf("Neovim shows %+v; check says %+v", res.Diagnostics, want)
	}
	found := false
	for i, w := range want {
		g := res.Diagnostics[i]
		// Neovim's columns are bytes, the same as characters in an ASCII file.
		if g.Lnum != w.Line-1 || g.Col != w.Column-1 || g.EndCol != w.EndColumn-1 || g.Message != w.Message || g.Source != "datumlint" {
			t.Errorf("diagnostic %d: Neovim %+v, check %+v", i, g, w)
		}
		if w.Rule == "datum-undefined" && strings.Contains(w.Message, "datum E") {
			found = true
		}
	}
	if !found {
		t.Errorf("the known mistake (datum E is not declared) is not among %+v", want)
	}
	if !strings.Contains(res.Hover, "Source:") {
		t.Errorf("hover on the first finding: %q", res.Hover)
	}
	if res.ExitCode == nil || *res.ExitCode != 0 {
		t.Errorf("the server's exit code after Neovim stopped it: %v", res.ExitCode)
	}
}

// TestCommandExitCodes runs `datumlint lsp` as a process: exit 0 after
// shutdown (and exit, or the end of the input), 1 when the input ends
// without shutdown.
func TestCommandExitCodes(t *testing.T) {
	bin := datumlintBinary(t)
	frame := func(body string) string { return fmt.Sprintf("Content-Length: %d\r\n\r\n%s", len(body), body) }
	session := frame(`{"jsonrpc":"2.0","id":1,"method":"initialize","params":{"processId":null,"rootUri":null,"capabilities":{}}}`) +
		frame(`{"jsonrpc":"2.0","method":"initialized","params":{}}`) +
		frame(`{"jsonrpc":"2.0","method":"textDocument/didOpen","params":{"textDocument":{"uri":"file:///tmp/x.callouts","languageId":"callouts","version":1,"text":"units mm\n"}}}`) +
		frame(`{"jsonrpc":"2.0","id":2,"method":"shutdown"}`)
	for _, c := range []struct {
		input string
		code  int
	}{
		{session + frame(`{"jsonrpc":"2.0","method":"exit"}`), 0},
		{session, 0},
		{"", 1},
	} {
		cmd := exec.Command(bin, "lsp")
		cmd.Stdin = strings.NewReader(c.input)
		var out bytes.Buffer
		cmd.Stdout = &out
		err := cmd.Run()
		code := 0
		if ee, ok := err.(*exec.ExitError); ok {
			code = ee.ExitCode()
		} else if err != nil {
			t.Fatal(err)
		}
		if code != c.code {
			t.Errorf("exit code %d, want %d; output:\n%s", code, c.code, out.Bytes())
		}
		if c.input != "" && !strings.Contains(out.String(), `"id":2,"result":null`) {
			t.Errorf("no answer to shutdown in:\n%s", out.Bytes())
		}
	}
}
