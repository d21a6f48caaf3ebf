// Package basicsref holds the basic-dimension engine (rules/basics) as it
// was before its cost was cut, in the old_*_test.go files, copied verbatim
// but for the package clause, and holds the engine as it is to it: the same
// Missing and Mismatches, field for field and bit for bit, on every
// .callouts file of the repository, on generated plates and on generated
// plates with basic dimensions taken away. It lives under rules/lint so
// that it may use the plate generator, rules/lint/internal/gen.
package basicsref

import (
	"bytes"
	"fmt"
	"io/fs"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rogpeppe/go-internal/txtar"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/basics"
	"github.com/datumlint/datumlint/rules/lint/internal/gen"
)

// compared counts what one comparison covered.
type compared struct{ files, queries, missing, mismatches int }

// compareFile builds both engines for one file, twice (with no toleranced
// dimensions counted, and with every toleranced one counted, which the rule
// basic-toleranced's selection lies between), and compares what each says
// of every segment of every frame and of every written dimension.
func compareFile(t *testing.T, name string, src []byte, c *compared) {
	t.Helper()
	part := model.Resolve(grammar.Parse(name, src))
	facts := rules.NewFacts(part)
	var toleranced []*model.Dimension
	for _, d := range part.Dims {
		if !d.Basic {
			toleranced = append(toleranced, d)
		}
	}
	c.files++
	for _, counted := range [][]*model.Dimension{nil, toleranced} {
		ne, oe := basics.Build(part, counted), Build(part, counted)
		for _, fr := range part.Frames {
			for i, seg := range fr.Segments {
				a := facts.DOF(fr, i)
				if !a.Resolved || a.DRF == nil {
					continue
				}
				nq, nok := basics.FrameQuery(fr, seg, a.DRF)
				oq, ook := FrameQuery(fr, seg, a.DRF)
				if nok != ook {
					t.Fatalf("%s: frame on %s segment %d: FrameQuery ok %v, reference %v", name, fr.Target.Name, i, nok, ook)
				}
				if !nok {
					continue
				}
				c.queries++
				got, want := ne.Missing(nq), oe.Missing(oq)
				c.missing += len(want)
				if g, w := fmtMissing(got), fmtOldMissing(want); g != w {
					t.Fatalf("%s: frame on %s segment %d (counted %d):\n got %s\nwant %s", name, fr.Target.Name, i, len(counted), g, w)
				}
			}
		}
		got, want := ne.Mismatches(), oe.Mismatches()
		c.mismatches += len(want)
		if len(got) != len(want) {
			t.Fatalf("%s: %d mismatches, reference %d", name, len(got), len(want))
		}
		for k := range got {
			g, w := got[k], want[k]
			if g.Dim != w.Dim || g.Nominal != w.Nominal || g.Member != w.Member || g.Problem != w.Problem {
				t.Fatalf("%s: mismatch %d: got %+v, reference %+v", name, k, g, w)
			}
		}
	}
}

// fmtMissing writes every field but the suggestion, pointers as pointers
// and floats to the bit (%v of a float64 prints the shortest text that
// reads back exactly). The engine now writes only a suggestion that would
// clear its quantity, and the reference's are held to no such promise:
// rules/lint/internal/basicsprop holds the suggestions to it, and with
// them the reference index a suggestion chooses.
func fmtMissing(ms []basics.Missing) string {
	var b strings.Builder
	for _, m := range ms {
		fmt.Fprintf(&b, "{%d %p %p %v %p} ", m.Kind, m.Member, m.Other, m.Dir, m.Hub)
	}
	return b.String()
}

func fmtOldMissing(ms []Missing) string {
	var b strings.Builder
	for _, m := range ms {
		fmt.Fprintf(&b, "{%d %p %p %v %p} ", m.Kind, m.Member, m.Other, m.Dir, m.Hub)
	}
	return b.String()
}

// TestMatchesReferenceOnTestdata compares the engines on every .callouts
// file of the repository and every .callouts file inside a txtar script.
func TestMatchesReferenceOnTestdata(t *testing.T) {
	var c compared
	err := filepath.WalkDir("../../../..", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		switch {
		case strings.HasSuffix(p, ".callouts"):
			b, err := os.ReadFile(p)
			if err != nil {
				return err
			}
			compareFile(t, p, b, &c)
		case strings.HasSuffix(p, ".txtar"):
			a, err := txtar.ParseFile(p)
			if err != nil {
				return err
			}
			for _, f := range a.Files {
				if strings.HasSuffix(f.Name, ".callouts") {
					compareFile(t, p+":"+f.Name, f.Data, &c)
				}
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if c.files < 40 || c.queries < 100 || c.missing < 20 || c.mismatches < 5 {
		t.Fatalf("compared %+v; the test data should give more", c)
	}
	t.Logf("compared %+v", c)
}

// TestMatchesReferenceOnPlates compares the engines on generated plates,
// which are clean, and on the same plates with basic dimensions taken away
// at random, so that the engines have missing quantities to find and name
// in patterns, bolt circles and chains.
func TestMatchesReferenceOnPlates(t *testing.T) {
	n := 60
	if testing.Short() {
		n = 10
	}
	rng := rand.New(rand.NewPCG(7, 11))
	var c compared
	for i := range n {
		src := gen.Plate(i)
		compareFile(t, fmt.Sprintf("plate %d", i), src, &c)
		for k := range 3 {
			var out [][]byte
			for _, l := range bytes.SplitAfter(src, []byte("\n")) {
				if bytes.HasPrefix(bytes.TrimSpace(l), []byte("basic ")) && rng.IntN(4) == 0 {
					continue
				}
				out = append(out, l)
			}
			compareFile(t, fmt.Sprintf("plate %d, cut %d", i, k), bytes.Join(out, nil), &c)
		}
	}
	for _, r := range []int{2, 7, 40} {
		compareFile(t, fmt.Sprintf("row of %d", r), gen.Row(r), &c)
	}
	if c.missing < 100 {
		t.Fatalf("compared %+v; the cut plates should miss more", c)
	}
	t.Logf("compared %+v", c)
}

// TestConcurrentQueriesMatchReference asks one engine every segment's
// question from several goroutines at once (an Engine may be shared: its
// memos are locked and its scratch pooled) and compares each answer with
// the reference's; run it with -race.
func TestConcurrentQueriesMatchReference(t *testing.T) {
	found := 0
	for i := range 4 {
		src := gen.Plate(i)
		var cut [][]byte
		for k, l := range bytes.SplitAfter(src, []byte("\n")) {
			if bytes.HasPrefix(bytes.TrimSpace(l), []byte("basic ")) && k%3 == 0 {
				continue
			}
			cut = append(cut, l)
		}
		part := model.Resolve(grammar.Parse("plate.callouts", bytes.Join(cut, nil)))
		facts := rules.NewFacts(part)
		ne, oe := basics.Build(part, nil), Build(part, nil)
		var nqs []basics.Query
		var want []string
		for _, fr := range part.Frames {
			for k, seg := range fr.Segments {
				a := facts.DOF(fr, k)
				if !a.Resolved || a.DRF == nil {
					continue
				}
				nq, nok := basics.FrameQuery(fr, seg, a.DRF)
				oq, ook := FrameQuery(fr, seg, a.DRF)
				if !nok || !ook {
					continue
				}
				nqs = append(nqs, nq)
				ms := oe.Missing(oq)
				found += len(ms)
				want = append(want, fmtOldMissing(ms))
			}
		}
		const workers = 4
		got := make([][]string, workers)
		done := make(chan int)
		for w := range workers {
			go func() {
				got[w] = make([]string, len(nqs))
				for k := range nqs {
					// each worker starts at a different query
					j := (k + w*len(nqs)/workers) % len(nqs)
					got[w][j] = fmtMissing(ne.Missing(nqs[j]))
				}
				done <- w
			}()
		}
		for range workers {
			<-done
		}
		for w := range workers {
			for k := range nqs {
				if got[w][k] != want[k] {
					t.Fatalf("plate %d, worker %d, query %d:\n got %s\nwant %s", i, w, k, got[w][k], want[k])
				}
			}
		}
	}
	if found < 10 {
		t.Fatalf("the cut plates miss %d quantities; they should miss more", found)
	}
}
