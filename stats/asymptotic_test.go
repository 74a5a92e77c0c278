package stats

import (
	"math"
	"math/rand/v2"
	"testing"
)

// coverageDist is a distribution of the coverage simulations with its
// exact mean and standard deviation.
type coverageDist struct {
	name      string
	draw      func(*rand.Rand) float64
	mean, std float64
}

// coverageDists are the distributions of the coverage simulations: a
// normal, a lognormal with sigma 0.5 (skewness 1.75) and a Beta(10, 2)
// (skewness -0.88), the last drawn as the 10th order statistic of 11
// uniforms, U^(1/11) V^(1/10) (David and Nagaraja, Order Statistics, 3rd
// ed. (Wiley, 2003), sec. 2.5: the top order statistics of uniforms are
// products of powers of uniforms; from memory). Moments: lognormal mean
// e^(sigma^2/2), variance (e^(sigma^2) - 1) e^(sigma^2); Beta mean
// a/(a+b), variance ab/((a+b)^2 (a+b+1)) (handbook formulas).
var coverageDists = []coverageDist{
	{"normal", func(r *rand.Rand) float64 { return 3 + 2*r.NormFloat64() }, 3, 2},
	{"lognormal0.5", func(r *rand.Rand) float64 { return math.Exp(0.5 * r.NormFloat64()) },
		math.Exp(0.125), math.Sqrt((math.Exp(0.25) - 1) * math.Exp(0.25))},
	{"beta10,2", func(r *rand.Rand) float64 {
		return math.Pow(1-r.Float64(), 1.0/11) * math.Pow(1-r.Float64(), 0.1)
	}, 10.0 / 12, math.Sqrt(20.0 / (144 * 13))},
}

// coverageTol returns three standard errors of a coverage estimated from
// reps replications at nominal c: sqrt(c (1 - c) / reps).
func coverageTol(c float64, reps int) float64 { return 3 * math.Sqrt(c*(1-c)/float64(reps)) }

// TestAsymptoticCoverage is the seeded coverage simulation of MeanSkewT
// and StdDelta: for each distribution and n at the summary's threshold
// (20000) and 10x it, reps samples, the share of two-sided 95 % intervals
// that hold the true mean and standard deviation must be within three
// standard errors of 0.95 (reps 400 at 20000, 120 at 200000: SE 0.011 and
// 0.020). The one-sided misses are logged.
func TestAsymptoticCoverage(t *testing.T) {
	const c = 0.95
	for _, d := range coverageDists {
		for _, sz := range []struct{ n, reps int }{{20000, 400}, {200000, 120}} {
			rng := rand.New(rand.NewPCG(11, uint64(sz.n)))
			x := make([]float64, sz.n)
			var inMean, inStd, lowMean, highMean int
			for range sz.reps {
				for i := range x {
					x[i] = d.draw(rng)
				}
				mo := SampleMoments(x)
				lo, hi := MeanSkewT(mo, c)
				switch {
				case d.mean < lo:
					lowMean++
				case d.mean > hi:
					highMean++
				default:
					inMean++
				}
				if lo, hi := StdDelta(mo, c); lo <= d.std && d.std <= hi {
					inStd++
				}
			}
			tol := coverageTol(c, sz.reps)
			cm, cs := float64(inMean)/float64(sz.reps), float64(inStd)/float64(sz.reps)
			t.Logf("%s n=%d reps=%d: mean %.3f (misses %d below, %d above), std %.3f; tolerance %.3f", d.name, sz.n, sz.reps, cm, lowMean, highMean, cs, tol)
			if math.Abs(cm-c) > tol {
				t.Errorf("%s n=%d: mean coverage %.3f, want %.2f +- %.3f", d.name, sz.n, cm, c, tol)
			}
			if math.Abs(cs-c) > tol {
				t.Errorf("%s n=%d: std coverage %.3f, want %.2f +- %.3f", d.name, sz.n, cs, c, tol)
			}
		}
	}
}

// TestComplexMeanDeltaCoverage is the seeded coverage simulation of
// ComplexMeanDelta: z = C e^(i phi) with C ~ Beta(10, 2) and phi ~
// N(0.1, 0.3^2) independent, so E z = E C e^(-0.3^2/2) e^(0.1 i) (the
// normal's characteristic function), at n = 20000 (reps 300) and 200000
// (reps 100); two-sided 95 % coverage of |E z| and arg E z within three
// standard errors (0.038 and 0.065).
func TestComplexMeanDeltaCoverage(t *testing.T) {
	const c = 0.95
	wantMod, wantArg := 10.0/12*math.Exp(-0.045), 0.1
	for _, sz := range []struct{ n, reps int }{{20000, 300}, {200000, 100}} {
		rng := rand.New(rand.NewPCG(12, uint64(sz.n)))
		re, im := make([]float64, sz.n), make([]float64, sz.n)
		var inMod, inArg int
		for range sz.reps {
			for i := range re {
				a := coverageDists[2].draw(rng)
				s, co := math.Sincos(0.1 + 0.3*rng.NormFloat64())
				re[i], im[i] = a*co, a*s
			}
			mod, arg := ComplexMeanDelta(re, im, c)
			if mod.Contains(wantMod) {
				inMod++
			}
			if arg.Contains(wantArg) {
				inArg++
			}
		}
		tol := coverageTol(c, sz.reps)
		cm, ca := float64(inMod)/float64(sz.reps), float64(inArg)/float64(sz.reps)
		t.Logf("n=%d reps=%d: |mean z| %.3f, arg mean z %.3f; tolerance %.3f", sz.n, sz.reps, cm, ca, tol)
		if math.Abs(cm-c) > tol || math.Abs(ca-c) > tol {
			t.Errorf("n=%d: coverage |mean z| %.3f, arg %.3f, want %.2f +- %.3f", sz.n, cm, ca, c, tol)
		}
	}
}

// TestSampleMoments checks the moments of {0, 0, 0, 3} worked by hand:
// mean 3/4, s^2 = 6.75/3, m3 = 10.125/4, m4 = 26.578125/4.
func TestSampleMoments(t *testing.T) {
	mo := SampleMoments([]float64{0, 0, 0, 3})
	want := Moments{N: 4, Mean: 0.75, Variance: 2.25, M3: 2.53125, M4: 6.64453125}
	if math.Abs(mo.Mean-want.Mean) > 1e-15 || math.Abs(mo.Variance-want.Variance) > 1e-15 ||
		math.Abs(mo.M3-want.M3) > 1e-15 || math.Abs(mo.M4-want.M4) > 1e-14 || mo.N != 4 {
		t.Errorf("SampleMoments = %+v, want %+v", mo, want)
	}
}

// TestMeanSkewTShift checks the closed form on given moments: a symmetric
// sample (m3 = 0) gives the plain t interval m -+ t s/sqrt(n), with t the
// 0.975 quantile of Student's t with 99 degrees of freedom, 1.9842169515
// (handbook table, e.g. Abramowitz and Stegun 26.10 interpolated; scipy
// stats.t.ppf(0.975, 99) from memory), and a skewness gamma shifts both
// ends by gamma s (2 t^2 + 1)/(6 n).
func TestMeanSkewTShift(t *testing.T) {
	const tq = 1.9842169515
	lo, hi := MeanSkewT(Moments{N: 100, Mean: 1, Variance: 4}, 0.95)
	if math.Abs(lo-(1-tq*0.2)) > 1e-9 || math.Abs(hi-(1+tq*0.2)) > 1e-9 {
		t.Errorf("symmetric: [%v, %v], want 1 -+ %v", lo, hi, tq*0.2)
	}
	// gamma = m3 / s^3 = 4 / 8 = 0.5.
	lo2, hi2 := MeanSkewT(Moments{N: 100, Mean: 1, Variance: 4, M3: 4}, 0.95)
	shift := 0.5 * 2 * (2*tq*tq + 1) / 600
	if math.Abs(lo2-lo-shift) > 1e-9 || math.Abs(hi2-hi-shift) > 1e-9 {
		t.Errorf("skewed: shifts %v, %v, want %v", lo2-lo, hi2-hi, shift)
	}
}
