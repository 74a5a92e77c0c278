package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// TestEdgeShortestRamp searches the shortest ramp of the fast ensemble that
// keeps its 5th-percentile contrast at 0.95, then confirms the value found
// with rampart qualify on the same seed: the search qualified that point at
// a stricter level (99 %, one of five points) than qualify's first look
// (96.96 %), so qualify must pass it too; and the bracket's lower end, which
// the search found not passing, lies below the value.
func TestEdgeShortestRamp(t *testing.T) {
	dir := t.TempDir()
	spec := writeSpec(t, dir, "spec.toml", "[contrast]\np05_min = 0.95\n")
	out := filepath.Join(dir, "edge")
	stdout, stderr, code := execute(t, "edge", "--scenario", ensembleScenario, "--spec", spec, "--key", "ramp.duration_us",
		"--range", "50:350", "--steps", "3", "--samples", "120", "--json", "--out", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var rep struct {
		Found           bool
		Value           float64
		Bracket         [2]float64
		PointConfidence float64 `json:"point_confidence"`
		Evaluations     []struct{ Value float64 }
	}
	if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
		t.Fatal(err)
	}
	if !rep.Found || rep.Bracket[1] != rep.Value || rep.Bracket[0] >= rep.Value || len(rep.Evaluations) != 5 {
		t.Fatalf("found %v at %g, bracket %v after %d points: want a value at the top of its bracket after 5", rep.Found, rep.Value, rep.Bracket, len(rep.Evaluations))
	}
	// Bonferroni: 1 - 0.05/5.
	if rep.PointConfidence != 0.99 {
		t.Errorf("point confidence %g, want 0.99", rep.PointConfidence)
	}
	v := strconv.FormatFloat(rep.Value, 'g', -1, 64)
	if _, stderr, code := execute(t, "qualify", "--scenario", ensembleScenario, "--spec", spec, "--set", "ramp.duration_us="+v,
		"--samples", "120"); code != 0 {
		t.Errorf("qualify at %s us: exit %d (%s), want pass", v, code, stderr)
	}
	if _, err := os.Stat(filepath.Join(out, "edge.json")); err != nil {
		t.Error(err)
	}
	// Nothing in a range of short ramps: exit 1, the first point failing.
	_, stderr, code = execute(t, "edge", "--scenario", ensembleScenario, "--spec", spec, "--key", "ramp.duration_us",
		"--range", "20:40", "--steps", "3", "--samples", "120")
	if code != 1 || !strings.Contains(stderr, "no value of ramp.duration_us in [20, 40] meets spec") {
		t.Errorf("short range: exit %d, stderr %q; want 1 and no value", code, stderr)
	}
}

func TestEdgeBadInput(t *testing.T) {
	dir := t.TempDir()
	spec := writeSpec(t, dir, "spec.toml", "[contrast]\np05_min = 0.95\n")
	out := filepath.Join(dir, "out")
	for _, tc := range []struct {
		args []string
		msg  string
	}{
		{[]string{"--range", "100"}, "want FROM:TO"},
		{[]string{"--range", "1:2:3"}, "want FROM:TO"},
		{[]string{"--range", "100:100"}, "want FROM:TO"},
		{[]string{"--range", "100:200", "--steps", "31"}, "want 0 to 30"},
		{[]string{"--range", "100:200", "--samples", "50"}, "give at least 90"},
		{[]string{"--range", "-5:200"}, "--key ramp.duration_us at ramp.duration_us=-5"},
	} {
		args := append([]string{"edge", "--scenario", ensembleScenario, "--spec", spec, "--key", "ramp.duration_us", "--steps", "3", "--out", out}, tc.args...)
		_, stderr, code := execute(t, args...)
		if code != 2 || !strings.Contains(stderr, tc.msg) || strings.Count(strings.TrimSpace(stderr), "\n") != 0 {
			t.Errorf("%v: exit %d, stderr %q; want 2 and one line containing %q", tc.args, code, stderr, tc.msg)
		}
		if _, err := os.Stat(out); err == nil {
			t.Errorf("%v: %s was created", tc.args, out)
		}
	}
}
