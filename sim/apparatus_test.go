package sim

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestFieldShiftPhase checks Phi_B = -2 pi integral delta_nu dt (issue 12's
// sign: a positive shift of arm s = +1 gives -2 pi delta_nu T) for records
// whose integrals are known in closed form.
func TestFieldShiftPhase(t *testing.T) {
	const T = 13e-3 // issue 12's 13 ms sequence
	ramp := &Series{StepS: 1e-4, Values: make([]float64, 131)}
	for i := range ramp.Values {
		ramp.Values[i] = 2e-6 * float64(i) * 1e-4 / T // b(t) = beta t, beta T = 2 uG
	}
	const beta = 2e-6 / T
	for _, c := range []struct {
		name string
		f    FieldShift
		want float64
	}{
		// Constant shift: -2 pi delta_nu T.
		{"static 10 Hz", FieldShift{ShiftHz: 10}, -2 * math.Pi * 10 * T},
		// Issue 12: 1 uG on |1,-1>-|2,-2> (-2.1 MHz/G) over 13 ms is
		// 0.17 rad; the sign is + because delta_nu < 0.
		{"1 uG stretched pair", FieldShift{Zeeman: Zeeman{LinearHzPerG: -2.1e6}, OffsetG: 1e-6}, 2 * math.Pi * 2.1e6 * 1e-6 * T},
		// Quadratic only (clock pair, 575.15 Hz/G^2) at 0.1 G offset.
		{"clock 0.1 G", FieldShift{Zeeman: Zeeman{QuadraticHzPerG2: 575.15}, OffsetG: 0.1}, -2 * math.Pi * 575.15 * 0.01 * T},
		// Linear ramp b = beta t: integral b = beta T^2/2, b^2 = beta^2 T^3/3,
		// and the cross term 2 b0 beta T^2/2.
		{"ramp", FieldShift{Zeeman: Zeeman{LinearHzPerG: 1e6, QuadraticHzPerG2: 3e9}, OffsetG: 1e-6, Noise: ramp},
			-2 * math.Pi * (1e6*(1e-6*T+beta*T*T/2) + 3e9*(1e-12*T+2e-6*beta*T*T/2+beta*beta*T*T*T/3))},
	} {
		got := c.f.PhaseRad(0, T)
		// Relative 1e-12: exact integrals in floating point.
		if math.Abs(got-c.want) > 1e-12*math.Abs(c.want) {
			t.Errorf("%s: got %.15g rad, want %.15g (relative tol 1e-12)", c.name, got, c.want)
		}
	}
	if got := (FieldShift{ShiftHz: 1}).PhaseRad(0, T); math.Abs(got+0.0816814) > 1e-6 {
		t.Errorf("1 Hz over 13 ms: %g rad, want -0.0816814 (2 pi x 0.013)", got)
	}
}

// TestSeriesIntegrals checks the exact integrals against a fine midpoint
// rule on a record that holds its ends, over windows that start and stop
// between samples and outside the record.
func TestSeriesIntegrals(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	x := &Series{StepS: 0.1, Values: make([]float64, 11)}
	for i := range x.Values {
		x.Values[i] = rng.NormFloat64()
	}
	for _, w := range [][2]float64{{0, 1}, {0.03, 0.77}, {-0.5, 1.7}, {0.42, 0.44}} {
		lin, sq := seriesIntegrals(x, w[0], w[1])
		const n = 200000
		var rl, rs float64
		h := (w[1] - w[0]) / n
		for i := range n {
			v := x.At(w[0] + (float64(i)+0.5)*h)
			rl += v * h
			rs += v * v * h
		}
		// Midpoint error on a piecewise-linear function: below (h^2) x
		// (kinks) ~ 1e-10 here; tolerance 1e-8.
		if math.Abs(lin-rl) > 1e-8 || math.Abs(sq-rs) > 1e-8 {
			t.Errorf("window %v: got %.10g, %.10g, midpoint %.10g, %.10g (tol 1e-8)", w, lin, sq, rl, rs)
		}
	}
}

// TestShotFieldShift runs a shot with a static differential shift and
// checks that its phase moves by exactly -2 pi delta_nu T, T the shot
// length, and its contrast not at all.
func TestShotFieldShift(t *testing.T) {
	c := slowConfig(t, 1)
	s, err := NewSimulator(c)
	if err != nil {
		t.Fatal(err)
	}
	nominal := s.Run(Shot{}, nil)
	const nu = 3.7 // Hz
	got := s.Run(Shot{Field: FieldShift{ShiftHz: nu}}, nil)
	want := Wrap(nominal.PhaseRad - 2*math.Pi*nu*c.Sequence.Duration())
	if d := math.Abs(Wrap(got.PhaseRad - want)); d > 1e-12 {
		t.Errorf("phase with %g Hz: got %.12f, want %.12f (tol 1e-12)", nu, got.PhaseRad, want)
	}
	if math.Abs(got.Contrast-nominal.Contrast) > 1e-14 {
		t.Errorf("contrast changed: %g against %g", got.Contrast, nominal.Contrast)
	}

	// A 50 Hz field line of 1 uG from t = 0 on a -2.1 MHz/G pair: the
	// phase is -2 pi k B (1 - cos 2 pi f T) / (2 pi f). The record is
	// sampled every 1 us; linear interpolation errs by h^2 / 12 of the
	// second derivative, 1e-7 relative here.
	const f, k, b = 50.0, -2.1e6, 1e-6
	T := c.Sequence.Duration()
	line := &Series{StepS: 1e-6, Values: make([]float64, int(T/1e-6)+2)}
	for i := range line.Values {
		line.Values[i] = b * math.Sin(2*math.Pi*f*float64(i)*1e-6)
	}
	got = s.Run(Shot{Field: FieldShift{Zeeman: Zeeman{LinearHzPerG: k}, Noise: line}}, nil)
	shift := -2 * math.Pi * k * b * (1 - math.Cos(2*math.Pi*f*T)) / (2 * math.Pi * f)
	want = Wrap(nominal.PhaseRad + shift)
	if d := math.Abs(Wrap(got.PhaseRad - want)); d > 1e-6*math.Abs(shift) {
		t.Errorf("phase with a 50 Hz line: got %.10f, want %.10f (shift %.6g rad, relative tol 1e-6)", got.PhaseRad, want, shift)
	}
}

// TestScatteringEnsembleMean draws the per-shot outcome of
// Scattering.Factor and checks its ensemble mean against the master
// equation's exp(-(L_+ + L_-)/2) (exp(-Gamma T) for equal rates). N =
// 100000 draws; tolerance 4 standard errors of the mean (a false failure
// once in 16000 runs), the standard error computed from the two-point
// distribution of the factor.
func TestScatteringEnsembleMean(t *testing.T) {
	rng := rand.New(rand.NewPCG(12, 1))
	for _, l := range [][2]float64{{0.3, 0.3}, {0.05, 0.4}, {1.5, 0}, {2, 3}} {
		const n = 100000
		var sum float64
		for range n {
			f, _ := Scattering{Uniform: rng.Float64()}.Factor(l)
			sum += f
		}
		mean := sum / n
		want := math.Exp(-(l[0] + l[1]) / 2)
		none := (math.Exp(-l[0]) + math.Exp(-l[1])) / 2
		kept := want / none
		se := kept * math.Sqrt(none*(1-none)/n)
		if math.Abs(mean-want) > 4*se {
			t.Errorf("L = %v: mean factor %.5f, want %.5f (4 se = %.2g)", l, mean, want, 4*se)
		}
		if cloud, _ := (Scattering{Cloud: true}).Factor(l); math.Abs(cloud-want) > 1e-15 {
			t.Errorf("L = %v: cloud factor %g, want %g", l, cloud, want)
		}
	}
}

// TestShotScattering: the accumulated means follow the arm's depth, and a
// shot applies the factor: the cloud mean exp(-(L_+ + L_-)/2), and zero
// after an event.
func TestShotScattering(t *testing.T) {
	c := slowConfig(t, 1)
	s, err := NewSimulator(c)
	if err != nil {
		t.Fatal(err)
	}
	T := c.Sequence.Duration()
	sc := Scattering{RateS: [2]float64{20, 5}, Cloud: true}
	sh := Shot{Scattering: sc, DepthRel: [2]float64{0.01, -0.01}}
	l := s.ScatteringMeans(sh)
	for a, want := range [2]float64{20 * 1.01 * T, 5 * 0.99 * T} {
		if math.Abs(l[a]-want) > 1e-12*want {
			t.Errorf("arm %d: L = %.12g, want Gamma (1 + eps) T = %.12g", a, l[a], want)
		}
	}
	ref := s.Run(Shot{DepthRel: sh.DepthRel}, nil)
	got := s.Run(sh, nil)
	want := ref.Contrast * math.Exp(-(l[0]+l[1])/2)
	if math.Abs(got.Contrast-want) > 1e-12 {
		t.Errorf("cloud contrast %.12f, want %.12f", got.Contrast, want)
	}
	if math.Abs(Wrap(got.PhaseRad-ref.PhaseRad)) > 1e-12 {
		t.Errorf("scattering moved the phase: %g against %g", got.PhaseRad, ref.PhaseRad)
	}
	sc.Cloud, sc.Uniform = false, 0.9999
	if r := s.Run(Shot{Scattering: sc}, nil); r.Contrast != 0 {
		t.Errorf("contrast after a scattering event: %g, want 0", r.Contrast)
	}
}

// TestRadiusError: a true radius R (1 + r) makes the measured phase grow
// by K ((1 + r)^2 - 1) Omega_bg, a scale-factor error 2 r + r^2 (issue 12:
// 0.1 % in radius is 2000 ppm).
func TestRadiusError(t *testing.T) {
	c := slowConfig(t, 1)
	s, err := NewSimulator(c)
	if err != nil {
		t.Fatal(err)
	}
	nominal := s.Run(Shot{}, nil)
	for _, r := range []float64{1e-3, -2e-3} {
		got := s.Run(Shot{RadiusRel: r}, nil)
		sf := Wrap(got.PhaseRad-nominal.PhaseRad) / nominal.SagnacRad
		want := 2*r + r*r
		// Relative 1e-9: the phase difference is exact up to rounding of
		// a 0.4 rad phase.
		if math.Abs(sf-want) > 1e-9*math.Abs(want)+1e-13 {
			t.Errorf("r = %g: scale-factor error %.12g, want 2r + r^2 = %.12g", r, sf, want)
		}
		if math.Abs(got.Contrast-nominal.Contrast) > 1e-14 {
			t.Errorf("r = %g: contrast moved", r)
		}
	}
}

func TestApparatusValidate(t *testing.T) {
	bad := []error{
		FieldShift{ShiftHz: math.NaN()}.Validate(),
		FieldShift{OffsetG: math.Inf(1)}.Validate(),
		Scattering{RateS: [2]float64{-1, 0}}.Validate(),
		Scattering{Uniform: 1}.Validate(),
		ValidateRadiusRel(-1),
		RingPotential{TiltRad: 0.5}.Validate(),
		RingPotential{Harmonics: []DepthHarmonic{{Order: 0, Rel: 1e-3}}}.Validate(),
	}
	for i, err := range bad {
		if err == nil {
			t.Errorf("case %d: bad input accepted", i)
		}
	}
	good := []error{
		FieldShift{ShiftHz: 1, OffsetG: 1e-6}.Validate(),
		Scattering{RateS: [2]float64{1, 2}, Uniform: 0.5}.Validate(),
		ValidateRadiusRel(1e-3),
		RingPotential{TiltRad: 1e-3, Harmonics: []DepthHarmonic{{Order: 2, Rel: 1e-3}}}.Validate(),
	}
	for i, err := range good {
		if err != nil {
			t.Errorf("case %d: %v", i, err)
		}
	}
}
