package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"rampart/mc"
)

const ensembleScenario = "testdata/scenarios/ensemble.toml"

// TestRunGolden pins the summary of a small ensemble: it depends only on the
// scenario, the seed and the sample count, not on the machine or the number
// of workers.
func TestRunGolden(t *testing.T) {
	for _, w := range []string{"1", "2"} {
		stdout, stderr, code := execute(t, "run", "--scenario", ensembleScenario, "--samples", "16", "--seed", "3", "--workers", w, "--min-contrast", "0.95", "--json")
		if code != 0 {
			t.Fatalf("workers %s: exit %d: %s", w, code, stderr)
		}
		golden(t, "run-ensemble.json", stdout)
	}
	stdout, stderr, code := execute(t, "run", "--scenario", ensembleScenario, "--samples", "16", "--seed", "3", "--min-contrast", "0.95")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	golden(t, "run-ensemble.txt", stdout)
}

// TestShardsMerge checks that three shards merged give the files of one
// run, byte for byte, and the same --json object.
func TestShardsMerge(t *testing.T) {
	dir := t.TempDir()
	args := []string{"run", "--scenario", ensembleScenario, "--samples", "9", "--seed", "5", "--sampler", "lhs"}
	one := filepath.Join(dir, "one")
	want, stderr, code := execute(t, append(args, "--out", one, "--json")...)
	if code != 0 {
		t.Fatalf("run: exit %d: %s", code, stderr)
	}
	var shards []string
	for _, k := range []string{"1/3", "2/3", "3/3"} {
		d := filepath.Join(dir, "shard"+k[:1])
		if _, stderr, code := execute(t, append(args, "--shard", k, "--out", d)...); code != 0 {
			t.Fatalf("shard %s: exit %d: %s", k, code, stderr)
		}
		shards = append(shards, d)
	}
	merged := filepath.Join(dir, "merged")
	got, stderr, code := execute(t, append([]string{"merge", "--out", merged, "--json"}, shards...)...)
	if code != 0 {
		t.Fatalf("merge: exit %d: %s", code, stderr)
	}
	if got != want {
		t.Errorf("merge --json differs from run --json:\n%s\nwant\n%s", got, want)
	}
	entries, err := os.ReadDir(one)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range entries {
		if e.Name() == mc.LockFile {
			continue // names the process that wrote the directory
		}
		a, _ := os.ReadFile(filepath.Join(one, e.Name()))
		b, err := os.ReadFile(filepath.Join(merged, e.Name()))
		if err != nil {
			t.Errorf("merged directory lacks %s", e.Name())
			continue
		}
		if !bytes.Equal(a, b) {
			t.Errorf("merged %s differs from the single run's", e.Name())
		}
	}
}

// TestRunBadInput: one clear message, exit 2, and no directory content.
func TestRunBadInput(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "out")
	for _, row := range []struct {
		name string
		args []string
		msg  string
	}{
		{"zero samples", []string{"run", "--scenario", ensembleScenario, "--samples", "0", "--out", out}, "--samples 0: need at least 1 realisation"},
		{"bad sampler", []string{"run", "--scenario", ensembleScenario, "--sampler", "halton", "--out", out}, `--sampler "halton": want random, lhs or sobol`},
		{"bad shard", []string{"run", "--scenario", ensembleScenario, "--shard", "4/3", "--out", out}, `shard "4/3" is not k/n with 1 <= k <= n`},
		{"bad confidence", []string{"run", "--scenario", ensembleScenario, "--confidence", "95", "--out", out}, "--confidence 95: want a level in (0, 1)"},
		{"bad spec", []string{"run", "--scenario", ensembleScenario, "--min-contrast", "2", "--out", out}, "--min-contrast 2: want a contrast in [0, 1]"},
		{"resume nothing", []string{"run", "--scenario", ensembleScenario, "--resume", out}, "no such directory, so nothing to resume; give --out "},
		{"merge nothing", []string{"merge", out}, out + " does not exist: give the run directories of the shards"},
	} {
		_, stderr, code := execute(t, row.args...)
		if code != 2 {
			t.Errorf("%s: exit %d, want 2", row.name, code)
		}
		if lines := strings.Count(strings.TrimSpace(stderr), "\n") + 1; lines != 1 || !strings.Contains(stderr, row.msg) {
			t.Errorf("%s: stderr %q, want one line containing %q", row.name, stderr, row.msg)
		}
		if _, err := os.Stat(filepath.Join(out, "realisations.csv")); err == nil {
			t.Errorf("%s: left a realisations file", row.name)
		}
	}
	// A second run into the same directory is refused and keeps the first.
	if _, stderr, code := execute(t, "run", "--scenario", ensembleScenario, "--samples", "2", "--out", out); code != 0 {
		t.Fatalf("first run: %s", stderr)
	}
	_, stderr, code := execute(t, "run", "--scenario", ensembleScenario, "--samples", "2", "--out", out)
	if code != 2 || !strings.Contains(stderr, "already holds a run") {
		t.Errorf("second run into %s: exit %d, stderr %q; want exit 2 and 'already holds a run'", out, code, stderr)
	}
	// Resuming with another seed is refused.
	_, stderr, code = execute(t, "run", "--scenario", ensembleScenario, "--samples", "2", "--seed", "9", "--resume", out)
	if code != 2 || !strings.Contains(stderr, "seed 1, not 9") {
		t.Errorf("resume with another seed: exit %d, stderr %q", code, stderr)
	}
}

// TestRunReport checks that run --report writes one page holding every
// figure and the command that reproduces it (the page's rendering in a
// browser is tested in package report).
func TestRunReport(t *testing.T) {
	dir := t.TempDir()
	_, stderr, code := execute(t, "run", "--scenario", ensembleScenario, "--samples", "8", "--min-contrast", "0.5", "--report", dir)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	readReport(t, dir, "rampart run --scenario testdata/scenarios/ensemble.toml --samples 8 --min-contrast 0.5 --report",
		append(driveFigures, "ensemble-contrast", "ensemble-bias"), 8, "Yield (contrast &gt;= 0.5)", "[noise.depth]")
}
