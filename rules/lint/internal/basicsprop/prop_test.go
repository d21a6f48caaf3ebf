// Package basicsprop holds the basic-dimension engine (rules/basics) to
// properties that need no second copy of it, on every .callouts file of
// the repository, every generated shape and random cuts of their basic
// dimensions:
//
//   - adding a basic dimension that the model implies (its value the
//     model's own) never makes a located feature unlocated: no segment's
//     missing quantities grow in number, and a segment with none keeps none;
//   - removing a basic dimension from a clean part either leaves it clean
//     by the whole part's factor too (the dimension was implied by the
//     others), or makes findings whose suggestions, added, make it clean
//     again;
//   - every suggested dimension, once added, removes that quantity from its
//     segment's finding, and agrees with the model;
//   - the answer from the rows near each target is the answer from all the
//     part's rows (Missing against MissingWhole), field for field.
//
// The properties are what the engine promises (a suggestion is a promise:
// doing what it says must clear the finding), so a failure is a bug in the
// engine, never in the test data. The package lives under rules/lint so
// that it may use the generator, rules/lint/internal/gen.
package basicsprop

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
	"github.com/datumlint/datumlint/rules/basics"
	"github.com/datumlint/datumlint/rules/kinematics"
	"github.com/datumlint/datumlint/rules/lint/internal/gen"
)

// quantity names one missing quantity so that it can be found again in
// another resolution of a changed file.
func quantity(m basics.Missing) string {
	other, hub := "", ""
	if m.Other != nil {
		other = basics.Name(m.Other)
	}
	if m.Hub != nil {
		hub = basics.Name(m.Hub)
	}
	return fmt.Sprintf("%d %s %s %d %s %s", m.Kind, basics.Name(m.Member), other, m.Ref, basics.DirName(m.Dir), hub)
}

// segment is what the engine says of one frame segment.
type segment struct {
	key     string // "line:segment"
	missing []basics.Missing
}

// analyse resolves a file and asks the engine about every segment that
// asks for basic dimensions, as the rules do (with no toleranced dimension
// counted); it also returns the engine's mismatches' lines.
func analyse(src []byte) (segs []segment, mismatches map[int]bool) {
	return analyseBy(src, (*basics.Engine).Missing)
}

// analyseBy is analyse with the engine's method of answering a query.
func analyseBy(src []byte, ask func(*basics.Engine, basics.Query) []basics.Missing) (segs []segment, mismatches map[int]bool) {
	part := grammar.Read("part.callouts", src)
	facts := kinematics.Analyze(part)
	e := basics.Build(part, nil)
	for _, fr := range part.Frames {
		for i, seg := range fr.Segments {
			if ask, _ := basics.Asks(fr, seg); !ask {
				continue
			}
			a := facts.Segment(fr, i)
			if !a.Resolved || a.DRF == nil {
				continue
			}
			q, ok := basics.FrameQuery(fr, seg, a.DRF)
			if !ok {
				continue
			}
			segs = append(segs, segment{fmt.Sprintf("%d:%d", fr.Span.Start.Line, i), ask(e, q)})
		}
	}
	mismatches = map[int]bool{}
	for _, m := range e.Mismatches() {
		mismatches[m.Dim.Span.Start.Line] = true
	}
	return segs, mismatches
}

// corpus is every .callouts file of the repository and every .callouts
// file inside a txtar script.
func corpus(t *testing.T) map[string][]byte {
	t.Helper()
	out := map[string][]byte{}
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
			out[p] = b
		case strings.HasSuffix(p, ".txtar"):
			a, err := txtar.ParseFile(p)
			if err != nil {
				return err
			}
			for _, f := range a.Files {
				if strings.HasSuffix(f.Name, ".callouts") {
					out[p+":"+f.Name] = f.Data
				}
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if len(out) < 40 {
		t.Fatalf("found %d files; the repository has more", len(out))
	}
	return out
}

// shapes returns generated parts of every shape at their own size, and a
// few larger ones.
func shapes(n int) map[string][]byte {
	out := map[string][]byte{}
	for _, s := range gen.Shapes {
		for i := range n {
			out[fmt.Sprintf("%s %d", s, i)] = gen.Part(s, i, 0)
		}
		out[fmt.Sprintf("%s of 120", s)] = gen.Part(s, 0, 120)
	}
	return out
}

// cut returns src with each basic dimension left out with probability p.
func cut(src []byte, rng *rand.Rand, p float64) []byte {
	var out [][]byte
	for _, l := range bytes.SplitAfter(src, []byte("\n")) {
		if isBasic(l) && rng.Float64() < p {
			continue
		}
		out = append(out, l)
	}
	return bytes.Join(out, nil)
}

func isBasic(l []byte) bool { return bytes.HasPrefix(bytes.TrimSpace(l), []byte("basic ")) }

// withLines appends lines to src.
func withLines(src []byte, lines ...string) []byte {
	out := append([]byte(nil), src...)
	if len(out) > 0 && out[len(out)-1] != '\n' {
		out = append(out, '\n')
	}
	for _, l := range lines {
		out = append(out, l+"\n"...)
	}
	return out
}

// mutations is the corpus, the shapes and cuts of the shapes.
func mutations(t *testing.T, nShapes, nCuts int) map[string][]byte {
	files := corpus(t)
	rng := rand.New(rand.NewPCG(12, 7))
	for name, src := range shapes(nShapes) {
		files[name] = src
		for k := range nCuts {
			files[fmt.Sprintf("%s cut %d", name, k)] = cut(src, rng, 0.25)
		}
	}
	return files
}

// TestSuggestionsClearTheirQuantity: a missing quantity's suggestion, once
// added to the file, removes that quantity from its segment's finding,
// and its value agrees with the model.
func TestSuggestionsClearTheirQuantity(t *testing.T) {
	nShapes, nCuts := 8, 3
	if testing.Short() {
		nShapes, nCuts = 2, 1
	}
	checked := 0
	for name, src := range mutations(t, nShapes, nCuts) {
		segs, before := analyse(src)
		for _, sg := range segs {
			for _, m := range sg.missing {
				if m.Suggest == "" {
					continue
				}
				checked++
				after, mism := analyse(withLines(src, m.Suggest))
				for _, a := range after {
					if a.key != sg.key {
						continue
					}
					for _, am := range a.missing {
						if quantity(am) == quantity(m) {
							t.Errorf("%s: segment %s: adding `%s` leaves %s missing", name, sg.key, m.Suggest, quantity(m))
						}
					}
				}
				if n := len(mism); n > len(before) {
					t.Errorf("%s: `%s` disagrees with the model (basic-mismatch)", name, m.Suggest)
				}
			}
		}
	}
	if checked < 300 {
		t.Fatalf("checked %d suggestions; the cut shapes should give more", checked)
	}
	t.Logf("checked %d suggestions", checked)
}

// TestRemovingABasic: from a clean part, remove each basic dimension in
// turn. Where the engine then finds nothing missing, the dimension was
// implied by the others, and the whole part's factor must agree; where it
// finds something, adding its suggestions (as many rounds as it takes,
// each round's suggestions to the file) must make the part clean again:
// the finding names what the removal took.
func TestRemovingABasic(t *testing.T) {
	n := 3
	if testing.Short() {
		n = 1
	}
	files := shapes(n)
	for name, src := range corpus(t) {
		if clean(src) {
			files[name] = src
		}
	}
	removed, implied, noSuggestion := 0, 0, 0
	for name, src := range files {
		if strings.HasSuffix(name, "of 120") {
			continue // as the small parts, line for line
		}
		if !clean(src) {
			t.Errorf("%s: a generated part is not clean", name)
			continue
		}
		lines := bytes.SplitAfter(src, []byte("\n"))
		for i, l := range lines {
			if !isBasic(l) {
				continue
			}
			removed++
			g := bytes.Join(append(append([][]byte(nil), lines[:i]...), lines[i+1:]...), nil)
			segs, _ := analyse(g)
			if count(segs) == 0 {
				implied++
				if whole, _ := analyseBy(g, (*basics.Engine).MissingWhole); count(whole) != 0 {
					t.Errorf("%s: without line %d (%s) the rows near each target find nothing missing, all the rows find %d", name, i+1, bytes.TrimSpace(l), count(whole))
				}
				continue
			}
			for round := 0; count(segs) > 0; round++ {
				var add []string
				unwritten := false
				for _, sg := range segs {
					for _, m := range sg.missing {
						if m.Suggest != "" {
							add = append(add, m.Suggest)
						} else {
							unwritten = true
						}
					}
				}
				if unwritten {
					// a quantity the engine names but writes no
					// dimension for: the finding says what is missing,
					// and there is no promise to hold it to
					noSuggestion++
					break
				}
				if round == 4 {
					t.Errorf("%s: without line %d (%s), suggestions do not make the part clean: %d quantities left", name, i+1, bytes.TrimSpace(l), count(segs))
					break
				}
				g = withLines(g, add...)
				segs, _ = analyse(g)
			}
		}
	}
	if removed < 300 {
		t.Fatalf("removed %d lines; the clean files hold more", removed)
	}
	t.Logf("removed %d lines one at a time: %d implied by the others, %d whose finding names a quantity with no dimension to suggest", removed, implied, noSuggestion)
}

func clean(src []byte) bool {
	segs, _ := analyse(src)
	return count(segs) == 0
}

func count(segs []segment) int {
	n := 0
	for _, sg := range segs {
		n += len(sg.missing)
	}
	return n
}

// TestLocalAgreesWithWhole: the rows near each target give the answer all
// the part's rows give, every field, on every file and mutation.
func TestLocalAgreesWithWhole(t *testing.T) {
	nShapes, nCuts := 8, 3
	if testing.Short() {
		nShapes, nCuts = 2, 1
	}
	found := 0
	for name, src := range mutations(t, nShapes, nCuts) {
		local, _ := analyse(src)
		whole, _ := analyseBy(src, (*basics.Engine).MissingWhole)
		if len(local) != len(whole) {
			t.Fatalf("%s: %d segments, %d by the whole factor", name, len(local), len(whole))
		}
		for k := range local {
			found += len(local[k].missing)
			if a, b := describe(local[k].missing), describe(whole[k].missing); a != b {
				t.Errorf("%s: segment %s:\n near %s\nwhole %s", name, local[k].key, a, b)
			}
		}
	}
	if found < 300 {
		t.Fatalf("found %d missing quantities; the cut shapes should miss more", found)
	}
	t.Logf("compared %d missing quantities", found)
}

// describe writes every field of the quantities, directions to the bit.
func describe(ms []basics.Missing) string {
	var b strings.Builder
	for _, m := range ms {
		fmt.Fprintf(&b, "{%s %v %q} ", quantity(m), m.Dir, m.Suggest)
	}
	return b.String()
}

// TestImpliedDimensionsNeverUnlocate: a basic dimension with the model's
// value between two features, added to any file, never adds a missing
// quantity to a segment.
func TestImpliedDimensionsNeverUnlocate(t *testing.T) {
	nShapes, nCuts := 6, 2
	if testing.Short() {
		nShapes, nCuts = 2, 1
	}
	rng := rand.New(rand.NewPCG(3, 5))
	added := 0
	for name, src := range mutations(t, nShapes, nCuts) {
		extra := impliedDims(src, rng, 6)
		if len(extra) == 0 {
			continue
		}
		before, _ := analyse(src)
		after, mism := analyse(withLines(src, extra...))
		added += len(extra)
		count := map[string]int{}
		for _, sg := range before {
			count[sg.key] = len(sg.missing)
		}
		for _, sg := range after {
			if c, ok := count[sg.key]; ok && len(sg.missing) > c {
				t.Errorf("%s: adding %q: segment %s misses %d quantities, %d before", name, extra, sg.key, len(sg.missing), c)
			}
		}
		// the added lines are the model's own values
		first := strings.Count(string(withLines(src)), "\n") + 1
		for l := range mism {
			if l >= first {
				t.Errorf("%s: added line %q disagrees with the model", name, extra[l-first])
			}
		}
	}
	if added < 200 {
		t.Fatalf("added %d dimensions; the corpus should take more", added)
	}
	t.Logf("added %d implied dimensions", added)
}

// impliedDims returns up to n basic dimensions between random pairs of
// members of src's features, linear (with and without `along`) and
// angular, each with the value the model gives it: written first with a
// wrong value, then with the nominal the engine's mismatch reports.
func impliedDims(src []byte, rng *rand.Rand, n int) []string {
	part := grammar.Read("part.callouts", src)
	var names []string
	for _, f := range part.Features {
		if f.Broken || !f.HasGeometry || f.Kind == model.Surface {
			continue
		}
		if !f.Pattern {
			names = append(names, f.Name)
			continue
		}
		for _, m := range f.Members {
			names = append(names, basics.Name(m))
		}
	}
	if len(names) < 2 {
		return nil
	}
	var trial []string
	for range n {
		a, b := names[rng.IntN(len(names))], names[rng.IntN(len(names))]
		if a == b {
			continue
		}
		switch rng.IntN(3) {
		case 0:
			trial = append(trial, fmt.Sprintf("basic 1e9 from %s to %s", a, b))
		case 1:
			trial = append(trial, fmt.Sprintf("basic 1e9 from %s to %s along %s", a, b, []string{"+x", "+y", "+z"}[rng.IntN(3)]))
		default:
			trial = append(trial, fmt.Sprintf("basic 89.123deg from %s to %s", a, b))
		}
	}
	withTrial := withLines(src, trial...)
	p := grammar.Read("part.callouts", withTrial)
	first := strings.Count(string(withLines(src)), "\n") + 1
	var out []string
	for _, m := range basics.Build(p, nil).Mismatches() {
		l := m.Dim.Span.Start.Line
		if l < first || m.Problem != "" {
			continue
		}
		t := trial[l-first]
		if m.Dim.Angle {
			out = append(out, strings.Replace(t, "89.123deg", basics.NumAngle(m.Nominal)+"deg", 1))
		} else {
			out = append(out, strings.Replace(t, "1e9", basics.Num(m.Nominal), 1))
		}
	}
	return out
}
