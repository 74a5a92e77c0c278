package sim_test

import (
	"fmt"

	"rampart/sim"
)

// An echo of two one-lap segments against one two-lap sequence, with the
// spin states' lattices 1e-4 apart in depth: the echo cancels the
// differential depth's phase but for what the ramps' excitation carries.
func ExampleNewEcho() {
	cfg := sim.Config{
		Ring:    sim.Ring{Sites: 20, RadiusM: 5e-6, MassKg: sim.Rb87MassU * sim.AtomicMassUnit},
		DepthHz: 20e3,
	}
	up, _ := sim.NewShape("sin2", 300e-6, 500, cfg.TrapRadS())
	seg, _ := sim.NewSequence(up, 1)
	plain, _ := sim.NewSequence(up, 2)
	echo, _ := sim.NewEcho(seg, 2, 0)
	shot := sim.Shot{DepthRel: [2]float64{0.5e-4, -0.5e-4}}
	for _, q := range []struct {
		name string
		seq  sim.Sequence
	}{{"two laps", plain}, {"echo of 2 x 1 lap", echo}} {
		cfg.Sequence = q.seq
		s, err := sim.NewSimulator(cfg)
		if err != nil {
			fmt.Println(err)
			return
		}
		r := s.Run(shot, nil)
		fmt.Printf("%-17s bias %.2g rad, contrast %.4f\n", q.name, r.BiasRad, r.Contrast)
	}
	// Output:
	// two laps          bias 0.3 rad, contrast 0.9892
	// echo of 2 x 1 lap bias 5.4e-05 rad, contrast 0.9967
}
