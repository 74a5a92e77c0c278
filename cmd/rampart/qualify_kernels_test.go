package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// TestQualifyKernelPrediction checks that qualify states the noise
// transfer functions' prediction for the budget's noise processes beside
// its verdict (the JSON field kernel_prediction and a note), here white
// field noise on the fast ensemble, whose one process's prediction is the
// total; with the platform's rotation noise added, both processes, their
// bias variances adding to the total's (independent processes; 1e-12
// relative); and that a budget without noise processes has neither.
func TestQualifyKernelPrediction(t *testing.T) {
	dir := t.TempDir()
	spec := writeSpec(t, dir, "bias.toml", "[bias]\nabs_p95_max_rad = 0.1\n")
	args := []string{"qualify", "--scenario", ensembleScenario, "--set", "atom.zeeman_linear_hz_g=1.4e6",
		"--set", "noise.field.noise_ug2_hz=1e-4", "--samples", "80", "--spec", spec}
	stdout, stderr, code := execute(t, append(args, "--json")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var rep struct {
		Kernel *struct {
			ContrastLoss float64 `json:"contrast_loss"`
			BiasStdRad   float64 `json:"bias_std_rad"`
			ByProcess    []struct {
				Process    string
				BiasStdRad float64 `json:"bias_std_rad"`
			} `json:"by_process"`
		} `json:"kernel_prediction"`
	}
	if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
		t.Fatal(err)
	}
	k := rep.Kernel
	if k == nil || len(k.ByProcess) != 1 || k.ByProcess[0].Process != "field" || !(k.BiasStdRad > 0) || math.Abs(k.ByProcess[0].BiasStdRad-k.BiasStdRad) > 1e-15 {
		t.Fatalf("kernel_prediction %+v: want field noise alone, its positive bias std the total", k)
	}
	both := append(append([]string{}, args...), "--set", "noise.platform.rotation_noise_urad2_s2_hz=100", "--json")
	stdout, stderr, code = execute(t, both...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	rep.Kernel = nil
	if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
		t.Fatal(err)
	}
	if k = rep.Kernel; k == nil || len(k.ByProcess) != 2 || k.ByProcess[0].Process != "field" || k.ByProcess[1].Process != "rotation" || !(k.ByProcess[1].BiasStdRad > 0) ||
		math.Abs(math.Hypot(k.ByProcess[0].BiasStdRad, k.ByProcess[1].BiasStdRad)/k.BiasStdRad-1) > 1e-12 {
		t.Fatalf("kernel_prediction %+v: want field and rotation noise, their variances adding to the total's", k)
	}
	stdout, _, _ = execute(t, args...)
	if !strings.Contains(stdout, "Noise transfer functions (docs/model.md, Noise transfer functions): the budget's noise processes during the shot are predicted") {
		t.Errorf("no prediction note:\n%s", stdout)
	}
	stdout, _, _ = execute(t, "qualify", "--scenario", ensembleScenario, "--samples", "80", "--spec", spec, "--json")
	if strings.Contains(stdout, "kernel_prediction") {
		t.Errorf("a static budget has a kernel prediction:\n%s", stdout)
	}
}
