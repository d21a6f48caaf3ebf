package main

import (
	"io"
	"os"
	"regexp"
	"strings"
	"testing"

	"github.com/spf13/pflag"
)

// docs/notation.md is the only reference a clone carries, and its command
// line section says it gives every command: each command and each of its
// flags must appear in the synopsis there.
func TestNotationDocShowsEveryCommandAndFlag(t *testing.T) {
	doc, err := os.ReadFile("../../docs/notation.md")
	if err != nil {
		t.Fatal(err)
	}
	_, rest, ok := strings.Cut(string(doc), "\n## The command line\n")
	if !ok {
		t.Fatal("docs/notation.md has no section \"The command line\"")
	}
	synopsis := regexp.MustCompile("(?s)```text\n(.*?)```").FindStringSubmatch(rest)
	if synopsis == nil {
		t.Fatal("the command line section has no synopsis block")
	}
	lines := strings.Split(synopsis[1], "\n")
	root := newRoot(io.Discard, io.Discard)
	for _, cmd := range root.Commands() {
		if cmd.Hidden || cmd.Name() == "help" || cmd.Name() == "completion" {
			continue
		}
		// A command's synopsis is its first line and the indented ones
		// after it.
		var own []string
		for i, l := range lines {
			if strings.HasPrefix(l, "datumlint "+cmd.Name()+" ") || l == "datumlint "+cmd.Name() {
				own = append(own, l)
				for _, m := range lines[i+1:] {
					if !strings.HasPrefix(m, " ") {
						break
					}
					own = append(own, m)
				}
			}
		}
		if own == nil {
			t.Errorf("the synopsis has no line for `datumlint %s`", cmd.Name())
			continue
		}
		text := strings.Join(own, "\n")
		cmd.Flags().VisitAll(func(f *pflag.Flag) {
			if f.Hidden || f.Name == "help" {
				return
			}
			if !regexp.MustCompile(`(^|[\[\s|])--`+regexp.QuoteMeta(f.Name)+`($|[^\w-])`).MatchString(text) &&
				(f.Shorthand == "" || !strings.Contains(text, "-"+f.Shorthand+" ")) {
				t.Errorf("the synopsis of `datumlint %s` does not show --%s", cmd.Name(), f.Name)
			}
		})
	}
}
