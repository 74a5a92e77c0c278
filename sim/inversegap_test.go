package sim

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
)

// TestBandGapMathieu checks the band gap at quasi-momentum 0 against the
// Mathieu characteristic values of SciPy 1.10.1 (testdata/reference/
// mathieu.csv): Delta / E_s = b_2(q) - a_0(q), for every q of the file, on
// the default 20-site ring. Tolerance absolute in units of E_s: the
// eigensolver's round-off (1e-11, as TestBandsMathieuSciPy) plus ten times
// SciPy's disagreement with the file's independent Hill-matrix column.
func TestBandGapMathieu(t *testing.T) {
	ring := rb87Ring(20, 5e-6)
	for _, q := range mathieuQs {
		a0, b2 := mathieu(t, "a", 0, q), mathieu(t, "b", 2, q)
		got := ring.BandGapHz(depthForQ(ring, q)) / recoilHz(ring)
		want := b2.scipy - a0.scipy
		tol := 1e-11 + 10*(a0.absDiff+b2.absDiff)
		if math.Abs(got-want) > tol {
			t.Errorf("q=%g: gap %v E_s, want b2 - a0 = %v (tol %g)", q, got, want, tol)
		}
		// In a deep lattice the cosine well is softer than its harmonic
		// approximation (4 sqrt(q) E_s, the trap frequency): the gap is
		// below it, by about E_s (A&S 20.2.30, from memory:
		// b_2 - a_0 = 4 sqrt(q) - 1 - 1/(4 sqrt(q)) + O(1/q)). In a shallow
		// one (q <= 1) the gap tends to the free 4 E_s instead.
		harmonic := ring.TrapHz(depthForQ(ring, q)) / recoilHz(ring)
		if q >= 2 && !(got < harmonic) {
			t.Errorf("q=%g: gap %v E_s not below the harmonic %v E_s", q, got, harmonic)
		}
		if q >= 20 {
			asym := 4*math.Sqrt(q) - 1 - 1/(4*math.Sqrt(q))
			if tol := 1 / q; math.Abs(got-asym) > tol { // the O(1/q) remainder, coefficient below 1
				t.Errorf("q=%g: gap %v E_s, asymptote %v (tol %g)", q, got, asym, tol)
			}
		}
	}
}

// TestInverseGapRamp checks the registered shape: its boundary values
// (speed 0 at t = 0 and the cruise speed at t_r, the recipe "add a ramp
// shape"), its angle against Gauss-Legendre quadrature of its speed (exact
// for the degree-7 polynomial), and the design frequency it uses, the band
// gap rather than the trap frequency.
func TestInverseGapRamp(t *testing.T) {
	const w0, tr, depth = 500.0, 150e-6, 20e3 // the demo's cruise, ramp time and depth
	ring := rb87Ring(20, 5e-6)
	shape, err := LookupShape("inverse-gap")
	if err != nil || !shape.Designed {
		t.Fatalf("registry: %v, designed %v", err, shape.Designed)
	}
	r, err := shape.New(ring, tr, w0, depth)
	if err != nil {
		t.Fatal(err)
	}
	g := r.(InverseGap)
	if g.Name() != "inverse-gap" || math.Abs(g.TrapRadS-2*math.Pi*ring.BandGapHz(depth)) > 1e-9 {
		t.Errorf("%s designed for %g rad/s, want 2 pi x the band gap %g Hz", g.Name(), g.TrapRadS, ring.BandGapHz(depth))
	}
	if got := r.Speed(0); got != 0 {
		t.Errorf("Speed(0) = %v, want 0", got)
	}
	if got := r.Speed(tr); math.Abs(got-w0) > 1e-12*w0 {
		t.Errorf("Speed(t_r) = %v, want %v (tol 1e-12 rel)", got, w0)
	}
	for _, frac := range []float64{0.3, 1} {
		want := quad.Fixed(r.Speed, 0, frac*tr, 12, quad.Legendre{}, 0)
		if got := r.Angle(frac * tr); math.Abs(got-want) > 1e-13*w0*tr {
			t.Errorf("Angle(%g t_r) = %v, want %v (tol %g)", frac, got, want, 1e-13*w0*tr)
		}
	}
	if _, err := NewInverseGap(ring, tr, w0, -1); err == nil {
		t.Error("negative design depth: no error")
	}
}

// TestInverseGapBeatsHarmonic runs the demo's sequence (20 sites, 5 um, 20
// kHz, 150 us to 500 rad/s, one lap, ground-state start) with both inverse
// ramps: designed for the band gap, the ramp leaves more of each arm in the
// ground band after the ramp-up than designed for the harmonic trap
// frequency, as it should when the packet oscillates at the gap. Measured:
// 0.99988 against 0.99839 (this test's log); the check is the order.
func TestInverseGapBeatsHarmonic(t *testing.T) {
	ring := rb87Ring(20, 5e-6)
	ground := func(r Ramp) float64 {
		seq, err := NewSequence(r, 1)
		if err != nil {
			t.Fatal(err)
		}
		s, err := NewSimulator(Config{Ring: ring, DepthHz: 20e3, Sequence: seq})
		if err != nil {
			t.Fatal(err)
		}
		return s.Run(Shot{}, nil).GroundAfterRampUp[0]
	}
	harm, err := NewInverse(ring, 150e-6, 500, 20e3)
	if err != nil {
		t.Fatal(err)
	}
	gap, err := NewInverseGap(ring, 150e-6, 500, 20e3)
	if err != nil {
		t.Fatal(err)
	}
	gh, gg := ground(harm), ground(gap)
	t.Logf("ground band after the ramp-up: harmonic design %.5f, gap design %.5f", gh, gg)
	if !(gg > gh) {
		t.Errorf("gap design leaves %v in the ground band, harmonic design %v: want more", gg, gh)
	}
}
