package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"rampart/scenario"
	"rampart/sim"
)

// steepTable writes a ramp table with one steep row (the speed jumps from
// 10 to 490 rad/s in 1 us at 100 us) to a temporary file. With the step
// fixed at 19 us, the duration rule's step, its contrast errs by 1.2e-4
// (measured against a step of 0.1 us), above the 1e-4 target.
func steepTable(t *testing.T) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "steep.csv")
	if err := os.WriteFile(path, []byte("t_s,omega_rad_s\n0,0\n1e-04,10\n1.01e-04,490\n1.5e-04,500\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// TestShotCheckExitCode checks that shot --check exits with
// ExitCheckFailed when the numerics miss the targets, after printing its
// tables, and names the remedy on stderr; and that the automatic step on
// the same table passes (exit 0).
func TestShotCheckExitCode(t *testing.T) {
	table := steepTable(t)
	args := []string{"shot", "--scenario", "testdata/scenarios/file.toml", "--set", "ramp.file=" + table, "--check"}
	stdout, stderr, code := execute(t, append(args, "--set", "numerics.step_us=19")...)
	if code != ExitCheckFailed {
		t.Errorf("fixed step 19 us: exit %d, want %d; stderr %q", code, ExitCheckFailed, stderr)
	}
	if !strings.Contains(stdout, "Numerics check") || !strings.Contains(stdout, "|     no |") {
		t.Errorf("fixed step 19 us: the tables lack the failed check:\n%s", stdout)
	}
	if !strings.Contains(stderr, "numerics.step_us = 9.5") {
		t.Errorf("stderr %q does not give the remedy numerics.step_us = 9.5", stderr)
	}
	// Without --check the tables are printed and the exit code is the same,
	// with the remedy (a new user's hand-set grid gave a wrong contrast
	// with exit 0 before).
	stdout, stderr, code = execute(t, append(args[:len(args)-1:len(args)-1], "--set", "numerics.step_us=19")...)
	if code != ExitCheckFailed || !strings.Contains(stderr, "numerics.step_us = 9.5") || !strings.Contains(stdout, "Contrast C = |z|") {
		t.Errorf("fixed step 19 us without --check: exit %d (want %d), stderr %q, stdout:\n%s", code, ExitCheckFailed, stderr, stdout)
	}
	if _, stderr, code := execute(t, args...); code != 0 {
		t.Errorf("automatic step: exit %d, stderr %q; want 0", code, stderr)
	}
}

// TestEnsemblesRefuseCoarseNumerics checks the preflight of the ensemble
// commands: run, and rank with one ramp among several that misses the
// targets, are refused with exit 2, the remedy, and nothing written.
func TestEnsemblesRefuseCoarseNumerics(t *testing.T) {
	table := steepTable(t)
	out := filepath.Join(t.TempDir(), "out")
	expectRefused(t, out, []refusal{
		{"run", []string{"run", "--scenario", "testdata/scenarios/file.toml", "--set", "ramp.file=" + table, "--set", "numerics.step_us=19", "--samples", "2", "--out", out},
			"refused to run the ensemble: the numerics miss the targets (contrast error 0.00013"},
		{"rank", []string{"rank", "--scenario", "testdata/scenarios/ensemble.toml", "--set", "numerics.step_us=19", "--ramp", "sin2=sin2", "--ramp", "steep=file:" + table, "--samples", "2", "--out", out},
			"ramp steep: refused to run the ensemble"},
	})
}

// TestValidityWarnings checks that a command reading a scenario warns on
// stderr about an input outside the model's validity (a rotation faster
// than the cruise, sim.Config.Warnings) and still runs.
func TestValidityWarnings(t *testing.T) {
	_, stderr, code := execute(t, "ramp", "--scenario", "testdata/scenarios/benchmark.toml", "--set", "motion.rotation_rad_s=600")
	if code != 0 || !strings.Contains(stderr, "rampart: warning: the rotation 600 rad/s is faster than the cruise 500 rad/s") {
		t.Errorf("exit %d, stderr %q; want 0 and the warning", code, stderr)
	}
}

// TestReportWarnsAndStatesNumerics checks that an ensemble's report gives
// the validity warnings and the numerics estimate in its setup, as the
// terminal does: a 20-site ring of radius 1 um has a site spacing of
// 2 pi 1 um / 20 = 0.314 um, below the 0.4 um of sim.MinSiteSpacingM.
func TestReportWarnsAndStatesNumerics(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "rep")
	stdout, stderr, code := execute(t, "run", "--scenario", ensembleScenario, "--samples", "2", "--set", "ring.radius_um=1", "--report", dir)
	if code != 0 {
		t.Fatalf("exit %d, stderr %q", code, stderr)
	}
	if !strings.Contains(stderr, "rampart: warning: the site spacing 2 pi R / N = 0.314 um") || !strings.Contains(stdout, "Numerics: grid ") {
		t.Errorf("stderr %q, stdout lacks the numerics line or stderr the warning:\n%s", stderr, stdout)
	}
	b, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"Warning: the site spacing 2 pi R / N = 0.314 um", "Numerics: grid "} {
		if !strings.Contains(string(b), want) {
			t.Errorf("report lacks %q", want)
		}
	}
}

// TestWarnRingModel: the demo's ring is tilted by 0.5 mrad with its
// lowest point 40 degrees from the start site, and has a 0.1 % second
// harmonic. On the 150 us sin2 ramp the shot carries the excited packets'
// bias in its propagation, and the first Magnus term over the cruise
// leaves out about 4e-8 rad (sim.Simulator.RingErrorRad;
// sim/ringexact_test.go), below the 1e-6 rad target: no note. A 1 %
// third harmonic 40 degrees off on half a lap leaves out 1.5e-4 rad (the
// error grows as the harmonic's square; on the whole lap the arms' errors
// mostly cancel, 4e-7 rad), and shot says so.
func TestWarnRingModel(t *testing.T) {
	_, stderr, code := execute(t, "shot", "--scenario", "testdata/demo/demo.toml", "--set", "ramp.shape=sin2")
	if code != 0 || strings.Contains(stderr, "ring potential") || strings.Contains(stderr, "first order") {
		t.Errorf("sin2: exit %d, stderr %q: want no ring potential note", code, stderr)
	}
	_, stderr, code = execute(t, "shot", "--scenario", "testdata/demo/demo.toml", "--set", "ramp.shape=sin2",
		"--set", "ring.harmonic_order=3", "--set", "ring.harmonic_rel=0.01", "--set", "ring.harmonic_phase_deg=40", "--set", "motion.laps=0.5")
	if code != 0 || !strings.Contains(stderr, "first Magnus term over the cruise leaves an estimated") {
		t.Errorf("1 %% third harmonic: exit %d, stderr %q: want the Magnus note", code, stderr)
	}
}

// TestRingModelErrorCarried checks that the ring potential's model error
// (sim.Simulator.RingErrorRad, held against the split-step reference in
// sim) reaches the JSON of shot and run beside the numerical error, and
// the text of run's numerics line: on the fast ensemble's 150 us sin2
// ramp tilted by 0.5 mrad with its lowest point 40 degrees from the start
// site it is the estimate's value, and below the target.
func TestRingModelErrorCarried(t *testing.T) {
	sets := []string{"--set", "ring.tilt_mrad=0.5", "--set", "ring.low_deg=40"}
	sc, cfg, err := scenario.LoadConfig(filepath.Join(repoRoot, ensembleScenario), []string{"ring.tilt_mrad=0.5", "ring.low_deg=40"})
	if err != nil {
		t.Fatal(err)
	}
	base, err := sc.Apparatus()
	if err != nil {
		t.Fatal(err)
	}
	want, firstOrder, _ := ringModelError(cfg, base)
	s, err := sim.NewSimulator(cfg)
	if err != nil {
		t.Fatal(err)
	}
	if direct := s.RingErrorRad(base); want != direct || firstOrder || !(want > 0 && want < sim.PhaseTargetRad) {
		t.Fatalf("model error %g (first order %v), RingErrorRad %g: want them equal, positive and below the phase target", want, firstOrder, direct)
	}
	stdout, stderr, code := execute(t, append([]string{"shot", "--scenario", ensembleScenario, "--json"}, sets...)...)
	if code != 0 {
		t.Fatalf("shot: exit %d: %s", code, stderr)
	}
	var shot struct {
		Numerics struct {
			Model float64 `json:"first_order_model_bias_rad"`
		} `json:"numerics_error"`
	}
	if err := json.Unmarshal([]byte(stdout), &shot); err != nil {
		t.Fatal(err)
	}
	if shot.Numerics.Model != want {
		t.Errorf("shot --json: model bias %g, want %g", shot.Numerics.Model, want)
	}
	stdout, stderr, code = execute(t, append([]string{"run", "--scenario", ensembleScenario, "--samples", "8"}, sets...)...)
	if code != 0 {
		t.Fatalf("run: exit %d: %s", code, stderr)
	}
	if !strings.Contains(stdout, "ring potential model: bias left out of order") {
		t.Errorf("run's numerics line lacks the model error:\n%s", stdout)
	}
}
