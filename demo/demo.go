// Package demo carries the shipped demo signal inside the binary, so that
// `unfold report --demo` works outside the repository. It exists because go:embed can only
// embed files of the package's own directory tree, and neither cmd/unfold nor testdata/ (which
// the go tool never builds) can hold it: strip.csv here is a byte-for-byte copy of
// testdata/demo/strip.csv (a test checks it), which testdata/demo/README.md documents — a
// synthetic strain record of a magnetically buckled strip driven at 5 Hz, from our own scenario.
package demo

import _ "embed"

//go:embed strip.csv
var strip []byte // read-only: only Strip reads it, and it hands out a copy

// Name is the file name of the demo signal.
const Name = "strip.csv"

// Path is where the same file lives in the repository.
const Path = "testdata/demo/strip.csv"

// TimeUnit and Unit are the units of the demo signal's columns (its header "t,strain" does
// not state them; testdata/demo/README.md does): the report of --demo shows them.
const (
	TimeUnit = "s"
	Unit     = "µε"
)

// Strip returns a copy of the demo signal's bytes (CSV with columns t in seconds and strain
// in microstrain, 250 samples per second).
func Strip() []byte { return append([]byte(nil), strip...) }
