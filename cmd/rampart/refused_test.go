package main

import (
	"os"
	"strings"
	"testing"
)

// refusal is a command line that must be refused as bad input.
type refusal struct {
	name string
	args []string
	msg  string // the one line on stderr contains this
}

// expectRefused runs each command line and checks that it exits with 2,
// prints nothing on stdout and one line on stderr, and leaves out unmade.
func expectRefused(t *testing.T, out string, rows []refusal) {
	t.Helper()
	for _, row := range rows {
		stdout, stderr, code := execute(t, row.args...)
		if code != 2 || stdout != "" {
			t.Errorf("%s: exit %d, stdout %q; want 2 and nothing", row.name, code, stdout)
		}
		if strings.Count(stderr, "\n") != 1 || !strings.Contains(stderr, row.msg) {
			t.Errorf("%s: stderr %q, want one line containing %q", row.name, stderr, row.msg)
		}
		if _, err := os.Stat(out); err == nil {
			t.Fatalf("%s: created %s", row.name, out)
		}
	}
}
