package mc

import (
	"math"

	"rampart/noise"
	"rampart/sim"
)

// Processes returns the budget's noise processes on the noise transfer
// functions' channels (sim.Kernels), in the bands the Monte Carlo draws
// them: from 1/T, the lowest frequency a record of a shot of duration T
// holds, up to the kernels' band unless the budget gives a band.
func (b Budget) Processes(durationS float64) []sim.Process {
	lo := 1 / durationS
	var ps []sim.Process
	if b.RIN != nil {
		band := b.RINBand
		band.LowHz = math.Max(band.LowHz, lo)
		ps = append(ps, sim.Process{Name: "rin", Load: sim.Load{sim.IntensityCommon: 1}, PSD: b.RIN, Band: band})
	}
	if b.Phase != nil {
		ps = append(ps, sim.Process{Name: "phase", Load: sim.PhaseLoad(b.PhaseCorrelation), PSD: b.Phase, Band: noise.Band{LowHz: lo}})
	}
	return ps
}
