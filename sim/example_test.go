package sim_test

import (
	"fmt"

	"rampart/sim"
)

// A nominal shot of a 20-site ring of radius 5 um at 20 kHz depth: a 150 us
// sin2 ramp and the inverse-engineered ramp, one lap at 500 rad/s, while the
// apparatus turns at 0.1 rad/s. Contrast is printed to three decimals,
// where the rounding margin (1.1e-4 at worst) exceeds the automatic
// numerics' accuracy (1e-4 promised, ~1e-6 seen in TestRunMatchesPlainSplitStep).
func ExampleNewSimulator() {
	ring := sim.Ring{Sites: 20, RadiusM: 5e-6, MassKg: sim.Rb87MassU * sim.AtomicMassUnit}
	cfg := sim.Config{Ring: ring, DepthHz: 20e3, RotationRadS: 0.1}
	for _, shape := range []string{"sin2", "inverse"} {
		up, err := sim.NewShape(shape, 150e-6, 500, cfg.TrapRadS())
		if err != nil {
			fmt.Println(err)
			return
		}
		if cfg.Sequence, err = sim.NewSequence(up, 1); err != nil {
			fmt.Println(err)
			return
		}
		s, err := sim.NewSimulator(cfg)
		if err != nil {
			fmt.Println(err)
			return
		}
		res := s.Run(sim.Shot{}, nil)
		fmt.Printf("%-7s contrast %.3f  phase %.5f rad  Sagnac %.5f rad  ground band after ramp-up %.3f\n",
			shape, res.Contrast, res.PhaseRad, res.SagnacRad, res.GroundAfterRampUp[0])
	}
	// Output:
	// sin2    contrast 0.963  phase 0.04299 rad  Sagnac 0.04299 rad  ground band after ramp-up 0.923
	// inverse contrast 0.999  phase 0.04299 rad  Sagnac 0.04299 rad  ground band after ramp-up 0.998
}

// The arms of a sequence meet again only if each turns by a whole number of
// half laps.
func ExampleCheckClosure() {
	fmt.Println(sim.CheckClosure(1.5, 20))
	fmt.Println(sim.CheckClosure(1.3, 20))
	// Output:
	// <nil>
	// the arms do not recombine: with laps = 1.3 they end 8 sites apart on the 20-site ring (2*laps must be a whole number); laps = 1 or 1.5 would close
}

// The cruise lasts as long as the laps require once the two ramps have
// turned the arm by Omega_0 t_r.
func ExampleNewSequence() {
	up := sim.Sin2{DurationS: 150e-6, CruiseRadS: 500}
	seq, err := sim.NewSequence(up, 1)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("ramp angle %.4f rad, cruise %.2f us, total %.2f us, phi(T) = %.6f rad\n",
		up.Angle(up.Duration()), seq.CruiseS*1e6, seq.Duration()*1e6, seq.TotalAngle())
	// Output:
	// ramp angle 0.0375 rad, cruise 12416.37 us, total 12716.37 us, phi(T) = 6.283185 rad
}
