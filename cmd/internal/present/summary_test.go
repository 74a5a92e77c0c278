package present

import (
	"bytes"
	"strings"
	"testing"

	"rampart/mc"
	"rampart/noise"
)

// TestBudgetLine checks the budget line made from the table of sources
// against the line the commands printed before the table existed, written
// out by hand for every source on (the goldens cover only some sources).
func TestBudgetLine(t *testing.T) {
	b := mc.Budget{
		DepthCommonRel: 0.01, DepthDifferentialRel: 2e-6, ClockRel: 1e-6, SpeedRel: 3e-6, SkewS: 20e-9,
		TemperatureSpreadK: 5e-9, PulseAreaRel: 0.01,
		RIN: noise.White{Level: 1e-12}, Phase: noise.White{Level: 1e-12}, PhaseCorrelation: 0.5,
	}
	want := "depth 1 % common, 2 ppm differential, intensity noise, drive phase noise (correlation 0.5), " +
		"clock 1 ppm, speed 3 ppm, skew 20 ns, temperature spread 5 nK, pulse area 1 % (standard deviations)"
	if got := BudgetLine(b); got != want {
		t.Errorf("budget line\n got %q\nwant %q", got, want)
	}
	if got, want := BudgetLine(mc.Budget{}), "none (every realisation is the nominal shot)"; got != want {
		t.Errorf("empty budget: got %q, want %q", got, want)
	}
}

// TestMeasuredRowsOnlyWithReadout checks that the measured signal adds a
// table after the others, and nothing without a read-out (the goldens of
// runs without one stay byte for byte).
func TestMeasuredRowsOnlyWithReadout(t *testing.T) {
	s := mc.Summary{Samples: 4, Confidence: 0.95, ScaleFactorS: 1,
		AbsBiasRad: mc.Distribution{P95: 1e-3}, BiasRad: mc.Distribution{Std: 5e-4}}
	var plain bytes.Buffer
	if err := PrintSummary(&plain, s); err != nil {
		t.Fatal(err)
	}
	s.Measured = &mc.Measured{Atoms: 1000, DetectionAtoms: 20,
		AbsBiasRad: mc.Distribution{P95: 2e-2}, BiasRad: mc.Distribution{Std: 3.2e-2}}
	var with bytes.Buffer
	if err := PrintSummary(&with, s); err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(with.String(), plain.String()) {
		t.Errorf("the measured signal changed the tables before it:\n%s", with.String())
	}
	extra := strings.TrimPrefix(with.String(), plain.String())
	for _, want := range []string{"projection noise of 1000 atoms, detection noise 20 atoms rms", "True", "Measured", "3.20e-02", "2.00e-02", "1.00e-03"} {
		if !strings.Contains(extra, want) {
			t.Errorf("measured table lacks %q:\n%s", want, extra)
		}
	}
}

// TestInvertedShotsAreNoRate: an inverted fringe (|bias| near pi) is a
// sign flip, so with inverted shots among the realisations the mean, the
// std and the quantiles beyond pi/2 get no rotation rate, the gyroscope
// figures neither, and a note says why; quantiles of ordinary shots keep
// theirs. Without inverted shots nothing changes.
func TestInvertedShotsAreNoRate(t *testing.T) {
	s := mc.Summary{Samples: 100, Confidence: 0.95, ScaleFactorS: 0.86,
		BiasRad:     mc.Distribution{Mean: 0.19, Std: 1.17, P50: 8.2e-6, P95: 3.14},
		BiasDegPerH: mc.Distribution{Mean: 4.56e4, Std: 2.81e5, P50: 1.97, P95: 7.53e5},
		AbsBiasRad:  mc.Distribution{P95: 3.14}}
	s.BiasCircular.Inverted = 16
	var b bytes.Buffer
	if err := PrintSummary(&b, s); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	row := func(name string) string {
		for _, l := range strings.Split(out, "\n") {
			if strings.HasPrefix(l, "| "+name+" ") {
				return l
			}
		}
		t.Fatalf("no row %q in\n%s", name, out)
		return ""
	}
	for _, name := range []string{"mean", "std", "p95"} {
		if r := row(name); !strings.Contains(r, notARate) || strings.Contains(r, "e+05") || strings.Contains(r, "e+04") {
			t.Errorf("row %q gives a rotation rate: %s", name, r)
		}
	}
	if r := row("p50 (median)"); !strings.Contains(r, "1.97e+00") {
		t.Errorf("the median of ordinary shots lost its rate: %s", r)
	}
	if !strings.Contains(out, "16 of the shots with a fringe are inverted") {
		t.Errorf("no note on the inverted shots:\n%s", out)
	}
	var g bytes.Buffer
	if err := GyroGrid(s, nil).Render(&g); err != nil {
		t.Fatal(err)
	}
	if strings.Count(g.String(), notARate) != 2 {
		t.Errorf("gyroscope figures give the inverted biases as rates:\n%s", g.String())
	}
	s.BiasCircular.Inverted = 0
	b.Reset()
	if err := PrintSummary(&b, s); err != nil {
		t.Fatal(err)
	}
	if strings.Contains(b.String(), notARate) || strings.Contains(b.String(), "inverted (") {
		t.Errorf("without inverted shots the rates are withheld:\n%s", b.String())
	}
}
