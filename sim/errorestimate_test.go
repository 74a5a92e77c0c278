package sim

import (
	"math"
	"strings"
	"testing"
)

// TestEstimateErrorBounds checks that EstimateError's errors bound the true
// error of the shot, measured against a reference three times the grid and
// a quarter of the step (its own error: the window reaches about three times
// further and the fourth-order step error is 256 times smaller), on two
// geometries and three cruise lengths, at the automatic numerics and at two
// deliberately coarse ones (one block pair less; twice the step), where the
// errors stand well above the reference's own. Where the true error is above
// the floor, the estimate must also be tight: at most 1.5 times it, so that
// an estimate that merely inflates everything would fail.
func TestEstimateErrorBounds(t *testing.T) {
	if testing.Short() {
		t.Skip("convergence study")
	}
	// floor: the references' spread at 10^4 laps (4e-8 rad between grids of
	// 1.5, 2 and 3 times the automatic one, seen), with a margin of 2.5.
	const floor = 1e-7
	for _, g := range []struct {
		sites int
		laps  float64
	}{{20, 1}, {20, 100}, {20, 1e4}, {12, 1}, {12, 100}, {12, 1e4}} {
		c := ringConfig(t, g.sites, 5e-6, 20e3, 50*math.Pi, 1e-3, g.laps)
		auto := AutoNumerics(c)
		ref := c
		ref.Grid, ref.StepS = 3*auto.Grid, auto.StepS/4
		rs, err := NewSimulator(ref)
		if err != nil {
			t.Fatal(err)
		}
		want := rs.Run(Shot{}, nil)
		for _, v := range []struct {
			name string
			grid int
			step float64
		}{
			{"auto", 0, 0},
			{"block-2", auto.Grid - 2*g.sites, auto.StepS},
			{"step*2", auto.Grid, 2 * auto.StepS},
		} {
			cc := c
			cc.Grid, cc.StepS = v.grid, v.step
			est, err := EstimateError(cc)
			if err != nil {
				t.Fatal(err)
			}
			s, err := NewSimulator(cc)
			if err != nil {
				t.Fatal(err)
			}
			got := s.Run(Shot{}, nil)
			dc := math.Abs(got.Contrast - want.Contrast)
			dp := math.Abs(Wrap(got.PhaseRad - want.PhaseRad))
			t.Logf("%d sites %g laps %s (grid %d): contrast %.2g est %.2g, phase %.2g est %.2g, met %v",
				g.sites, g.laps, v.name, est.Grid, dc, est.ContrastError, dp, est.PhaseErrorRad, est.Met)
			for _, q := range []struct {
				what      string
				true, est float64
			}{{"contrast", dc, est.ContrastError}, {"phase", dp, est.PhaseErrorRad}} {
				if q.true > q.est+floor {
					t.Errorf("%d sites %g laps %s: %s error %.3g exceeds the estimate %.3g (+ floor %g)", g.sites, g.laps, v.name, q.what, q.true, q.est, floor)
				}
				if q.true > 10*floor && q.est > 1.5*q.true {
					t.Errorf("%d sites %g laps %s: %s estimate %.3g is more than 1.5 times the true error %.3g", g.sites, g.laps, v.name, q.what, q.est, q.true)
				}
			}
			if v.name == "auto" && !est.Met {
				t.Errorf("%d sites %g laps: automatic numerics flagged: %s", g.sites, g.laps, est.Remedy)
			}
		}
	}
}

// TestEstimateErrorFlagsCoarseGrid: the legacy grid (window 5 l_osc, 320
// states) on the 20-site ring at 10^4 laps misses the phase target by
// a factor of about 300 (TestCruiseGrid); the estimate must say so and
// name the key to set.
func TestEstimateErrorFlagsCoarseGrid(t *testing.T) {
	c := ringConfig(t, 20, 5e-6, 20e3, 50*math.Pi, 1e-3, 1e4)
	c.Grid = 320
	est, err := EstimateError(c)
	if err != nil {
		t.Fatal(err)
	}
	if est.Met {
		t.Fatalf("grid 320 at 10^4 laps passed: contrast error %.2g, phase error %.2g rad", est.ContrastError, est.PhaseErrorRad)
	}
	if est.PhaseErrorRad < 100*PhaseTargetRad {
		t.Errorf("phase error estimate %.2g rad, want above 1e-4 (measured 3.6e-4 against a converged shot)", est.PhaseErrorRad)
	}
	if !strings.Contains(est.Remedy, "numerics.grid = 640") {
		t.Errorf("remedy %q does not name numerics.grid = 640", est.Remedy)
	}
	if est.RefinedGrid != 640 || est.RefinedStepS != est.StepS/2 {
		t.Errorf("refined numerics %d, %g s; want 640 and half of %g s", est.RefinedGrid, est.RefinedStepS, est.StepS)
	}
}
