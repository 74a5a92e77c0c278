package mc

import (
	"testing"

	"rampart/noise"
	"rampart/sim"
)

// BenchmarkResponseVersusMonteCarlo times the two ways of answering "what
// does this noise do to the benchmark sequence" (benchSequence; white RIN
// at -120 dB/Hz and drive phase noise at -110 dBc/Hz of correlation 0.9,
// nothing static), each on one core:
//
//   - monte-carlo: realisations with noise records through the shot
//     (ms/realisation; an answer to the standard error of 1000
//     realisations costs 1000 of them);
//   - kernels: all noise transfer functions of the nominal shot;
//   - predict: the prediction for the budget from the kernels
//     (PredictProcesses), which every further spectrum costs.
//
// The kernels agree with the Monte Carlo within its standard error at
// 1000 realisations or better (sim TestResponseMonteCarlo, TestFieldNoiseKernel),
// so the speed-up at equal accuracy is 1000 x monte-carlo / (kernels +
// predict) for a first spectrum and 1000 x monte-carlo / predict for each
// further one (README, "Performance").
func BenchmarkResponseVersusMonteCarlo(b *testing.B) {
	c := benchSequence(b)
	bud := Budget{RIN: noise.White{Level: noise.IntensityFromRIN(-120)}, Phase: noise.White{Level: noise.PhaseFromDBc(-110)}, PhaseCorrelation: 0.9}
	b.Run("monte-carlo", func(b *testing.B) {
		runBench(b, Ensemble{Config: c, Budget: bud, Samples: 4, Seed: 1, Sampler: "random"}, 1)
	})
	s, err := sim.NewSimulator(c)
	if err != nil {
		b.Fatal(err)
	}
	var k *sim.Kernels
	b.Run("kernels", func(b *testing.B) {
		for b.Loop() {
			if k, err = s.Kernels(0); err != nil {
				b.Fatal(err)
			}
		}
	})
	if k == nil {
		if k, err = s.Kernels(0); err != nil {
			b.Fatal(err)
		}
	}
	ps := bud.Processes(k.DurationS)
	b.Run("predict", func(b *testing.B) {
		for b.Loop() {
			k.PredictProcesses(ps)
		}
	})
}
