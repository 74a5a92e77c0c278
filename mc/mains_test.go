package mc

import (
	"math"
	"testing"

	"rampart/sim"
)

// mainsEnsemble is testEnsemble with the mains line alone, on a stretched
// pair's linear Zeeman coefficient of -2.1 MHz/G (issue 12's figure for
// |1,-1>-|2,-2>, Breit-Rabi; Steck, "Rubidium 87 D Line Data").
func mainsEnsemble(t *testing.T, samples int, m Mains, amp float64) Ensemble {
	e := testEnsemble(t, samples, false)
	e.Budget = Budget{MainsG: amp, Mains: m}
	e.Budget.Apparatus.Field.Zeeman = sim.Zeeman{LinearHzPerG: -2.1e6}
	e.Sampler = "random"
	return e
}

// TestMainsLineShot checks the phase of one 50 Hz line of 1 uG at a fixed
// phase through a whole shot (sim.Simulator.Run) against the closed form
// -2 pi k A integral_0^T sin(2 pi f t + p) dt = -2 pi k A (cos p - cos(2 pi
// f T + p)) / (2 pi f) (docs/model.md, Perturbations, magnetic field;
// the reference of sim/apparatus_test.go's line). The record is sampled
// at a quarter split step (about 5 us): linear interpolation errs by
// h^2 (2 pi f)^2 / 12 of the phase, 2e-7 relative; tolerance 1e-6 relative
// (a 5x margin).
func TestMainsLineShot(t *testing.T) {
	const a, k, f = 1e-6, -2.1e6, 50.0
	for _, p := range []float64{0, 0.7, 2.5, -1.2} {
		e := mainsEnsemble(t, 1, Mains{Hz: f, FixedPhase: true, PhaseRad: p}, a)
		r, err := NewRealiser(e)
		if err != nil {
			t.Fatal(err)
		}
		sh, _ := r.NewWorker().Shot(0)
		nominal := r.sim.Run(e.Budget.Apparatus, nil)
		got := r.sim.Run(sh, nil)
		T := r.Config().Sequence.Duration()
		w := 2 * math.Pi * f
		shift := -2 * math.Pi * k * a * (math.Cos(p) - math.Cos(w*T+p)) / w
		if d := math.Abs(sim.Wrap(got.PhaseRad - nominal.PhaseRad - shift)); d > 1e-6*math.Abs(shift) {
			t.Errorf("p = %g: phase shift %.10g, want %.10g (relative tol 1e-6)", p, sim.Wrap(got.PhaseRad-nominal.PhaseRad), shift)
		}
	}
}

// TestMainsRandomPhaseVariance checks the ensemble variance of the phase
// of a 60 Hz line with two harmonics and a random phase per shot against
// the average over the phase: a 3600-point average over p of the closed
// form of each harmonic's integral (independent of PhaseVarianceRad2,
// which it checks to 1e-9), and the sample variance of 4000 shots against
// it within 3 standard errors (its standard error is under 3 % of it, so
// a variance off by a factor 2, the amplitude convention, fails).
func TestMainsRandomPhaseVariance(t *testing.T) {
	const a, k, f, n = 2e-6, -2.1e6, 60.0, 4000
	m := Mains{Hz: f, HarmonicsRel: []float64{0.5, 0.3}}
	e := mainsEnsemble(t, n, m, a)
	r, err := NewRealiser(e)
	if err != nil {
		t.Fatal(err)
	}
	T := r.Config().Sequence.Duration()
	w := 2 * math.Pi * f
	// Longer shots than this one make the harmonics matter: the closed form
	// is checked at T and at 4 ms.
	for _, d := range []float64{T, 4e-3} {
		phi := func(p float64) float64 {
			s := 0.0
			for h, r := range []float64{1, 0.5, 0.3} {
				hh := float64(h + 1)
				s += r * (math.Cos(hh*p) - math.Cos(hh*(w*d+p))) / (hh * w)
			}
			return -2 * math.Pi * k * a * s
		}
		var avg, avg2 float64
		const q = 3600
		for j := range q {
			x := phi(2 * math.Pi * float64(j) / q)
			avg += x / q
			avg2 += x * x / q
		}
		want := avg2 - avg*avg
		if got := m.PhaseVarianceRad2(a, k, d); math.Abs(got-want) > 1e-9*want {
			t.Errorf("T = %g: PhaseVarianceRad2 %.10g, average over the phase %.10g", d, got, want)
		}
	}
	want := m.PhaseVarianceRad2(a, k, T)
	wk := r.NewWorker()
	x := make([]float64, n)
	for i := range x {
		sh, _ := wk.Shot(i)
		x[i] = sh.Field.PhaseRad(0, T)
	}
	mean, _ := meanStd(x)
	d := make([]float64, n)
	for i, v := range x {
		d[i] = (v - mean) * (v - mean)
	}
	got, sd := meanStd(d)
	se := sd / math.Sqrt(n)
	if se > 0.03*want {
		t.Fatalf("standard error %.3g too large against %.3g to test", se, want)
	}
	if math.Abs(got-want) > 3*se {
		t.Errorf("ensemble phase variance %.6g, want %.6g (se %.2g)", got, want, se)
	}
}
