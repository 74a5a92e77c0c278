package main

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"rampart/cmd/internal/present"
)

// qualifyArgs qualifies a small fixed-seed ensemble of the inverse ramp.
func qualifyArgs(spec string) []string {
	return []string{"qualify", "--scenario", ensembleScenario, "--set", "ramp.shape=inverse", "--samples", "80", "--seed", "3", "--spec", spec}
}

// writeSpec writes a spec file into dir.
func writeSpec(t *testing.T, dir, name, text string) string {
	t.Helper()
	path := filepath.Join(dir, name)
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// qualifyJSON is the part of qualify --json the tests read (mc.Verdict
// encodes as text only).
type qualifyJSON struct {
	Verdict  string `json:"verdict"`
	Criteria []struct {
		Value      float64 `json:"value"`
		Lo         float64 `json:"lo"`
		Hi         float64 `json:"hi"`
		Verdict    string  `json:"verdict"`
		Extra      int     `json:"extra_realisations"`
		OutOfReach bool    `json:"out_of_reach"`
	} `json:"criteria"`
}

// TestQualifyExitCodes crafts specs around the measured values of a
// fixed-seed ensemble: a limit below the lower bound passes, one above the
// upper bound fails, and one between the bounds is undecided; each verdict
// has its exit code (0, 1, 3) and, but for pass, one line on stderr.
func TestQualifyExitCodes(t *testing.T) {
	dir := t.TempDir()
	probe := writeSpec(t, dir, "probe.toml", "[contrast]\np05_min = 0.5\n")
	stdout, stderr, code := execute(t, append(qualifyArgs(probe), "--json")...)
	if code != 0 {
		t.Fatalf("probe: exit %d: %s", code, stderr)
	}
	var q qualifyJSON
	if err := json.Unmarshal([]byte(stdout), &q); err != nil {
		t.Fatal(err)
	}
	c := q.Criteria[0]
	if !(c.Lo < c.Value && c.Value < c.Hi) {
		t.Fatalf("probe bounds [%v, %v] about %v: want a spread to place limits in", c.Lo, c.Hi, c.Value)
	}
	for _, row := range []struct {
		verdict string
		limit   float64
		code    int
	}{
		{"pass", c.Lo - 0.01, 0},
		{"fail", c.Hi + 0.001, 1},
		{"undecided", (c.Value + c.Hi) / 2, 3},
	} {
		spec := writeSpec(t, dir, row.verdict+".toml", fmt.Sprintf("[contrast]\np05_min = %.17g\n", row.limit))
		stdout, stderr, code := execute(t, qualifyArgs(spec)...)
		if code != row.code {
			t.Errorf("%s: exit %d, want %d; stderr %q", row.verdict, code, row.code, stderr)
		}
		if !strings.Contains(stdout, "Verdict: "+row.verdict+".") {
			t.Errorf("%s: no verdict line in\n%s", row.verdict, stdout)
		}
		if row.code == 0 {
			if stderr != "" {
				t.Errorf("pass: stderr %q", stderr)
			}
			continue
		}
		if strings.Count(stderr, "\n") != 1 || !strings.HasPrefix(stderr, "rampart: "+row.verdict+" against spec") {
			t.Errorf("%s: stderr %q, want one line", row.verdict, stderr)
		}
	}
	// The undecided criterion says how many more realisations would decide it.
	stdout, _, _ = execute(t, append(qualifyArgs(filepath.Join(dir, "undecided.toml")), "--json")...)
	if err := json.Unmarshal([]byte(stdout), &q); err != nil {
		t.Fatal(err)
	}
	if c := q.Criteria[0]; q.Verdict != "undecided" || c.Verdict != "undecided" || (c.Extra <= 0 && !c.OutOfReach) {
		t.Errorf("undecided criterion %+v: want extra realisations or out of reach", c)
	}
}

// TestQualifyLook: --look 2 tests at the second look's share of the 5 %,
// 0.05 x 6/(4 pi^2) = 0.0075991 (stats.LookAlpha), at which no order
// statistic of 80 bounds a 5th percentile: that needs
// ceil(ln 0.0075991 / ln 0.95) = 96, and the third look's level
// (0.05 x 6/(9 pi^2)) 111, 31 more than 80 (by hand). --look 0 is refused.
func TestQualifyLook(t *testing.T) {
	dir := t.TempDir()
	spec := writeSpec(t, dir, "p05.toml", "[contrast]\np05_min = 0.5\n")
	stdout, stderr, code := execute(t, append(qualifyArgs(spec), "--look", "2", "--json")...)
	if want := "no 99.24 % bound below 96 realisations: about 31 more"; code != 3 || !strings.Contains(stderr, want) {
		t.Fatalf("exit %d, stderr %q; want 3 and %q", code, stderr, want)
	}
	var q struct {
		Look           int     `json:"look"`
		LookConfidence float64 `json:"look_confidence"`
	}
	if err := json.Unmarshal([]byte(stdout), &q); err != nil {
		t.Fatal(err)
	}
	if want := 1 - 0.0075990887731753; q.Look != 2 || math.Abs(q.LookConfidence-want) > 1e-15 {
		t.Errorf("look %d at %v, want 2 at %v (tol 1e-15)", q.Look, q.LookConfidence, want)
	}
	if _, stderr, code := execute(t, append(qualifyArgs(spec), "--look", "0")...); code != 2 || !strings.Contains(stderr, "--look 0") {
		t.Errorf("--look 0: exit %d, stderr %q; want 2 and a message", code, stderr)
	}
}

// TestQualifyGolden pins the table of a spec with every kind of criterion
// and the gyroscope figures of a [readout] given by flags.
func TestQualifyGolden(t *testing.T) {
	stdout, _, code := execute(t, append(qualifyArgs("testdata/demo/spec.toml"), "--atoms", "1e4", "--cycle-s", "0.5")...)
	if code != 1 {
		t.Fatalf("exit %d, want 1 (the fast ensemble misses the demo's bias limit)", code)
	}
	golden(t, "qualify-ensemble.txt", stdout)
}

// TestQualifyOut: the ensemble is kept as run keeps it, with the verdict.
func TestQualifyOut(t *testing.T) {
	out := filepath.Join(t.TempDir(), "q")
	if _, stderr, code := execute(t, append(qualifyArgs("testdata/demo/spec.toml"), "--out", out)...); code != 1 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	for _, f := range []string{"manifest.json", "realisations.csv", present.SummaryFile, present.QualificationFile} {
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Error(err)
		}
	}
}

// TestQualifyReport checks that qualify --report writes its page, with the
// verdict, also when the verdict is fail.
func TestQualifyReport(t *testing.T) {
	dir := t.TempDir()
	args := qualifyArgs("testdata/demo/spec.toml")
	if _, stderr, code := execute(t, append(args, "--report", dir)...); code != 1 {
		t.Fatalf("exit %d, want 1 (the fast ensemble misses the demo's bias limit): %s", code, stderr)
	}
	readReport(t, dir, "rampart "+strings.Join(args, " ")+" --report", append(driveFigures, "qualify-contrast", "qualify-bias"), 8,
		"Verdict: fail. Missed with 95 % confidence: bias.abs_p95_max_rad, yield.min.", "Qualification against testdata/demo/spec.toml", "Gyroscope figure")
}

// TestQualifyBadInput: a bad spec or flag is exit 2 with one line, before
// anything runs or is written.
func TestQualifyBadInput(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "out")
	unknown := writeSpec(t, dir, "unknown.toml", "[contrast]\np10_min = 0.9\n")
	empty := writeSpec(t, dir, "empty.toml", "confidence = 0.9\n")
	good := writeSpec(t, dir, "good.toml", "[contrast]\np05_min = 0.9\n")
	expectRefused(t, out, []refusal{
		{"unknown key", append(qualifyArgs(unknown), "--out", out), `spec "` + unknown + `" line 2`},
		{"no criterion", append(qualifyArgs(empty), "--out", out), `spec "` + empty + `"`},
		{"missing spec", append(qualifyArgs(filepath.Join(dir, "none.toml")), "--out", out), "none.toml"},
		{"no spec flag", []string{"qualify", "--scenario", ensembleScenario}, `qualify needs --spec (`},
		{"confidence out of range", append(qualifyArgs(good), "--confidence", "0.4", "--out", out), "--confidence 0.4 for spec"},
		{"shard without a directory", append(qualifyArgs(good), "--shard", "1/2"), "--shard 1/2 needs --out DIR"},
	})
}
