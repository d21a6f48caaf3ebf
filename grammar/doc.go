// Package grammar is the callout notation (`*.callouts`): its lexer, its
// syntax tree with spans and comments, the statement-wise parser, the
// drafter-worded syntax messages, the printer that gives `datumlint fmt`
// its canonical layout, and the reader that turns a parsed file into the
// part model (grammar/model).
//
// The participle grammar (the struct tags in ast.go and lexerDef in
// lexer.go) is the reference: it parses every statement that has an error
// and reports it. A hand-written scanner (scan.go) and parser
// (fastparse.go) parse well-formed statements faster; tests and fuzzers
// hold them to the reference on every statement in the repository.
//
// The notation is one reader among others: Read gives a model.Part, which
// is all that rules, engines and outputs see. Another input format is a
// package beside this one that builds the same model (grammar/qif).
package grammar
