package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/datumlint/datumlint/rules/longtest"
)

// The pre-commit hooks of .pre-commit-hooks.yaml, run by pre-commit itself
// with `try-repo` on a temporary repository: a clean file passes and a file
// with an undefined datum fails.
//
// The system hook is always tried (datumlint is built into a temporary
// folder put first on PATH). The golang hook makes pre-commit build
// datumlint from the repository, which needs the modules of go.mod: it is
// tried offline against the local module cache (GOPROXY=off) and skipped
// with a message when that cache does not hold them.
//
// A long test (go test -tags long; .ci/run runs it): it takes 15 s on an
// idle two-core machine, nearer a minute on a busy one.
// Needs pre-commit and git on PATH (Debian: apt-get install pre-commit);
// skipped otherwise and under -short.

const precommitClean = `part "Cover plate CP-1"
units mm
standard asme-2018

feature base plane normal -z at (0, 0, 0)
feature top  plane normal +z at (0, 0, 5)

datum A on base

frame base: flatness 0.05
frame top: parallelism 0.1 datums A
`

func TestPreCommitHooks(t *testing.T) {
	longtest.Skip(t, "runs pre-commit, which clones the repository and builds datumlint twice")
	for _, tool := range []string{"pre-commit", "git", "go"} {
		if _, err := exec.LookPath(tool); err != nil {
			t.Skipf("%s is not on PATH; install it (Debian: apt-get install -y pre-commit) to run this test", tool)
		}
	}
	root, err := filepath.Abs("../..")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(root, ".pre-commit-hooks.yaml")); err != nil {
		t.Fatalf("no .pre-commit-hooks.yaml at the project root %s: %v", root, err)
	}
	if _, err := os.Stat(filepath.Join(root, ".git")); err != nil {
		t.Skipf("the project root %s is not a git checkout, which try-repo needs", root)
	}

	tmp := t.TempDir()
	bin := filepath.Join(tmp, "bin")
	build := exec.Command("go", "build", "-o", filepath.Join(bin, "datumlint"), ".")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	repo := filepath.Join(tmp, "repo")
	if err := os.MkdirAll(repo, 0o755); err != nil {
		t.Fatal(err)
	}
	env := append(os.Environ(),
		"PATH="+bin+string(os.PathListSeparator)+os.Getenv("PATH"),
		"PRE_COMMIT_HOME="+filepath.Join(tmp, "pre-commit-home"),
		// try-repo commits the checkout's uncommitted changes to a shadow clone
		"GIT_AUTHOR_NAME=datumlint test", "GIT_AUTHOR_EMAIL=test@datumlint.invalid",
		"GIT_COMMITTER_NAME=datumlint test", "GIT_COMMITTER_EMAIL=test@datumlint.invalid",
	)
	cmd := func(name string, args ...string) (string, error) {
		c := exec.Command(name, args...)
		c.Dir, c.Env = repo, env
		out, err := c.CombinedOutput()
		return string(out), err
	}
	if out, err := cmd("git", "init", "-q", "."); err != nil {
		t.Fatalf("git init: %v\n%s", err, out)
	}
	bad := strings.Replace(precommitClean, "datums A", "datums B", 1)
	example, err := os.ReadFile(filepath.Join(root, "testdata", "examples", "bearing-flange.qif"))
	if err != nil {
		t.Fatal(err)
	}
	files := map[string]string{"clean.callouts": precommitClean, "bad.callouts": bad,
		// a QIF document, named in upper case, that is not QIF 3
		"PLATE.QIF": strings.Replace(string(example), `versionQIF="3.0.0"`, `versionQIF="2.0.0"`, 1)}
	for name, src := range files {
		if err := os.WriteFile(filepath.Join(repo, name), []byte(src), 0o644); err != nil {
			t.Fatal(err)
		}
		if out, err := cmd("git", "add", name); err != nil {
			t.Fatalf("git add: %v\n%s", err, out)
		}
	}

	try := func(t *testing.T, hook, file string) (string, error) {
		return cmd("pre-commit", "try-repo", root, hook, "--files", file)
	}
	expect := func(t *testing.T, hook string) {
		out, err := try(t, hook, "clean.callouts")
		if err != nil {
			t.Fatalf("the hook failed on a clean file: %v\n%s", err, out)
		}
		if !strings.Contains(out, "Passed") {
			t.Errorf("the hook did not report Passed on a clean file:\n%s", out)
		}
		out, err = try(t, hook, "bad.callouts")
		if err == nil {
			t.Fatalf("the hook passed a file with an undefined datum:\n%s", out)
		}
		if !strings.Contains(out, "datum-undefined") || !strings.Contains(out, "bad.callouts:11:") {
			t.Errorf("the failure does not show the datum-undefined finding on line 11:\n%s", out)
		}
		out, err = try(t, hook, "PLATE.QIF")
		if err == nil || !strings.Contains(out, "PLATE.QIF:7:1: error syntax: QIF version 2.0.0") {
			t.Errorf("the hook does not check a QIF file (%v):\n%s", err, out)
		}
	}

	t.Run("system", func(t *testing.T) { expect(t, "datumlint-system") })

	t.Run("golang", func(t *testing.T) {
		gomodcache, err := exec.Command("go", "env", "GOMODCACHE").Output()
		if err != nil {
			t.Skipf("go env GOMODCACHE: %v", err)
		}
		// offline: the modules must come from the local cache
		env = append(env, "GOMODCACHE="+strings.TrimSpace(string(gomodcache)), "GOPROXY=off", "GOTOOLCHAIN=local", "GOFLAGS=-mod=mod")
		out, err := try(t, "datumlint", "clean.callouts")
		if err != nil && (strings.Contains(out, "GOPROXY=off") || strings.Contains(out, "module lookup disabled") || strings.Contains(out, "dial tcp")) {
			t.Skipf("the golang hook needs module downloads, and the local module cache lacks them:\n%s", out)
		}
		expect(t, "datumlint")
	})
}
