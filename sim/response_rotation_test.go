package sim

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"

	"rampart/noise"
)

// TestRotationKernelParseval checks the rotation channel's bias kernel
// |W(f)|^2 against Parseval's theorem: for white rotation noise of
// one-sided level S_0 over all frequencies the phase variance is
// (S_0/2) int w(t)^2 dt (docs/model.md, Perturbations, platform rotation;
// the closed form TestRotationNoiseWhite checks on the shot). For the sin2
// ramp w = 2 I Omega_0 sin^2(pi t/2 t_r) / hbar on the ramps, so
//
//	int w^2 dt = (2 I Omega_0 / hbar)^2 (T_cruise + 3 t_r / 4);
//
// for the inverse-engineered ramp the integral is by an independent
// 64-point Gauss-Legendre quadrature of w^2 on each ramp (exact for its
// polynomial speed profile). A white PSD's prediction (Kernels.Predict)
// is the trapezoid rule over the grid; since |W|^2 is the transform of
// w's autocorrelation, which vanishes beyond lag T, and the grid's step
// is below 1/(2T), that sum is exact by Poisson's summation formula but
// for the tail above the grid's end. The simulator's kernels end at its
// noise band (26 kHz here), where that tail is 1e-8 (sin2) and 9e-7
// (inverse) of the variance, so the check runs on the same kernel
// (rotationKernel, same grid step) continued to 1 MHz, where w's
// continuous slope leaves a tail falling as f^-6 (measured relative
// error 5e-13 and 1.1e-12; tolerance 1e-11). The simulator's kernel
// must equal it on the grid they share (1e-12 of the peak) and be K^2 at
// f = 0 to 1e-12 (a constant rate gives K Omega), and its contrast
// kernel must be zero: a phase cannot change |z|.
func TestRotationKernelParseval(t *testing.T) {
	for _, shape := range []string{"sin2", "inverse"} {
		c, s, k := shapedKernels(t, shape, 1)
		up := c.Sequence.Up
		w0 := 2 * c.Ring.Inertia() / Hbar
		tr, tc := up.Duration(), c.Sequence.CruiseS
		var w2 float64
		switch shape {
		case "sin2":
			w0 *= c.Sequence.CruiseSpeed()
			w2 = w0 * w0 * (tc + 3*tr/4)
		default:
			ramp := quad.Fixed(func(t float64) float64 { v := w0 * up.Speed(t); return v * v }, 0, tr, 64, quad.Legendre{}, 0)
			cruise := w0 * c.Sequence.CruiseSpeed()
			w2 = 2*ramp + cruise*cruise*tc
		}
		const s0 = 1e-12 // (rad/s)^2/Hz
		want := s0 / 2 * w2

		kk := c.Ring.ScaleFactor(c.Sequence.TotalAngle())
		kc := k.Channel(Rotation)
		if math.Abs(kc.Bias[0]/(kk*kk)-1) > 1e-12 {
			t.Errorf("%s: |W(0)|^2 = %.12g, want K^2 = %.12g", shape, kc.Bias[0], kk*kk)
		}
		const top = 1e6 // Hz
		wide := &Kernels{StepHz: k.StepHz, Channels: []ChannelKernel{rotationKernel(s.drives(Shot{}), c.Ring.Inertia(), k.StepHz, int(top/k.StepHz))}}
		for m, b := range wide.Channels[0].Bias {
			wide.FrequencyHz = append(wide.FrequencyHz, float64(m)*k.StepHz)
			if m < len(kc.Bias) && math.Abs(b-kc.Bias[m]) > 1e-12*kc.Bias[0] {
				t.Fatalf("%s: kernel at %g Hz %.14g, the same kernel continued %.14g", shape, k.FrequencyHz[m], kc.Bias[m], b)
			}
		}
		inBand := k.Predict(Rotation, noise.White{Level: s0}, noise.Band{})
		got := wide.Predict(Rotation, noise.White{Level: s0}, noise.Band{})
		rel := got.BiasVarRad2/want - 1
		t.Logf("%s: predicted variance %.12g rad^2 to %g Hz, (S_0/2) int w^2 %.12g (relative %.2g); in the noise band to %.4g Hz %.12g (relative %.2g)", shape, got.BiasVarRad2, top, want, rel,
			k.FrequencyHz[len(k.FrequencyHz)-1], inBand.BiasVarRad2, inBand.BiasVarRad2/want-1)
		if math.Abs(rel) > 1e-11 {
			t.Errorf("%s: predicted rotation-noise variance %.12g rad^2, want (S_0/2) int w^2 = %.12g (relative tolerance 1e-11)", shape, got.BiasVarRad2, want)
		}
		if inBand.ContrastLoss != 0 {
			t.Errorf("%s: rotation-noise contrast loss %g, want 0 (a pure phase)", shape, inBand.ContrastLoss)
		}
		for m, x := range kc.Contrast {
			if x != 0 {
				t.Fatalf("%s: contrast kernel %g at %g Hz, want 0", shape, x, k.FrequencyHz[m])
			}
		}
	}
}

// flatRamp is a ramp of no duration: the arm starts at its cruise speed.
type flatRamp struct{ speed float64 }

func (r flatRamp) Duration() float64       { return 0 }
func (r flatRamp) Name() string            { return "flat" }
func (r flatRamp) Speed(float64) float64   { return r.speed }
func (r flatRamp) Angle(t float64) float64 { return r.speed * t }

// TestRotationKernelConstantSpeed checks the rotation kernel of arms that
// run at a constant speed Omega_0 for a time T (no ramps) against the
// free-evolution filter function: w = 2 I Omega_0 / hbar on [0, T], so
//
//	|W(f)|^2 = w^2 sin^2(pi f T) / (pi f)^2,
//
// the sinc^2 of a phase that accumulates at a constant rate between two
// instantaneous pulses (P. Cheinet et al., IEEE Trans. Instrum. Meas. 57,
// 1141 (2008)). It is evaluated in closed form: measured 1.6e-16 of the
// peak (w T)^2, tolerance 1e-14 (what is tested is the assembly and its conventions, at
// every grid point).
func TestRotationKernelConstantSpeed(t *testing.T) {
	r := Ring{Sites: 20, RadiusM: 5e-6, MassKg: Rb87MassU * AtomicMassUnit}
	const omega0, T = 500.0, 12e-3
	seq := Sequence{Up: flatRamp{omega0}, CruiseS: T}
	drives := [2]Drive{{Seq: seq, Sign: 1}, {Seq: seq, Sign: -1}}
	const df, M = 1 / (4 * T), 4000
	kc := rotationKernel(drives, r.Inertia(), df, M)
	w := 2 * r.Inertia() * omega0 / Hbar
	peak := w * w * T * T
	var worst float64
	defer func() { t.Logf("largest error %.2g of the peak", worst) }()
	for m := range M + 1 {
		f := float64(m) * df
		want := peak
		if m > 0 {
			want = w * w * math.Pow(math.Sin(math.Pi*f*T)/(math.Pi*f), 2)
		}
		d := math.Abs(kc.Bias[m] - want)
		worst = math.Max(worst, d/peak)
		if d > 1e-14*peak {
			t.Fatalf("f = %g Hz: |W|^2 = %.14g, want %.14g (tol %.2g)", f, kc.Bias[m], want, 1e-14*peak)
		}
		if kc.Contrast[m] != 0 {
			t.Fatalf("f = %g Hz: contrast kernel %g, want 0", f, kc.Contrast[m])
		}
	}
}

// BenchmarkRotationKernel times the rotation channel's kernel on the
// benchmark scenario (sin2 ramps of 150 us, one lap) on a grid like the
// simulator's: step 1/(4T) up to its noise band.
func BenchmarkRotationKernel(b *testing.B) {
	c := benchConfig(b, 1)
	s, err := NewSimulator(c)
	if err != nil {
		b.Fatal(err)
	}
	T := c.Sequence.Duration()
	df := 1 / (4 * T)
	M := int(s.NoiseBandHz() / df)
	drives := s.drives(Shot{})
	for b.Loop() {
		rotationKernel(drives, c.Ring.Inertia(), df, M)
	}
}
