package dof_test

import (
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/rules/kinematics"

	"github.com/rogpeppe/go-internal/txtar"

	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/rules/dof"
)

// TestFastMatchesReferenceOnTestdata holds the engine, as the rules reach it
// through rules/kinematics (with its per-file sharing of frames and zones), to
// the reference engine of reference_test.go on every frame segment of every
// .callouts file and every .callouts file inside a txtar script of the
// repository: the same counts, the same names, and twists equal to
// rounding (dof.SameMotions).
func TestFastMatchesReferenceOnTestdata(t *testing.T) {
	files, segs := 0, 0
	err := filepath.WalkDir("../..", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		var srcs map[string][]byte
		switch {
		case strings.HasSuffix(p, ".callouts"):
			b, err := os.ReadFile(p)
			if err != nil {
				return err
			}
			srcs = map[string][]byte{p: b}
		case strings.HasSuffix(p, ".txtar"):
			a, err := txtar.ParseFile(p)
			if err != nil {
				return err
			}
			srcs = map[string][]byte{}
			for _, f := range a.Files {
				if strings.HasSuffix(f.Name, ".callouts") {
					srcs[p+":"+f.Name] = f.Data
				}
			}
		}
		for name, src := range srcs {
			files++
			segs += compareFile(t, name, src)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if files < 40 || segs < 100 {
		t.Fatalf("compared %d segments of %d files; the test data should give more", segs, files)
	}
	t.Logf("compared %d segments of %d files", segs, files)
}

// compareFile compares every resolved segment of one file and returns how
// many it compared.
func compareFile(t *testing.T, name string, src []byte) int {
	t.Helper()
	part := grammar.Read(name, src)
	facts := kinematics.Analyze(part)
	frame := dof.Frame{Center: dof.Vec(part.Center), Scale: part.Scale}
	n := 0
	for _, fr := range part.Frames {
		for i, s := range fr.Segments {
			a := facts.Segment(fr, i)
			if !a.Resolved {
				continue
			}
			ds := make([]dof.Datum, len(s.Refs))
			for k, r := range s.Refs {
				ds[k] = kinematics.RefSurfaces(r)
			}
			ref := dof.ReferenceAnalyze(frame, ds)
			where := name + ": " + fr.Target.Name + " " + string(fr.Characteristic)
			sameSteps(t, frame, where, a.DRF.Steps(), ref.Steps)
			sameMotions(t, frame, where+" free", a.DRF.Free(), ref.Free)
			sameZone(t, frame, where, a.Zone, dof.ReferenceZone(ref, kinematics.ZoneOf(fr)))
			n++
		}
	}
	return n
}

func sameSteps(t *testing.T, f dof.Frame, where string, got, want []dof.Step) {
	t.Helper()
	if len(got) != len(want) {
		t.Errorf("%s: %d steps, reference %d", where, len(got), len(want))
		return
	}
	for k := range got {
		if got[k].Constrains != want[k].Constrains {
			t.Errorf("%s: step %d constrains %d, reference %d", where, k+1, got[k].Constrains, want[k].Constrains)
		}
		sameMotions(t, f, where+" removed", got[k].Removed, want[k].Removed)
		sameMotions(t, f, where+" step free", got[k].Free, want[k].Free)
	}
}

func sameZone(t *testing.T, f dof.Frame, where string, got, want dof.ZoneResult) {
	t.Helper()
	if !equalInts(got.PerStep, want.PerStep) || got.TranslationMoves != want.TranslationMoves {
		t.Errorf("%s: zone per step %v translation %v, reference %v %v", where, got.PerStep, got.TranslationMoves, want.PerStep, want.TranslationMoves)
	}
	sameMotions(t, f, where+" zone free", got.Free, want.Free)
}

// sameMotions requires the same names and twists equal to rounding.
func sameMotions(t *testing.T, f dof.Frame, where string, got, want []dof.Motion) {
	t.Helper()
	if !dof.SameMotions(f, got, want) {
		t.Errorf("%s: motions %+v, reference %+v", where, got, want)
	}
}

func equalInts(a, b []int) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}
