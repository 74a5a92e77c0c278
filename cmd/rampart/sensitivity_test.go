package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"rampart/cmd/internal/present"
)

// sensitivityArgs is a small design on the fast ensemble: 4 base rows of
// its 6 static inputs (common and differential depth, clock, skew, and the
// two pulse areas), 4 (6 + 2) = 32 shots.
var sensitivityArgs = []string{"sensitivity", "--scenario", ensembleScenario, "--base", "4", "--seed", "3"}

// TestSensitivityGolden pins the index and derivative tables.
func TestSensitivityGolden(t *testing.T) {
	stdout, stderr, code := execute(t, sensitivityArgs...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	golden(t, "sensitivity-ensemble.txt", stdout)
}

// TestSensitivityReport checks that sensitivity --report writes its page
// with the bar charts and both tables.
func TestSensitivityReport(t *testing.T) {
	dir := t.TempDir()
	if _, stderr, code := execute(t, append(sensitivityArgs, "--report", dir)...); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	readReport(t, dir, "rampart "+strings.Join(sensitivityArgs, " ")+" --report", append(driveFigures, "sensitivity-contrast", "sensitivity-bias"), 8,
		"Sobol&#39; indices of contrast and bias, 32 shots", "d2C/dx2")
}

// TestSensitivityStore checks the design's size, the files of --out, that
// the merged shards give the indices of one run, and that a resume with
// another design is refused.
func TestSensitivityStore(t *testing.T) {
	dir := t.TempDir()
	one := filepath.Join(dir, "one")
	want, stderr, code := execute(t, append(sensitivityArgs, "--out", one, "--json")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var rep struct {
		Inputs      []string          `json:"inputs"`
		Shots       int               `json:"shots"`
		Indices     map[string]any    `json:"indices"`
		Derivatives []json.RawMessage `json:"derivatives"`
	}
	if err := json.Unmarshal([]byte(want), &rep); err != nil {
		t.Fatal(err)
	}
	// Every static input has a derivative; the design has n (d + 2) shots.
	if len(rep.Inputs) != 6 || rep.Shots != 32 || len(rep.Derivatives) != 6 || rep.Indices["evaluations"] != 32.0 {
		t.Errorf("inputs %v, %d shots, %d derivatives, indices %v; want 6 inputs, 32 shots and evaluations, 6 derivatives", rep.Inputs, rep.Shots, len(rep.Derivatives), rep.Indices)
	}
	if rows := readCSV(t, filepath.Join(one, "realisations.csv")); len(rows)-1 != 32 {
		t.Errorf("%d stored shots, want 32", len(rows)-1)
	}
	for _, f := range []string{present.SensitivityFile, "sensitivity-contrast.svg", "sensitivity-contrast.png", "sensitivity-bias.svg", "sensitivity-bias.png"} {
		if _, err := os.Stat(filepath.Join(one, f)); err != nil {
			t.Error(err)
		}
	}

	var shards []string
	for _, k := range []string{"1", "2"} {
		d := filepath.Join(dir, "d"+k)
		stdout, stderr, code := execute(t, append(sensitivityArgs, "--shard", k+"/2", "--out", d)...)
		if code != 0 || !strings.Contains(stdout, "rampart merge --out ALL D1 D2") {
			t.Fatalf("shard %s: exit %d, stdout %q, stderr %q", k, code, stdout, stderr)
		}
		shards = append(shards, d)
	}
	all := filepath.Join(dir, "all")
	if _, stderr, code := execute(t, append([]string{"merge", "--out", all}, shards...)...); code != 0 {
		t.Fatalf("merge: %s", stderr)
	}
	got, stderr, code := execute(t, append(sensitivityArgs, "--resume", all, "--json")...)
	if code != 0 || got != want {
		t.Errorf("merged shards: exit %d (%s), JSON\n%s\nwant\n%s", code, stderr, got, want)
	}

	_, stderr, code = execute(t, "sensitivity", "--scenario", ensembleScenario, "--base", "8", "--seed", "3", "--resume", one)
	if code != 2 || !strings.Contains(stderr, "holds a design of 32 shots, 4 base rows for these 6 inputs, not 8: give --base 4") {
		t.Errorf("resume with another design: exit %d, stderr %q", code, stderr)
	}
}

// TestSensitivityBadInput: exit 2 and one line.
func TestSensitivityBadInput(t *testing.T) {
	out := filepath.Join(t.TempDir(), "out")
	expectRefused(t, out, []refusal{
		{"samples", append(sensitivityArgs, "--samples", "100", "--out", out), "--samples does not apply to sensitivity"},
		{"base", []string{"sensitivity", "--scenario", ensembleScenario, "--base", "1", "--out", out}, "--base 1: want at least 2 base rows"},
		{"no source", []string{"sensitivity", "--scenario", "testdata/scenarios/benchmark.toml", "--base", "4", "--out", out}, "no active source, so there is no spread to apportion: set one or more of noise.depth.common_rel"},
		{"shard without a directory", append(sensitivityArgs, "--shard", "1/2"), "--shard 1/2 needs --out DIR"},
	})
}
