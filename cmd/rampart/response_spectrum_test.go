package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// TestResponseSpectrum checks --spectrum on the fast ensemble's small
// ring: a power law of exponent 0 is the white level of its coefficient,
// and a sum of terms predicts the sum of their predictions (both effects
// are linear in the PSD; docs/model.md, Noise transfer functions), each to
// 1e-9 relative (rounding and the sums' order); the platform's rotation
// noise is a pure phase (no contrast loss) whose bias variance is linear in
// its level (1e-9 relative); and bad values are refused
// with exit 2 and a message naming what would be accepted.
func TestResponseSpectrum(t *testing.T) {
	run := func(spec string) (loss, biasStd float64) {
		t.Helper()
		stdout, stderr, code := execute(t, "response", "--scenario", ensembleScenario, "--set", "ring.sites=10", "--set", "ring.radius_um=2.5",
			"--spectrum", spec, "--json")
		if code != 0 {
			t.Fatalf("--spectrum %s: exit %d: %s", spec, code, stderr)
		}
		var rep struct {
			Predicted struct {
				ContrastLoss float64 `json:"contrast_loss"`
				BiasStdRad   float64 `json:"bias_std_rad"`
			}
		}
		if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
			t.Fatal(err)
		}
		return rep.Predicted.ContrastLoss, rep.Predicted.BiasStdRad
	}
	predict := func(spec string) float64 { t.Helper(); l, _ := run(spec); return l }
	white := predict("rin=white:1e-11")
	flat := predict("rin=powerlaw:1e-11:0")
	pink := predict("rin=powerlaw:1e-8:-1")
	sum := predict("rin=white:1e-11+powerlaw:1e-8:-1")
	if !(white > 0) || math.Abs(flat/white-1) > 1e-9 {
		t.Errorf("powerlaw of exponent 0: loss %.12g, white %.12g (tol 1e-9 relative)", flat, white)
	}
	if math.Abs(sum/(white+pink)-1) > 1e-9 {
		t.Errorf("sum of terms: loss %.12g, sum of the terms' %.12g (tol 1e-9 relative)", sum, white+pink)
	}
	// The fast ensemble's budget has no other noise process: the
	// prediction is the rotation noise's alone.
	l1, s1 := run("rotation=white:1")
	l4, s4 := run("rotation=powerlaw:4:0")
	if l1 != 0 || l4 != 0 || !(s1 > 0) || math.Abs(s4/s1-2) > 2e-9 {
		t.Errorf("rotation noise: losses %g and %g (want 0), bias std %.12g at 1 and %.12g at 4 (urad/s)^2/Hz (want twice)", l1, l4, s1, s4)
	}
	// --spectrum takes the budget's unit: 1 (urad/s)^2/Hz predicts what
	// the scenario's rotation_noise_urad2_s2_hz = 1 does.
	stdout, stderr, code := execute(t, "response", "--scenario", ensembleScenario, "--set", "ring.sites=10", "--set", "ring.radius_um=2.5",
		"--set", "noise.platform.rotation_noise_urad2_s2_hz=1", "--json")
	if code != 0 {
		t.Fatalf("rotation_noise_urad2_s2_hz=1: exit %d: %s", code, stderr)
	}
	var rep struct {
		Predicted struct {
			BiasStdRad float64 `json:"bias_std_rad"`
		}
	}
	if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
		t.Fatal(err)
	}
	if b := rep.Predicted.BiasStdRad; math.Abs(b/s1-1) > 1e-9 {
		t.Errorf("rotation noise 1 (urad/s)^2/Hz: --spectrum predicts %.12g rad, the scenario's key %.12g rad", s1, b)
	}
	for _, tc := range []struct{ spec, want string }{
		{"laser=white:1", "unknown process"},
		{"rin=white:-1", "must be positive"},
		{"rin=brown:1", "want white:S, powerlaw:H:ALPHA or table:FILE"},
		{"field=table:x.csv", "x.csv"},
		{"rotation=table:testdata/demo/spec.toml", "rotation noise has no table format"},
		{"phase", "PROCESS=TERM"},
	} {
		_, stderr, code := execute(t, "response", "--scenario", ensembleScenario, "--spectrum", tc.spec)
		if code != 2 || !strings.Contains(stderr, tc.want) {
			t.Errorf("--spectrum %s: exit %d, stderr %q; want 2 and %q", tc.spec, code, stderr, tc.want)
		}
	}
}
