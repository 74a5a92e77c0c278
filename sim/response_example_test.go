package sim_test

import (
	"fmt"

	"rampart/noise"
	"rampart/sim"
)

// The noise transfer functions of the inverse-engineered ramp on the
// benchmark ring (half a lap), and what white drive phase noise of
// -100 dBc/Hz on each arm (uncorrelated) does to it over the simulator's
// noise band: the prediction TestResponseMonteCarlo and
// TestResponseNonlinear check against the Monte Carlo (which gave a loss
// of 4.4e-4 +- 0.6e-4 and a bias std of 2.6e-3 +- 0.3e-3 rad). Printed to
// two significant figures.
func ExampleSimulator_Kernels() {
	ring := sim.Ring{Sites: 20, RadiusM: 5e-6, MassKg: sim.Rb87MassU * sim.AtomicMassUnit}
	cfg := sim.Config{Ring: ring, DepthHz: 20e3, RotationRadS: 1e-3}
	up, err := sim.NewShape("inverse", 150e-6, 500, cfg.TrapRadS())
	if err != nil {
		fmt.Println(err)
		return
	}
	if cfg.Sequence, err = sim.NewSequence(up, 0.5); err != nil {
		fmt.Println(err)
		return
	}
	s, err := sim.NewSimulator(cfg)
	if err != nil {
		fmt.Println(err)
		return
	}
	k, err := s.Kernels(0)
	if err != nil {
		fmt.Println(err)
		return
	}
	psds := sim.PhaseNoise(noise.White{Level: noise.PhaseFromDBc(-100)}, 0)
	p := k.PredictAll(psds, noise.Band{LowHz: 1 / k.DurationS})
	for _, c := range p.Channels {
		fmt.Printf("%-18v loss %.2g  bias std %.2g rad\n", c.Channel, c.ContrastLoss, c.BiasStdRad)
	}
	fmt.Printf("total              loss %.2g  bias std %.2g rad  warnings %d\n", p.ContrastLoss, p.BiasStdRad, len(p.Warnings))
	// Output:
	// phase_common       loss 3.4e-06  bias std 0.0024 rad
	// phase_differential loss 0.00046  bias std 5.5e-09 rad
	// total              loss 0.00046  bias std 0.0024 rad  warnings 0
}
