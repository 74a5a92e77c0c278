package mc

import (
	"context"
	"fmt"
	"math"
	"os"
	"runtime"
	"runtime/metrics"
	"sync"
	"testing"
	"time"

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
// one worker at 1, 20 and 100 laps (RAMPART_BENCH_LARGE=1: also 1000) and
// reports the time per lap and the peak of the live heap during the
// realisations (runtime/metrics, sampled every 10 ms, less the heap before),
// which holds the worker's noise records or streams.
func BenchmarkNoisyCruise(b *testing.B) {
	laps := []float64{1, 20, 100}
	if os.Getenv("RAMPART_BENCH_LARGE") == "1" {
		laps = append(laps, 1000)
	}
	for _, l := range laps {
		b.Run(fmt.Sprintf("laps=%g", l), func(b *testing.B) {
			e := cruiseEnsemble(b, l, 1)
			r, err := NewRealiser(e)
			if err != nil {
				b.Fatal(err)
			}
			runtime.GC()
			base := liveHeap()
			peak := base
			done := make(chan struct{})
			var wg sync.WaitGroup
			wg.Add(1)
			go func() {
				defer wg.Done()
				tick := time.NewTicker(10 * time.Millisecond)
				defer tick.Stop()
				for {
					select {
					case <-done:
						return
					case <-tick.C:
						peak = max(peak, liveHeap())
					}
				}
			}()
			for b.Loop() {
				if _, err := r.Run(context.Background(), 0, 1, 1, func(Record) error { return nil }); err != nil {
					b.Fatal(err)
				}
			}
			close(done)
			wg.Wait()
			b.ReportMetric(b.Elapsed().Seconds()/float64(b.N)/l*1e3, "ms/lap")
			b.ReportMetric(float64(peak-base)/1e6, "MBpeak")
		})
	}
}

// liveHeap returns the bytes of live and not yet collected heap objects.
func liveHeap() uint64 {
	s := []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}}
	metrics.Read(s)
	return s[0].Value.Uint64()
}
