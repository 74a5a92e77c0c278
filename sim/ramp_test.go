package sim

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
)

// testTrapRadS is the trap angular frequency of the default ring (20 sites,
// 5 um, Rb-87) at 20 kHz, 2 pi x 4.314 kHz; the ramp tests only need a
// realistic scale.
var testTrapRadS = 2 * math.Pi * rb87Ring(20, 5e-6).TrapHz(20e3)

// testRamps returns the analytic shapes to 500 rad/s over tr, the inverse
// ramp designed for testTrapRadS.
func testRamps(tr float64) []Ramp {
	return []Ramp{
		Sin2{DurationS: tr, CruiseRadS: 500},
		MinJerk{DurationS: tr, CruiseRadS: 500},
		Inverse{DurationS: tr, CruiseRadS: 500, TrapRadS: testTrapRadS},
	}
}

// testRampTimes are ramp times from a tenth of a trap period (the inverse
// ramp reverses) to ten.
var testRampTimes = []float64{23e-6, 150e-6, 2.3e-3}

// TestRampBoundaries checks the boundary values every ramp shape promises
// (docs/model.md, Ramp shapes): speed 0 at t = 0 and Omega_0 at t_r, zero
// acceleration at both ends, and the ramp angle Omega_0 t_r / 2 (exact for
// all three: int sin^2(pi s/2) ds = 1/2, int (10s^3-15s^4+6s^5) ds = 1/2,
// int v ds = 7-14+10-5/2 = 1/2, and the term in the second derivative of v
// integrates to the first derivative's end values, both 0).
func TestRampBoundaries(t *testing.T) {
	for _, tr := range testRampTimes {
		for _, r := range testRamps(tr) {
			t.Run(fmt.Sprintf("%s_%gus", r.Name(), tr*1e6), func(t *testing.T) {
				const w0 = 500 // rad/s, the cruise of testRamps
				if got := r.Speed(0); got != 0 {
					t.Errorf("Speed(0): got %v, want %v (tol 0)", got, 0.0)
				}
				const tolEnd = 1e-13 // relative: round-off of the polynomial
				if got := r.Speed(tr); math.Abs(got/w0-1) > tolEnd {
					t.Errorf("Speed(t_r): got %v, want %v (tol %g)", got, w0, tolEnd*w0)
				}
				if got := Cruise(r); math.Abs(got/w0-1) > tolEnd {
					t.Errorf("Cruise: got %v, want %v (tol %g)", got, w0, tolEnd*w0)
				}
				if got, want := r.Angle(tr), w0*tr/2; math.Abs(got/want-1) > tolEnd {
					t.Errorf("ramp angle: got %v, want %v (tol %g)", got, want, tolEnd*want)
				}
				// One-sided differences over h = 1e-4 t_r, relative to the
				// ramp's peak acceleration (sampled). With zero end
				// acceleration they are O(h / t_r) = O(1e-4); a non-zero
				// one would give O(0.1) or more (seen at most 9e-4).
				h := 1e-4 * tr
				var scale float64
				for i := range 1000 {
					ta, tb := tr*float64(i)/1000, tr*float64(i+1)/1000
					scale = math.Max(scale, math.Abs(r.Speed(tb)-r.Speed(ta))/(tb-ta))
				}
				const tol = 1e-2 // relative to the peak acceleration
				if got := (r.Speed(h) - r.Speed(0)) / h / scale; math.Abs(got) > tol {
					t.Errorf("acceleration at t = 0: got %v of the peak, want %v (tol %g)", got, 0.0, tol)
				}
				if got := (r.Speed(tr) - r.Speed(tr-h)) / h / scale; math.Abs(got) > tol {
					t.Errorf("acceleration at t = t_r: got %v of the peak, want %v (tol %g)", got, 0.0, tol)
				}
			})
		}
	}
}

// TestRampAngleIsIntegralOfSpeed checks Angle against a Gauss-Legendre
// quadrature of Speed (gonum integrate/quad, 12 nodes: exact for the
// polynomial shapes, degree <= 7; for sin2 the error is ~(pi/2)^24 / 24!
// ~ 1e-20).
func TestRampAngleIsIntegralOfSpeed(t *testing.T) {
	for _, tr := range testRampTimes {
		for _, r := range testRamps(tr) {
			for _, frac := range []float64{0.13, 0.5, 0.77, 1} {
				want := quad.Fixed(r.Speed, 0, frac*tr, 12, quad.Legendre{}, 0)
				got := r.Angle(frac * tr)
				tol := 1e-13 * 500 * tr // absolute: round-off relative to the ramp angle scale Omega_0 t_r
				if math.Abs(got-want) > tol {
					t.Errorf("%s t_r=%g: Angle(%g t_r): got %v, want %v (tol %g)", r.Name(), tr, frac, got, want, tol)
				}
			}
		}
	}
}

// TestInverseRampHarmonicExact integrates the classical driven oscillator
//
//	d^2x/dt^2 = -omega^2 (x - a(t)),  a(t) = Inverse.Angle(t),
//
// from rest at the trap centre, and checks that the packet's velocity follows the designed
// v(s) = Omega_0 (35 s^4 - 84 s^5 + 70 s^6 - 20 s^7) (the formula,
// written out here) and that it ends at rest in the centre of the moving
// trap: x = a(t_r), x' = Omega_0 (Torrontegui et al., Phys. Rev. A 83,
// 013415 (2011), exact for a harmonic trap). Sin2 over the same times is the
// control: it leaves the packet oscillating.
func TestInverseRampHarmonicExact(t *testing.T) {
	const w0 = 500.0
	omega := testTrapRadS
	for _, tr := range testRampTimes {
		inv := Inverse{DurationS: tr, CruiseRadS: w0, TrapRadS: omega}
		for _, tt := range []struct {
			r     Ramp
			exact bool
		}{{inv, true}, {Sin2{DurationS: tr, CruiseRadS: w0}, false}} {
			t.Run(fmt.Sprintf("%s_%gus", tt.r.Name(), tr*1e6), func(t *testing.T) {
				const n = 20000 // RK4 steps: omega h <= 2e-3, global error ~ (omega h)^4 omega t_r < 1e-9
				h := tr / n
				x, v := 0.0, 0.0
				accel := func(tm, x float64) float64 { return -omega * omega * (x - tt.r.Angle(tm)) }
				maxDev := 0.0
				for i := range n {
					tm := float64(i) * h
					k1x, k1v := v, accel(tm, x)
					k2x, k2v := v+h/2*k1v, accel(tm+h/2, x+h/2*k1x)
					k3x, k3v := v+h/2*k2v, accel(tm+h/2, x+h/2*k2x)
					k4x, k4v := v+h*k3v, accel(tm+h, x+h*k3x)
					x += h / 6 * (k1x + 2*k2x + 2*k3x + k4x)
					v += h / 6 * (k1v + 2*k2v + 2*k3v + k4v)
					s := float64(i+1) / n
					design := w0 * s * s * s * s * (35 + s*(-84+s*(70-20*s)))
					maxDev = math.Max(maxDev, math.Abs(v-design)/w0)
				}
				// residual oscillation amplitude in the moving trap, in
				// units of Omega_0
				residual := math.Hypot(omega*(x-tt.r.Angle(tr)), v-w0) / w0
				const tol = 1e-8 // relative to Omega_0: RK4 error
				if tt.exact {
					if residual > tol {
						t.Errorf("residual oscillation: got %v, want %v (tol %g)", residual, 0.0, tol)
					}
					if maxDev > tol {
						t.Errorf("packet velocity vs design v(s): got max deviation %v, want %v (tol %g)", maxDev, 0.0, tol)
					}
				} else if residual < 1e-4 {
					t.Errorf("control: sin2 residual %v, want above %v (the check must discriminate)", residual, 1e-4)
				}
				t.Logf("residual %.3g Omega_0", residual)
			})
		}
	}
}

// TestPeakSpeed checks the drive summary: the smooth shapes peak at the
// cruise speed and never reverse; the inverse ramp overshoots and, at a
// ramp of a tenth of a trap period, reverses ("throw and catch",
// docs/model.md, Ramp shapes).
func TestPeakSpeed(t *testing.T) {
	tests := []struct {
		r        Ramp
		reverses bool
		minPeak  float64 // relative to Omega_0
	}{
		{Sin2{150e-6, 500}, false, 1},
		{MinJerk{150e-6, 500}, false, 1},
		{Inverse{DurationS: 2.3e-3, CruiseRadS: 500, TrapRadS: testTrapRadS}, false, 1},
		{Inverse{DurationS: 23e-6, CruiseRadS: 500, TrapRadS: testTrapRadS}, true, 2},
		{Sin2{150e-6, -500}, false, 1}, // negative cruise: reversal is relative to the cruise direction
	}
	for _, tt := range tests {
		peak, rev := PeakSpeed(tt.r)
		w0 := math.Abs(Cruise(tt.r))
		if rev != tt.reverses {
			t.Errorf("%s %g s: reverses %v, want %v", tt.r.Name(), tt.r.Duration(), rev, tt.reverses)
		}
		if peak < tt.minPeak*w0*(1-1e-12) {
			t.Errorf("%s %g s: peak %v, want at least %v (tol %g)", tt.r.Name(), tt.r.Duration(), peak, tt.minPeak*w0, 1e-12*w0)
		}
		if !tt.reverses && tt.minPeak == 1 && tt.r.Name() != "inverse" && math.Abs(peak/w0-1) > 1e-12 {
			t.Errorf("%s: peak got %v, want %v (tol %g)", tt.r.Name(), peak, w0, 1e-12*w0)
		}
	}
}

// TestNewShapeErrors checks that bad ramp parameters are refused with a
// message naming the problem.
func TestNewShapeErrors(t *testing.T) {
	tests := []struct {
		name           string
		shape          string
		tr, w0, trapRS float64
		want           string // substring of the message
	}{
		{"zero duration", "sin2", 0, 500, 0, "duration"},
		{"negative duration", "minjerk", -1e-6, 500, 0, "duration"},
		{"infinite duration", "sin2", math.Inf(1), 500, 0, "duration"},
		{"zero cruise", "sin2", 1e-4, 0, 0, "cruise speed"},
		{"NaN cruise", "sin2", 1e-4, math.NaN(), 0, "cruise speed"},
		{"inverse without trap", "inverse", 1e-4, 500, 0, "trap frequency"},
		{"unknown shape", "cosine", 1e-4, 500, 0, "unknown ramp shape"},
	}
	for _, tt := range tests {
		_, err := NewShape(tt.shape, tt.tr, tt.w0, tt.trapRS)
		if err == nil || !strings.Contains(err.Error(), tt.want) {
			t.Errorf("%s: got error %v, want one mentioning %q", tt.name, err, tt.want)
		}
	}
}
