// Package rampart holds the files the rampart binary ships with: the
// built-in demo of `rampart demo`, kept in testdata/demo so that the tests
// and the binary read the same files.
package rampart

import "embed"

// Demo holds testdata/demo: the demo scenario and the files it refers to.
//
//go:embed testdata/demo
var Demo embed.FS
