package main

import (
	"encoding/json"
	"path/filepath"
	"strings"
	"testing"
)

// TestQualifyScaleFactorCriterion checks that a spec with [scale_factor]
// makes qualify measure every realisation's scale-factor error without a
// flag: the criterion is decided (on the inverse ramp the errors are the
// ppm-scale non-adiabatic lags: measured mean 0.08 ppm, |.| p95 0.35 ppm,
// far inside 50 ppm; 80 realisations bound a 95th percentile at 95 %),
// and the JSON
// summary carries the distribution; then that resuming the run without
// the criterion (so without the column) is refused with what differs.
func TestQualifyScaleFactorCriterion(t *testing.T) {
	dir := t.TempDir()
	spec := writeSpec(t, dir, "sf.toml", "[scale_factor]\nabs_p95_max_ppm = 50\n")
	out := filepath.Join(dir, "run")
	stdout, stderr, code := execute(t, append(qualifyArgs(spec), "--json", "--out", out)...)
	if code != 0 {
		t.Fatalf("exit %d, stderr %q", code, stderr)
	}
	var rep struct {
		Verdict  string `json:"verdict"`
		Criteria []struct {
			Name    string  `json:"name"`
			Value   float64 `json:"value"`
			Verdict string  `json:"verdict"`
		} `json:"criteria"`
		Summary struct {
			SF *struct {
				Mean float64 `json:"mean"`
			} `json:"scale_factor_error_ppm"`
			Numerics *struct {
				Met bool `json:"met"`
			} `json:"numerics_error"`
		} `json:"summary"`
	}
	if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
		t.Fatal(err)
	}
	if len(rep.Criteria) != 1 || rep.Criteria[0].Name != "scale_factor.abs_p95_max_ppm" || rep.Criteria[0].Verdict != "pass" || rep.Verdict != "pass" {
		t.Errorf("criteria %+v, verdict %s; want scale_factor.abs_p95_max_ppm passing", rep.Criteria, rep.Verdict)
	}
	if rep.Summary.SF == nil || rep.Summary.Numerics == nil || !rep.Summary.Numerics.Met {
		t.Fatalf("summary lacks the scale-factor distribution or the numerics estimate: %s", stdout)
	}
	t.Logf("|scale-factor error| p95 %.3g ppm, mean error %.3g ppm", rep.Criteria[0].Value, rep.Summary.SF.Mean)
	if m := rep.Summary.SF.Mean; !(m > -10 && m < 10) {
		t.Errorf("mean scale-factor error %g ppm, want within 10 ppm of 0 (a ramp's lag is of order ppm)", m)
	}
	_, stderr, code = execute(t, "run", "--scenario", ensembleScenario, "--set", "ramp.shape=inverse", "--samples", "80", "--seed", "3", "--resume", out)
	if code != 2 || !strings.Contains(stderr, "records with scale-factor errors, not without them") {
		t.Errorf("resume without the column: exit %d, stderr %q; want 2 and what differs", code, stderr)
	}
}
