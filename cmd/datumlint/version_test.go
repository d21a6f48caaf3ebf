package main

import (
	"bytes"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// The version that `datumlint --version` prints, the versions the
// documentation names (a pre-commit `rev`, a `go install ...@vX`, "datumlint
// version X", a release tag vX.Y.Z) and a tag on the checked-out commit must
// agree, so that what a user is told to pin exists and is what they run.

func TestVersionInDocsMatchesCommand(t *testing.T) {
	printed := printedVersion(t)
	root := projectRoot(t)
	docs := map[string]string{}
	paths, err := filepath.Glob(filepath.Join(root, "docs", "*.md"))
	if err != nil {
		t.Fatal(err)
	}
	paths = append(paths, filepath.Join(root, "README.md"), filepath.Join(root, "DEVELOPERS.md"))
	for _, p := range paths {
		b, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		rel, _ := filepath.Rel(root, p)
		docs[filepath.ToSlash(rel)] = string(b)
	}
	problems, named := docVersionProblems(printed, docs)
	for _, p := range problems {
		t.Error(p)
	}
	if named == 0 {
		t.Errorf("no document says which version `datumlint --version` prints (%q): docs/integration.md should, as `datumlint version %s`", printed, printed)
	}

	// A tag on the commit being tested is the release of that version.
	if _, err := exec.LookPath("git"); err != nil {
		t.Logf("git is not on PATH: tags not compared")
		return
	}
	cmd := exec.Command("git", "tag", "--points-at", "HEAD")
	cmd.Dir = root
	out, err := cmd.Output()
	if err != nil {
		t.Logf("not a git checkout (%v): tags not compared", err)
		return
	}
	for _, tag := range strings.Fields(string(out)) {
		if strings.HasPrefix(tag, "v") && tag != "v"+printed {
			t.Errorf("the commit is tagged %s but `datumlint --version` prints %s: set version in cmd/datumlint/main.go to %s", tag, printed, strings.TrimPrefix(tag, "v"))
		}
	}
}

func TestVersionCheckCatchesStaleDocs(t *testing.T) {
	const printed = "0.3.0-dev"
	for name, doc := range map[string]string{
		"a tag that is not this version": "```yaml\nrepos:\n  - repo: https://github.com/datumlint/datumlint\n    rev: v0.1.0\n```\n",
		"a branch as rev":                "```yaml\nrepos:\n  - repo: https://github.com/datumlint/datumlint\n    rev: main\n```\n",
		"an install of another version":  "go install github.com/datumlint/datumlint/cmd/datumlint@v0.2.0\n",
		"a stale version line":           "`datumlint --version` prints `datumlint version 0.2.0`.\n",
		"a bare release tag":             "The first release is v0.2.0.\n",
	} {
		if problems, _ := docVersionProblems(printed, map[string]string{"x.md": doc}); len(problems) == 0 {
			t.Errorf("%s passes: %q", name, doc)
		}
	}
	ok := "```yaml\nrepos:\n  - repo: https://github.com/datumlint/datumlint\n    rev: 0123456789abcdef0123456789abcdef01234567\n```\n" +
		"`datumlint version 0.3.0-dev`; SARIF 2.1.0; github.com/alecthomas/participle/v2 v2.1.4; actions/checkout@v4; @latest\n"
	problems, named := docVersionProblems(printed, map[string]string{"x.md": ok})
	if len(problems) > 0 || named != 1 {
		t.Errorf("a page in step is reported (%d named): %v", named, problems)
	}
}

func printedVersion(t *testing.T) string {
	t.Helper()
	var out, errb bytes.Buffer
	if code := run([]string{"--version"}, &out, &errb); code != 0 {
		t.Fatalf("datumlint --version exits %d: %s", code, errb.String())
	}
	m := regexp.MustCompile(`^datumlint version (\S+)\n$`).FindStringSubmatch(out.String())
	if m == nil {
		t.Fatalf("datumlint --version prints %q, not `datumlint version X`", out.String())
	}
	return m[1]
}

var (
	versionLineRE = regexp.MustCompile(`datumlint version (v?\d+\.\d+\.\d+[0-9A-Za-z.+-]*)`)
	installRE     = regexp.MustCompile(`datumlint/cmd/datumlint@(\S+)`)
	tagRE         = regexp.MustCompile(`(^|[^\w./@-])(v\d+\.\d+\.\d+(?:-[0-9A-Za-z.]+)?)\b`)
	repoRE        = regexp.MustCompile(`^\s*-?\s*repo:\s*(\S+)`)
	revRE         = regexp.MustCompile(`^\s*rev:\s*(\S+)`)
	shaRE         = regexp.MustCompile(`^[0-9a-f]{40}$`)
)

// docVersionProblems lists every place in docs (name -> text) that names a
// version of datumlint other than printed, and counts the places that name
// printed as what `--version` prints.
func docVersionProblems(printed string, docs map[string]string) (problems []string, named int) {
	for name, text := range docs {
		repo := ""
		for i, line := range strings.Split(text, "\n") {
			at := func(format string, args ...any) {
				problems = append(problems, fmt.Sprintf("%s:%d: ", name, i+1)+fmt.Sprintf(format, args...))
			}
			for _, m := range versionLineRE.FindAllStringSubmatch(line, -1) {
				if m[1] != printed {
					at("says datumlint's version is %s, but `datumlint --version` prints %s", m[1], printed)
				} else {
					named++
				}
			}
			for _, m := range installRE.FindAllStringSubmatch(line, -1) {
				if v := strings.TrimRight(m[1], "`.,;)"); v != "latest" && v != "v"+printed && !shaRE.MatchString(v) {
					at("installs datumlint@%s, but `datumlint --version` prints %s: install @latest, a commit SHA or @v%s", v, printed, printed)
				}
			}
			for _, m := range tagRE.FindAllStringSubmatchIndex(line, -1) {
				tag := line[m[4]:m[5]]
				if prev := strings.Fields(line[:m[4]]); len(prev) > 0 {
					if w := prev[len(prev)-1]; strings.Contains(w, "/") && !strings.Contains(w, "datumlint") {
						continue // another module's version: github.com/x/y/v2 v2.1.4
					}
				}
				if tag != "v"+printed {
					at("names the release %s, but `datumlint --version` prints %s (a release tag is v and the version)", tag, printed)
				}
			}
			if m := repoRE.FindStringSubmatch(line); m != nil {
				repo = m[1]
			}
			if m := revRE.FindStringSubmatch(line); m != nil && strings.Contains(repo, "datumlint") {
				if rev := m[1]; !shaRE.MatchString(rev) && rev != "v"+printed {
					at("pins rev %s, which is neither a full commit SHA nor v%s, the tag of the version `datumlint --version` prints: pin a commit SHA", rev, printed)
				}
			}
		}
	}
	return problems, named
}
