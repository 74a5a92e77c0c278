package sim

import (
	"fmt"
	"math"
	"testing"
)

// The propagator tests run on a small ring where every step is cheap and the
// dynamics is strong: 10 sites of radius 3 um at 10 kHz (q = 15.5, trap
// frequency nu = 2.54 kHz, oscillator momentum l_osc = 14), driven to
// l0 = I w / hbar = 30, about two oscillator momenta, in less than a trap
// period, so the packet sloshes by more than its width. K = 40 (|l| <= 200)
// holds the packet's momentum range, up to ~2 l0 + 6 l_osc = 144, with
// amplitudes at the window's edge below 1e-12.
const (
	propSites   = 10
	propRadiusM = 3e-6
	propDepthHz = 10e3
	propBlock   = 40
	propL0      = 30
)

func propFixture(t testing.TB) (Ring, Basis, State, float64) {
	t.Helper()
	ring := rb87Ring(propSites, propRadiusM)
	b := mustBasis(t, propSites, propSites*propBlock)
	w := propL0 / ring.MomentumOf(1) // angular velocity of l0
	return ring, b, groundWannier(b, ring, propDepthHz), w
}

// breathing is a sin2 ramp-up of the lattice speed to w over tr with the
// depth modulated by 10 %, so that both the angle and the depth of a motion
// change in time.
type breathing struct {
	up Sin2
	tr float64
}

func (m breathing) angle(t float64) float64 { return m.up.Angle(t) }
func (m breathing) depth(t float64) float64 { return 1 + 0.1*math.Sin(2*math.Pi*t/m.tr) }

// TestNormConservation checks that every propagation path is unitary: the
// split steps of both schemes, the exact step, and the noisy stretch
// (exact steps with kicks and lattice steps in between).
func TestNormConservation(t *testing.T) {
	ring, b, psi, w := propFixture(t)
	v0 := 2 * math.Pi * propDepthHz
	period := 1 / ring.TrapHz(propDepthHz)
	tr := 0.8 * period
	mo := breathing{Sin2{tr, w}, tr}
	jitter := &Series{StepS: period / 50, Values: make([]float64, 200)}
	depthNoise := &Series{StepS: period / 50, Values: make([]float64, 200)}
	for i := range jitter.Values {
		jitter.Values[i] = 0.01 * math.Sin(0.37*float64(i)) // rad, a few percent of the site spacing
		depthNoise.Values[i] = 0.05 * math.Cos(0.91*float64(i))
	}
	noisy := Drive{Seq: Sequence{Up: Sin2{DurationS: tr, CruiseRadS: w}}, Sign: 1, Jitter: jitter, DepthNoise: depthNoise}
	tests := []struct {
		name   string
		run    func(p *propagator, f *field)
		factor int // unitary factors applied, which sets the round-off tolerance
	}{
		{"strang 1000 steps", func(p *propagator, f *field) {
			p.scheme = strang
			p.splitSteps(f, mo, 0, tr, 1000)
		}, 1000},
		{"suzuki4 200 steps", func(p *propagator, f *field) {
			p.scheme = suzuki4
			p.splitSteps(f, mo, 0, tr, 200)
		}, 1000},
		{"exact step of 1 s", func(p *propagator, f *field) {
			p.exactStep(f, nil, w, 1, 1)
		}, 1},
		{"100 exact steps", func(p *propagator, f *field) {
			es := diagonalise(b, ring.rotationalRate(), w, v0)
			for range 100 {
				p.exactStep(f, &es, w, 1, period/7)
			}
		}, 100},
		{"noisy stretch", func(p *propagator, f *field) {
			p.stretch(f, noisy, w, 0, 3*period, jitter.StepS, nil)
		}, 150},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			p := newPropagator(b, ring, v0, 1)
			f := fieldOf(psi)
			tt.run(p, f)
			got := f.get(0).Norm()
			t.Logf("norm - 1 = %.3g", got-1)
			// Round-off: each factor is an orthogonal K x K transform
			// (twice for a lattice step), error ~ K eps ~ 1e-14 per factor.
			tol := 1e-13 + 1e-14*float64(tt.factor)
			if math.Abs(got-1) > tol {
				t.Errorf("norm: got %v, want %v (tol %g)", got, 1.0, tol)
			}
		})
	}
}

// TestTimeReversal propagates forward, applies the time reversal
// psi(theta) -> conj(psi(theta)), propagates under the reversed drive
// a(T - t), g(T - t), and reverses again: with H = E_rot l^2 + g V(theta - a)
// real in angle, this returns the start state exactly. The split-step
// schemes are symmetric (palindromic) compositions, so their discrete
// propagators obey the same identity up to round-off; the exact step under
// H'(w) is undone by the exact step under H'(-w).
func TestTimeReversal(t *testing.T) {
	ring, b, psi, w := propFixture(t)
	v0 := 2 * math.Pi * propDepthHz
	period := 1 / ring.TrapHz(propDepthHz)
	tr := 0.8 * period
	mo := breathing{Sin2{tr, w}, tr}
	tests := []struct {
		name string
		fwd  func(p *propagator, f *field)
		back func(p *propagator, f *field)
		tol  float64 // absolute, 2-norm of the difference: round-off of ~1e3 unitary factors
	}{
		{"strang",
			func(p *propagator, f *field) { p.scheme = strang; p.splitSteps(f, mo, 0, tr, 300) },
			func(p *propagator, f *field) { p.splitSteps(f, reversed{mo, tr}, 0, tr, 300) },
			1e-11},
		{"suzuki4",
			func(p *propagator, f *field) { p.scheme = suzuki4; p.splitSteps(f, mo, 0, tr, 60) },
			func(p *propagator, f *field) { p.splitSteps(f, reversed{mo, tr}, 0, tr, 60) },
			1e-11},
		{"exact",
			func(p *propagator, f *field) { p.exactStep(f, nil, w, 1.1, 3.7*period) },
			func(p *propagator, f *field) { p.exactStep(f, nil, -w, 1.1, 3.7*period) },
			1e-11},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			p := newPropagator(b, ring, v0, 1)
			f := fieldOf(psi)
			tt.fwd(p, f)
			moved := distance(f.get(0), psi)
			f.set(0, timeReverse(f.get(0)))
			tt.back(p, f)
			got := distance(timeReverse(f.get(0)), psi)
			t.Logf("moved %.3g, returned to within %.3g", moved, got)
			if moved < 0.1 {
				t.Fatalf("forward run moved the state by only %g; the test needs real dynamics", moved)
			}
			if got > tt.tol {
				t.Errorf("distance from the start: got %v, want %v (tol %g)", got, 0.0, tt.tol)
			}
		})
	}
}

// TestSplitStepConvergesToExact propagates the site's ground state in a
// lattice suddenly set moving at l0 = 30 (a constant drive, where exactStep
// is the exact answer) for two trap periods with split steps, and checks
// the order of each scheme, error ratio 2^p on halving the step (Strang
// p = 2: G. Strang, SIAM J. Numer. Anal. 5, 506 (1968); Suzuki p = 4:
// M. Suzuki, Phys. Lett. A 146, 319 (1990)), and that the finest run
// agrees with the exact step.
func TestSplitStepConvergesToExact(t *testing.T) {
	ring, b, psi, w := propFixture(t)
	v0 := 2 * math.Pi * propDepthHz
	tau := 2 / ring.TrapHz(propDepthHz)
	p := newPropagator(b, ring, v0, 1)
	ex := fieldOf(psi)
	p.exactStep(ex, nil, w, 1, tau)
	exact := ex.get(0)
	if d := distance(exact, psi); d < 0.5 {
		t.Fatalf("the exact step moved the state by only %g; the test needs real dynamics", d)
	}
	tests := []struct {
		sch      scheme
		name     string
		steps    []int   // per two trap periods; the coarsest error is 1e-2 (Strang) and 5e-4 (Suzuki), far above round-off
		ratio    float64 // 2^order
		ratioTol float64 // relative: higher-order terms, seen below 1 %
		finalTol float64 // absolute, 2-norm: the finest error predicted from the ratio, times 2
	}{
		{strang, "strang", []int{100, 200, 400, 800}, 4, 0.05, 3e-4},
		{suzuki4, "suzuki4", []int{25, 50, 100, 200}, 16, 0.05, 3e-7},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var errs []float64
			for _, n := range tt.steps {
				f := fieldOf(psi)
				p.scheme = tt.sch
				p.splitSteps(f, linearMotion{w}, 0, tau, n)
				errs = append(errs, distance(f.get(0), exact))
			}
			t.Logf("errors %.3g", errs)
			for i := 1; i < len(errs); i++ {
				got := errs[i-1] / errs[i]
				if math.Abs(got/tt.ratio-1) > tt.ratioTol {
					t.Errorf("error ratio %d -> %d steps: got %v, want %v (tol %g)", tt.steps[i-1], tt.steps[i], got, tt.ratio, tt.ratioTol)
				}
			}
			if got := errs[len(errs)-1]; got > tt.finalTol {
				t.Errorf("distance to the exact step at %d steps: got %v, want %v (tol %g)", tt.steps[len(tt.steps)-1], got, 0.0, tt.finalTol)
			}
		})
	}
}

// TestCruiseStretchMatchesSplitStep checks the exact cruise of a Drive (one
// stretch at constant speed and depth, with and without a static depth
// error) against split steps of the same drive over the same interval.
func TestCruiseStretchMatchesSplitStep(t *testing.T) {
	ring, b, psi, w := propFixture(t)
	v0 := 2 * math.Pi * propDepthHz
	period := 1 / ring.TrapHz(propDepthHz)
	tr := 0.8 * period
	up := Sin2{DurationS: tr, CruiseRadS: w}
	seq := Sequence{Up: up, CruiseS: 3 * period}
	for _, tt := range []struct {
		depthRel, rotation float64
	}{{0, 0}, {0.03, 0}, {0, 40}} {
		t.Run(fmt.Sprintf("depth%+g_rotation%g", tt.depthRel, tt.rotation), func(t *testing.T) {
			d := Drive{Seq: seq, Sign: -1, DepthRel: tt.depthRel, RotationRadS: tt.rotation}
			tm := d.times()
			p := newPropagator(b, ring, v0, 1)
			p.scheme = suzuki4
			ramped := fieldOf(psi)
			p.splitSteps(ramped, d, tm[0], tm[1], 40)
			exact, split := newField(b, 1), newField(b, 1)
			exact.copyFrom(ramped)
			split.copyFrom(ramped)
			p.stretch(exact, d, d.cruiseSpeed(), tm[1], tm[2], math.Inf(1), nil)
			p.splitSteps(split, d, tm[1], tm[2], 1200) // 400 Suzuki steps per trap period: error ~1e-9 by TestSplitStepConvergesToExact (1.3e-7 at 100 per period over two periods, / 4^4, x 1.5)
			got := distance(exact.get(0), split.get(0))
			t.Logf("distance %.3g", got)
			const tol = 1e-8 // absolute, 2-norm: the split-step error at this step, times 10
			if got > tol {
				t.Errorf("exact cruise vs split-step: got %v, want %v (tol %g)", got, 0.0, tol)
			}
		})
	}
}

// TestNoisyStretchConverges checks the cruise with lattice jitter and depth
// noise (exact steps of the commanded H' with the perturbation split in
// between, Strang in the perturbation) against split steps of the same
// noisy drive: second order in the interval, ratio 4 on halving it (G.
// Strang, SIAM J. Numer. Anal. 5, 506 (1968)). The noise is strong (0.01 rad
// of jitter, 5 % of depth) so that its effect is far above round-off.
func TestNoisyStretchConverges(t *testing.T) {
	ring, b, psi, w := propFixture(t)
	v0 := 2 * math.Pi * propDepthHz
	period := 1 / ring.TrapHz(propDepthHz)
	tr := 0.8 * period
	seq := Sequence{Up: Sin2{DurationS: tr, CruiseRadS: w}, CruiseS: 3 * period}
	rec := period / 50
	jitter := &Series{StepS: rec, Values: make([]float64, 300)}
	depthNoise := &Series{StepS: rec, Values: make([]float64, 300)}
	for i := range jitter.Values {
		jitter.Values[i] = 0.01 * math.Sin(0.37*float64(i))
		depthNoise.Values[i] = 0.05 * math.Cos(0.91*float64(i))
	}
	d := Drive{Seq: seq, Sign: 1, Jitter: jitter, DepthNoise: depthNoise}
	tm := d.times()
	p := newPropagator(b, ring, v0, 1)
	ramped := fieldOf(psi)
	p.splitSteps(ramped, d, tm[0], tm[1], 40)
	// Reference: 800 Suzuki steps per trap period; halving them moves the
	// state by 4e-10.
	ref := newField(b, 1)
	ref.copyFrom(ramped)
	p.splitSteps(ref, d, tm[1], tm[2], 2400)
	var errs []float64
	for _, div := range []float64{1, 2, 4, 8} {
		f := newField(b, 1)
		f.copyFrom(ramped)
		p.stretch(f, d, d.cruiseSpeed(), tm[1], tm[2], rec/div, nil)
		errs = append(errs, distance(f.get(0), ref.get(0)))
	}
	t.Logf("errors at record step / 1, 2, 4, 8: %.3g", errs)
	for i := 1; i < len(errs); i++ {
		const want, tol = 4, 0.05 // relative: higher orders, seen < 0.5 %
		if got := errs[i-1] / errs[i]; math.Abs(got/want-1) > tol {
			t.Errorf("error ratio on halving the interval: got %v, want %v (tol %g)", got, want, tol)
		}
	}
	const tol = 5e-5 // absolute, 2-norm: the error at the record step / 8 predicted from the first, 1.6e-3 / 64, times 2
	if got := errs[len(errs)-1]; got > tol {
		t.Errorf("noisy stretch vs split steps: got %v, want %v (tol %g)", got, 0.0, tol)
	}
}
