package mc

import (
	"testing"

	"rampart/noise"
	"rampart/sim"
)

// TestBudgetProcesses checks how a budget's noise processes reach the
// kernels' channels: RIN is common to both spin states (one laser), the
// drive phase splits by the arms' correlation as sim.PhaseLoad says, and
// no band starts below 1/T, the lowest frequency a record of the shot
// holds (docs/model.md, Noise transfer functions).
func TestBudgetProcesses(t *testing.T) {
	const T = 0.01 // s: 1/T = 100 Hz
	if ps := (Budget{DepthCommonRel: 0.01}).Processes(T); len(ps) != 0 {
		t.Fatalf("a static budget gives processes %v", ps)
	}
	b := Budget{
		RIN: noise.White{Level: 1e-12}, RINBand: noise.Band{LowHz: 10, HighHz: 1e4},
		Phase: noise.White{Level: 1e-10}, PhaseCorrelation: 0.5,
	}
	ps := b.Processes(T)
	if len(ps) != 2 || ps[0].Name != "rin" || ps[1].Name != "phase" {
		t.Fatalf("processes %v, want rin and phase", ps)
	}
	if ps[0].Band.LowHz != 100 || ps[0].Band.HighHz != 1e4 || ps[0].Load[sim.IntensityCommon] != 1 || len(ps[0].Load) != 1 {
		t.Errorf("rin: band %+v load %v, want [100, 1e4] Hz on intensity_common alone", ps[0].Band, ps[0].Load)
	}
	want := sim.PhaseLoad(0.5)
	for ch, w := range want {
		if ps[1].Load[ch] != w {
			t.Errorf("phase load on %v: %g, want %g", ch, ps[1].Load[ch], w)
		}
	}
	if ps[1].Band.LowHz != 100 || ps[1].Band.HighHz != 0 {
		t.Errorf("phase band %+v, want from 100 Hz to the kernels' end", ps[1].Band)
	}
}
