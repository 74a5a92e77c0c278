package sim

import (
	"math"
	"testing"
)

// rampedConfig is the benchmark ring (benchConfig) with a ramp of the
// given shape and duration to 500 rad/s and laps laps.
func rampedConfig(t testing.TB, shape string, rampS, laps float64) Config {
	t.Helper()
	c := benchConfig(t, laps)
	up, err := NewShape(shape, rampS, 500, c.TrapRadS())
	if err != nil {
		t.Fatal(err)
	}
	if c.Sequence, err = NewSequence(up, laps); err != nil {
		t.Fatal(err)
	}
	return c
}

// kernelGap is the largest difference between two kernels' values relative
// to scale, and the difference of their integrals (a white PSD's
// prediction, int S K df with S = 1) relative to the integral's scale.
func kernelGap(got, want []float64, step, scale, intScale float64) (float64, float64) {
	var d, ig, iw float64
	for m := range got {
		d = math.Max(d, math.Abs(got[m]-want[m]))
		ig += got[m] * step
		iw += want[m] * step
	}
	return d / scale, math.Abs(ig-iw) / intScale
}

// oneArm is the channel on one arm alone whose kernels set the scale of
// channel c's: a kernel that vanishes by the arms' symmetry (the bias of
// common intensity or phase noise) is compared on that scale.
func oneArm(c Channel) Channel {
	switch c {
	case IntensityCommon, IntensityDifferential, IntensityPlus:
		return IntensityPlus
	case PhaseCommon, PhaseDifferential, PhasePlus, PhaseMinus:
		return PhasePlus
	}
	return c
}

func peakAbs(x []float64) float64 {
	var p float64
	for _, v := range x {
		p = math.Max(p, math.Abs(v))
	}
	return p
}

func absIntegral(x []float64, step float64) float64 {
	var s float64
	for _, v := range x {
		s += math.Abs(v) * step
	}
	return s
}

// TestKernelsClosedAgreeSampled checks the kernels with the cruise in
// closed form (closedSpectra, the method Kernels uses) against the sampled
// reference (sampledSpectra: every time step of the whole sequence
// sampled and Fourier transformed), on half a lap of the benchmark ring
// with an adiabatic sin2 ramp of 150 us, the inverse-engineered ramp, and
// a non-adiabatic sin2 ramp of 30 us (a quarter of a trap period, which
// leaves the atoms spread over many bands: most eigenstates of the cruise
// carry weight). The closed form integrates the cruise exactly and the
// ramps by Gregory's end-corrected trapezoid rule (gregoryWeights); the
// reference uses the trapezoid rule across the whole sequence, with an
// error of order (omega h)^2/12 on each Bohr component. Measured: up to
// 5.3e-5 of a kernel's peak and 1.9e-4 of its integral (the sin2 ramp's
// intensity contrast kernels; 3.3e-6 and 2.6e-5 for the 30 us ramp).
// Halving and quartering the closed form's ramp step moved it by at most
// 1.1e-6 of the peak and left it 2.9e-5 to 5.1e-5 from the reference: the
// difference is the reference's error. Tolerances 2e-4 of the peak and
// 4e-4 of the integral.
func TestKernelsClosedAgreeSampled(t *testing.T) {
	for _, tc := range []struct {
		shape string
		ramp  float64
	}{
		{"sin2", 150e-6},
		{"inverse", 150e-6},
		{"sin2", 30e-6},
	} {
		if testing.Short() && tc.shape != "sin2" {
			continue // each reference costs about a second
		}
		s, err := NewSimulator(rampedConfig(t, tc.shape, tc.ramp, 0.5))
		if err != nil {
			t.Fatal(err)
		}
		got, err := s.Kernels(0)
		if err != nil {
			t.Fatal(err)
		}
		want, err := s.kernels(0, s.sampledSpectra)
		if err != nil {
			t.Fatal(err)
		}
		if got.StepHz != want.StepHz || len(got.FrequencyHz) != len(want.FrequencyHz) {
			t.Fatalf("%s %g s: grid %g Hz x %d, reference %g Hz x %d", tc.shape, tc.ramp, got.StepHz, len(got.FrequencyHz), want.StepHz, len(want.FrequencyHz))
		}
		var worst, worstInt float64
		for i := range want.Channels {
			ch := want.Channels[i].Channel
			ref := want.Channel(oneArm(ch))
			for _, k := range []struct {
				name            string
				got, want, ref1 []float64
			}{
				{"bias", got.Channels[i].Bias, want.Channels[i].Bias, ref.Bias},
				{"contrast", got.Channels[i].Contrast, want.Channels[i].Contrast, ref.Contrast},
			} {
				scale := math.Max(peakAbs(k.want), peakAbs(k.ref1))
				if scale == 0 {
					continue
				}
				intScale := math.Max(absIntegral(k.want, want.StepHz), absIntegral(k.ref1, want.StepHz))
				d, di := kernelGap(k.got, k.want, want.StepHz, scale, intScale)
				worst, worstInt = math.Max(worst, d), math.Max(worstInt, di)
				if d > 2e-4 || di > 4e-4 {
					t.Errorf("%s %g s, %v %s kernel: differs from the sampled reference by %.3g of its peak and %.3g of its integral (tol 2e-4 and 4e-4)", tc.shape, tc.ramp, ch, k.name, d, di)
				}
			}
		}
		t.Logf("%s %g s: largest difference %.3g of a peak, %.3g of an integral", tc.shape, tc.ramp, worst, worstInt)
	}
}

// TestKernelsTruncation bounds what the closed form's two truncations
// leave. Dropping the smallest terms A e^{i (g_k - g_k') s} of a cruise
// series whose moduli add up to tol times the terms' root-sum-square
// moves the series by at most that at every instant, and the kernels,
// bilinear in the series, by far less of their peak: measured 0.0023 tol
// here at tol = 1e-3 (half a lap, sin2 ramps of 150 and 30 us, up to
// 12 kHz), 0.009 tol on a whole lap (2.5e-3 tol at 1e-4). Keeping each ramp
// sample to within tol of the largest sample's norm changed the kernels
// by 0.01 tol. Both are checked at tol = 1e-3 (cruise) and 1e-4 (ramps),
// well above rounding, and at the defaults, against no truncation, with
// bounds of 0.005 tol (cruise) and 0.05 tol (ramps) of each kernel's peak
// (on its one-arm channel's scale for the kernels that vanish by
// symmetry, as in TestKernelsClosedAgreeSampled).
func TestKernelsTruncation(t *testing.T) {
	defer func(r, p float64) { responseRampTol, responsePruneTol = r, p }(responseRampTol, responsePruneTol)
	def := [2]float64{responseRampTol, responsePruneTol}
	for _, ramp := range []float64{150e-6, 30e-6} {
		s, err := NewSimulator(rampedConfig(t, "sin2", ramp, 0.5))
		if err != nil {
			t.Fatal(err)
		}
		responseRampTol, responsePruneTol = 0, 0
		exact, err := s.Kernels(12e3)
		if err != nil {
			t.Fatal(err)
		}
		for _, tc := range []struct {
			name       string
			ramp, prun float64
			bound      float64
		}{
			{"ramps at 1e-4", 1e-4, 0, 0.05 * 1e-4},
			{"cruise at 1e-3", 0, 1e-3, 0.005 * 1e-3},
			{"defaults", def[0], def[1], 0.05*def[0] + 0.005*def[1]},
		} {
			responseRampTol, responsePruneTol = tc.ramp, tc.prun
			k, err := s.Kernels(12e3)
			if err != nil {
				t.Fatal(err)
			}
			var worst float64
			for i := range exact.Channels {
				ref := exact.Channel(oneArm(exact.Channels[i].Channel))
				for _, p := range [][3][]float64{
					{k.Channels[i].Bias, exact.Channels[i].Bias, ref.Bias},
					{k.Channels[i].Contrast, exact.Channels[i].Contrast, ref.Contrast},
				} {
					scale := math.Max(peakAbs(p[1]), peakAbs(p[2]))
					if scale == 0 {
						continue
					}
					d, _ := kernelGap(p[0], p[1], k.StepHz, scale, 1)
					worst = math.Max(worst, d)
				}
			}
			t.Logf("sin2 %g s, %s: largest change %.3g of a peak (%.3g of the bound)", ramp, tc.name, worst, worst/tc.bound)
			if worst > tc.bound {
				t.Errorf("sin2 %g s, %s: the kernels moved by %.3g of their peak, above the bound %.3g", ramp, tc.name, worst, tc.bound)
			}
		}
	}
}

// TestKernelsHundredLaps computes the kernels of 100 laps of the
// benchmark ring (T = 1.26 s), whose sampled series would have needed
// about 29 GB, and checks them at zero frequency against static depth
// errors as TestResponseStaticLimit does: |H(0)| against the finite
// difference of the phase in a differential depth error eps, and the
// contrast kernel at 0 against -(d^2 C/d eps^2)/2, by shots with eps = +-d/2
// (Run, independent of the kernels). The slope grows with T (1.5e5 rad
// per unit), so d = 3e-7: the difference quotient's truncation, measured
// by its growth as d^2 (6e-3 at d = 4e-6, 3.8e-4 at 1e-6), is then 3e-5
// of the curvature. Measured: 5e-8 relative in the slope and 7.7e-5 in the
// curvature; tolerances 5e-7 and 3e-4. The band is cut at 50 Hz: the
// grid's length, not the memory, is what grows with the laps
// (KernelsBytes, checked below 150 MiB for the whole noise band).
func TestKernelsHundredLaps(t *testing.T) {
	if testing.Short() {
		t.Skip("100 laps: about 0.3 s")
	}
	s, err := NewSimulator(benchConfig(t, 100))
	if err != nil {
		t.Fatal(err)
	}
	if est := s.KernelsBytes(0); est > 150<<20 {
		t.Errorf("100 laps: kernels estimated at %d MiB, want below 150", est>>20)
	}
	k, err := s.Kernels(50)
	if err != nil {
		t.Fatal(err)
	}
	_, slope, curv := staticDifferentialDepth(s, 3e-7)
	kd := k.Channel(IntensityDifferential)
	g0 := math.Sqrt(kd.Bias[0])
	t.Logf("100 laps, %d frequencies: |dPhi/deps| %.8g, kernel %.8g (%.2g); -C''/2 %.8g, kernel %.8g (%.2g); KernelsBytes(0) %d MiB",
		len(k.FrequencyHz), slope, g0, g0/slope-1, -curv/2, kd.Contrast[0], -kd.Contrast[0]/(curv/2)-1, s.KernelsBytes(0)>>20)
	if math.Abs(g0-slope) > 5e-7*slope {
		t.Errorf("|H(0)| = %.8g, finite difference %.8g (tol 5e-7 relative)", g0, slope)
	}
	if math.Abs(kd.Contrast[0]+curv/2) > 3e-4*math.Abs(curv/2) {
		t.Errorf("contrast kernel at 0 %.8g, -C''/2 = %.8g (tol 3e-4 relative)", kd.Contrast[0], -curv/2)
	}
}

// TestGregoryWeights checks the ramps' quadrature weights (gregoryWeights)
// by the property that defines them: on n+1 equally spaced points of
// [0, n] they integrate 1, x, x^2 and x^3 exactly (int_0^n x^p dx =
// n^{p+1}/(p+1); Simpson's 3/8, Boole's and Gregory's end-corrected
// trapezoid rules are exact for cubics, W. H. Press et al., Numerical
// Recipes, 3rd ed., sec. 4.1, from memory), except n = 1 (the trapezoid
// rule: exact for lines only). Tolerance 1e-12 relative (rounding).
func TestGregoryWeights(t *testing.T) {
	for n := 1; n <= 12; n++ {
		w := gregoryWeights(n)
		if len(w) != n+1 {
			t.Fatalf("n = %d: %d weights, want %d", n, len(w), n+1)
		}
		top := 3
		if n == 1 {
			top = 1
		}
		for p := 0; p <= top; p++ {
			var got float64
			for j, x := range w {
				got += x * math.Pow(float64(j), float64(p))
			}
			want := math.Pow(float64(n), float64(p+1)) / float64(p+1)
			if math.Abs(got-want) > 1e-12*want {
				t.Errorf("n = %d: sum w_j j^%d = %.15g, want %.15g", n, p, got, want)
			}
		}
	}
}
