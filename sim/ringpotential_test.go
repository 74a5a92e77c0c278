package sim

import (
	"fmt"
	"math"
	"testing"
)

// plainWithPotential is PlainSplitStep (inertial frame, FFT Strang steps
// on the full grid of angles) with the ring potential p added to the
// lattice factor as a diagonal in angle space: the independent exact
// reference of the ring potential's propagation (sim/ringexact.go).
// Lowest level, no pulse factor.
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

// TestRingPotentialSelectionRules compares the shot with the ring
// potential in the Hamiltonian (sim/ringexact.go) with the independent
// full-grid integration (plainWithPotential, FFT Strang steps in the
// inertial frame) on adiabatic 2 ms ramps, and checks the selection rules
// of issue 12: for symmetric ramps and whole laps the arms' phases cancel
// (a(T - t) = 2 pi laps - a(t) makes the difference odd about T/2), at
// first order exactly and in the exact integration to second order;
// half-integer laps leave a bias. A skew leaves none on adiabatic ramps:
// each arm's phase -integral U(a_s(t)) dt does not change when its motion
// is delayed, since both arms rest at the same site angle before and
// after (issue 12 expected a bias from a skew; it is not there for a
// static potential and adiabatic packets; on fast ramps it is, see
// TestRingPotentialExact). A small potential leaves an adiabatic ramp
// adiabatic: the contrast does not move.
func TestRingPotentialSelectionRules(t *testing.T) {
	if testing.Short() {
		t.Skip("full-grid integration of whole sequences")
	}
	// Tilt 1e-4 rad: 1.07 Hz of gravity on this ring (issue 12: 10.7 kHz
	// per rad), lowest point a quarter turn from the start site, where
	// the whole-lap cancellation is not by symmetry of the potential.
	tilt := RingPotential{TiltRad: 1e-4, LowRad: math.Pi / 2}
	harm := RingPotential{Harmonics: []DepthHarmonic{{Order: 3, Rel: 1e-4, PhaseRad: 0.7}}}
	for _, c := range []struct {
		name  string
		laps  float64
		skewS float64
		p     RingPotential
		zero  bool // the bias must vanish (symmetry)
	}{
		{"tilt, 1 lap", 1, 0, tilt, true},
		{"tilt, 0.5 lap", 0.5, 0, tilt, false},
		{"tilt, 1 lap, skew 50 us", 1, 50e-6, tilt, true},
		{"harmonic 3, 0.5 lap", 0.5, 0, harm, false},
		{"harmonic 3, 1 lap", 1, 0, harm, true},
	} {
		t.Run(c.name, func(t *testing.T) {
			cfg := potentialConfig(t, c.laps, 2e-3)
			s, err := NewSimulator(cfg)
			if err != nil {
				t.Fatal(err)
			}
			sh := Shot{SkewS: c.skewS}
			got, dc := potentialPhase(s, sh, c.p)

			const step = 2e-6
			z0 := plainWithPotential(s, Shot{SkewS: c.skewS}, RingPotential{}, step)
			z1 := plainWithPotential(s, Shot{SkewS: c.skewS}, c.p, step)
			exact := math.Atan2(imag(z1/z0), real(z1/z0))
			t.Logf("shot %.8g rad, full grid %.8g rad, contrast change %.3g (full grid %.3g)", got, exact, dc, cmplxAbs(z1)-cmplxAbs(z0))
			if c.zero {
				// What is left is second order in the potential (seen:
				// -1.4e-8, -1.7e-8 and -4.3e-8 rad, 3e-7 to 2e-6 of the
				// half lap's bias), and the shot follows the full grid
				// there too (seen: 0.8e-9 to 2.8e-9 rad apart, the 2 us
				// Strang step's error). Tolerances 1e-7 and 1e-8 rad.
				if math.Abs(got) > 1e-7 {
					t.Errorf("bias %g rad, want below 1e-7 (cancellation)", got)
				}
				if math.Abs(got-exact) > 1e-8 {
					t.Errorf("shot %.8g rad, full grid %.8g rad (tol 1e-8)", got, exact)
				}
			} else {
				if math.Abs(got) < 1e-3 {
					t.Errorf("bias %g rad, want a bias (no symmetry)", got)
				}
				// The full grid's 2 us Strang step leaves about 2e-5 of
				// the bias (seen: 1e-7 and 2e-5 relative; the shot
				// against the split-step reference agrees to 1e-9 rad,
				// TestRingPotentialExact). Tolerance 6e-5 relative.
				if math.Abs(got-exact) > 6e-5*math.Abs(exact) {
					t.Errorf("shot %.8g rad, full grid %.8g rad (relative tol 6e-5)", got, exact)
				}
			}
			// Adiabatic stays adiabatic (seen: below 4e-9 on these 2 ms
			// ramps, in the shot and the full grid; tolerance 3e-8).
			if math.Abs(dc) > 3e-8 {
				t.Errorf("contrast moved by %g with the potential, want < 3e-8", dc)
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
				reportCPU(b, func() { s.Run(sh, nil) })
			})
		}
	}
}

// TestRingPotentialExcitedBias is the demo's geometry (benchConfig: 20
// sites, 5 um, 20 kHz, 500 rad/s) on one lap with fast ramps, not
// rotating, tilted by 0.5 mrad (the demo's tilt). With the lowest point a
// quarter turn from the start site the potential is odd under theta ->
// -theta; the ramps leave each arm's packet excited (ground population
// after the 150 us ramp-up 0.923 for sin2, 0.998 for inverse), and a
// sloshing packet samples the odd part of the potential differently on the
// two arms: a whole-lap bias, linear in the tilt, that the first-order
// treatment along the adiabatic path (which cancels on every symmetric
// whole lap) missed. The shot now carries it; held against the full-grid
// integration, Richardson-extrapolated from 1 and 0.5 us steps (its
// Strang step's error is of second order). With the lowest point at the
// start site the potential is even and the bias vanishes by symmetry.
func TestRingPotentialExcitedBias(t *testing.T) {
	if testing.Short() {
		t.Skip("full-grid integration of whole sequences")
	}
	for _, c := range []struct {
		shape string
		rampS float64
		low   float64 // rad
	}{
		{"sin2", 150e-6, math.Pi / 2},
		{"inverse", 150e-6, math.Pi / 2},
		{"sin2", 150e-6, 0},
	} {
		t.Run(fmt.Sprintf("%s %g us, low %.3g rad", c.shape, c.rampS*1e6, c.low), func(t *testing.T) {
			rc := ringCase{shape: c.shape, rampS: c.rampS, laps: 1}
			s := rc.simulator(t)
			p := RingPotential{TiltRad: 5e-4, LowRad: c.low}
			got, _ := potentialPhase(s, Shot{}, p)
			if c.low == 0 {
				// Even potential, mirror arms: zero (seen: 2.2e-11 rad,
				// rounding over the split steps). Tolerance 1e-10.
				if math.Abs(got) > 1e-10 {
					t.Errorf("bias %g rad with an even potential, want 0 (tol 1e-10)", got)
				}
				return
			}
			ref := func(step float64) float64 {
				z0 := plainWithPotential(s, Shot{}, RingPotential{}, step)
				z1 := plainWithPotential(s, Shot{}, p, step)
				return math.Atan2(imag(z1/z0), real(z1/z0))
			}
			e1, e2 := ref(1e-6), ref(0.5e-6)
			exact := (4*e2 - e1) / 3
			// The extrapolation's own error: a fraction of its last
			// change, |e2 - exact| (3.8e-8 rad for sin2).
			t.Logf("shot %.8g rad, full grid %.8g (1 us), %.8g (0.5 us), extrapolated %.8g rad", got, e1, e2, exact)
			// Seen: shot against extrapolated 2e-10 (sin2) and 1e-10
			// (inverse) rad, while the extrapolation moved the full grid
			// by 3.8e-8 and 5.2e-9 rad; the first-order treatment gave 0
			// here, the whole of the bias (1.2e-5 rad, 2.3e-6 rad).
			// Tolerance 1e-9 rad: 5 to 10 times the difference seen,
			// 8e-5 of the sin2 bias.
			if d := math.Abs(got - exact); d > 1e-9 {
				t.Errorf("shot %.8g rad, full grid extrapolated %.8g rad: difference %.3g above 1e-9", got, exact, d)
			}
			// Odd in the tilt: reversing it reverses the bias (seen to
			// 1e-6 relative, second order; tolerance 1e-4 relative).
			p.TiltRad = -p.TiltRad
			flipped, _ := potentialPhase(s, Shot{}, p)
			if d := math.Abs(got + flipped); d > 1e-4*math.Abs(got) {
				t.Errorf("bias %g rad, %g with the tilt reversed: not odd (tol 1e-4 relative)", got, flipped)
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
