package sim

import (
	"math"
	"strings"
	"testing"
)

// TestAutoNumericsAccuracy checks the promise of AutoNumerics: contrast
// within 1e-4 and phase within 1e-6 rad of a refined calculation (grid x1.5,
// step / 4; the composed step is fourth order, so the refined step's own
// error is about 256 times smaller). The shots are deliberately asymmetric
// (differential depth and skew) so that the phase is not protected by the
// mirror symmetry of the arms. Scenarios span shallow to deep lattices,
// fast and slow ramps and a thermal start; all keep a contrast above 0.5,
// below which a phase is of little use.
func TestAutoNumericsAccuracy(t *testing.T) {
	if testing.Short() {
		t.Skip("convergence study")
	}
	const tolC, tolPhi = 1e-4, 1e-6 // the accuracy targets
	cases := []struct {
		shape   string
		rampS   float64
		cruise  float64 // rad/s
		depthHz float64
		tempK   float64
		laps    float64
	}{
		{"sin2", 150e-6, 500, 20e3, 0, 1},      // the benchmark scenario
		{"inverse", 150e-6, 500, 20e3, 0, 1},   // the demo's shortcut ramp
		{"inverse", 60e-6, 500, 20e3, 0, 1},    // shorter than a quarter trap period
		{"sin2", 300e-6, 500, 5e3, 0, 1},       // shallow
		{"sin2", 150e-6, 500, 20e3, 200e-9, 1}, // thermal, five levels
		{"sin2", 1e-3, 300, 2e3, 0, 0.5},       // very shallow, half a lap
	}
	shot := Shot{DepthRel: [2]float64{1e-3, -1e-3}, SkewS: 20e-9}
	for _, tc := range cases {
		c := benchConfig(t, 1)
		c.DepthHz, c.TemperatureK = tc.depthHz, tc.tempK
		up, err := NewShape(tc.shape, tc.rampS, tc.cruise, c.TrapRadS())
		if err != nil {
			t.Fatal(err)
		}
		if c.Sequence, err = NewSequence(up, tc.laps); err != nil {
			t.Fatal(err)
		}
		auto := AutoNumerics(c)
		fine := c
		unit := 2 * c.Ring.Sites
		fine.Grid = (auto.Grid*3/2 + unit - 1) / unit * unit
		fine.StepS = auto.StepS / 4
		s, err := NewSimulator(c)
		if err != nil {
			t.Fatal(err)
		}
		f, err := NewSimulator(fine)
		if err != nil {
			t.Fatal(err)
		}
		got, want := s.Run(shot, nil), f.Run(shot, nil)
		if d := math.Abs(got.Contrast - want.Contrast); d > tolC {
			t.Errorf("%s %g us %g kHz: contrast %.8f, refined %.8f: error %.2g (tol %g)", tc.shape, tc.rampS*1e6, tc.depthHz/1e3, got.Contrast, want.Contrast, d, tolC)
		}
		if d := math.Abs(Wrap(got.PhaseRad - want.PhaseRad)); d > tolPhi {
			t.Errorf("%s %g us %g kHz: phase %.9f rad, refined %.9f rad: error %.2g (tol %g)", tc.shape, tc.rampS*1e6, tc.depthHz/1e3, got.PhaseRad, want.PhaseRad, d, tolPhi)
		}
	}
}

// TestSchemeOrder checks the order of the split-step compositions on the
// benchmark ramp: halving the step divides the error of Strang's scheme by
// about 4 and that of Suzuki's by about 16 (G. Strang, SIAM J. Numer. Anal.
// 5, 506 (1968); M. Suzuki, Phys. Lett. A 146, 319 (1990)). The error is
// measured on the state after the ramp-up against a step 16 times smaller.
func TestSchemeOrder(t *testing.T) {
	c := benchConfig(t, 1)
	s, err := NewSimulator(c)
	if err != nil {
		t.Fatal(err)
	}
	b := s.basis
	es := diagonalise(b, c.Ring.rotationalRate(), 0, 2*math.Pi*c.DepthHz)
	start := wannier(b, c.Ring, es, 0, c.TrapRadS())
	d := s.drives(Shot{})[0]
	tr := c.Sequence.Up.Duration()
	run := func(sch scheme, n int) State {
		p := newPropagator(b, c.Ring, 2*math.Pi*c.DepthHz, 1)
		p.scheme = sch
		f := newField(b, 1)
		f.set(0, start)
		p.splitSteps(f, d, 0, tr, n)
		return f.get(0)
	}
	distance := func(a, b State) float64 {
		var s float64
		for i := range a.Amp {
			x := a.Amp[i] - b.Amp[i]
			s += real(x)*real(x) + imag(x)*imag(x)
		}
		return math.Sqrt(s)
	}
	for _, tc := range []struct {
		name  string
		sch   scheme
		n     int
		ratio float64 // 2^order
	}{
		{"strang", strang, 8, 4},
		{"suzuki4", suzuki4, 10, 16},
		{"blanesMoan6", blanesMoan6, 8, 16},
	} {
		ref := run(tc.sch, 16*tc.n)
		e1 := distance(run(tc.sch, tc.n), ref)
		e2 := distance(run(tc.sch, 2*tc.n), ref)
		// The reference has an error of its own; with order p it is
		// (1/16)^p of e1, negligible. Tolerance: 20 % on the ratio, the
		// higher-order terms at these step sizes.
		r := e1 / e2
		t.Logf("%s: errors %.3g, %.3g, ratio %.3g", tc.name, e1, e2, r)
		if math.Abs(r-tc.ratio) > 0.2*tc.ratio {
			t.Errorf("%s: error ratio on halving the step %.3g (errors %.3g, %.3g), want %g (tol 20%%)", tc.name, r, e1, e2, tc.ratio)
		}
	}
}

// ringConfig is a ring of Rb-87 with a 150 us sin2 ramp to cruise rad/s
// and laps laps.
func ringConfig(tb testing.TB, sites int, radiusM, depthHz, cruise, rot, laps float64) Config {
	tb.Helper()
	c := Config{Ring: Ring{Sites: sites, RadiusM: radiusM, MassKg: Rb87MassU * AtomicMassUnit}, DepthHz: depthHz, RotationRadS: rot}
	up, err := NewShape("sin2", 150e-6, cruise, c.TrapRadS())
	if err != nil {
		tb.Fatal(err)
	}
	if c.Sequence, err = NewSequence(up, laps); err != nil {
		tb.Fatal(err)
	}
	return c
}

// refined returns c with the grid 1.5 times auto's (rounded up to a
// multiple of 2 N) and half its step: the window reaches 2.5 l_osc further,
// which divides the cruise error by exp(-0.7 (x+2.5)^2 + 0.7 x^2) < 1e-7.
func refined(c Config, auto Numerics) Config {
	unit := 2 * c.Ring.Sites
	c.Grid = (auto.Grid*3/2 + unit - 1) / unit * unit
	c.StepS = auto.StepS / 2
	return c
}

// TestCruiseGrid checks that the automatic grid grows with the cruise: the
// contrast and phase of a shot with automatic numerics stay within
// ContrastTarget and PhaseTargetRad of a refined calculation at 1, 100 and
// 10^4 laps, on two geometries (issue 8, part 2). Before the cruise rule
// the 20-site ring's phase was off by 1.6e-6 rad at 100 laps and 3.6e-4 rad
// at 10^4 (contrast 7e-4); the 12-site ring's by 6.6e-6 rad at 10^4 laps.
// With it the largest errors measured were 3e-10 rad (20 sites) and 3e-8
// rad (12 sites), contrast 2e-7 (the ramps' step error). The legacy rule (window 5 l_osc,
// x = 1 + GridTail, without CruiseTail) is run too, and must fail at 10^4
// laps, so that the test can tell the two apart.
func TestCruiseGrid(t *testing.T) {
	if testing.Short() {
		t.Skip("convergence study")
	}
	for _, tc := range []struct {
		sites int
		laps  float64
	}{
		{20, 1}, {20, 100}, {20, 1e4}, // the benchmark ring of issue 8 (5 um, 20 kHz, 50 pi rad/s)
		{12, 1}, {12, 100}, {12, 1e4}, // a 12-site ring, otherwise the same
	} {
		c := ringConfig(t, tc.sites, 5e-6, 20e3, 50*math.Pi, 1e-3, tc.laps)
		auto := AutoNumerics(c)
		s, err := NewSimulator(c)
		if err != nil {
			t.Fatal(err)
		}
		f, err := NewSimulator(refined(c, auto))
		if err != nil {
			t.Fatal(err)
		}
		got, want := s.Run(Shot{}, nil), f.Run(Shot{}, nil)
		dc, dp := math.Abs(got.Contrast-want.Contrast), math.Abs(Wrap(got.PhaseRad-want.PhaseRad))
		t.Logf("%d sites, %g laps: grid %d: contrast error %.2g, phase error %.2g rad", tc.sites, tc.laps, auto.Grid, dc, dp)
		if dc > ContrastTarget || dp > PhaseTargetRad {
			t.Errorf("%d sites, %g laps, grid %d: contrast error %.2g (target %g), phase error %.2g rad (target %g)",
				tc.sites, tc.laps, auto.Grid, dc, ContrastTarget, dp, PhaseTargetRad)
		}
		if tc.laps < 1e4 {
			continue
		}
		// The legacy window: x = 1 + GridTail from the packet centre.
		legacy := c
		lMax := c.Ring.MomentumOf(50*math.Pi+1e-3) + (1+GridTail)*math.Sqrt(c.Ring.Inertia()*c.TrapRadS()/Hbar)
		k := int(math.Ceil(2 * lMax / float64(tc.sites)))
		legacy.Grid = (k + k%2) * tc.sites
		l, err := NewSimulator(legacy)
		if err != nil {
			t.Fatal(err)
		}
		old := l.Run(Shot{}, nil)
		if d := math.Abs(Wrap(old.PhaseRad - want.PhaseRad)); d <= PhaseTargetRad {
			t.Errorf("%d sites, %g laps: the legacy grid %d meets the phase target (error %.2g rad): the test cannot tell the rules apart", tc.sites, tc.laps, legacy.Grid, d)
		}
	}
}

// TestNearStepTableRefused: a ramp table whose speed jumps by half the
// cruise speed within 1e-12 s would need about 10^9 split steps at the
// automatic step, which resolves its steepest stretch; the simulator
// refuses it at once, naming the cause, instead of running for hours.
func TestNearStepTableRefused(t *testing.T) {
	c := benchConfig(t, 1)
	up, err := NewTabulated("steep.csv", []float64{0, 1e-12, 150e-6}, []float64{0, 250, 500}, 500)
	if err != nil {
		t.Skipf("the table is refused by its reader already: %v", err)
	}
	if c.Sequence, err = NewSequence(up, 1); err != nil {
		t.Fatal(err)
	}
	_, err = NewSimulator(c)
	if err == nil || !strings.Contains(err.Error(), "steepest stretch") {
		t.Errorf("err %v, want the refusal naming the ramp's steepest stretch", err)
	}
}
