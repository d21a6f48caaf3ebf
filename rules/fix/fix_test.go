package fix

import (
	"bytes"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/grammar/source"
	"github.com/datumlint/datumlint/rules"
)

// wordChecker reports every "bad" in the text with a fix replacing it by
// "good", every "twice" with two overlapping fixes' worth of edits, and a
// syntax finding on a line that says "broken": enough of a checker to hold
// the passes, the deferral of overlapping edits and the refusals to.
func wordChecker(name string, src []byte) ([]rules.Diagnostic, *source.File) {
	f := source.NewFile(name, src)
	var out []rules.Diagnostic
	for l := 1; l <= f.Lines(); l++ {
		line := string(f.LineBytes(l))
		if strings.Contains(line, "broken") {
			out = append(out, rules.Diagnostic{File: name, Rule: rules.Syntax.ID, Span: source.Line(l)})
		}
		for col, rest := 1, line; ; {
			i := strings.Index(rest, "bad")
			if i < 0 {
				break
			}
			col += len([]rune(rest[:i]))
			sp := source.Span{Start: source.Pos{Line: l, Col: col}, End: source.Pos{Line: l, Col: col + 3}}
			out = append(out, rules.Diagnostic{File: name, Rule: "word", Span: sp,
				Fixes: []rules.Fix{{Message: "say good", Safe: true, Edits: []rules.Edit{{Span: sp, NewText: "good"}}}}})
			rest = rest[i+3:]
			col += 3
		}
		if i := strings.Index(line, "risky"); i >= 0 {
			col := 1 + len([]rune(line[:i]))
			sp := source.Span{Start: source.Pos{Line: l, Col: col}, End: source.Pos{Line: l, Col: col + 5}}
			out = append(out, rules.Diagnostic{File: name, Rule: "word", Span: sp,
				Fixes: []rules.Fix{{Message: "drop it", Safe: false, Edits: []rules.Edit{{Span: sp, NewText: ""}}}}})
		}
		if strings.Contains(line, "stack") {
			// Two findings insert at the start of the same line: one waits.
			at := source.Span{Start: source.Pos{Line: l, Col: 1}, End: source.Pos{Line: l, Col: 1}}
			for k := 0; k < 2; k++ {
				out = append(out, rules.Diagnostic{File: name, Rule: "stack", Span: source.Line(l),
					Fixes: []rules.Fix{{Message: "add", Safe: true, Edits: []rules.Edit{{Span: at, NewText: "x\n"}}}}})
			}
		}
	}
	return out, f
}

func TestRunAppliesUntilNothingIsLeft(t *testing.T) {
	res := Run("a", []byte("one bad, two bad\nrisky bad\n"), wordChecker, false, nil)
	if got := string(res.Src); got != "one good, two good\nrisky good\n" {
		t.Errorf("got %q", got)
	}
	if res.Applied != 3 || res.Passes != 1 || res.Refused != "" {
		t.Errorf("applied %d in %d passes, refused %q", res.Applied, res.Passes, res.Refused)
	}
	if len(res.Findings) != 1 || !strings.Contains(res.Findings[0].Fixes[0].Message, "drop") {
		t.Errorf("what remains: %+v (the fix that needs review is left)", res.Findings)
	}
	res = Run("a", []byte("risky bad\n"), wordChecker, true, nil)
	if got := string(res.Src); got != " good\n" {
		t.Errorf("with review: %q", got)
	}
}

func TestOverlappingEditsWaitForTheNextPass(t *testing.T) {
	res := Run("a", []byte("stack\n"), wordChecker, false, nil)
	// Pass 1 inserts one line (the other insertion at the same place
	// waits); pass 2 sees "stack" on line 2 and again inserts one of two;
	// and so on until the pass limit: the bound holds a fix that keeps
	// offering itself.
	if res.Passes != MaxPasses || res.Applied != MaxPasses {
		t.Errorf("passes %d applied %d", res.Passes, res.Applied)
	}
	if !bytes.HasSuffix(res.Src, []byte("x\nstack\n")) || bytes.Count(res.Src, []byte("x\n")) != MaxPasses {
		t.Errorf("got %q", res.Src)
	}
	take, deferred := Select(source.NewFile("a", []byte("stack\n")), must(wordChecker("a", []byte("stack\n"))), false)
	if len(take) != 1 || deferred != 1 {
		t.Errorf("select took %d, deferred %d; want 1 and 1", len(take), deferred)
	}
}

func must(ds []rules.Diagnostic, _ *source.File) []rules.Diagnostic { return ds }

func TestNeverRewritesWhatDoesNotParse(t *testing.T) {
	src := []byte("bad\nbroken\n")
	res := Run("a", src, wordChecker, true, nil)
	if !bytes.Equal(res.Src, src) || res.Applied != 0 || res.Refused == "" {
		t.Errorf("a file with a syntax finding was changed: %q, refused %q", res.Src, res.Refused)
	}
	// A fix that would break the file is not applied.
	breaking := func(name string, src []byte) ([]rules.Diagnostic, *source.File) {
		ds, f := wordChecker(name, src)
		for i := range ds {
			for j := range ds[i].Fixes {
				for k := range ds[i].Fixes[j].Edits {
					ds[i].Fixes[j].Edits[k].NewText = "broken"
				}
			}
		}
		return ds, f
	}
	res = Run("a", []byte("bad\n"), breaking, false, nil)
	if string(res.Src) != "bad\n" || res.Refused == "" {
		t.Errorf("a breaking fix was applied: %q", res.Src)
	}
}

func TestLineEndsAndCanonicalLayout(t *testing.T) {
	res := Run("a", []byte("stack\r\nbad\r\n"), wordChecker, false, nil)
	if bytes.Contains(bytes.ReplaceAll(res.Src, []byte("\r\n"), nil), []byte("\n")) {
		t.Errorf("an inserted line end is not CRLF in a CRLF file: %q", res.Src)
	}
	upper := func(b []byte) ([]byte, bool) { return bytes.ToUpper(b), true }
	res = Run("a", []byte("BAD\n"), wordChecker, false, upper)
	if string(res.Src) != "BAD\n" {
		t.Errorf("nothing to fix, yet changed: %q", res.Src)
	}
	// "bad" is not canonical under upper, so the fixed text is not laid out.
	res = Run("a", []byte("bad\n"), wordChecker, false, upper)
	if string(res.Src) != "good\n" {
		t.Errorf("a file that was not canonical was laid out: %q", res.Src)
	}
}

// One fix may insert several lines at one place: they go in, in the order
// the fix lists them, in one pass (two fixes inserting at one place wait).
func TestOneFixInsertsInOrder(t *testing.T) {
	src := source.NewFile("a", []byte("one\ntwo\n"))
	at := source.Span{Start: source.Pos{Line: 2, Col: 1}, End: source.Pos{Line: 2, Col: 1}}
	d := rules.Diagnostic{Rule: "x", Fixes: []rules.Fix{{Safe: true, Edits: []rules.Edit{{Span: at, NewText: "a\n"}, {Span: at, NewText: "b\n"}}}}}
	take, deferred := Select(src, []rules.Diagnostic{d}, false)
	if len(take) != 1 || deferred != 0 {
		t.Fatalf("took %d, deferred %d", len(take), deferred)
	}
	if got := string(Apply(src, take)); got != "one\na\nb\ntwo\n" {
		t.Errorf("got %q", got)
	}
}
