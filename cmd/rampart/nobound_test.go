package main

import (
	"encoding/json"
	"path/filepath"
	"strings"
	"testing"

	"rampart/scenario"
)

// TestNoBoundWording: a confidence bound that does not exist at the
// ensemble size is printed as run prints it, "none below N", not as the
// end of the statistic's range (0), in rank's and qualify's tables. N is
// the smallest size with the bound (mc.TestRankNoBound and
// mc.TestCriterionNoBound derive it, Wilks 1941): 86 for the 5th
// percentile of two ramps at 95 % simultaneous, 69 one-sided on qualify's
// first look.
func TestNoBoundWording(t *testing.T) {
	stdout, stderr, code := execute(t, "rank", "--scenario", ensembleScenario, "--ramp", "a=sin2", "--ramp", "b=inverse", "--samples", "20")
	if code != 0 {
		t.Fatalf("rank: exit %d: %s", code, stderr)
	}
	// Each place's own interval, the first's difference to the next and
	// the second's difference to the best; then the note.
	if n := strings.Count(stdout, " none below 86 |"); n != 4 || !strings.Contains(stdout, "\nnone below 86: no order statistic") {
		t.Errorf("rank --samples 20: %d cells \"none below 86\" (want 4) or no note:\n%s", n, stdout)
	}
	if strings.Contains(stdout, "[0.00000, 0.9") {
		t.Errorf("rank --samples 20 prints the range's end as a bound:\n%s", stdout)
	}
	stdout, _, _ = execute(t, "rank", "--scenario", ensembleScenario, "--ramp", "a=sin2", "--ramp", "b=inverse", "--samples", "20", "--json")
	var rep struct {
		Ranking []struct {
			Name         string
			Lo, Hi       *float64
			NoBoundBelow int `json:"no_bound_below"`
		}
	}
	if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
		t.Fatal(err)
	}
	for _, p := range rep.Ranking {
		if p.Lo != nil || p.Hi == nil || p.NoBoundBelow != 86 {
			t.Errorf("rank --json place %s: lo %v, hi %v, no_bound_below %d; want lo null, hi a number, 86", p.Name, p.Lo, p.Hi, p.NoBoundBelow)
		}
	}
	dir := t.TempDir()
	spec := writeSpec(t, dir, "spec.toml", "[contrast]\np05_min = 0.1\n")
	stdout, stderr, _ = execute(t, "qualify", "--scenario", ensembleScenario, "--spec", spec, "--samples", "10")
	if !strings.Contains(stdout, " none below 69 |") || strings.Contains(stdout, " 0.00000 |") {
		t.Errorf("qualify --samples 10: want the lower bound as \"none below 69\":\n%s%s", stdout, stderr)
	}
	stdout, _, _ = execute(t, "qualify", "--scenario", ensembleScenario, "--spec", spec, "--samples", "10", "--json")
	if !strings.Contains(stdout, `"lo": null`) {
		t.Errorf("qualify --samples 10 --json: want \"lo\": null:\n%s", stdout)
	}
}

// TestKernelPredictionSkippedJSON: when the kernels are skipped (here a
// memory cap of 0 MiB), the JSON gives the reason alone, without a
// nominal contrast, loss or bias std of 0 that were never computed.
func TestKernelPredictionSkippedJSON(t *testing.T) {
	_, cfg, budget, err := scenario.LoadBudget(filepath.Join(repoRoot, ensembleScenario),
		[]string{"atom.zeeman_linear_hz_g=1.4e6", "noise.field.noise_ug2_hz=1e-4"})
	if err != nil {
		t.Fatal(err)
	}
	p, err := kernelPrediction(cfg, budget, 0)
	if err != nil || p == nil || p.Skipped == "" {
		t.Fatalf("cap 0 MiB: %+v, %v; want a skipped prediction", p, err)
	}
	js, err := json.Marshal(p)
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]any
	if err := json.Unmarshal(js, &m); err != nil {
		t.Fatal(err)
	}
	if _, ok := m["skipped"]; !ok || len(m) != 1 {
		t.Errorf("skipped prediction %s: want the key skipped alone", js)
	}
}
