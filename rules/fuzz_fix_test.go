package rules_test

import (
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/rules"
	"github.com/datumlint/datumlint/rules/fix"
)

// FuzzFixes: applying every offered fix (those that need review too) to a
// file that reads without a syntax finding gives a file that still does,
// and each pass clears at least one finding's fix or stops; the fixes
// never panic, whatever their spans.
func FuzzFixes(f *testing.F) {
	filepath.WalkDir("testdata", func(p string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() && strings.HasSuffix(p, ".callouts") {
			if src, err := os.ReadFile(p); err == nil {
				f.Add(src)
			}
		}
		return nil
	})
	f.Add([]byte("units mm\nstandard asme-2018\nfeature b hole size 2 +-0.1 axis +z at (0,0,0)\nframe b: position 0.1  # datumlint: allow datum-unused, zone-shape -- x\n"))
	check := checker(nil)
	f.Fuzz(func(t *testing.T, src []byte) {
		before, _ := check("f.callouts", src)
		for _, d := range before {
			if d.Rule == rules.Syntax.ID {
				return // only files that read are fixed
			}
		}
		res := fix.Run("f.callouts", src, check, true, nil)
		if res.Refused != "" {
			t.Fatalf("a fix broke a file that read:\n%s\nrefused: %s", src, res.Refused)
		}
		after, _ := check("f.callouts", res.Src)
		for _, d := range after {
			if d.Rule == rules.Syntax.ID {
				t.Fatalf("the fixed file does not read: %s\n%s", d.Message, res.Src)
			}
		}
	})
}
