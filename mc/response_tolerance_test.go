package mc

import (
	"context"
	"math"
	"testing"

	"rampart/noise"
	"rampart/sim"
	"rampart/stats"
)

// flatKernels returns kernels on 0 .. 1000 Hz (1 Hz grid) of a shot of
// duration 10 ms whose differential-shift channel has the flat bias kernel
// bias and contrast kernel contrast: white noise of level S between 1/T =
// 100 Hz and 1000 Hz costs S x 900 Hz times each.
func flatKernels(bias, contrast float64) *sim.Kernels {
	k := &sim.Kernels{StepHz: 1, DurationS: 0.01, Contrast: 1}
	ck := sim.ChannelKernel{Channel: sim.ShiftDifferential}
	for m := 0; m <= 1000; m++ {
		k.FrequencyHz = append(k.FrequencyHz, float64(m))
		ck.Bias, ck.Contrast = append(ck.Bias, bias), append(ck.Contrast, contrast)
	}
	k.Channels = []sim.ChannelKernel{ck}
	return k
}

// TestKernelTolerance checks the tolerance of field noise found from
// kernels against closed forms, on a synthetic ensemble that follows the
// kernels exactly: bias b0 + sigma z with sigma^2 = S kz^2 B 900 Hz and
// contrast c0 - S kz^2 K 900 Hz. The |bias| p95 criterion binds at the
// sigma of the folded normal distribution whose 95th percentile is the
// limit (sim.BiasStdForP95; F. C. Leone, L. S. Nelson and R. B. Nottingham,
// Technometrics 3, 543 (1961)), z_0.975 = 1.959964 sigma for b0 = 0; the
// mean contrast at (c0 - limit) / (kz^2 K 900 Hz). The prediction uses
// only the ensemble with the source off and the kernels, so it is exact to
// the bisection (tolerance 1e-9 relative); the confirming ensemble at the
// tolerance must have its estimate within three standard errors of the
// limit (the p95's standard error sqrt(0.05 x 0.95 / n) / phi(1.96) sigma
// = 0.0836 sigma at n = 1000; the mean's 0).
func TestKernelTolerance(t *testing.T) {
	const kz, bias, n, limit = 1.4e6, 2.0, 1000, 0.01 // Hz/G, rad^2/Hz per Hz^2, realisations, rad
	const band = 900.0                                // Hz
	k := flatKernels(bias, 0)
	base := Budget{FieldNoise: noise.White{Level: 1e-16}}
	base.Apparatus.Field.Zeeman.LinearHzPerG = kz
	level := func(b Budget) float64 {
		if b.FieldNoise == nil {
			return 0
		}
		return b.FieldNoise.(interface{ Integral(a, b float64) float64 }).Integral(0, 1)
	}
	for _, b0 := range []float64{0, 0.004} {
		eval := func(_ context.Context, b Budget) ([]Record, error) {
			sigma := math.Sqrt(level(b) * kz * kz * bias * band)
			return synthetic(n, 3, func(z1, _ float64) (float64, float64) { return 1, b0 + sigma*z1 }), nil
		}
		s := ToleranceSearch{Budget: base, Requirements: Requirements{AbsBiasP95MaxRad: limit}, Seed: 1}
		res, err := s.Kernel(context.Background(), eval, k, SourceFieldNoise)
		if err != nil {
			t.Fatal(err)
		}
		sigma := sim.BiasStdForP95(limit, b0)
		want := FieldNoiseUG2Hz(sigma * sigma / (kz * kz * bias * band))
		if res.Method != MethodKernels || res.Kernel == nil || !kernelStatusAgrees(res) || res.Metric != CriterionBiasRad {
			t.Fatalf("b0 = %g: method %q, kernel %v, status %s, metric %s; want kernels, found (or predicted when the confirmation did not pass), %s", b0, res.Method, res.Kernel, res.Status, res.Metric, CriterionBiasRad)
		}
		if got := res.Kernel.Amplitude; math.Abs(got-want) > 1e-9*want {
			t.Errorf("b0 = %g: tolerance %.10g uG^2/Hz, want %.10g (tol 1e-9 relative)", b0, got, want)
		}
		if a, _ := res.Tolerance(); a != res.Kernel.Amplitude || math.Abs(res.Kernel.Predicted-limit) > 1e-9*limit {
			t.Errorf("b0 = %g: At %g, predicted %g; want the kernel's amplitude %g and the limit %g", b0, a, res.Kernel.Predicted, res.Kernel.Amplitude, limit)
		}
		cv := res.Kernel.Curve
		if len(cv) != CurvePoints || cv[CurveAt].Amplitude != res.Kernel.Amplitude || math.Abs(cv[CurveAt].Predicted-limit) > 1e-9*limit {
			t.Fatalf("b0 = %g: curve of %d points, at index %d %+v; want %d points, the tolerance %g at the limit %g there", b0, len(cv), CurveAt, cv[min(CurveAt, len(cv)-1)], CurvePoints, res.Kernel.Amplitude, limit)
		}
		for i := 1; i < len(cv); i++ {
			if !(cv[i].Amplitude > cv[i-1].Amplitude && cv[i].Predicted > cv[i-1].Predicted) {
				t.Errorf("b0 = %g: curve not increasing at %d: %+v after %+v", b0, i, cv[i], cv[i-1])
			}
		}
		if se := 0.0836 * sigma; math.Abs(res.At.Value-limit) > 3*se {
			t.Errorf("b0 = %g: the confirmation's p95 |bias| %.4g, want the limit %g within 3 x %.2g", b0, res.At.Value, limit, se)
		}
	}

	// The mean contrast: contrast 0.98 - S kz^2 K 900 Hz, limit 0.9.
	const kc, c0, cmin = 5.0, 0.98, 0.9
	k = flatKernels(0, kc)
	eval := func(_ context.Context, b Budget) ([]Record, error) {
		loss := level(b) * kz * kz * kc * band
		return synthetic(50, 3, func(z1, _ float64) (float64, float64) { return c0 - loss + 1e-3*z1, 0 }), nil
	}
	s := ToleranceSearch{Budget: base, Requirements: Requirements{ContrastMeanMin: cmin}, Seed: 1}
	res, err := s.Kernel(context.Background(), eval, k, SourceFieldNoise)
	if err != nil {
		t.Fatal(err)
	}
	off, _ := eval(context.Background(), Budget{})
	var mean float64
	for _, r := range off {
		mean += r.Contrast / float64(len(off))
	}
	want := FieldNoiseUG2Hz((mean - cmin) / (kz * kz * kc * band))
	if got := res.Kernel.Amplitude; math.Abs(got-want) > 1e-9*want || res.Metric != CriterionContrastMean {
		t.Errorf("mean contrast: tolerance %.10g uG^2/Hz bound by %s, want %.10g by %s (tol 1e-9 relative)", got, res.Metric, want, CriterionContrastMean)
	}
	if math.Abs(res.At.Value-cmin) > 1e-12 {
		t.Errorf("mean contrast at the tolerance %.15g, want the limit %g (the synthetic loss is exact)", res.At.Value, cmin)
	}

	// A yield alone is not predicted: the Monte Carlo search runs instead.
	s.Requirements = Requirements{YieldMin: 0.5, Yield: Spec{MinContrast: cmin}}
	if res, err = s.Kernel(context.Background(), eval, k, SourceFieldNoise); err != nil || res.Method != MethodSearch || res.Kernel != nil {
		t.Errorf("yield alone: method %q, kernel %v, error %v; want the search", res.Method, res.Kernel, err)
	}
}

// smallRing is testEnsemble's sequence on a ring of 10 sites (radius 2.5
// um, the same lattice spacing) from the ground state: a realisation with
// intensity noise costs about 12 ms, its kernels about a second.
func smallRing(t testing.TB, samples int) Ensemble {
	e := testEnsemble(t, samples, false)
	e.Config.Ring.Sites, e.Config.Ring.RadiusM, e.Config.TemperatureK = 10, 2.5e-6, 0
	e.Sampler = "random"
	return e
}

// TestKernelToleranceAgreesWithSearch compares the tolerance of white
// intensity noise found from the kernels with the Monte Carlo search's on
// a small ring, against a mean-contrast limit that leaves a loss of about
// 0.01 to the noise (within the linear range, sim.MaxLinearContrastLoss).
// At a confidence of 0.51 the search's bound sits on its estimate (0.025
// standard errors away), so both look for the amplitude where the mean
// contrast meets the limit: the kernels' must lie in the search's bracket
// [tolerance, tolerance x (1 + precision)] widened by three standard
// errors of the mean contrast at the tolerance, converted to amplitude
// through the kernels' loss per unit PSD (dB = 10 log10 of the PSD).
// Measured: kernels -65.95 dB/Hz, search [-67.64, -67.43] dB/Hz, slack
// 2.8 dB (the mean's standard error at 100 realisations is 0.003, a third
// of the loss).
func TestKernelToleranceAgreesWithSearch(t *testing.T) {
	if testing.Short() {
		t.Skip("about 2000 realisations with intensity noise")
	}
	const n, precision = 100, 0.05
	e := smallRing(t, n)
	e.Budget = Budget{RIN: noise.White{Level: noise.IntensityFromRIN(-100)}}
	s0, err := sim.NewSimulator(e.Config)
	if err != nil {
		t.Fatal(err)
	}
	k, err := s0.Kernels(0)
	if err != nil {
		t.Fatal(err)
	}
	limit := k.Contrast - 0.01
	eval := func(ctx context.Context, b Budget) ([]Record, error) {
		c := e
		c.Budget = b
		c.NoiseDurationS = NoiseDuration(e.Config, e.Budget)
		r, err := NewRealiser(c)
		if err != nil {
			return nil, err
		}
		var recs []Record
		_, err = r.Run(ctx, 0, n, 2, func(rec Record) error { recs = append(recs, rec); return nil })
		return recs, err
	}
	s := ToleranceSearch{Budget: e.Budget, Requirements: Requirements{Confidence: 0.51, ContrastMeanMin: limit}, Seed: 1,
		Options: ToleranceOptions{Precision: precision}}
	kr, err := s.Kernel(context.Background(), eval, k, SourceRIN)
	if err != nil {
		t.Fatal(err)
	}
	mr, err := s.Source(context.Background(), eval, SourceRIN)
	if err != nil {
		t.Fatal(err)
	}
	got, ok1 := kr.Tolerance()
	lo, ok2 := mr.Tolerance()
	if !ok1 || !ok2 || kr.Method != MethodKernels || mr.Method != MethodSearch {
		t.Fatalf("kernels %+v, search %+v: want a tolerance from each", kr, mr)
	}
	hi := lo + 10*math.Log10(1+precision)
	// The standard error of the mean contrast at the tolerance, as a
	// shift of the level: dC = loss per unit x dS, and dS/S = dC / loss.
	c, _ := kr.Binding(*kr.At)
	recs, err := eval(context.Background(), Budget{RIN: noise.White{Level: noise.IntensityFromRIN(got)}})
	if err != nil {
		t.Fatal(err)
	}
	se := stats.StdDev(contrasts(recs)) / math.Sqrt(n)
	slack := 10 * math.Log10(1+3*se/kr.Kernel.ContrastLoss)
	t.Logf("MC at the kernels' tolerance: mean %.5f se %.2g (records' own)", stats.Mean(contrasts(recs)), se)
	t.Logf("kernels: %.2f dB/Hz (loss %.4g, MC mean %.5f vs limit %.5f, %s); search: [%.2f, %.2f] dB/Hz, %d points; slack %.2f dB",
		got, kr.Kernel.ContrastLoss, c.Value, limit, kr.Kernel.Confirm, lo, hi, len(mr.Points), slack)
	if got < lo-slack || got > hi+slack {
		t.Errorf("kernel tolerance %.3f dB/Hz outside the search's bracket [%.3f, %.3f] dB/Hz widened by %.2f dB", got, lo, hi, slack)
	}
}

// TestRotationKernelTolerance finds the tolerance of the platform's
// rotation-rate noise (platform.rotation_noise_urad2_s2_hz) from the
// kernels of a small ring and confirms it with rampart's own ensemble.
// With the rotation noise off every shot has the nominal bias b0, so the
// |bias| p95 criterion binds where the added normal bias's std is that of
// the folded normal whose 95th percentile is the limit (sim.BiasStdForP95;
// F. C. Leone, L. S. Nelson and R. B. Nottingham, Technometrics 3, 543
// (1961)): the level sigma^2 / V with V the kernels' variance per unit
// level from 1/T (Budget.Process), exact to the bisection (tolerance 1e-9
// relative). The confirming ensemble of n = 1000 at that level must have
// its p95 |bias| within three standard errors of the limit (the p95's
// standard error sqrt(0.05 x 0.95 / n) / phi(1.96) sigma = 0.0836 sigma;
// measured -0.48 at 1.7e5 (urad/s)^2/Hz for a 2e-4 rad limit).
func TestRotationKernelTolerance(t *testing.T) {
	if testing.Short() {
		t.Skip("1000 realisations with rotation noise")
	}
	const n, limit = 1000, 2e-4 // realisations, rad
	e := smallRing(t, n)
	e.Budget = Budget{RotationNoise: noise.White{Level: RotationNoiseFromURad2S2Hz(1)}}
	s0, err := sim.NewSimulator(e.Config)
	if err != nil {
		t.Fatal(err)
	}
	k, err := s0.Kernels(0)
	if err != nil {
		t.Fatal(err)
	}
	eval := func(ctx context.Context, b Budget) ([]Record, error) {
		c := e
		c.Budget = b
		r, err := NewRealiser(c)
		if err != nil {
			return nil, err
		}
		var recs []Record
		_, err = r.Run(ctx, 0, n, 2, func(rec Record) error { recs = append(recs, rec); return nil })
		return recs, err
	}
	s := ToleranceSearch{Budget: e.Budget, Requirements: Requirements{AbsBiasP95MaxRad: limit}, Seed: 1}
	res, err := s.Kernel(context.Background(), eval, k, SourceRotationPSD)
	if err != nil {
		t.Fatal(err)
	}
	if res.Method != MethodKernels || res.Kernel == nil || !kernelStatusAgrees(res) || res.Metric != CriterionBiasRad {
		t.Fatalf("method %q, kernel %v, status %s, metric %s; want kernels, found (or predicted when the confirmation did not pass), %s", res.Method, res.Kernel, res.Status, res.Metric, CriterionBiasRad)
	}
	unit, _ := (Budget{RotationNoise: noise.White{Level: 1}}).Process(SourceRotationPSD, k.DurationS)
	v := math.Pow(k.PredictProcesses([]sim.Process{unit}).BiasStdRad, 2)
	b0 := s0.Run(sim.Shot{}, nil).BiasRad
	sigma := sim.BiasStdForP95(limit, b0)
	want := RotationNoiseURad2S2Hz(sigma * sigma / v)
	got := res.Kernel.Amplitude
	se := 0.0836 * sigma
	t.Logf("tolerance %.6g (urad/s)^2/Hz (closed form %.6g); confirmation p95 |bias| %.5g rad against the limit %g (%.2f standard errors), verdict %s",
		got, want, res.At.Value, limit, (res.At.Value-limit)/se, res.Kernel.Confirm)
	if math.Abs(got-want) > 1e-9*want {
		t.Errorf("tolerance %.10g (urad/s)^2/Hz, want %.10g (tol 1e-9 relative)", got, want)
	}
	if math.Abs(res.At.Value-limit) > 3*se {
		t.Errorf("the confirmation's p95 |bias| %.4g rad, want the limit %g within 3 x %.2g", res.At.Value, limit, se)
	}
}

// kernelStatusAgrees reports whether a tolerance from the kernels has the
// status its confirmation allows: found when the confirming ensemble
// passed there, predicted when it did not.
func kernelStatusAgrees(res ToleranceResult) bool {
	if res.Kernel == nil || res.Kernel.Confirm == nil {
		return false
	}
	if *res.Kernel.Confirm == Pass {
		return res.Status == ToleranceFound
	}
	return res.Status == TolerancePredicted
}
