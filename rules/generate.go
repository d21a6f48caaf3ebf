package rules

// docs/rules.md is generated from the registry; a test in rules/gendocs
// fails when it is stale.
//go:generate go run ./gendocs -o ../docs/rules.md
