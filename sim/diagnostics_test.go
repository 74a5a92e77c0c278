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

// TestDiagnosticsFollowTheLattice checks the per-arm diagnostics along a
// slow ramp (minjerk, 2 ms, to l0 = 20 on the default 20 kHz ring), where the
// packet follows its accelerating lattice adiabatically (common practice for
// a particle dragged by a trap):
//
//   - offset: in the lattice frame the inertial force -s I Omega' shifts the
//     packet to x = -s Omega' / omega_10^2, omega_10 = 2 pi (E_1 - E_0) / h
//     (linear response; the f-sum rule puts the weight on band 1), so arm
//     s = +1 lags on the way up and leads on the way down;
//   - velocity error: the lattice-frame velocity is dx/dt (kinematics),
//     compared with the difference quotient of the offsets;
//   - ground band: the shifted packet is the band-0 state displaced by x, a
//     coherent state with 1 - P_0 = |alpha|^2 = x^2 / (4 sigma^2);
//   - width: the oscillator ground state's sigma = sqrt(hbar / (2 I omega_10)).
//
// The ramp also excites a small sloshing (amplitude ~1e-5 rad, 1 % of the
// peak lag), which sets the tolerances below.
func TestDiagnosticsFollowTheLattice(t *testing.T) {
	ring := rb87Ring(20, 5e-6)
	const depth, tr = 20e3, 2e-3
	w0 := 20 / ring.MomentumOf(1)
	up := MinJerk{DurationS: tr, CruiseRadS: w0}
	s := newTestSimulator(t, Config{Ring: ring, DepthHz: depth}, up, 1)
	seq := s.Config().Sequence
	T := seq.Duration()
	e := ring.BandsHz(mustBasis(t, 20, s.Config().Grid), depth, 0)
	w10 := 2 * math.Pi * (e[1] - e[0])
	sigma := math.Sqrt(Hbar / (2 * ring.Inertia() * w10))
	accel := func(x float64) float64 { // central difference, h << t_r
		const h = 1e-8
		return (seq.Speed(x+h) - seq.Speed(x-h)) / (2 * h)
	}
	peakLag := w0 * 1.875 / tr / (w10 * w10) // minjerk peak acceleration 15/8 Omega_0 / t_r

	var ds [2][]Diagnostics
	s.Run(Shot{}, func(d Diagnostics) { ds[d.Arm] = append(ds[d.Arm], d) })
	for arm, sign := range [2]float64{1, -1} {
		d := ds[arm]
		if len(d) < 3*TraceSamples {
			t.Fatalf("arm %d: %d observations, want at least %d (three stretches of TraceSamples)", arm, len(d), 3*TraceSamples)
		}
		if d[0].TimeS != 0 || math.Abs(d[len(d)-1].TimeS-T) > 1e-12*T {
			t.Errorf("arm %d: observations span [%v, %v] s, want [0, %v]", arm, d[0].TimeS, d[len(d)-1].TimeS, T)
		}
		for i, x := range d {
			if i > 0 && x.TimeS < d[i-1].TimeS {
				t.Errorf("arm %d: time goes back from %v to %v", arm, d[i-1].TimeS, x.TimeS)
			}
			if math.Abs(x.Norm-1) > 1e-10 { // absolute: round-off, see TestNormConservation
				t.Errorf("arm %d t=%v: norm got %v, want %v (tol %g)", arm, x.TimeS, x.Norm, 1.0, 1e-10)
			}
			const tolW = 0.01 // relative: anharmonicity beyond omega_10, seen 1e-3
			if math.Abs(x.WidthRad/sigma-1) > tolW {
				t.Errorf("arm %d t=%v: width got %v, want %v (tol %g)", arm, x.TimeS, x.WidthRad, sigma, tolW*sigma)
			}
			// Inside the ramps, away from their ends where the lag is
			// small and the sloshing dominates.
			u := x.TimeS / tr
			if x.TimeS > T/2 {
				u = (T - x.TimeS) / tr
			}
			if u < 0.2 || u > 0.8 || i == 0 || i == len(d)-1 {
				continue
			}
			want := -sign * accel(x.TimeS) / (w10 * w10)
			tol := 0.05 * peakLag // absolute: the sloshing, 1 % of the peak lag, and the linear-response error
			if math.Abs(x.OffsetRad-want) > tol {
				t.Errorf("arm %d t=%v: offset got %v, want %v (tol %g)", arm, x.TimeS, x.OffsetRad, want, tol)
			}
			if prev, next := d[i-1], d[i+1]; next.TimeS > prev.TimeS {
				dxdt := (next.OffsetRad - prev.OffsetRad) / (next.TimeS - prev.TimeS)
				tolV := 0.05 * w0 * 5.77 / (tr * tr) / (w10 * w10) // absolute: 5 % of the peak lag speed (minjerk peak jerk 5.77 Omega_0 / t_r^2); the difference quotient misses 2 % of the sloshing
				if math.Abs(x.VelocityErrRadS-dxdt) > tolV {
					t.Errorf("arm %d t=%v: velocity error got %v, want d(offset)/dt = %v (tol %g)", arm, x.TimeS, x.VelocityErrRadS, dxdt, tolV)
				}
			}
			if loss, want := 1-x.GroundBand, x.OffsetRad*x.OffsetRad/(4*sigma*sigma); want > 1e-5 && math.Abs(loss/want-1) > 0.05 {
				t.Errorf("arm %d t=%v: 1 - ground band got %v, want %v (tol %g)", arm, x.TimeS, loss, want, 0.05*want) // relative: anharmonic corrections, seen 1-2 %
			}
		}
		last := d[len(d)-1]
		if math.Abs(last.OffsetRad) > 0.05*peakLag || last.GroundBand < 1-1e-6 {
			t.Errorf("arm %d at the end: offset %v (tol %g), ground band %v (tol %g): want the packet back at rest in its site",
				arm, last.OffsetRad, 0.05*peakLag, last.GroundBand, 1e-6)
		}
	}
}
