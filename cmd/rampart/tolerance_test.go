package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"rampart/cmd/internal/present"
)

// skewArgs searches the skew tolerance of the fast ensemble with the
// differential depth error off, so that the skew sets the bias: its |bias|
// grows linearly with the skew (about 6e-6 rad per ns here), which puts a
// limit of 1e-4 rad near 15 ns.
func skewArgs(spec string) []string {
	return []string{"tolerance", "--scenario", ensembleScenario, "--set", "noise.depth.differential_rel=0",
		"--spec", spec, "--sources", "timing.skew_ns", "--samples", "80", "--seed", "2"}
}

const skewSpec = "[bias]\nabs_p95_max_rad = 1e-4\n"

// TestToleranceSkew checks the skew tolerance against rampart run at the
// found amplitude (its |bias| p95 is the one the search measured there and
// meets the limit), its monotone verdicts, the curves in --out, and that
// --resume reuses every stored ensemble.
func TestToleranceSkew(t *testing.T) {
	dir := t.TempDir()
	spec := writeSpec(t, dir, "skew.toml", skewSpec)
	out := filepath.Join(dir, "out")
	stdout, stderr, code := execute(t, append(skewArgs(spec), "--out", out, "--json")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	// The part of the report the test reads (mc.Verdict encodes as text only).
	type point struct {
		Amplitude float64 `json:"amplitude"`
		Value     float64 `json:"value"`
		Holds     bool    `json:"holds"`
	}
	var rep struct {
		Results []struct {
			Source, Unit, Status, Metric string
			Precision                    float64
			At                           *point
			Points                       []point
		}
	}
	if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
		t.Fatal(err)
	}
	if len(rep.Results) != 1 {
		t.Fatalf("%d results, want 1", len(rep.Results))
	}
	res := rep.Results[0]
	if res.Source != "timing.skew_ns" || res.Unit != "ns" || res.Status != "found" || res.At == nil || res.Metric != "bias.abs_p95_max_rad" {
		t.Fatalf("result %s in %s: status %s, at %v, metric %s; want timing.skew_ns in ns found by bias.abs_p95_max_rad", res.Source, res.Unit, res.Status, res.At, res.Metric)
	}
	tol := res.At.Amplitude
	// Monotone verdicts: every amplitude that holds lies below every one
	// that fails, and the tolerance is the largest that holds.
	smallestFail := math.Inf(1)
	for _, p := range res.Points {
		if !p.Holds {
			smallestFail = math.Min(smallestFail, p.Amplitude)
		}
	}
	for _, p := range res.Points {
		if p.Holds && (p.Amplitude > tol || p.Amplitude >= smallestFail) {
			t.Errorf("amplitude %v ns holds beside tolerance %v ns and first failure %v ns", p.Amplitude, tol, smallestFail)
		}
	}
	if smallestFail > tol*(1+res.Precision)*(1+1e-12) {
		t.Errorf("tolerance %v ns and first failure %v ns are further apart than the precision %v", tol, smallestFail, res.Precision)
	}

	// rampart run at the tolerance sees the same realisations: the same
	// |bias| p95 (to rounding of the amplitude, relative 1e-9), within the limit.
	runOut, stderr, code := execute(t, "run", "--scenario", ensembleScenario, "--set", "noise.depth.differential_rel=0",
		"--set", "noise.timing.skew_ns="+strconv.FormatFloat(tol, 'g', -1, 64), "--samples", "80", "--seed", "2", "--json")
	if code != 0 {
		t.Fatalf("run: %s", stderr)
	}
	var sum struct {
		AbsBias struct {
			P95 float64 `json:"p95"`
		} `json:"abs_bias_rad"`
	}
	if err := json.Unmarshal([]byte(runOut), &sum); err != nil {
		t.Fatal(err)
	}
	if got, want := sum.AbsBias.P95, res.At.Value; math.Abs(got-want) > 1e-9*want || got > 1e-4 {
		t.Errorf("run at %v ns: |bias| p95 %v rad, want the search's %v (tol 1e-9 relative) and at most 1e-4", tol, got, want)
	}

	rows := readCSV(t, filepath.Join(out, present.ToleranceCurvesFile))
	if got := strings.Join(rows[0], ","); got != "source,unit,amplitude,metric,limit,value,lo,hi,envelope_value,envelope_lo,envelope_hi,holds" {
		t.Errorf("curves header %q", got)
	}
	if len(rows)-1 != len(res.Points) {
		t.Errorf("%d curve rows for %d points", len(rows)-1, len(res.Points))
	}
	for _, f := range []string{"tolerance-timing-skew_ns.svg", "tolerance-timing-skew_ns.png", filepath.Join("timing.skew_ns", "off", "realisations.csv"),
		filepath.Join("timing.skew_ns", amplitudeDir(tol), "realisations.csv")} {
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Error(err)
		}
	}

	again, stderr, code := execute(t, append(skewArgs(spec), "--resume", out)...)
	if code != 0 {
		t.Fatalf("resume: exit %d: %s", code, stderr)
	}
	if strings.Contains(again, "simulated") || !strings.Contains(again, "resumed") {
		t.Errorf("resume ran realisations again:\n%s", again)
	}
	golden(t, "tolerance-skew.txt", strings.ReplaceAll(again, spec, "SPEC"))
}

// TestToleranceReport checks that tolerance --report writes its page with
// the curve of each search, the joint one included.
func TestToleranceReport(t *testing.T) {
	dir := t.TempDir()
	args := append(skewArgs(writeSpec(t, dir, "skew.toml", skewSpec)), "--joint")
	report := filepath.Join(dir, "report")
	if _, stderr, code := execute(t, append(args, "--report", report)...); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	readReport(t, report, "rampart "+strings.Join(args, " ")+" --report", append(driveFigures, "tolerance-timing-skew_ns", "tolerance-budget"), 8,
		"The tolerance of each noise source against spec")
}

// TestToleranceBadInput: exit 2 and one line before anything runs.
func TestToleranceBadInput(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "out")
	spec := writeSpec(t, dir, "skew.toml", skewSpec)
	expectRefused(t, out, []refusal{
		{"shard", append(skewArgs(spec), "--shard", "1/2", "--out", out), "--shard 1/2: a tolerance search cannot be sharded"},
		{"unknown source", append(skewArgs(spec), "--sources", "timing.skew_ns,laser", "--out", out), `--sources: unknown noise source "laser"`},
		{"budget as a source", append(skewArgs(spec), "--sources", "budget", "--out", out), "(--joint searches the whole budget)"},
		{"precision", append(skewArgs(spec), "--precision", "0", "--out", out), "--precision 0: want a relative precision in [0.001, 1]"},
		{"resume nothing", append(skewArgs(spec), "--resume", out), "--resume " + out + ": no such directory"},
		{"bad spec", append(skewArgs(writeSpec(t, dir, "bad.toml", "[bias]\nabs_p95_max_rad = -1\n")), "--out", out), "bad.toml"},
		{"empty budget", []string{"tolerance", "--scenario", "testdata/scenarios/benchmark.toml", "--spec", spec, "--out", out}, "has no active source: give --sources"},
		// A 95th percentile at look 1 needs 69 (mc.Requirements.MinSamples).
		{"too few to bound", append(skewArgs(spec), "--samples", "68", "--out", out), "give at least 69"},
	})
}

// TestToleranceDetectionAxis checks the detection-noise axis end to end
// against rampart qualify --signal measured on the same ensemble (the same
// seed and read-out draws): at the tolerance the measured signal passes,
// at 1.2 times it (beyond the 5 % precision) it does not. The closed form
// of the axis is checked in mc (TestToleranceDetection). Here the contrast
// is about 0.59 (a half lap of sin2 ramps), so 1e4 atoms give a projection
// noise of about 0.017 rad alone. Without a read-out the axis is refused
// with exit 2.
func TestToleranceDetectionAxis(t *testing.T) {
	dir := t.TempDir()
	spec := writeSpec(t, dir, "det.toml", "[bias]\nabs_p95_max_rad = 0.05\n")
	common := []string{"--scenario", ensembleScenario, "--spec", spec, "--samples", "500", "--seed", "2"}
	readout := []string{"--atoms", "1e4", "--cycle-s", "1"}
	args := append(append([]string{"tolerance", "--sources", "readout.detection_atoms", "--precision", "0.05"}, common...), readout...)
	stdout, stderr, code := execute(t, append(args, "--json")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var rep struct {
		Results []struct {
			Unit, Status string
			At           *struct{ Amplitude float64 }
		}
	}
	if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
		t.Fatal(err)
	}
	if len(rep.Results) != 1 || rep.Results[0].At == nil || rep.Results[0].Unit != "atoms rms" || rep.Results[0].Status != "found" {
		t.Fatalf("results %+v: want one found, in atoms rms", rep.Results)
	}
	tol := rep.Results[0].At.Amplitude
	for _, tc := range []struct {
		sigma float64
		pass  bool
	}{{tol, true}, {1.2 * tol, false}} {
		q := append([]string{"qualify", "--signal", "measured", "--set", "readout.atoms=1e4", "--set", "readout.cycle_s=1",
			"--set", "readout.detection_atoms=" + strconv.FormatFloat(tc.sigma, 'g', -1, 64)}, common...)
		_, stderr, code := execute(t, q...)
		if (code == 0) != tc.pass {
			t.Errorf("qualify --signal measured at %.4g atoms rms (tolerance %.4g): exit %d, want pass %v: %s", tc.sigma, tol, code, tc.pass, stderr)
		}
	}
	noReadout := append([]string{"tolerance", "--sources", "readout.detection_atoms"}, common...)
	_, stderr, code = execute(t, noReadout...)
	if code != 2 || !strings.Contains(stderr, "needs a read-out") {
		t.Errorf("without a read-out: exit %d, %q; want 2 and a message", code, stderr)
	}
}
