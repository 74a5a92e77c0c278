package sim

import (
	"fmt"
	"testing"
)

// benchConfig is the performance scenario of the project's issue: a 20-site
// ring of radius 5 um (Rb-87) at 20 kHz depth, a 150 us sin2 ramp to
// 500 rad/s, laps laps, rotation 1e-3 rad/s.
func benchConfig(tb testing.TB, laps float64) Config {
	tb.Helper()
	c := Config{
		Ring:         Ring{Sites: 20, RadiusM: 5e-6, MassKg: Rb87MassU * AtomicMassUnit},
		DepthHz:      20e3,
		RotationRadS: 1e-3,
	}
	up, err := NewShape("sin2", 150e-6, 500, c.TrapRadS())
	if err != nil {
		tb.Fatal(err)
	}
	if c.Sequence, err = NewSequence(up, laps); err != nil {
		tb.Fatal(err)
	}
	return c
}

// BenchmarkShot times a nominal ground-state shot with automatic numerics.
// A cruise of any length is one exact step, so 100 laps should cost about
// what one lap does, up to the grid's growth with the sequence time
// (CruiseTail).
func BenchmarkShot(b *testing.B) {
	for _, laps := range []float64{1, 100, 1e4} {
		b.Run(fmt.Sprintf("laps=%g", laps), func(b *testing.B) {
			s, err := NewSimulator(benchConfig(b, laps))
			if err != nil {
				b.Fatal(err)
			}
			for b.Loop() {
				s.Run(Shot{}, nil)
			}
		})
	}
}

// BenchmarkPlainSplitStep times the oracle integrating the whole one-lap
// sequence at dt = 0.5 us, where its contrast error (about 1.4e-4) is
// still far larger than that of Run with automatic numerics (about 5e-7):
// the ratio of the two timings is therefore a lower bound on the speed-up at
// equal accuracy.
func BenchmarkPlainSplitStep(b *testing.B) {
	s, err := NewSimulator(benchConfig(b, 1))
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		s.PlainSplitStep(Shot{}, 0.5e-6)
	}
}

// BenchmarkEstimateError times the numerical-error estimate of the benchmark
// shot (one shot and one on twice the grid and half the step).
func BenchmarkEstimateError(b *testing.B) {
	c := benchConfig(b, 1)
	for b.Loop() {
		if _, err := EstimateError(c); err != nil {
			b.Fatal(err)
		}
	}
}

// shapedKernels is the benchmark ring with a 150 us ramp of the given
// shape to 500 rad/s and laps laps: its configuration, simulator and
// noise kernels.
func shapedKernels(tb testing.TB, shape string, laps float64) (Config, *Simulator, *Kernels) {
	tb.Helper()
	c := benchConfig(tb, laps)
	up, err := NewShape(shape, 150e-6, 500, c.TrapRadS())
	if err != nil {
		tb.Fatal(err)
	}
	if c.Sequence, err = NewSequence(up, laps); err != nil {
		tb.Fatal(err)
	}
	s, err := NewSimulator(c)
	if err != nil {
		tb.Fatal(err)
	}
	k, err := s.Kernels(0)
	if err != nil {
		tb.Fatal(err)
	}
	return c, s, k
}
