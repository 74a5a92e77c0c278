package present

import (
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
