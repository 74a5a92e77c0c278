package mc

import (
	"math"
	"math/cmplx"
	"testing"

	"rampart/sim"
)

// apparatusEnsemble is testEnsemble's ring and sequence (half a lap, so
// that a tilt does not cancel) with only budget b.
func apparatusEnsemble(t *testing.T, b Budget, samples int) (*Realiser, sim.Result) {
	t.Helper()
	e := testEnsemble(t, samples, false)
	e.Config.TemperatureK = 0
	e.Budget = b
	r, err := NewRealiser(e)
	if err != nil {
		t.Fatal(err)
	}
	s, err := sim.NewSimulator(r.Config())
	if err != nil {
		t.Fatal(err)
	}
	return r, s.Run(sim.Shot{}, nil)
}

// TestEnsembleFieldOffset: a realisation's field offset v adds to the
// apparatus's static offset b0 and moves the phase by
// -2 pi (lin (b0 + v) + quad (b0 + v)^2) T (docs/model.md, Perturbations,
// magnetic field; the sign of issue 12), T the shot's length. The
// coefficients are the stretched pair's linear limit, (g_F(2) (-2) -
// g_F(1) (-1)) mu_B/h = -(3/2) 1.399 624 6 MHz/G with g_F = +-1/2 (Steck,
// "Rubidium 87 D Line Data", table 1 and eq. (35), nuclear term
// neglected), and the clock pair's 575.15 Hz/G^2 (Steck, table 2). The
// phase factor is applied exactly, so the tolerance is 1e-9 rad (the
// rounding of a phase of order 1 is 1e-15).
func TestEnsembleFieldOffset(t *testing.T) {
	const lin, quad, b0 = -1.5 * 1.3996246e6, 575.15, 3e-7
	b := Budget{FieldOffsetG: 1e-7}
	b.Apparatus.Field = sim.FieldShift{Zeeman: sim.Zeeman{LinearHzPerG: lin, QuadraticHzPerG2: quad}, OffsetG: b0}
	r, nominal := apparatusEnsemble(t, b, 4)
	w := r.NewWorker()
	T := r.Config().Sequence.Duration()
	for i := range 4 {
		rec := w.Realise(i)
		f := b0 + rec.Inputs[0]
		want := sim.Wrap(nominal.BiasRad - 2*math.Pi*(lin*f+quad*f*f)*T)
		if d := math.Abs(sim.Wrap(rec.BiasRad - want)); d > 1e-9 {
			t.Errorf("realisation %d, offset %g G: bias %.12g rad, want %.12g (off by %g)", i, rec.Inputs[0], rec.BiasRad, want, d)
		}
		if math.Abs(rec.Contrast-nominal.Contrast) > 1e-12 {
			t.Errorf("realisation %d: contrast %g, want the nominal %g", i, rec.Contrast, nominal.Contrast)
		}
	}
}

// TestEnsembleRadius: a realisation's radius error r moves the measured
// phase by K ((1 + r)^2 - 1) Omega_bg, K = 2 m R^2 phi(T) / hbar the
// nominal scale factor (docs/model.md, Interferometer and signs, and
// Perturbations, radius calibration; issue 12: 0.1 % of radius is 2000
// ppm of scale factor). K is computed here from its definition; the
// tolerance 1e-9 rad covers the rounding of K Omega (about 1e-13 rad).
func TestEnsembleRadius(t *testing.T) {
	r, nominal := apparatusEnsemble(t, Budget{RadiusRel: 1e-3}, 4)
	w := r.NewWorker()
	cfg := r.Config()
	K := 2 * cfg.Ring.MassKg * cfg.Ring.RadiusM * cfg.Ring.RadiusM * (2 * math.Pi * 0.5) / sim.Hbar
	for i := range 4 {
		rec := w.Realise(i)
		x := rec.Inputs[0]
		want := sim.Wrap(nominal.BiasRad + K*((1+x)*(1+x)-1)*cfg.RotationRadS)
		if d := math.Abs(sim.Wrap(rec.BiasRad - want)); d > 1e-9 {
			t.Errorf("realisation %d, r = %g: bias %.12g rad, want %.12g (off by %g)", i, x, rec.BiasRad, want, d)
		}
	}
}

// TestEnsembleTilt: a realisation's tilt adds to the apparatus's tilt
// towards its lowest point, and at first order (docs/model.md,
// Perturbations, gravity and an imperfect ring) the phase it adds is
// proportional to sin(tilt): the bias change per unit sin(tilt) is the
// same for every draw. The first-order phase is linear in the amplitude
// by construction, so the tolerance is rounding, 1e-9 relative; the
// phase must also not vanish on this half-lap sequence (issue 12: the
// arms visit the sites at different times).
func TestEnsembleTilt(t *testing.T) {
	b := Budget{TiltRad: 2e-4}
	b.Apparatus.Potential = sim.RingPotential{TiltRad: 1e-4, LowRad: 0.3}
	r, _ := apparatusEnsemble(t, b, 3)
	w := r.NewWorker()
	s, err := sim.NewSimulator(r.Config())
	if err != nil {
		t.Fatal(err)
	}
	level := s.Run(sim.Shot{}, nil).Z
	var slope []float64
	for i := range 3 {
		rec := w.Realise(i)
		tilt := 1e-4 + rec.Inputs[0]
		direct := s.Run(sim.Shot{Potential: sim.RingPotential{TiltRad: tilt, LowRad: 0.3}}, nil)
		if cmplx.Abs(rec.Z-direct.Z) > 1e-14 {
			t.Errorf("realisation %d: z %v, a shot tilted by %g rad towards 0.3 rad gives %v", i, rec.Z, tilt, direct.Z)
		}
		slope = append(slope, cmplx.Phase(rec.Z/level)/math.Sin(tilt))
	}
	if math.Abs(slope[0]) < 1e-3 {
		t.Errorf("tilt phase %g rad per rad of tilt on a half-lap sequence: want it clearly non-zero", slope[0])
	}
	for i, x := range slope[1:] {
		if math.Abs(x-slope[0]) > 1e-9*math.Abs(slope[0]) {
			t.Errorf("realisation %d: %g rad per unit sin(tilt), realisation 0 %g: not first order", i+1, x, slope[0])
		}
	}
}

// TestEnsembleScattering: each realisation is one atom that scatters with
// probability 1 - P(none), P(none) = (e^{-L_+} + e^{-L_-})/2 (Dalibard,
// Castin & Moelmer 1992: Poisson events in each arm's accumulated mean
// L_s); with equal rates, 1 - e^{-L}. The draw is the realisation's own
// (reproducible), and the shots are only drawn here, not run. 4000 draws;
// tolerance 4 binomial standard errors (false failure once in 16000).
func TestEnsembleScattering(t *testing.T) {
	for _, rates := range [][2]float64{{300, 300}, {100, 900}} {
		var b Budget
		b.Apparatus.Scattering = sim.Scattering{RateS: rates, Cloud: true}
		const n = 4000
		r, _ := apparatusEnsemble(t, b, n)
		s, err := sim.NewSimulator(r.Config())
		if err != nil {
			t.Fatal(err)
		}
		w := r.NewWorker()
		var l [2]float64
		hit := 0
		for i := range n {
			sh, _ := w.Shot(i)
			if sh.Scattering.Cloud {
				t.Fatal("a realisation's scattering is the cloud mean, not a draw")
			}
			l = s.ScatteringMeans(sh)
			if _, scattered := sh.Scattering.Factor(l); scattered {
				hit++
			}
			if again, _ := w.Shot(i); again.Scattering.Uniform != sh.Scattering.Uniform {
				t.Fatalf("realisation %d: the scattering draw is not reproducible", i)
			}
		}
		// Independent: L_s = rate T at the nominal depth.
		T := r.Config().Sequence.Duration()
		p := 1 - (math.Exp(-rates[0]*T)+math.Exp(-rates[1]*T))/2
		if math.Abs(l[0]-rates[0]*T) > 1e-12*l[0] {
			t.Errorf("L_+ = %g, want rate T = %g", l[0], rates[0]*T)
		}
		se := math.Sqrt(p * (1 - p) / n)
		if got := float64(hit) / n; math.Abs(got-p) > 4*se {
			t.Errorf("rates %v: %d of %d scattered (%.4f), want %.4f +- %.4f", rates, hit, n, got, p, 4*se)
		}
	}
}
