package main

import (
	"encoding/json"
	"os"
	"testing"

	"rampart/internal/version"
)

// testBuild is the build every output of the tests names, so that goldens
// do not depend on how the test binary was built.
var testBuild = version.Info{Version: "test", Revision: "test"}

func TestMain(m *testing.M) {
	restore := version.Override(testBuild)
	code := m.Run()
	restore()
	os.Exit(code)
}

func TestVersionFlag(t *testing.T) {
	stdout, stderr, code := execute(t, "--version")
	if code != 0 || stderr != "" || stdout != "rampart test (revision test)\n" {
		t.Errorf("--version: exit %d, stdout %q, stderr %q", code, stdout, stderr)
	}
}

func TestStampVersion(t *testing.T) {
	for _, c := range []struct {
		in   any
		want string
	}{
		{map[string]int{"a": 1}, `{"rampart":{"version":"test","revision":"test"},"a":1}`},
		{struct{}{}, `{"rampart":{"version":"test","revision":"test"}}`},
		{[]int{1}, `[1]`}, // not an object: unchanged
	} {
		b, err := stampVersion(c.in)
		if err != nil || string(b) != c.want || !json.Valid(b) {
			t.Errorf("stampVersion(%v) = %s, %v, want %s", c.in, b, err, c.want)
		}
	}
}
