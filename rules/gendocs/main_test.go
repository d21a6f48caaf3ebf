package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/ruledoc"
)

const regenerate = "regenerate it from the project root with `go generate ./rules` (or `go run ./rules/gendocs -o docs/rules.md`)"

// TestRulesDocUpToDate fails when docs/rules.md no longer matches the
// registry.
func TestRulesDocUpToDate(t *testing.T) {
	path := filepath.Join("..", "..", "docs", "rules.md")
	have, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("reading %s: %v; %s", path, err, regenerate)
	}
	want := render(rules.All())
	if !bytes.Equal(have, want) {
		hl, wl := strings.Split(string(have), "\n"), strings.Split(string(want), "\n")
		i := 0
		for i < len(hl) && i < len(wl) && hl[i] == wl[i] {
			i++
		}
		at := func(ls []string) string {
			if i < len(ls) {
				return ls[i]
			}
			return "(end of file)"
		}
		t.Errorf("docs/rules.md is stale: %s\nfirst difference at line %d:\n  file:      %s\n  generated: %s", regenerate, i+1, at(hl), at(wl))
	}
}

// Every rule gets a section with its examples, reachable from the table.
func TestRenderCoversEveryRule(t *testing.T) {
	doc := string(render(rules.All()))
	for _, r := range rules.All() {
		for _, want := range []string{"\n## " + r.ID + "\n", "](#" + r.ID + ")", r.Source, ruledoc.Fence(r.Bad), ruledoc.Fence(r.Good)} {
			if !strings.Contains(doc, want) {
				t.Errorf("rule %s: the reference lacks %q", r.ID, want)
			}
		}
	}
}

func TestWriteAtomic(t *testing.T) {
	p := filepath.Join(t.TempDir(), "x.md")
	if err := writeAtomic(p, []byte("one")); err != nil {
		t.Fatal(err)
	}
	if err := writeAtomic(p, []byte("two")); err != nil {
		t.Fatal(err)
	}
	b, _ := os.ReadFile(p)
	ents, _ := os.ReadDir(filepath.Dir(p))
	if string(b) != "two" || len(ents) != 1 {
		t.Errorf("got %q and %d files, want \"two\" and no temporary left", b, len(ents))
	}
}
