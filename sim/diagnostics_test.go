package sim

import (
	"math"
	"testing"
)

// TestDisplacedPacketOscillates displaces the ground state of a deep site by
// x0 and checks that its mean offset (Diagnostics.OffsetRad) oscillates at
// the trap frequency (common practice: the dipole mode of a trapped packet),
// with the lattice at rest, for the exact and the split-step propagator.
//
// In the cosine lattice the small-amplitude frequency is the gap E_1 - E_0,
// below nu by the anharmonic shift nu / (4 sqrt(q)) (A&S 20.2.30, see
// TestHarmonicLimit). The displacement, a tenth of the oscillator length,
// mixes in band 2 with weight ~ x0^2 / x_osc^2 / 2, which shifts the
// frequency by about that times 2 / (4 sqrt(q)), ~1e-4.
func TestDisplacedPacketOscillates(t *testing.T) {
	ring := rb87Ring(20, 5e-6)
	const q = 100 // deep: the band-0 width is ~1e-14 E_s, no tunnelling over the run
	depth := depthForQ(ring, q)
	// K = 40: the oscillator's momentum width is l_osc ~ 45, the window
	// +-400 holds 9 of them.
	b := mustBasis(t, 20, 20*40)
	nu := ring.TrapHz(depth)
	omega := 2 * math.Pi * nu
	xOsc := math.Sqrt(Hbar / (ring.Inertia() * omega)) // oscillator length, rad
	x0 := 0.1 * xOsc

	e := ring.BandsHz(b, depth, 0)
	gap := e[1] - e[0]
	const perPeriod, periods = 40, 6
	dt := 1 / gap / perPeriod

	for _, method := range []string{"exact", "split-step"} {
		t.Run(method, func(t *testing.T) {
			psi := groundWannier(b, ring, depth)
			for i := range psi.Amp {
				psi.Amp[i] *= cis(-float64(b.LMin()+i) * x0) // psi(theta) -> psi(theta - x0)
			}
			f := fieldOf(psi)
			p := newPropagator(b, ring, 2*math.Pi*depth, 1)
			es := diagonalise(b, ring.rotationalRate(), 0, 2*math.Pi*depth)
			d := restDrive()

			start := p.diagnose(f, d, 0, 0, &es).OffsetRad
			if math.Abs(start/x0-1) > 1e-9 { // relative: round-off
				t.Errorf("initial offset: got %v, want %v (tol %g)", start, x0, 1e-9*x0)
			}
			var crossings []float64
			prev := start
			for i := range perPeriod * periods {
				t0 := float64(i) * dt
				if method == "exact" {
					p.exactStep(f, &es, 0, 1, dt)
				} else {
					p.splitSteps(f, d, t0, t0+dt, 5) // 200 steps per period: frequency error ~ (omega dt)^2 / 24 ~ 4e-5
				}
				x := p.diagnose(f, d, 0, t0+dt, &es).OffsetRad
				if prev < 0 && x >= 0 {
					crossings = append(crossings, t0+dt*(-prev)/(x-prev))
				}
				prev = x
			}
			if len(crossings) < periods-1 {
				t.Fatalf("%d upward zero crossings in %d periods, want %d", len(crossings), periods, periods-1)
			}
			got := float64(len(crossings)-1) / (crossings[len(crossings)-1] - crossings[0])
			t.Logf("oscillation %.6g Hz, E_1 - E_0 = %.6g Hz, nu = %.6g Hz", got, gap, nu)

			want := nu * (1 - 1/(4*math.Sqrt(q))) // trap frequency less the anharmonic shift
			tol := 2e-3                           // relative: 1/(16 q) = 6e-4 of the next order in A&S 20.2.30, plus the amplitude shift
			if math.Abs(got/want-1) > tol {
				t.Errorf("frequency vs nu(1 - 1/(4 sqrt q)): got %v, want %v (tol %g)", got, want, tol)
			}
			tol = 5e-4 // relative: amplitude shift ~1e-4, zero-crossing interpolation, split-step error
			if math.Abs(got/gap-1) > tol {
				t.Errorf("frequency vs E_1 - E_0: got %v, want %v (tol %g)", got, gap, tol)
			}
		})
	}
}
