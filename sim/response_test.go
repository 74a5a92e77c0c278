package sim

import (
	"math"
	"testing"
)

// deepRing is the heating test's ring: 4 sites of radius 5 um at 26.9 kHz
// depth, trap frequency 1000.6 Hz, q ~ 720 (anharmonic corrections of order
// 1/(4 sqrt q) ~ 1 %), with a slow sin2 ramp of 2 ms to 50 rad/s and half
// a lap: 65 ms in the lattice, 65 trap periods.
func deepRing(t testing.TB) Config {
	t.Helper()
	c := Config{Ring: Ring{Sites: 4, RadiusM: 5e-6, MassKg: Rb87MassU * AtomicMassUnit}, DepthHz: 26.9e3}
	up, err := NewShape("sin2", 2e-3, 50, c.TrapRadS())
	if err != nil {
		t.Fatal(err)
	}
	if c.Sequence, err = NewSequence(up, 0.5); err != nil {
		t.Fatal(err)
	}
	return c
}

// bandIntegral returns the integral of ker over [lo, hi] on the grid.
func bandIntegral(k *Kernels, ker []float64, lo, hi float64) float64 {
	var s float64
	for m, f := range k.FrequencyHz {
		if f >= lo && f <= hi {
			s += ker[m] * k.StepHz
		}
	}
	return s
}

// TestResponseSavardRates checks the contrast kernels of noise on one arm
// against the harmonic-trap heating rates of M. E. Savard, K. M. O'Hara
// and J. E. Thomas, Phys. Rev. A 56, R1095 (1997), as the golden rule
// gives them for the ground state (one-sided PSDs per Hz; see
// TestHeatingHarmonicLimit):
//
//	intensity: 0 -> 2 at Gamma_2 = (omega^2/16) S_eps(2 nu)
//	angle:     0 -> 1 at Gamma_1 = (I omega^3 / (4 hbar)) S_a(nu),  S_a = S_alpha / N^2
//
// Noise on arm s = +1 alone moves a fraction P = Gamma T of it out of the
// ground state, orthogonal to the other arm's, so |z| = C0 sqrt(1 - P):
// the contrast kernel integrated over a band around the resonance is
// C0 Gamma T / (2 S). Intensity noise resonates at 2 nu only and angle
// noise at nu only (Savard et al.): the kernels integrated over the other
// band are checked to be below 2 % of these. Tolerance 4 %: anharmonicity
// at q ~ 720 (about 1 %) and the sinc^2 tails of a T = 65 ms response
// outside a band of width nu (1/(pi nu T) ~ 0.5 %), plus the anharmonic
// shift of the gaps: the lattice's E_1 - E_0 and (E_2 - E_0)/2 lie about
// 1 % below h nu, and the rates go as omega^3 and omega^2, so the formulas
// are also evaluated with the gaps of the bands in place of omega, where
// the tolerance is 1.5 %.
func TestResponseSavardRates(t *testing.T) {
	c := deepRing(t)
	s, err := NewSimulator(c)
	if err != nil {
		t.Fatal(err)
	}
	k, err := s.Kernels(3 * c.Ring.TrapHz(c.DepthHz))
	if err != nil {
		t.Fatal(err)
	}
	nu := c.Ring.TrapHz(c.DepthHz)
	omega := 2 * math.Pi * nu
	T := c.Sequence.Duration()
	n := float64(c.Ring.Sites)
	gamma2 := omega * omega / 16
	gamma1 := c.Ring.Inertia() * omega * omega * omega / (4 * Hbar) / (n * n)
	bands := bandMeans(diagonalise(s.basis, c.Ring.rotationalRate(), 0, 2*math.Pi*c.DepthHz))
	w1, w2 := bands[1]-bands[0], (bands[2]-bands[0])/2
	gap2 := w2 * w2 / 16
	gap1 := c.Ring.Inertia() * w1 * w1 * w1 / (4 * Hbar) / (n * n)
	for _, tc := range []struct {
		ch       Channel
		in, away [2]float64
		rate, gap float64
	}{
		{IntensityPlus, [2]float64{1.5 * nu, 2.5 * nu}, [2]float64{0.5 * nu, 1.5 * nu}, gamma2, gap2},
		{PhasePlus, [2]float64{0.5 * nu, 1.5 * nu}, [2]float64{1.5 * nu, 2.5 * nu}, gamma1, gap1},
	} {
		kc := k.Channel(tc.ch).Contrast
		got := bandIntegral(k, kc, tc.in[0], tc.in[1])
		want := k.Contrast * tc.rate * T / 2
		t.Logf("%v: band integral %.5g, Savard et al. %.5g (ratio %.4f); other band %.3g", tc.ch, got, want, got/want, bandIntegral(k, kc, tc.away[0], tc.away[1]))
		if math.Abs(got-want) > 0.04*want {
			t.Errorf("%v: contrast kernel over the resonance %.5g, want %.5g (tol 4 %%)", tc.ch, got, want)
		}
		wantGap := k.Contrast * tc.gap * T / 2
		t.Logf("%v: with the band gaps %.5g (ratio %.4f)", tc.ch, wantGap, got/wantGap)
		if math.Abs(got-wantGap) > 0.015*wantGap {
			t.Errorf("%v: contrast kernel over the resonance %.5g, want %.5g with the band gaps (tol 1.5 %%)", tc.ch, got, wantGap)
		}
		if o := math.Abs(bandIntegral(k, kc, tc.away[0], tc.away[1])); o > 0.02*want {
			t.Errorf("%v: contrast kernel away from the resonance %.3g, want below 2 %% of %.3g", tc.ch, o, want)
		}
	}
}
