package design

import (
	"bytes"
	"context"
	"math"
	"testing"

	"gonum.org/v1/gonum/integrate"

	"rampart/mc"
	"rampart/scenario"
	"rampart/sim"
)

// TestCorrectedBoundary checks what the correction must keep: speed 0 at
// t = 0 and the cruise speed at t_r, the speed's slope at both ends (zero
// for sin2: B and B' vanish there, so the correction adds none), the ramp
// angle at t_r (every basis term integrates to zero), and the angle as the
// integral of the speed, here by the composite Simpson rule on 20001 points
// (gonum integrate.Simpsons; error ~ h^4, below 1e-12 of Omega_0 t_r).
func TestCorrectedBoundary(t *testing.T) {
	const w0, tr = 500.0, 100e-6
	ref := sim.Sin2{DurationS: tr, CruiseRadS: w0}
	coef := []float64{0.3, -0.2, 0.15, 0.1, -0.05, 0.08, 0.02, -0.04, 0.03, 0.01, -0.02, 0.015}
	r, err := NewCorrected(ref, coef, "")
	if err != nil {
		t.Fatal(err)
	}
	if got := r.Speed(0); got != 0 {
		t.Errorf("Speed(0) = %v, want 0", got)
	}
	if got := r.Speed(tr); math.Abs(got-w0) > 1e-12*w0 {
		t.Errorf("Speed(t_r) = %v, want %v (tol 1e-12 rel)", got, w0)
	}
	h := tr * 1e-5
	for _, end := range []float64{h, tr - h} { // one-sided difference inside the ramp
		slope := (r.Speed(end+h/2) - r.Speed(end-h/2)) / h
		refSlope := (ref.Speed(end+h/2) - ref.Speed(end-h/2)) / h
		// B' ~ 3 s^2 near the ends: the correction's slope at s = 1e-5 is
		// ~ 64 * 3e-10 Omega_0 / t_r per unit coefficient.
		if tol := 1e-6 * w0 / tr; math.Abs(slope-refSlope) > tol {
			t.Errorf("slope near t = %g: %v, reference %v (tol %g)", end, slope, refSlope, tol)
		}
	}
	if got, want := r.Angle(tr), ref.Angle(tr); math.Abs(got-want) > 1e-13*w0*tr {
		t.Errorf("Angle(t_r) = %v, want the reference's %v", got, want)
	}
	const n = 20001
	for _, frac := range []float64{0.21, 0.5, 0.9} {
		x := make([]float64, n)
		f := make([]float64, n)
		for i := range x {
			x[i] = frac * tr * float64(i) / (n - 1)
			f[i] = r.Speed(x[i])
		}
		want := integrate.Simpsons(x, f)
		if got := r.Angle(frac * tr); math.Abs(got-want) > 1e-12*w0*tr {
			t.Errorf("Angle(%g t_r) = %v, Simpson %v (tol %g)", frac, got, want, 1e-12*w0*tr)
		}
	}
	if _, err := NewCorrected(ref, make([]float64, MaxTerms+1), ""); err == nil {
		t.Error("too many terms: no error")
	}
	if _, err := NewCorrected(ref, []float64{math.NaN()}, ""); err == nil {
		t.Error("NaN coefficient: no error")
	}
}

// TestWriteRampReadBack writes a corrected ramp as a ramp file and reads it
// with the scenario's reader: the table's PCHIP interpolant must follow the
// ramp to 1e-6 of the cruise speed and its angle to 1e-9 of Omega_0 t_r
// (PCHIP's error is fourth order in the row spacing, t_r/2000).
func TestWriteRampReadBack(t *testing.T) {
	const w0, tr = 500.0, 100e-6
	r, err := NewCorrected(sim.Sin2{DurationS: tr, CruiseRadS: w0}, []float64{0.3, -0.2, 0.1}, "robust")
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteRamp(&buf, r, RampRows); err != nil {
		t.Fatal(err)
	}
	tab, err := scenario.ParseRamp(&buf, "robust.csv", 20, w0)
	if err != nil {
		t.Fatal(err)
	}
	for i := range 97 {
		tm := tr * float64(i) / 96
		if d := math.Abs(tab.Speed(tm) - r.Speed(tm)); d > 1e-6*w0 {
			t.Errorf("t = %g: table %v, ramp %v", tm, tab.Speed(tm), r.Speed(tm))
		}
	}
	if d := math.Abs(tab.Angle(tr) - r.Angle(tr)); d > 1e-9*w0*tr {
		t.Errorf("angle: table %v, ramp %v", tab.Angle(tr), r.Angle(tr))
	}
}

// TestRobustImprovesPoorRamp gives the optimiser a deliberately poor ramp:
// the fast test ensemble's sin2 at 100 us, whose p05 contrast is about 0.29
// (README, rampart scan), on 16 realisations. Nelder-Mead over 4 terms
// with 24 evaluations must raise the objective on those draws; measured
// 0.288 -> 0.937, a gain of 0.65. The check is a gain of at least 0.3, so a
// tenfold smaller gain fails.
func TestRobustImprovesPoorRamp(t *testing.T) {
	_, cfg, budget, err := scenario.LoadBudget("../testdata/scenarios/ensemble.toml", []string{"ramp.duration_us=100"})
	if err != nil {
		t.Fatal(err)
	}
	r := Robust{Ensemble: mc.Ensemble{Config: cfg, Budget: budget, Samples: 16, Seed: 3, Sampler: "random"},
		Terms: 4, Objective: Objective{Name: ObjectiveP05}, MaxEvals: 24, InitialStep: 0.2}
	res, err := r.Optimise(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("p05 contrast %.4f -> %.4f after %d evaluations, coef %v", res.Reference, res.Value, len(res.History), res.Coef)
	if res.Value < res.Reference+0.3 {
		t.Errorf("objective %v from %v: want a gain of at least 0.3", res.Value, res.Reference)
	}
	if len(res.History) > r.MaxEvals {
		t.Errorf("%d evaluations, more than the %d allowed", len(res.History), r.MaxEvals)
	}
	// The best ramp's objective is reproducible: common random numbers.
	v, _, err := r.Evaluate(context.Background(), res.Coef)
	if err != nil || v != res.Value {
		t.Errorf("re-evaluated best: %v (err %v), want %v", v, err, res.Value)
	}
	// Cancelled: the best so far, marked interrupted.
	ctx, cancel := context.WithCancel(context.Background())
	r.Evaluated = func(s Step) {
		if s.Eval == 3 {
			cancel()
		}
	}
	res, err = r.Optimise(ctx)
	if err != nil || !res.Interrupted || len(res.History) > 4 {
		t.Errorf("cancelled: err %v, interrupted %v after %d evaluations", err, res.Interrupted, len(res.History))
	}
}
