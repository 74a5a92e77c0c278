package sim

import (
	"fmt"
	"math"
	"testing"
)

// plainWithPotential is PlainSplitStep (inertial frame, FFT Strang steps
// on the full grid of angles) with the ring potential p added to the
// lattice factor as a diagonal in angle space: the exact reference the
// first-order treatment is tested against. Lowest level, no pulse factor.
func plainWithPotential(s *Simulator, sh Shot, p RingPotential, stepS float64) complex128 {
	v0 := 2 * math.Pi * s.cfg.DepthHz
	return s.plainSplitStep(sh, stepS, func(a, g, theta, sign float64) float64 {
		return p.potentialRadS(s.cfg.Ring, v0, g, a, theta, sign)
	})
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

// TestRingPotentialWholeLapFastRamps is the demo's geometry (benchConfig:
// 20 sites, 5 um, 20 kHz, 500 rad/s) on one lap with fast ramps, not
// rotating, tilted by 0.5 mrad (the demo's tilt): the case where the first
// order fails. With the lowest point a quarter turn from the start site
// the potential is odd under theta -> -theta; the ramps leave each arm's
// packet excited (ground population after the 150 us ramp-up 0.923 for
// sin2, 0.998 for inverse), and the exact integration keeps a bias linear
// in the tilt that the first order, which follows the adiabatic path and
// cancels on every symmetric whole lap, does not have. ExcitedBiasRad
// gives its scale. With the lowest point at the start site the potential
// is even and both vanish by symmetry.
func TestRingPotentialWholeLapFastRamps(t *testing.T) {
	if testing.Short() {
		t.Skip("full-grid integration of whole sequences")
	}
	for _, c := range []struct {
		shape string
		rampS float64
		low   float64 // rad
		// pin is the oracle's bias at a 0.5 us step, 0 for none (seen:
		// 1.233e-5 and 2.264e-6 rad; the 1 us step used here gave
		// 1.245e-5 and 2.279e-6, 1.0 % and 0.7 % off; 2 us gave
		// 1.293e-5 and 2.341e-6).
		pin float64
	}{
		{"sin2", 150e-6, math.Pi / 2, 1.233e-5},
		{"inverse", 150e-6, math.Pi / 2, 2.264e-6},
		{"sin2", 300e-6, math.Pi / 2, 0},
		{"sin2", 150e-6, 0, 0},
	} {
		t.Run(fmt.Sprintf("%s %g us, low %.3g rad", c.shape, c.rampS*1e6, c.low), func(t *testing.T) {
			cfg := benchConfig(t, 1)
			cfg.RotationRadS = 0
			up, err := NewShape(c.shape, c.rampS, 500, cfg.TrapRadS())
			if err != nil {
				t.Fatal(err)
			}
			if cfg.Sequence, err = NewSequence(up, 1); err != nil {
				t.Fatal(err)
			}
			s, err := NewSimulator(cfg)
			if err != nil {
				t.Fatal(err)
			}
			p := RingPotential{TiltRad: 5e-4, LowRad: c.low}
			nominal := s.Run(Shot{}, nil)
			first := Wrap(s.Run(Shot{Potential: p}, nil).PhaseRad - nominal.PhaseRad)
			const step = 1e-6
			z0 := plainWithPotential(s, Shot{}, RingPotential{}, step)
			z1 := plainWithPotential(s, Shot{}, p, step)
			exact := math.Atan2(imag(z1/z0), real(z1/z0))
			scale := p.ExcitedBiasRad(cfg.Ring, cfg.TrapRadS(), nominal.GroundAfterRampUp[0])
			t.Logf("first order %.4g rad, exact %.4g rad, ExcitedBiasRad %.4g rad (ground %.6f)", first, exact, scale, nominal.GroundAfterRampUp[0])

			// The first order cancels by the arms' symmetry on the
			// adiabatic path (seen: below 5e-16 rad; 3.9e-7 rad before
			// the cruise lost its spurious lag). Tolerance 1e-12.
			if math.Abs(first) > 1e-12 {
				t.Errorf("first-order bias %g rad, want 0 by symmetry (tol 1e-12)", first)
			}
			if c.low == 0 {
				// Even potential, mirror arms: exactly zero (seen: below
				// 3e-14 rad). The estimate has no odd part to scale.
				if math.Abs(exact) > 1e-12 || scale != 0 {
					t.Errorf("exact bias %g rad, scale %g rad with an even potential, want 0 (tol 1e-12)", exact, scale)
				}
				return
			}
			// The exact bias is first order in the tilt: odd under its
			// reversal (seen: equal and opposite to the 4 digits printed;
			// tolerance 1e-3 relative).
			p.TiltRad = -p.TiltRad
			z2 := plainWithPotential(s, Shot{}, p, step)
			flipped := math.Atan2(imag(z2/z0), real(z2/z0))
			if d := math.Abs(exact + flipped); d > 1e-3*math.Abs(exact) {
				t.Errorf("exact bias %g rad, %g with the tilt reversed: not odd (tol 1e-3 relative)", exact, flipped)
			}
			if c.pin != 0 && math.Abs(exact-c.pin) > 0.03*math.Abs(c.pin) {
				// Tolerance 3 %: the 1 us step's own error is 1 %.
				t.Errorf("exact bias %.4g rad, want %.4g rad within 3 %%", exact, c.pin)
			}
			// The scale: seen |exact|/scale 0.39 (sin2 150 us), 0.49
			// (inverse 150 us), 0.51 (sin2 300 us), and 0.54 for inverse
			// 300 us; accepted 0.2 to 1, so that the scale bounds the
			// bias and stays within 5x of it.
			if r := math.Abs(exact) / scale; r < 0.2 || r > 1 {
				t.Errorf("exact bias %.4g rad is %.3g of ExcitedBiasRad %.4g rad, want 0.2 to 1", exact, r, scale)
			}
			// The failing case: the first order misses the whole bias.
			// When this fails the first order has learnt the excited
			// packets; compare it with exact instead.
			if math.Abs(exact-first) < 0.9*math.Abs(exact) {
				t.Errorf("first order %.4g rad now follows the exact %.4g rad: tighten this test", first, exact)
			}
		})
	}
}

// TestRingPotentialKeepsScaleFactor checks that a potential fixed in the
// apparatus frame leaves the Sagnac scale factor alone: the apparatus
// turns with the background rotation, so the potential sees the lattices'
// angles relative to it, which do not depend on Omega_bg, and dPhi/dOmega
// stays K = 2 I phi(T) / hbar (docs/model.md, Interferometer and signs).
// Evaluated in the inertial frame instead, a 0.1 % second harmonic and a
// 0.5 mrad tilt on the demo ring gave a scale-factor error of about 1.7e4
// ppm; the tolerance, 0.05 ppm, sits near the nominal shot's own error on
// this adiabatic 2 ms ramp (sim/gyro_test.go: below 3e-4 ppm).
func TestRingPotentialKeepsScaleFactor(t *testing.T) {
	cfg := potentialConfig(t, 1, 2e-3)
	s, err := NewSimulator(cfg)
	if err != nil {
		t.Fatal(err)
	}
	_, plain, err := s.Gyro(Shot{})
	if err != nil {
		t.Fatal(err)
	}
	sh := Shot{Potential: RingPotential{TiltRad: 5e-4, LowRad: 0.7, Harmonics: []DepthHarmonic{{Order: 2, Rel: 1e-3, PhaseRad: 0.3}}}}
	_, tilted, err := s.Gyro(sh)
	if err != nil {
		t.Fatal(err)
	}
	if d := tilted.ScaleFactorErrorPPM - plain.ScaleFactorErrorPPM; math.Abs(d) > 0.05 {
		t.Errorf("scale-factor error moved by %g ppm with the potential (%g against %g), want 0 (tol 0.05 ppm)", d, tilted.ScaleFactorErrorPPM, plain.ScaleFactorErrorPPM)
	}
}
