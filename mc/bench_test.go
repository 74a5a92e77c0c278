package mc

import (
	"context"
	"fmt"
	"testing"

	"rampart/noise"
	"rampart/sim"
)

// benchEnsemble is the benchmark scenario of the project's issues (20-site
// ring of radius 5 um, Rb-87, 20 kHz, 150 us sin2 ramp to 500 rad/s, one
// lap, ground-state start) under static noise: depth (1 % common, 0.1 %
// differential), timing (1 ppm clock, 1 ppm speed, 10 ns skew), a 20 nK
// temperature spread and 1 % pulse area errors; with dynamic set, also
// white RIN at -120 dB/Hz and drive phase noise at -110 dBc/Hz.
func benchEnsemble(b *testing.B, samples int, dynamic bool) Ensemble {
	b.Helper()
	c := benchSequence(b)
	bud := Budget{DepthCommonRel: 0.01, DepthDifferentialRel: 1e-3, ClockRel: 1e-6, SpeedRel: 1e-6,
		SkewS: 10e-9, TemperatureSpreadK: 20e-9, PulseAreaRel: 0.01}
	if dynamic {
		bud.RIN = noise.White{Level: noise.IntensityFromRIN(-120)}
		bud.Phase = noise.White{Level: noise.PhaseFromDBc(-110)}
	}
	return Ensemble{Config: c, Budget: bud, Samples: samples, Seed: 1, Sampler: "random"}
}

func runBench(b *testing.B, e Ensemble, workers int) {
	r, err := NewRealiser(e)
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if _, err := r.Run(context.Background(), 0, e.Samples, workers, func(Record) error { return nil }); err != nil {
			b.Fatal(err)
		}
	}
	perRealisation := b.Elapsed().Seconds() / float64(b.N*e.Samples)
	b.ReportMetric(perRealisation*1e3, "ms/realisation")
}

// BenchmarkEnsembleStatic runs 200 realisations with static noise on 1 and
// 2 workers; the goal is 10,000 in at most 60 s with 2 workers
// (ms/realisation <= 6) and near-linear scaling.
func BenchmarkEnsembleStatic(b *testing.B) {
	for _, w := range []int{1, 2} {
		b.Run(fmt.Sprintf("workers=%d", w), func(b *testing.B) {
			runBench(b, benchEnsemble(b, 200, false), w)
		})
	}
}

// BenchmarkEnsembleDynamic runs 20 realisations with intensity and drive
// phase noise during the whole shot on 2 workers; the goal is 1000 in at
// most 3 minutes (ms/realisation <= 180).
func BenchmarkEnsembleDynamic(b *testing.B) {
	runBench(b, benchEnsemble(b, 20, true), 2)
}

// benchSequence is the benchmark sequence: a 20-site ring of radius 5 um,
// Rb-87, 20 kHz deep, a 150 us sin2 ramp to 500 rad/s, one lap, rotation
// 1e-3 rad/s.
func benchSequence(tb testing.TB) sim.Config {
	tb.Helper()
	c := sim.Config{
		Ring:         sim.Ring{Sites: 20, RadiusM: 5e-6, MassKg: sim.Rb87MassU * sim.AtomicMassUnit},
		DepthHz:      20e3,
		RotationRadS: 1e-3,
	}
	up, err := sim.NewShape("sin2", 150e-6, 500, c.TrapRadS())
	if err != nil {
		tb.Fatal(err)
	}
	if c.Sequence, err = sim.NewSequence(up, 1); err != nil {
		tb.Fatal(err)
	}
	return c
}
