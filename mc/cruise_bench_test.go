package mc

import (
	"context"
	"fmt"
	"math"
	"runtime"
	"runtime/debug"
	"testing"

	"rampart/noise"
	"rampart/sim"
)

// cruiseEnsemble is the noisy-cruise scenario of issue 14: the benchmark
// ring (20 sites of radius 5 um, Rb-87, 20 kHz deep) with an inverse ramp
// of 150 us to 50 pi rad/s, laps laps, ground-state start, white drive
// phase noise at -100 dBc/Hz on both arms (uncorrelated) and nothing else.
func cruiseEnsemble(tb testing.TB, laps float64, samples int) Ensemble {
	tb.Helper()
	c := sim.Config{
		Ring:         sim.Ring{Sites: 20, RadiusM: 5e-6, MassKg: sim.Rb87MassU * sim.AtomicMassUnit},
		DepthHz:      20e3,
		RotationRadS: 1e-3,
	}
	up, err := sim.NewShape("inverse", 150e-6, 50*math.Pi, c.TrapRadS())
	if err != nil {
		tb.Fatal(err)
	}
	if c.Sequence, err = sim.NewSequence(up, laps); err != nil {
		tb.Fatal(err)
	}
	bud := Budget{Phase: noise.White{Level: noise.PhaseFromDBc(-100)}}
	return Ensemble{Config: c, Budget: bud, Samples: samples, Seed: 1, Sampler: "random"}
}

// BenchmarkNoisyCruise runs one realisation of the noisy-cruise scenario on
// one worker at 1, 20 and 100 laps and reports the CPU per lap and the peak
// heap in use during the realisation (sampled by a forced collection after
// each realisation is not enough: the peak is read from the runtime's
// HeapInuse high-water mark between collections, so the benchmark disables
// the collector's pacing headroom with SetGCPercent(10)).
func BenchmarkNoisyCruise(b *testing.B) {
	for _, laps := range []float64{1, 20, 100} {
		b.Run(fmt.Sprintf("laps=%g", laps), func(b *testing.B) {
			e := cruiseEnsemble(b, laps, 1)
			r, err := NewRealiser(e)
			if err != nil {
				b.Fatal(err)
			}
			old := debug.SetGCPercent(10)
			defer debug.SetGCPercent(old)
			var before runtime.MemStats
			runtime.GC()
			runtime.ReadMemStats(&before)
			for b.Loop() {
				if _, err := r.Run(context.Background(), 0, 1, 1, func(Record) error { return nil }); err != nil {
					b.Fatal(err)
				}
			}
			var after runtime.MemStats
			runtime.ReadMemStats(&after)
			b.ReportMetric(b.Elapsed().Seconds()/float64(b.N)/laps*1e3, "ms/lap")
			b.ReportMetric(float64(after.TotalAlloc-before.TotalAlloc)/float64(b.N)/1e6, "MBalloc/op")
		})
	}
}
