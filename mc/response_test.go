package mc

import (
	"context"
	"math"
	"testing"

	"rampart/noise"
	"rampart/sim"
	"rampart/stats"
)

// TestBudgetProcesses checks how a budget's noise processes reach the
// kernels' channels: RIN is common to both spin states (one laser), the
// drive phase splits by the arms' correlation as sim.PhaseLoad says, and
// no band starts below 1/T, the lowest frequency a record of the shot
// holds (docs/model.md, Noise transfer functions).
func TestBudgetProcesses(t *testing.T) {
	const T = 0.01 // s: 1/T = 100 Hz
	if ps := (Budget{DepthCommonRel: 0.01}).Processes(T); len(ps) != 0 {
		t.Fatalf("a static budget gives processes %v", ps)
	}
	b := Budget{
		RIN: noise.White{Level: 1e-12}, RINBand: noise.Band{LowHz: 10, HighHz: 1e4},
		Phase: noise.White{Level: 1e-10}, PhaseCorrelation: 0.5,
	}
	ps := b.Processes(T)
	if len(ps) != 2 || ps[0].Name != "rin" || ps[1].Name != "phase" {
		t.Fatalf("processes %v, want rin and phase", ps)
	}
	if ps[0].Band.LowHz != 100 || ps[0].Band.HighHz != 1e4 || ps[0].Load[sim.IntensityCommon] != 1 || len(ps[0].Load) != 1 {
		t.Errorf("rin: band %+v load %v, want [100, 1e4] Hz on intensity_common alone", ps[0].Band, ps[0].Load)
	}
	want := sim.PhaseLoad(0.5)
	for ch, w := range want {
		if ps[1].Load[ch] != w {
			t.Errorf("phase load on %v: %g, want %g", ch, ps[1].Load[ch], w)
		}
	}
	if ps[1].Band.LowHz != 100 || ps[1].Band.HighHz != 0 {
		t.Errorf("phase band %+v, want from 100 Hz to the kernels' end", ps[1].Band)
	}
	// Field noise: the differential shift's slope k = 2e6 + 2 x 500 x 0.01
	// = 2.00001e6 Hz/G at the offset, k^2 on shift_differential.
	b.FieldNoise = noise.White{Level: 1e-16}
	b.Apparatus.Field = sim.FieldShift{Zeeman: sim.Zeeman{LinearHzPerG: 2e6, QuadraticHzPerG2: 500}, OffsetG: 0.01}
	ps = b.Processes(T)
	if len(ps) != 3 || ps[2].Name != ProcessField || ps[2].Band.LowHz != 100 || len(ps[2].Load) != 1 ||
		math.Abs(ps[2].Load[sim.ShiftDifferential]/(2.00001e6*2.00001e6)-1) > 1e-15 {
		t.Errorf("processes %+v: want field third, from 100 Hz, with load %g on shift_differential", ps, 2.00001e6*2.00001e6)
	}
}

// TestFieldNoiseKernel checks field noise on the kernels: a pure
// differential phase -2 pi k int b dt, k = LinearHzPerG + 2
// QuadraticHzPerG2 OffsetG the slope of the differential Zeeman shift at
// the static offset (sim.FieldShift), so its bias variance is the
// free-evolution filter function of the sensitivity formalism scaled by
// k^2 (P. Cheinet et al., IEEE Trans. Instrum. Meas. 57, 1141 (2008)):
//
//	Var = (2 pi k)^2 S_B int_{1/T}^{F} sin^2(pi f T) / (pi f)^2 df,
//
// here by an independent midpoint quadrature in ln f, and no contrast loss
// (a phase cannot change |z|). The prediction integrates the kernel
// interpolated linearly on its grid of four points per sinc^2 lobe;
// measured agreement 1.7e-3 relative (the interpolation), tolerance 5e-3.
// And rampart's own Monte Carlo of the same noise (k = LinearHzPerG, 800
// realisations of field noise alone): its bias std within three standard
// errors sigma / sqrt(2 (n-1)) of the prediction (measured 0.3).
func TestFieldNoiseKernel(t *testing.T) {
	const lin, quad, b0, sb = 1.4e6, 575.0, 0.01, 1e-16 // Hz/G, Hz/G^2, G, G^2/Hz
	e := smallRing(t, 1)
	s, err := sim.NewSimulator(e.Config)
	if err != nil {
		t.Fatal(err)
	}
	k, err := s.Kernels(0)
	if err != nil {
		t.Fatal(err)
	}
	b := Budget{FieldNoise: noise.White{Level: sb}}
	b.Apparatus.Field = sim.FieldShift{Zeeman: sim.Zeeman{LinearHzPerG: lin, QuadraticHzPerG2: quad}, OffsetG: b0}
	p, ok := b.Process(SourceFieldNoise, k.DurationS)
	if !ok || p.Name != ProcessField || p.Unit != "G" {
		t.Fatalf("field process %+v (on %v): want field in G", p, ok)
	}
	got := k.PredictProcesses([]sim.Process{p})
	T, top := k.DurationS, k.FrequencyHz[len(k.FrequencyHz)-1]
	slope := lin + 2*quad*b0
	var integral float64
	const m = 400000
	lo, hi := 1/T, top
	for i := range m {
		f := lo * math.Exp((float64(i)+0.5)/m*math.Log(hi/lo))
		x := math.Sin(math.Pi*f*T) / (math.Pi * f)
		integral += x * x * f * math.Log(hi/lo) / m
	}
	want := math.Sqrt(math.Pow(2*math.Pi*slope, 2) * sb * integral)
	t.Logf("bias std %.6g rad, filter function %.6g rad (ratio %.6f)", got.BiasStdRad, want, got.BiasStdRad/want)
	if math.Abs(got.BiasStdRad/want-1) > 5e-3 {
		t.Errorf("field noise bias std %.6g rad, want %.6g (relative tolerance 5e-3)", got.BiasStdRad, want)
	}
	if math.Abs(got.ContrastLoss) > 1e-9*want*want {
		t.Errorf("field noise contrast loss %g, want 0 (a pure phase)", got.ContrastLoss)
	}

	if testing.Short() {
		return
	}
	const n = 800
	mcb := Budget{FieldNoise: noise.White{Level: sb}}
	mcb.Apparatus.Field.Zeeman.LinearHzPerG = lin
	sd, se := monteCarloBiasStd(t, e, mcb, n)
	pm, _ := mcb.Process(SourceFieldNoise, k.DurationS)
	pred := k.PredictProcesses([]sim.Process{pm}).BiasStdRad
	t.Logf("Monte Carlo bias std %.5g +- %.2g rad, predicted %.5g rad", sd, se, pred)
	if math.Abs(sd-pred) > 3*se {
		t.Errorf("Monte Carlo bias std %.5g rad, predicted %.5g (tol 3 x %.2g)", sd, pred, se)
	}
}

// TestMainsKernel checks the mains line on the kernels, a line spectrum
// on the differential-shift channel, against the closed form of its phase
// variance over a uniform phase (Mains.PhaseVarianceRad2: each harmonic h
// adds (2 pi k a_h / w_h)^2 (1 - cos w_h T), the free-evolution filter
// function at w_h times a_h^2/2), with harmonics up to 450 Hz on a 1.7 ms
// shot (the filter falls by a third there). The kernel is interpolated
// at each line by its band-limited series (sim.Kernels.At); measured
// below 1e-6 relative, tolerance 1e-5 (linear interpolation between the
// grid points would err by 2 %). A line at a fixed phase is no process.
func TestMainsKernel(t *testing.T) {
	const lin, a = 1.4e6, 1e-6 // Hz/G, G
	e := smallRing(t, 1)
	s, err := sim.NewSimulator(e.Config)
	if err != nil {
		t.Fatal(err)
	}
	k, err := s.Kernels(0)
	if err != nil {
		t.Fatal(err)
	}
	b := Budget{MainsG: a, Mains: Mains{Hz: 50, HarmonicsRel: []float64{0.5, 0.3, 0, 0, 0, 0, 0, 0.2}}}
	b.Apparatus.Field.Zeeman.LinearHzPerG = lin
	p, ok := b.Process(ParamMains, k.DurationS)
	if !ok || p.Name != ProcessMains {
		t.Fatalf("mains process %+v (on %v)", p, ok)
	}
	got := k.PredictProcesses([]sim.Process{p}).BiasStdRad
	want := math.Sqrt(b.Mains.PhaseVarianceRad2(a, lin, k.DurationS))
	t.Logf("bias std %.8g rad, closed form %.8g (ratio - 1 = %.2g)", got, want, got/want-1)
	if math.Abs(got/want-1) > 1e-5 {
		t.Errorf("mains bias std %.8g rad, want %.8g (relative tolerance 1e-5)", got, want)
	}
	b.Mains.FixedPhase = true
	if _, ok := b.Process(ParamMains, k.DurationS); ok {
		t.Errorf("a mains line at a fixed phase is a process")
	}
}

// TestRotationNoiseKernel checks the platform's rotation-rate noise on the
// kernels (process rotation, channel sim.Rotation): the budget's row
// platform.rotation_noise_urad2_s2_hz maps onto the channel with weight 1
// in (rad/s)^2/Hz from 1/T, the band the Monte Carlo's records hold, and
// costs no contrast (a pure phase). Its prediction is checked against
// rampart's own Monte Carlo of the same noise (800 realisations of
// rotation noise alone, the level set for a bias std of about 1 mrad):
// the ensemble's bias std within three standard errors sigma / sqrt(2
// (n-1)) of the prediction (measured -0.56; the same prediction from 0 Hz
// instead of 1/T would be 3.8 times larger, since w's weight lies mostly
// below 1/T: the bands must match). The kernel itself is
// checked against Parseval's theorem and the free-evolution sinc^2 in
// sim (TestRotationKernelParseval, TestRotationKernelConstantSpeed).
func TestRotationNoiseKernel(t *testing.T) {
	e := smallRing(t, 1)
	s, err := sim.NewSimulator(e.Config)
	if err != nil {
		t.Fatal(err)
	}
	k, err := s.Kernels(0)
	if err != nil {
		t.Fatal(err)
	}
	if ps := (Budget{}).Processes(k.DurationS); len(ps) != 0 {
		t.Fatalf("an empty budget gives processes %v", ps)
	}
	unit := Budget{RotationNoise: noise.White{Level: 1}}
	p, ok := unit.Process(SourceRotationPSD, k.DurationS)
	if !ok || p.Name != ProcessRotation || p.Unit != "rad/s" || len(p.Load) != 1 || p.Load[sim.Rotation] != 1 || p.Band.LowHz != 1/k.DurationS || p.Band.HighHz != 0 {
		t.Fatalf("rotation process %+v (on %v): want rotation in rad/s, load 1 on the rotation channel, from 1/T", p, ok)
	}
	if ps := unit.Processes(k.DurationS); len(ps) != 1 || ps[0].Name != ProcessRotation {
		t.Fatalf("processes %+v, want rotation alone", ps)
	}
	if n, ok := ProcessName(SourceRotationPSD); !ok || n != ProcessRotation {
		t.Errorf("ProcessName(%q) = %q, %v; want %q", SourceRotationPSD, n, ok, ProcessRotation)
	}
	perLevel := k.PredictProcesses([]sim.Process{p})
	if perLevel.ContrastLoss != 0 || !(perLevel.BiasStdRad > 0) {
		t.Fatalf("rotation noise of unit level: contrast loss %g, bias std %g; want 0 and a positive std", perLevel.ContrastLoss, perLevel.BiasStdRad)
	}

	if testing.Short() {
		return
	}
	const n = 800
	level := math.Pow(1e-3/perLevel.BiasStdRad, 2) // (rad/s)^2/Hz: a 1 mrad std
	b := Budget{RotationNoise: noise.White{Level: level}}
	sd, se := monteCarloBiasStd(t, e, b, n)
	pm, _ := b.Process(SourceRotationPSD, k.DurationS)
	pred := k.PredictProcesses([]sim.Process{pm}).BiasStdRad
	full := pm
	full.Band = noise.Band{}
	t.Logf("level %.4g (urad/s)^2/Hz: Monte Carlo bias std %.5g +- %.2g rad, predicted %.5g rad (%.2f standard errors); from 0 Hz it would be %.5g rad",
		RotationNoiseURad2S2Hz(level), sd, se, pred, (sd-pred)/se, k.PredictProcesses([]sim.Process{full}).BiasStdRad)
	if math.Abs(sd-pred) > 3*se {
		t.Errorf("Monte Carlo bias std %.5g rad, predicted %.5g (tol 3 x %.2g)", sd, pred, se)
	}
}

// monteCarloBiasStd runs n realisations of ensemble e under budget b and
// returns the bias's sample standard deviation and its standard error,
// sd/sqrt(2(n-1)) (normal samples).
func monteCarloBiasStd(t *testing.T, e Ensemble, b Budget, n int) (sd, se float64) {
	t.Helper()
	e.Budget, e.Samples = b, n
	r, err := NewRealiser(e)
	if err != nil {
		t.Fatal(err)
	}
	var bias []float64
	if _, err := r.Run(context.Background(), 0, n, 2, func(rec Record) error { bias = append(bias, rec.BiasRad); return nil }); err != nil {
		t.Fatal(err)
	}
	sd = stats.StdDev(bias)
	return sd, sd / math.Sqrt(2*float64(n-1))
}
