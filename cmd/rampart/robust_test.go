package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"rampart/design"
	"rampart/sim"
)

// TestRobustPoorRamp runs rampart robust on a deliberately poor ramp (the
// fast test ensemble's sin2 at 100 us, p05 contrast about 0.29): the ramp
// file it writes must rank first on the fresh ensemble, resolved, and
// rampart rank, reading the file as any command does, must rank it first
// too on yet another seed.
func TestRobustPoorRamp(t *testing.T) {
	dir := t.TempDir()
	ramp := filepath.Join(dir, "better.csv")
	hist := filepath.Join(dir, "history.csv")
	stdout, stderr, code := execute(t, "robust", "--scenario", ensembleScenario, "--set", "ramp.duration_us=100", "--samples", "20",
		"--terms", "3", "--evals", "16", "--step", "0.2", "--fresh-samples", "100", "--write", ramp, "--history", hist, "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var rep struct {
		Result struct {
			Value     float64
			Reference float64 `json:"reference_value"`
			History   []any
		}
		Fresh struct {
			Ranking []struct {
				Name     string
				Resolved bool
			}
		}
	}
	if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
		t.Fatal(err)
	}
	if r := rep.Fresh.Ranking; len(r) != 2 || r[0].Name != "better" || !r[0].Resolved || rep.Result.Value <= rep.Result.Reference {
		t.Fatalf("fresh ranking %+v, objective %v from %v: want better first, resolved, and a gain", r, rep.Result.Value, rep.Result.Reference)
	}
	if n := len(rep.Result.History); n < 5 || n > 16 {
		t.Errorf("%d evaluations, want 5 to 16", n)
	}
	if lines, err := os.ReadFile(hist); err != nil || strings.Count(string(lines), "\n") != len(rep.Result.History)+1 {
		t.Errorf("history: %d lines (err %v), want %d", strings.Count(string(lines), "\n"), err, len(rep.Result.History)+1)
	}
	out, stderr, code := execute(t, "rank", "--scenario", ensembleScenario, "--set", "ramp.duration_us=100", "--ramp", "sin2=sin2",
		"--ramp", "better=file:"+ramp, "--samples", "100", "--seed", "9", "--json")
	if code != 0 {
		t.Fatalf("rank: exit %d: %s", code, stderr)
	}
	var rank struct{ Ranking []struct{ Name string } }
	if err := json.Unmarshal([]byte(out), &rank); err != nil {
		t.Fatal(err)
	}
	if len(rank.Ranking) != 2 || rank.Ranking[0].Name != "better" {
		t.Errorf("rank: %+v, want better first", rank.Ranking)
	}
}

func TestRobustBadInput(t *testing.T) {
	dir := t.TempDir()
	ramp := filepath.Join(dir, "r.csv")
	for _, tc := range []struct {
		args []string
		msg  string
	}{
		{[]string{"--terms", "13"}, "want 1 to 12"},
		{[]string{"--evals", "3"}, "want at least 8"},
		{[]string{"--objective", "best"}, "unknown objective \"best\""},
		{[]string{"--objective", "yield"}, "needs --spec FILE"},
		{[]string{"--samples", "5"}, "--samples 5: want 20"},
		{[]string{"--fresh-seed", "1"}, "is the tuning --seed"},
		{[]string{"--ramp", "x=cos2"}, "--ramp x=cos2"},
	} {
		_, stderr, code := execute(t, append([]string{"robust", "--scenario", ensembleScenario, "--write", ramp}, tc.args...)...)
		if code != 2 || !strings.Contains(stderr, tc.msg) || strings.Count(strings.TrimSpace(stderr), "\n") != 0 {
			t.Errorf("%v: exit %d, stderr %q; want 2 and one line containing %q", tc.args, code, stderr, tc.msg)
		}
		if _, err := os.Stat(ramp); err == nil {
			t.Errorf("%v: %s was written", tc.args, ramp)
		}
	}
}

// TestRobustShapeNote: a correction that makes the ramp reverse, or peak
// well above the cruise speed, is named with its peak; a gentle one is not.
func TestRobustShapeNote(t *testing.T) {
	// 4314 Hz: the benchmark ring's trap frequency as rampart prints it;
	// the shape only needs a plausible one.
	up, err := sim.NewShape("sin2", 100e-6, 500, 2*math.Pi*4314)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		coef []float64
		want string
	}{
		{[]float64{0, 0, 0, 0}, ""},
		{[]float64{1.5, 0, 0, 0}, "rampart: note: the best ramp"},
	} {
		r, err := design.NewCorrected(up, c.coef, "x")
		if err != nil {
			t.Fatal(err)
		}
		got := robustShapeNote(r, "best.csv")
		peak, rev := sim.PeakSpeed(r)
		if (c.want == "") != (got == "") || !strings.HasPrefix(got, c.want) {
			t.Errorf("coefficients %v (peak %g rad/s, reverses %v): note %q, want one starting %q", c.coef, peak, rev, got, c.want)
		}
	}
	if robustShapeNote(nil, "x") != "" {
		t.Error("no ramp: want no note")
	}
}
