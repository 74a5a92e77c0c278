package sim

import (
	"math"
	"math/rand/v2"
	"testing"

	"rampart/noise"
)

// TestNoisyCruiseAccuracy measures the interval method for noise during
// constant stretches (Simulator.stretch: exact steps of the commanded
// motion with the noise split off, intervals of half the split step)
// against a fine-step reference that takes fourth-order split steps of a
// tenth of the automatic step through the whole shot (itself converged: a
// twentieth changes contrast by 3e-6 and phase by 2e-6 rad in the strongest
// row). White intensity noise common to both spin states and independent
// white drive phase noise on the two arms, band-limited to what the split
// step resolves (Simulator.NoiseBandHz), on the benchmark ring with a
// half-lap sequence.
//
// The interval method's error is second order in the interval and first
// order in the jitter amplitude (it splits the frame velocity -hbar delta' l
// from the exact motion); intensity noise alone is reproduced to 1e-6 in
// contrast and 1e-11 rad in phase. Tolerances: 0.5 % of the noise's own
// effect, or the targets of the automatic numerics (1e-4 in contrast,
// 1e-6 rad in phase) where that is larger (measured: 0.1 to 0.4 %).
func TestNoisyCruiseAccuracy(t *testing.T) {
	if testing.Short() {
		t.Skip("fine-step reference")
	}
	c := benchConfig(t, 0.5)
	s, err := NewSimulator(c)
	if err != nil {
		t.Fatal(err)
	}
	nominal := s.Run(Shot{}, nil)
	band := noise.Band{HighHz: s.NoiseBandHz()}
	for _, tc := range []struct {
		rinDB, phaseDBc float64
	}{
		{-130, -120},
		{-120, -110},
		{-100, -90}, // strong enough to take the contrast to 0.43
	} {
		rng := rand.New(rand.NewPCG(3, 4))
		sh := noiseShot(t, s, noise.IntensityFromRIN(tc.rinDB), noise.PhaseFromDBc(tc.phaseDBc), band, rng)
		got := s.Run(sh, nil)
		ref := *s
		ref.splitOnly, ref.splitStep, ref.step = true, s.step/10, s.step/10
		want := ref.Run(sh, nil)
		t.Logf("RIN %g dB/Hz, L %g dBc/Hz: noise moves C by %.2g and phase by %.2g rad; interval method errors %.2g (C), %.2g rad; %v against %v",
			tc.rinDB, tc.phaseDBc, want.Contrast-nominal.Contrast, Wrap(want.PhaseRad-nominal.PhaseRad),
			got.Contrast-want.Contrast, Wrap(got.PhaseRad-want.PhaseRad), got.Elapsed, want.Elapsed)
		tolC := math.Max(1e-4, 5e-3*math.Abs(want.Contrast-nominal.Contrast))
		if d := math.Abs(got.Contrast - want.Contrast); d > tolC {
			t.Errorf("RIN %g, L %g: contrast %.8f, reference %.8f (error %.2g, tol %.2g)", tc.rinDB, tc.phaseDBc, got.Contrast, want.Contrast, d, tolC)
		}
		tolPhi := 5e-3*math.Abs(Wrap(want.PhaseRad-nominal.PhaseRad)) + 1e-6
		if d := math.Abs(Wrap(got.PhaseRad - want.PhaseRad)); d > tolPhi {
			t.Errorf("RIN %g, L %g: phase %.9f, reference %.9f (error %.2g rad, tol %.2g)", tc.rinDB, tc.phaseDBc, got.PhaseRad, want.PhaseRad, d, tolPhi)
		}
	}
}
