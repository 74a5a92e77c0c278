package main

import (
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
