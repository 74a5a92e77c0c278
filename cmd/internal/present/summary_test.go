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
