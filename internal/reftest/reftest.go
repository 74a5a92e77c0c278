// Package reftest reads the reference numbers that the scripts in
// testdata/reference/ computed with outside libraries (SciPy, numpy), for
// the tests of every package that checks against them.
package reftest

import (
	"encoding/json"
	"os"
	"path/filepath"
	"runtime"
	"testing"
)

// Dir is testdata/reference/ of the module, found from this file's place
// so that a test reads it from any package's directory.
func Dir() string {
	_, file, _, _ := runtime.Caller(0)
	return filepath.Join(filepath.Dir(file), "..", "..", "testdata", "reference")
}

// JSON decodes testdata/reference/name into v, failing the test if the
// file cannot be read or decoded.
func JSON(tb testing.TB, name string, v any) {
	tb.Helper()
	b, err := os.ReadFile(filepath.Join(Dir(), name))
	if err != nil {
		tb.Fatalf("read the reference numbers: %v", err)
	}
	if err := json.Unmarshal(b, v); err != nil {
		tb.Fatalf("decode the reference numbers %s: %v", name, err)
	}
}
