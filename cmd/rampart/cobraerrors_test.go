package main

import (
	"strings"
	"testing"
)

// TestCobraErrorsExplained checks that a missing required flag and a stray
// argument are reported with the flag's meaning or what the command takes,
// exit 2 and nothing on stdout.
func TestCobraErrorsExplained(t *testing.T) {
	for _, row := range []struct {
		args []string
		want string
	}{
		{[]string{"qualify", "--scenario", ensembleScenario}, "qualify needs --spec (spec file (TOML) of the criteria to meet); see rampart qualify --help"},
		{[]string{"edge", "--scenario", ensembleScenario}, "edge needs --key ("},
		{[]string{"shot", "--scenario", ensembleScenario, "extra"}, `shot: unexpected argument "extra": the command takes flags only (a scenario is given as --scenario FILE); see rampart shot --help`},
		{[]string{"demo", "extra"}, `demo: unexpected argument "extra": the command takes flags only; see rampart demo --help`},
	} {
		stdout, stderr, code := execute(t, row.args...)
		if code != 2 || stdout != "" || !strings.Contains(stderr, row.want) {
			t.Errorf("%v: exit %d, stdout %q, stderr %q; want exit 2 and %q", row.args, code, stdout, stderr, row.want)
		}
	}
}
