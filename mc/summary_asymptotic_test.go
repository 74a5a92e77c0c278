package mc

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"

	"rampart/stats"
)

// asymptoticSample is a seeded ensemble-like sample of n shots: contrast
// C ~ Beta(10, 2) (U^(1/11) V^(1/10), the 10th of 11 uniforms; skewed
// towards 1 as contrasts are) and bias ~ N(0.02, 0.05^2), with z = C
// e^(i (0.1 + bias)).
func asymptoticSample(n int, seed uint64) *Outcomes {
	rng := rand.New(rand.NewPCG(seed, 3))
	o := NewOutcomes(n)
	for i := range n {
		c := math.Pow(1-rng.Float64(), 1.0/11) * math.Pow(1-rng.Float64(), 0.1)
		b := 0.02 + 0.05*rng.NormFloat64()
		o.Add(Record{Index: i, Contrast: c, PhaseRad: 0.1 + b, BiasRad: b, Z: cmplx.Rect(c, 0.1+b)})
	}
	return o
}

// TestAsymptoticAgreesWithBootstrap compares, on one seeded sample at the
// threshold (n = AsymptoticMin), each end of the closed-form intervals
// with the bootstrap ones the summary uses below it: the mean's bootstrap-t
// with stats.MeanSkewT, the std's percentile bootstrap with stats.StdDelta
// and the fringe's with fringeDelta. Each end must agree within 10 % of
// the bootstrap interval's half-width: the Monte Carlo spread of the
// 2.5 % and 97.5 % points of 500 replicates is about 5 % of it (binomial
// spread of the order statistic, sqrt(0.025 0.975 / 500) / phi(1.96) =
// 0.12 sigma of the replicates out of 1.96; from memory), and the largest
// difference measured here is logged.
func TestAsymptoticAgreesWithBootstrap(t *testing.T) {
	const c = 0.95
	o := asymptoticSample(AsymptoticMin, 5)
	rng := rand.New(rand.NewPCG(6, 7))
	buf := make([]float64, AsymptoticMin)
	worst := 0.0
	agree := func(what string, bLo, bHi, aLo, aHi float64) {
		t.Helper()
		half := (bHi - bLo) / 2
		d := max(math.Abs(aLo-bLo), math.Abs(aHi-bHi)) / half
		worst = max(worst, d)
		t.Logf("%s: bootstrap [%.8g, %.8g], closed form [%.8g, %.8g], largest end difference %.3f half-widths", what, bLo, bHi, aLo, aHi, d)
		if d > 0.1 {
			t.Errorf("%s: closed form [%v, %v] differs from the bootstrap [%v, %v] by %.3f half-widths, want at most 0.1", what, aLo, aHi, bLo, bHi, d)
		}
	}
	for _, col := range []struct {
		name string
		x    []float64
	}{{"contrast", o.Contrast}, {"bias", o.BiasRad}} {
		mo := stats.SampleMoments(col.x)
		bLo, bHi := stats.MeanBootstrapT(col.x, BootstrapResamples, rng).Interval(c)
		aLo, aHi := stats.MeanSkewT(mo, c)
		agree(col.name+" mean", bLo, bHi, aLo, aHi)
		bLo, bHi = stats.PercentileInterval(stdReplicates(col.x, buf, rng), c)
		aLo, aHi = stats.StdDelta(mo, c)
		agree(col.name+" std", bLo, bHi, aLo, aHi)
	}
	bc, bb := fringeBootstrap(o.ZRe, o.ZIm, 0.1, rng, c)
	ac, ab := fringeDelta(o.ZRe, o.ZIm, 0.1, c)
	if bc.Value != ac.Value || bb.Value != ab.Value {
		t.Errorf("fringe values differ: bootstrap %v %v, delta %v %v", bc.Value, bb.Value, ac.Value, ab.Value)
	}
	agree("fringe contrast", bc.Lo, bc.Hi, ac.Lo, ac.Hi)
	agree("fringe bias", bb.Lo, bb.Hi, ab.Lo, ab.Hi)
	t.Logf("largest difference %.3f half-widths", worst)
}

// TestSummaryIntervalMethodSwitch checks that the summary switches at
// AsymptoticMin: one realisation below it the intervals are the
// bootstraps' (no method named, the mean's interval the bootstrap-t drawn
// first from the summary stream), at it the closed forms, named in
// IntervalMethod.
func TestSummaryIntervalMethodSwitch(t *testing.T) {
	const c = 0.95
	below := asymptoticSample(AsymptoticMin-1, 8)
	s := SummariseOutcomes(below, 9, 0.1, 1, c, Spec{})
	if s.IntervalMethod != "" {
		t.Errorf("n = %d: IntervalMethod %q, want empty", below.Len(), s.IntervalMethod)
	}
	lo, hi := stats.MeanBootstrapT(below.Contrast, BootstrapResamples, Substream(9, 0, "summary")).Interval(c)
	if got := s.Contrast.CI["mean"]; got != [2]float64{max(lo, 0), min(hi, 1)} {
		t.Errorf("n = %d: contrast mean interval %v, want the bootstrap-t's [%v, %v]", below.Len(), got, lo, hi)
	}
	at := asymptoticSample(AsymptoticMin, 8)
	s = SummariseOutcomes(at, 9, 0.1, 1, c, Spec{})
	if s.IntervalMethod != AsymptoticMethod {
		t.Errorf("n = %d: IntervalMethod %q, want %q", at.Len(), s.IntervalMethod, AsymptoticMethod)
	}
	mo := stats.SampleMoments(at.BiasRad)
	mLo, mHi := stats.MeanSkewT(mo, c)
	sLo, sHi := stats.StdDelta(mo, c)
	if got := s.BiasRad.CI["mean"]; got != [2]float64{mLo, mHi} {
		t.Errorf("bias mean interval %v, want MeanSkewT's [%v, %v]", got, mLo, mHi)
	}
	if got := s.BiasRad.CI["std"]; got != [2]float64{sLo, sHi} {
		t.Errorf("bias std interval %v, want StdDelta's [%v, %v]", got, sLo, sHi)
	}
	fc, fb := fringeDelta(at.ZRe, at.ZIm, 0.1, c)
	if s.FringeContrast != fc || s.FringeBiasRad != fb {
		t.Errorf("fringe %v %v, want the delta method's %v %v", s.FringeContrast, s.FringeBiasRad, fc, fb)
	}
}
