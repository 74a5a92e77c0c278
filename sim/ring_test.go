package sim

import (
	"math"
	"testing"
)

// TestTrapHz checks nu = N sqrt(V0 E_rot) (docs/model.md, Hamiltonian) against
// the same formula evaluated from the constants, E_rot/h = hbar / (4 pi m R^2).
func TestTrapHz(t *testing.T) {
	tests := []struct {
		sites   int
		radiusM float64
		depthHz float64
		tol     float64 // relative: round-off
	}{
		{20, 5e-6, 20e3, 1e-12},
		{4, 2e-6, 467, 1e-12},
		{64, 30e-6, 1e5, 1e-12},
	}
	for _, tt := range tests {
		ring := rb87Ring(tt.sites, tt.radiusM)
		erot := hbarRef / (4 * math.Pi * rb87MassKg * tt.radiusM * tt.radiusM)
		want := float64(tt.sites) * math.Sqrt(tt.depthHz*erot)
		got := ring.TrapHz(tt.depthHz)
		if math.Abs(got/want-1) > tt.tol {
			t.Errorf("N=%d R=%g depth=%g: got %v, want %v (tol %g)", tt.sites, tt.radiusM, tt.depthHz, got, want, tt.tol)
		}
	}
}

// TestHarmonicLimit checks that in a deep lattice the lowest band sits at the
// asymptotic Mathieu value and the gap to the next band approaches the trap
// frequency nu = Ring.TrapHz (docs/model.md, Hamiltonian), using the large-q
// expansion of A&S 20.2.30, w = 2r + 1,
//
//	a_r ~ b_r+1 ~ -2q + 2w sqrt(q) - (w^2+1)/8 - (w^3+3w)/(2^7 sqrt(q))
//	              - (5w^4+34w^2+9)/(2^12 q) - ...
//
// (the first three terms are in docs/model.md, Hamiltonian; the later ones from memory,
// confirmed against SciPy 1.10.1: at q = 400 each term cuts the error to
// a_0 by a factor of 20 to 50). So, in units of E_s = nu / (4 sqrt(q)),
//
//	E_1 - E_0 = b_2 - a_0 = 4 sqrt(q) - 1 - 1/(4 sqrt(q)) - 0.164/q ...
//	(E_1 - E_0) / nu      = 1 - 1/(4 sqrt(q)) - 1/(16 q) - 0.041 q^(-3/2) ...
func TestHarmonicLimit(t *testing.T) {
	ring := rb87Ring(20, 5e-6)
	// K = 120 terms per class: the oscillator ground state's Fourier width
	// is ~ q^(1/4)/sqrt(2) < 7 terms at q = 6400, so the window holds 8 widths.
	b := mustBasis(t, 20, 20*120)
	es := recoilHz(ring)
	for _, q := range []float64{100, 400, 1600, 6400} {
		depth := depthForQ(ring, q)
		e := ring.BandsHz(b, depth, 0)
		sq := math.Sqrt(q)

		a0 := (e[0] + depth/2) / es
		wantA0 := -2*q + 2*sq - 0.25 // A&S 20.2.30 to the constant term
		tolA0 := 1.5 / (32 * sq)     // absolute, units of E_s: 1.5 times the first omitted term, (w^3+3w)/(2^7 sqrt(q)) at w = 1
		if math.Abs(a0-wantA0) > tolA0 {
			t.Errorf("q=%g a_0: got %v, want %v (tol %g)", q, a0, wantA0, tolA0)
		}

		nu := ring.TrapHz(depth)
		ratio := (e[1] - e[0]) / nu
		want := 1 - 1/(4*sq) - 1/(16*q) // from A&S 20.2.30 as above
		tol := 0.1 * math.Pow(q, -1.5)  // absolute: 2.5 times the first omitted term, 0.041 q^(-3/2)
		if math.Abs(ratio-want) > tol {
			t.Errorf("q=%g (E_1-E_0)/nu: got %v, want %v (tol %g)", q, ratio, want, tol)
		}
	}
}
