package mc

import (
	"math"
	"math/cmplx"
	"testing"

	"rampart/noise"
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
// same for every draw. The shot has the potential in its Hamiltonian, so
// second-order terms remain (seen 1.6e-7 relative between draws of 1e-4
// to 3e-4 rad); tolerance 1e-6 relative. The phase must also not vanish
// on this half-lap sequence (issue 12: the arms visit the sites at
// different times).
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
		if math.Abs(x-slope[0]) > 1e-6*math.Abs(slope[0]) {
			t.Errorf("realisation %d: %g rad per unit sin(tilt), realisation 0 %g: not first order (tol 1e-6 relative)", i+1, x, slope[0])
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

// lostRecords are n records of which every third is lost (z = 0, the
// bias a deliberately large 3 rad that no statistic may see) and the
// others have contrast 0.9 and bias 1e-5 (i - n/2) rad.
func lostRecords(n int) []Record {
	recs := make([]Record, n)
	for i := range recs {
		recs[i] = Record{Index: i, Contrast: 0.9, BiasRad: 1e-5 * float64(i-n/2), Z: complex(0.9, 0)}
		if i%3 == 0 {
			recs[i] = Record{Index: i, BiasRad: 3}
		}
	}
	return recs
}

// TestSummariseLost: a lost shot (its atom scattered) counts as contrast
// 0 and outside the yield, and stays out of the bias: the bias statistics
// equal those of the shots with a fringe alone, the contrast mean is the
// mean over all with the lost shots at 0, and a bias-only spec counts
// them outside (by the definitions of docs/model.md, Statistics, and
// Perturbations, photon scattering).
func TestSummariseLost(t *testing.T) {
	recs := lostRecords(90)
	var fringe []Record
	for _, r := range recs {
		if !r.Lost() {
			fringe = append(fringe, r)
		}
	}
	spec := Spec{MaxAbsBiasRad: 1}
	s := Summarise(recs, 1, 0, 1, 0.95, spec)
	if s.Lost != 30 || s.Samples != 90 {
		t.Errorf("lost %d of %d, want 30 of 90", s.Lost, s.Samples)
	}
	if want := 0.9 * 60 / 90; math.Abs(s.Contrast.Mean-want) > 1e-15 {
		t.Errorf("contrast mean %g, want %g", s.Contrast.Mean, want)
	}
	var m, mx float64
	for _, r := range fringe {
		m += r.BiasRad / 60
		mx = math.Max(mx, math.Abs(r.BiasRad))
	}
	if math.Abs(s.BiasRad.Mean-m) > 1e-15 || s.AbsBiasRad.P99 > mx || s.BiasCircular.Inverted != 0 {
		t.Errorf("bias mean %g (want %g), |bias| p99 %g (at most %g), inverted %d (want 0): a lost shot reached the bias", s.BiasRad.Mean, m, s.AbsBiasRad.P99, mx, s.BiasCircular.Inverted)
	}
	if s.Yield == nil || s.Yield.Inside != 60 {
		t.Errorf("yield %+v, want 60 inside", s.Yield)
	}
	if math.Abs(s.FringeContrast.Value-0.6) > 1e-15 {
		t.Errorf("fringe contrast %g, want 0.9 x 60/90 = 0.6", s.FringeContrast.Value)
	}
}

// TestQualifyLost: the |bias| p95 criterion is over the shots with a
// fringe (all within 7.5e-4 rad here, so it passes a 1e-3 limit although
// a third of the shots carry a recorded 3 rad), while the yield counts
// the lost shots outside (100 of 150 cannot show a yield of 0.9).
func TestQualifyLost(t *testing.T) {
	req := Requirements{AbsBiasP95MaxRad: 1e-3, YieldMin: 0.9, Yield: Spec{MinContrast: 0.5}}
	q := Qualify(lostRecords(150), req, 1, 1)
	for _, c := range q.Criteria {
		switch c.Name {
		case CriterionBiasRad:
			if c.Verdict != Pass || c.Value > 7.5e-4 {
				t.Errorf("bias criterion %+v: want a pass at most 7.5e-4 rad", c)
			}
		case CriterionYield:
			if c.Verdict != Fail {
				t.Errorf("yield criterion %+v: want a fail", c)
			}
		}
	}
}

// TestRankLost: ranking by the |bias| spread pairs only the realisations
// with a fringe in every ramp.
func TestRankLost(t *testing.T) {
	a, b := lostRecords(90), lostRecords(90)
	for i := range b {
		b[i].BiasRad *= 2
	}
	b[1] = Record{Index: 1, BiasRad: 3} // lost in b only: its pair goes too
	rk, err := Rank([]string{"a", "b"}, [][]Record{a, b}, MetricBiasSpread, Spec{}, 0.95, 1)
	if err != nil {
		t.Fatal(err)
	}
	if rk.Ranking[0].Name != "a" || rk.Samples != 90 {
		t.Errorf("ranking %+v: want a first, 90 realisations", rk.Ranking)
	}
	for _, p := range rk.Ranking {
		if p.Value > 1e-3 {
			t.Errorf("%s: |bias| p95 %g rad: a lost shot's recorded 3 rad reached it", p.Name, p.Value)
		}
	}
}

// TestEnsembleScatteringMean: over an ensemble of shots, each drawing
// whether its atom scattered, the mean z is the master equation's
// z_0 exp(-(L_+ + L_-)/2) (Dalibard, Castin & Moelmer 1992; with equal
// rates each unscattered shot keeps z_0 exactly), and the summary counts
// the scattered shots. 300 realisations; tolerance 4 binomial standard
// errors of the mean.
func TestEnsembleScatteringMean(t *testing.T) {
	var b Budget
	b.Apparatus.Scattering = sim.Scattering{RateS: [2]float64{2000, 2000}}
	const n = 300
	r, nominal := apparatusEnsemble(t, b, n)
	w := r.NewWorker()
	recs := make([]Record, n)
	lost := 0
	for i := range recs {
		recs[i] = w.Realise(i)
		if recs[i].Lost() {
			lost++
		} else if cmplx.Abs(recs[i].Z-nominal.Z) > 1e-12 {
			t.Fatalf("realisation %d: unscattered z %v, want the nominal %v", i, recs[i].Z, nominal.Z)
		}
	}
	L := 2000 * r.Config().Sequence.Duration()
	p := math.Exp(-L)
	s := Summarise(recs, 1, nominal.SagnacRad, nominal.ScaleFactorS, 0.95, Spec{})
	if s.Lost != lost || lost == 0 || lost == n {
		t.Errorf("summary lost %d, records lost %d of %d (L = %g)", s.Lost, lost, n, L)
	}
	want := nominal.Contrast * p
	se := nominal.Contrast * math.Sqrt(p*(1-p)/n)
	if math.Abs(s.FringeContrast.Value-want) > 4*se {
		t.Errorf("fringe contrast %g, want C_0 e^{-L} = %g +- %g", s.FringeContrast.Value, want, 4*se)
	}
}

// TestEnsembleFieldNoise: white field noise S_b during the shot moves the
// phase by -2 pi lin integral_0^T b dt, whose variance is
// (2 pi lin)^2 S_b integral sin^2(pi f T)/(pi f)^2 df over the record's
// band (the transfer function of an integrator over T, docs/model.md,
// Perturbations, magnetic field), here by an independent midpoint
// quadrature. 300 realisations: the sample variance has a relative
// standard error sqrt(2/299) = 8 %; tolerance 4 of them (a 10x error
// fails).
//
// The PSD takes the power-law forms of IEEE Std 1139 (the scenario's
// noise_ug2_hz, flicker_ug2 and random_walk_ug2_hz): white, h_-1/f and
// h_-2/f^2, each checked against the same integral of its own density.
func TestEnsembleFieldNoise(t *testing.T) {
	const lin = 1e4 // Hz/G
	for _, tc := range []struct {
		name string
		psd  noise.PSD // G^2/Hz
	}{
		{"white", noise.White{Level: 1e-14}},                 // 0.01 uG^2/Hz
		{"flicker", noise.PowerLaw{H: 1.5e-12, Alpha: -1}},   // 1.5 uG^2
		{"random walk", noise.PowerLaw{H: 2e-10, Alpha: -2}}, // 200 uG^2 Hz
		{"sum", noise.Sum{noise.White{Level: 5e-15}, noise.PowerLaw{H: 1e-10, Alpha: -2}}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			b := Budget{FieldNoise: tc.psd}
			b.Apparatus.Field.Zeeman.LinearHzPerG = lin
			const n = 300
			r, nominal := apparatusEnsemble(t, b, n)
			w := r.NewWorker()
			var s, s2 float64
			for i := range n {
				rec := w.Realise(i)
				x := sim.Wrap(rec.BiasRad - nominal.BiasRad)
				s, s2 = s+x, s2+x*x
			}
			got := (s2 - s*s/n) / (n - 1)
			T := r.Config().Sequence.Duration()
			records := int(math.Ceil(NoiseDuration(r.Config(), b)/r.NoiseStepS())) + 2
			lo, hi := 1/(float64(records)*r.NoiseStepS()), 1/(2*r.Config().StepS)
			var integral float64
			const m = 200000
			for k := range m {
				// midpoints in ln f: df = f d(ln f)
				u := math.Log(lo) + (float64(k)+0.5)/m*math.Log(hi/lo)
				f := math.Exp(u)
				x := math.Sin(math.Pi*f*T) / (math.Pi * f)
				integral += tc.psd.Density(f) * x * x * f * math.Log(hi/lo) / m
			}
			want := math.Pow(2*math.Pi*lin, 2) * integral
			t.Logf("phase variance %g rad^2, integrator formula %g (ratio %.3f)", got, want, got/want)
			if tol := 4 * math.Sqrt(2.0/(n-1)); math.Abs(got/want-1) > tol {
				t.Errorf("phase variance %g rad^2, want %g (relative tolerance %.2f)", got, want, tol)
			}
		})
	}
}

// TestSensitivityApparatus: in a sensitivity design, field noise is an
// input of its own (its record follows the design's stream coordinate, so
// that rows A and B differ), and photon scattering enters as the cloud's
// mean, since no input of the design explains a per-atom draw.
func TestSensitivityApparatus(t *testing.T) {
	b := Budget{FieldNoise: noise.White{Level: 1e-14}, FieldOffsetG: 1e-6}
	b.Apparatus.Field.Zeeman.LinearHzPerG = 1e4
	b.Apparatus.Scattering = sim.Scattering{RateS: [2]float64{500, 500}}
	r, _ := apparatusEnsemble(t, b, 4)
	d, err := NewSensitivityDesign(r, 4)
	if err != nil {
		t.Fatal(err)
	}
	if in := d.Inputs(); len(in) != 2 || in[1] != SourceFieldNoise {
		t.Fatalf("inputs %v, want [%s %s]", in, ParamFieldOffset, SourceFieldNoise)
	}
	w := r.NewWorker()
	first := map[float64]bool{}
	for j := range d.Len() {
		sh, _ := d.Shot(w, j)
		if !sh.Scattering.Cloud {
			t.Errorf("design point %d: scattering drawn per atom, want the cloud mean", j)
		}
		first[sh.Field.Noise.Values[1]] = true
	}
	if len(first) < 2*4 {
		t.Errorf("%d distinct field records over the design, want at least one per row of A and B (8)", len(first))
	}
}

// TestEnsembleGradient: a realisation's field gradient adds to the
// apparatus's static gradient towards its azimuth, and the shot is the
// one sim runs with that gradient (sim.TestFieldGradientFirstOrder checks
// the physics against the full-grid integration). On a whole lap it leaves
// a bias linear in the gradient (the arms add; the half lap cancels it):
// the phase per unit gradient is the same for every draw (first order; the
// shot keeps the second-order terms of the potential in its Hamiltonian).
func TestEnsembleGradient(t *testing.T) {
	const lin, g0, az = -2.1e6, 0.05, 0.4
	b := Budget{GradientGPerM: 0.02}
	b.Apparatus.Field = sim.FieldShift{Zeeman: sim.Zeeman{LinearHzPerG: lin}, GradientGPerM: g0, GradientRad: az}
	e := testEnsemble(t, 3, false)
	e.Config.TemperatureK = 0
	seq, err := sim.NewSequence(e.Config.Sequence.Up, 1)
	if err != nil {
		t.Fatal(err)
	}
	e.Config.Sequence = seq
	e.Budget = b
	r, err := NewRealiser(e)
	if err != nil {
		t.Fatal(err)
	}
	s, err := sim.NewSimulator(r.Config())
	if err != nil {
		t.Fatal(err)
	}
	level := s.Run(sim.Shot{}, nil).Z
	w := r.NewWorker()
	var slope []float64
	for i := range 3 {
		rec := w.Realise(i)
		g := g0 + rec.Inputs[0]
		direct := s.Run(sim.Shot{Field: sim.FieldShift{Zeeman: sim.Zeeman{LinearHzPerG: lin}, GradientGPerM: g, GradientRad: az}}, nil)
		if cmplx.Abs(rec.Z-direct.Z) > 1e-14 {
			t.Errorf("realisation %d: z %v, a shot with gradient %g G/m gives %v", i, rec.Z, g, direct.Z)
		}
		slope = append(slope, cmplx.Phase(rec.Z/level)/g)
	}
	if math.Abs(slope[0]) < 1e-3 {
		t.Errorf("gradient phase %g rad per G/m on a whole lap: want it clearly non-zero", slope[0])
	}
	// The potential is in the shot's Hamiltonian: second-order terms
	// remain (seen 1.1e-6 relative between draws); tolerance 5e-6.
	for i, x := range slope[1:] {
		if math.Abs(x-slope[0]) > 5e-6*math.Abs(slope[0]) {
			t.Errorf("realisation %d: %g rad per G/m, realisation 0 %g: not first order (tol 5e-6 relative)", i+1, x, slope[0])
		}
	}
}

// TestEnsembleRotationNoise: a budget's rotation-rate PSD reaches each
// shot as a record of the platform's rate (sim.Shot.RotationNoise; its
// phase, sim.RotationNoisePhaseRad, is checked against the closed form
// in sim), drawn from its own stream: its variance over a realisation's
// samples is the PSD's integral over the synthesis band, S_0 (f_hi -
// f_lo) (noise.Synthesizer: each sample's variance is the band integral),
// within 4 standard errors of a mean over 40 records; it differs from the
// field record of the same realisation; and a sensitivity design has it
// as an input of its own.
func TestEnsembleRotationNoise(t *testing.T) {
	const s0 = 1e-14 // (rad/s)^2/Hz
	b := Budget{RotationNoise: noise.White{Level: s0}, FieldNoise: noise.White{Level: s0}}
	b.Apparatus.Field.Zeeman.LinearHzPerG = 1
	r, nominal := apparatusEnsemble(t, b, 40)
	w := r.NewWorker()
	records := int(math.Ceil(NoiseDuration(r.Config(), b)/r.NoiseStepS())) + 2
	lo, hi := 1/(float64(records)*r.NoiseStepS()), r.sim.NoiseBandHz()
	want := s0 * (hi - lo)
	var mean float64
	var moved bool
	for i := range 40 {
		sh, rec := w.Shot(i)
		if sh.RotationNoise == nil || sh.Field.Noise == nil {
			t.Fatal("no rotation or field record in the shot")
		}
		if sh.RotationNoise.Values[5] == sh.Field.Noise.Values[5] {
			t.Error("the rotation record is the field record")
		}
		var v float64
		for _, x := range sh.RotationNoise.Values {
			v += x * x / float64(len(sh.RotationNoise.Values))
		}
		mean += v / 40
		if out := w.RunShot(sh, rec); out.BiasRad != nominal.BiasRad {
			moved = true
		}
	}
	// Each record's mean square scatters by about sqrt(2 / (records B
	// T)), under 20 % here; the mean of 40 within 4 x 20 % / sqrt(40).
	if math.Abs(mean/want-1) > 4*0.2/math.Sqrt(40) {
		t.Errorf("rotation record mean square %g (rad/s)^2, want S_0 (f_hi - f_lo) = %g", mean, want)
	}
	if !moved {
		t.Error("rotation noise does not move the bias")
	}
	d, err := NewSensitivityDesign(r, 4)
	if err != nil {
		t.Fatal(err)
	}
	if in := d.Inputs(); len(in) != 2 || in[1] != SourceRotationPSD {
		t.Errorf("sensitivity inputs %v, want the field and the rotation noise", in)
	}
}

// TestEnsembleSwapArea: on an echo of two segments (one swap), a
// realisation's swap-area draw e scales the contrast by the swap's
// transfer probability sin^2(pi (1 + e)/2) = cos^2(pi e/2) (a pi pulse of
// area pi (1 + e): Rabi's formula on resonance, common practice) and
// leaves the phase; over the draws the mean factor is the Gaussian
// characteristic function's (1 + exp(-pi^2 sigma^2 / 2))/2 (docs/model.md,
// Echo sequences), within 4 standard errors of the sample.
func TestEnsembleSwapArea(t *testing.T) {
	const sigma, n = 0.1, 300
	e := testEnsemble(t, n, false)
	e.Config.TemperatureK = 0
	echo, err := sim.NewEcho(e.Config.Sequence, 2, 0)
	if err != nil {
		t.Fatal(err)
	}
	e.Config.Sequence = echo
	e.Budget = Budget{SwapAreaRel: sigma}
	r, err := NewRealiser(e)
	if err != nil {
		t.Fatal(err)
	}
	s, err := sim.NewSimulator(r.Config())
	if err != nil {
		t.Fatal(err)
	}
	nominal := s.Run(sim.Shot{}, nil)
	w := r.NewWorker()
	var sum, sum2 float64
	for i := range n {
		rec := w.Realise(i)
		x := rec.Inputs[0]
		c := math.Cos(math.Pi * x / 2)
		if want := nominal.Contrast * c * c; math.Abs(rec.Contrast-want) > 1e-12 {
			t.Fatalf("realisation %d, e = %g: contrast %.15g, want %.15g", i, x, rec.Contrast, want)
		}
		if d := math.Abs(sim.Wrap(rec.BiasRad - nominal.BiasRad)); d > 1e-12 {
			t.Fatalf("realisation %d: bias moved by %g rad", i, d)
		}
		f := rec.Contrast / nominal.Contrast
		sum += f
		sum2 += f * f
	}
	mean := sum / n
	se := math.Sqrt((sum2/n - mean*mean) / (n - 1))
	if want := (1 + math.Exp(-math.Pi*math.Pi*sigma*sigma/2)) / 2; math.Abs(mean-want) > 4*se {
		t.Errorf("mean swap factor %.5f, want %.5f (4 se = %.2g)", mean, want, 4*se)
	}
}
