// Package longtest tells a test whether the long run was asked for.
//
// `go test ./...` is the everyday run and stays well under a minute on two
// cores: it samples the sweeps (fuzz-seed prefixes, differential
// comparisons against the reference engines, generated plates) and skips
// the big generated corpora and the tests that drive outside tools.
// `go test -tags long ./...` runs them in full; .ci/run runs both. A test
// asks for its size with N, or skips with Skip: the assertions are the
// same in both runs, only the amount of input differs.
package longtest

import "testing"

// Enabled reports whether the tests were built with -tags long.
func Enabled() bool { return enabled }

// N returns long in the long run and short otherwise (also under -short).
func N(short, long int) int {
	if enabled && !testing.Short() {
		return long
	}
	return short
}

// Skip skips t unless the tests were built with -tags long; what says what
// the test does, for the skip message.
func Skip(t testing.TB, what string) {
	t.Helper()
	if !enabled {
		t.Skipf("long test (%s): run it with go test -tags long", what)
	}
	if testing.Short() {
		t.Skipf("long test (%s): skipped under -short", what)
	}
}
