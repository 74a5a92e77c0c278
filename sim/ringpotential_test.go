package sim

import (
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/gonum/dsp/fourier"
)

// plainWithPotential is PlainSplitStep (inertial frame, FFT Strang steps
// on the full grid of angles) with the ring potential p added to the
// lattice factor as a diagonal in angle space: the exact reference the
// first-order treatment is tested against. Lowest level, no pulse factor.
func plainWithPotential(s *Simulator, sh Shot, p RingPotential, stepS float64) complex128 {
	cfg, b := s.cfg, s.basis
	m := b.Size()
	v0 := 2 * math.Pi * cfg.DepthHz
	rot := cfg.Ring.rotationalRate()
	gStart := 1 + (sh.DepthRel[0]+sh.DepthRel[1])/2
	es0 := diagonalise(b, rot, cfg.RotationRadS, gStart*v0)
	trap := 2 * math.Pi * cfg.Ring.TrapHz(cfg.DepthHz*gStart)
	start := wannier(b, cfg.Ring, es0, 0, trap)

	drives := s.drives(sh)
	end := math.Max(drives[0].times()[3], drives[1].times()[3])
	n := int(math.Ceil(end/stepS - 1e-9))
	dt := end / float64(n)
	fft := fourier.NewCmplxFFT(m)
	kin := make([]complex128, m)
	for i := range m {
		l := float64(i)
		if i >= m/2 {
			l -= float64(m)
		}
		kin[i] = cis(-rot * l * l * dt / 2)
	}
	var out [2][]complex128
	for a, d := range drives {
		psi := make([]complex128, m)
		for i, amp := range start.Amp {
			psi[(b.LMin()+i+m)%m] = amp
		}
		x := make([]complex128, m)
		for step := range n {
			t := (float64(step) + 0.5) * dt
			for i := range psi {
				psi[i] *= kin[i]
			}
			fft.Sequence(x, psi)
			aa, g := d.Angle(t), d.Depth(t)
			for j := range x {
				th := 2 * math.Pi * float64(j) / float64(m)
				c := math.Cos(float64(b.Sites) * (th - aa) / 2)
				u := p.potentialRadS(cfg.Ring, v0, g, aa, th)
				x[j] *= cis((g*v0*c*c - u) * dt)
			}
			fft.Coefficients(psi, x)
			for i := range psi {
				psi[i] *= kin[i] / complex(float64(m), 0)
			}
		}
		out[a] = psi
	}
	var z complex128
	for i := range out[0] {
		z += complexConj(out[1][i]) * out[0][i]
	}
	return z
}

// potentialConfig is slowConfig's ring and a sin2 ramp of rampS s (2 ms:
// adiabatic to 1e-6) for laps laps, not rotating, so that any phase is the
// potential's.
func potentialConfig(t *testing.T, laps, rampS float64) Config {
	t.Helper()
	c := benchConfig(t, 1)
	c.RotationRadS = 0
	up, err := NewShape("sin2", rampS, 500, c.TrapRadS())
	if err != nil {
		t.Fatal(err)
	}
	if c.Sequence, err = NewSequence(up, laps); err != nil {
		t.Fatal(err)
	}
	return c
}

// TestRingPotentialFirstOrder compares the phase the first-order
// treatment gives (the arms' potential difference integrated along the
// nominal trajectories, with the packet's form factors) with the exact
// full-grid integration, and checks the selection rules: for symmetric
// ramps and whole laps the arms' phases cancel (a(T - t) = 2 pi laps -
// a(t) makes the difference odd about T/2); half-integer laps leave a
// bias. A skew leaves none, at first order or in the exact integration:
// each arm's phase -integral U(a_s(t)) dt does not change when its motion
// is delayed, since both arms rest at the same site angle before and
// after (issue 12 expected a bias from a skew; it is not there for a
// static potential).
func TestRingPotentialFirstOrder(t *testing.T) {
	if testing.Short() {
		t.Skip("full-grid integration of whole sequences")
	}
	// Tilt 1e-4 rad: 1.07 Hz of gravity on this ring (issue 12: 10.7 kHz
	// per rad), lowest point a quarter turn from the start site, where
	// the whole-lap cancellation is not by symmetry of the potential.
	tilt := RingPotential{TiltRad: 1e-4, LowRad: math.Pi / 2}
	harm := RingPotential{Harmonics: []DepthHarmonic{{Order: 3, Rel: 1e-4, PhaseRad: 0.7}}}
	for _, c := range []struct {
		name   string
		laps   float64
		rampS  float64
		skewS  float64
		p      RingPotential
		zero   bool    // first order must vanish (symmetry)
		tolRel float64 // relative on the exact bias (second order and numerics)
	}{
		// Achieved: 4.2e-5 (tilt) and 4.1e-5 (harmonic) relative, the same
		// at 10x the amplitude (a model error, not second order); without
		// the packet's lag a''/omega^2 in the ramps they were 3.7e-4 and
		// 2.3e-3. Tolerances 2e-4, about 5x the achieved.
		{"tilt, 1 lap", 1, 2e-3, 0, tilt, true, 0},
		{"tilt, 0.5 lap", 0.5, 2e-3, 0, tilt, false, 2e-4},
		{"tilt, 1 lap, skew 50 us", 1, 2e-3, 50e-6, tilt, true, 0},
		{"harmonic 3, 0.5 lap", 0.5, 2e-3, 0, harm, false, 2e-4},
		{"harmonic 3, 1 lap", 1, 2e-3, 0, harm, true, 0},
		// A non-adiabatic 150 us ramp (contrast 0.48): the packet is not
		// the one the first order follows; seen 9e-5 relative.
		{"tilt, 0.5 lap, 150 us ramp", 0.5, 150e-6, 0, tilt, false, 5e-4},
	} {
		t.Run(c.name, func(t *testing.T) {
			cfg := potentialConfig(t, c.laps, c.rampS)
			s, err := NewSimulator(cfg)
			if err != nil {
				t.Fatal(err)
			}
			sh := Shot{SkewS: c.skewS}
			nominal := s.Run(sh, nil)
			sh.Potential = c.p
			got := s.Run(sh, nil)
			first := Wrap(got.PhaseRad - nominal.PhaseRad)

			const step = 2e-6
			z0 := plainWithPotential(s, Shot{SkewS: c.skewS}, RingPotential{}, step)
			z1 := plainWithPotential(s, Shot{SkewS: c.skewS}, c.p, step)
			exact := math.Atan2(imag(z1/z0), real(z1/z0))
			t.Logf("first order %.6g rad, exact %.6g rad, contrast %.9f -> %.9f", first, exact, cmplxAbs(z0), cmplxAbs(z1))
			if c.zero {
				// Seen: up to 1.3e-9 rad, the central difference of the
				// commanded speed in the packet's lag (2e-8 of the
				// half-lap's bias); tolerance 1e-8.
				if math.Abs(first) > 1e-8 {
					t.Errorf("first-order bias %g rad, want 0 by symmetry (tol 1e-8)", first)
				}
				// The exact bias is second order (seen: up to 1.1e-7 rad,
				// 2e-6 of the half-lap's first-order bias).
				if math.Abs(exact) > 1e-6 {
					t.Errorf("exact bias %g rad, want below 1e-6 (cancellation)", exact)
				}
			} else {
				if math.Abs(first) < 1e-3 {
					t.Errorf("first-order bias %g rad, want a bias (no symmetry)", first)
				}
				if math.Abs(first-exact) > c.tolRel*math.Abs(exact) {
					t.Errorf("first order %.6g rad, exact %.6g rad (relative tol %g)", first, exact, c.tolRel)
				}
			}
			// A small potential leaves an adiabatic ramp adiabatic
			// (seen: 3e-9 on the 2 ms ramps, 4e-8 on the 150 us one at
			// 10x the tilt; tolerance 3e-8).
			if d := math.Abs(cmplxAbs(z1) - cmplxAbs(z0)); d > 3e-8 {
				t.Errorf("contrast moved by %g with the potential, want < 3e-8", d)
			}
		})
	}
}

// BenchmarkShotRingPotential times a shot of the benchmark ring with a
// tilt and a depth harmonic against the perfect ring (goal: at most 3x).
func BenchmarkShotRingPotential(b *testing.B) {
	for _, laps := range []float64{1, 100} {
		for _, tilted := range []bool{false, true} {
			b.Run(fmt.Sprintf("laps=%g/tilted=%v", laps, tilted), func(b *testing.B) {
				s, err := NewSimulator(benchConfig(b, laps))
				if err != nil {
					b.Fatal(err)
				}
				var sh Shot
				if tilted {
					sh.Potential = RingPotential{TiltRad: 1e-3, LowRad: 1, Harmonics: []DepthHarmonic{{Order: 2, Rel: 1e-3}}}
				}
				for b.Loop() {
					s.Run(sh, nil)
				}
			})
		}
	}
}
