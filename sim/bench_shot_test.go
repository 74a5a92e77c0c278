package sim

import (
	"fmt"
	"math"
	"rampart/internal/cputime"
	"testing"
)

// issueConfig is the benchmark ring of the performance issue (14): a
// 20-site ring of radius 5 um (Rb-87) at 20 kHz depth, a 150 us inverse
// ramp to 50 pi rad/s, laps laps, rotation 1e-3 rad/s.
func issueConfig(tb testing.TB, laps float64) Config {
	tb.Helper()
	c := Config{
		Ring:         Ring{Sites: 20, RadiusM: 5e-6, MassKg: Rb87MassU * AtomicMassUnit},
		DepthHz:      20e3,
		RotationRadS: 1e-3,
	}
	up, err := NewShape("inverse", 150e-6, 50*math.Pi, c.TrapRadS())
	if err != nil {
		tb.Fatal(err)
	}
	if c.Sequence, err = NewSequence(up, laps); err != nil {
		tb.Fatal(err)
	}
	return c
}

// reportCPU runs f in b.Loop and reports, besides the wall time, the
// process's CPU time per iteration (cpu-ns/op, all threads): the figure the
// goals are stated in, which a loaded machine disturbs less than the wall
// time.
func reportCPU(b *testing.B, f func()) {
	b.Helper()
	c0 := cputime.Process()
	for b.Loop() {
		f()
	}
	b.ReportMetric(float64((cputime.Process()-c0).Nanoseconds())/float64(b.N), "cpu-ns/op")
}

// BenchmarkShotCold times a nominal ground-state shot on the issue's
// benchmark ring, each on a new Simulator, so that nothing one shot
// computed is reused by the next but the block's DST-I (shared by every
// simulator of the block size). The goal is at most 1 ms of CPU.
func BenchmarkShotCold(b *testing.B) {
	for _, laps := range []float64{1, 100} {
		b.Run(fmt.Sprintf("laps=%g", laps), func(b *testing.B) {
			c := issueConfig(b, laps)
			reportCPU(b, func() {
				s, err := NewSimulator(c)
				if err != nil {
					b.Fatal(err)
				}
				s.Run(Shot{}, nil)
			})
		})
	}
}

// BenchmarkShotRepeated times the nominal shot of BenchmarkShotCold
// repeated on one Simulator: the second and later shots take over the
// eigensystems and start states of the first (sim/shotwork.go), so this
// is the cost of a shot whose depth and speeds repeat (the nominal shot
// again, or an ensemble drawing only skew, temperature, pulse areas or
// dynamic noise): the ramps' split steps and the cruise's exact step.
func BenchmarkShotRepeated(b *testing.B) {
	for _, laps := range []float64{1, 100} {
		b.Run(fmt.Sprintf("laps=%g", laps), func(b *testing.B) {
			s, err := NewSimulator(issueConfig(b, laps))
			if err != nil {
				b.Fatal(err)
			}
			reportCPU(b, func() { s.Run(Shot{}, nil) })
		})
	}
}
