package stats

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

func TestBootstrapTExactCases(t *testing.T) {
	// Constant data: every t* is 0 and SE is 0, so both bounds are the
	// value. Two distinct values {0, 1}: a resample of equal values has
	// t* = +-Inf (half the resamples), so the 95 % bounds are infinite.
	b := MeanBootstrapT([]float64{2, 2, 2}, 100, rand.New(rand.NewPCG(1, 1)))
	if b.Lower(0.95) != 2 || b.Upper(0.95) != 2 {
		t.Errorf("constant data: bounds [%v, %v], want [2, 2]", b.Lower(0.95), b.Upper(0.95))
	}
	b = MeanBootstrapT([]float64{0, 1}, 100, rand.New(rand.NewPCG(1, 1)))
	if !math.IsInf(b.Lower(0.95), -1) || !math.IsInf(b.Upper(0.95), 1) {
		t.Errorf("{0, 1}: bounds [%v, %v], want [-Inf, +Inf]", b.Lower(0.95), b.Upper(0.95))
	}
	// SE is s / sqrt(n): for {1, 2, 3, 4}, s = sqrt(5/3) (by hand).
	b = MeanBootstrapT([]float64{1, 2, 3, 4}, 10, rand.New(rand.NewPCG(1, 1)))
	if want := math.Sqrt(5.0/3) / 2; math.Abs(b.SE-want) > 1e-15 || b.Value != 2.5 {
		t.Errorf("{1,2,3,4}: value %v SE %v, want 2.5 and %v (tol 1e-15)", b.Value, b.SE, want)
	}
}

func TestBootstrapTPValuesAreDualToBounds(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 9))
	x := make([]float64, 80)
	for i := range x {
		x[i] = math.Exp(rng.NormFloat64())
	}
	b := MeanBootstrapT(x, 1000, rng)
	for _, c := range []float64{0.9, 0.95, 0.99} {
		for _, limit := range []float64{1.2, 1.5, 1.65, 1.8, 2.2} {
			pass, fail := b.AtLeast(limit)
			if (pass <= 1-c) != (b.Lower(c) >= limit) {
				t.Errorf("c %g limit %g: at-least pass p %g, lower bound %g", c, limit, pass, b.Lower(c))
			}
			if (fail <= 1-c) != (b.Upper(c) < limit) {
				t.Errorf("c %g limit %g: at-least fail p %g, upper bound %g", c, limit, fail, b.Upper(c))
			}
			pass, fail = b.AtMost(limit)
			if (pass <= 1-c) != (b.Upper(c) <= limit) {
				t.Errorf("c %g limit %g: at-most pass p %g, upper bound %g", c, limit, pass, b.Upper(c))
			}
			if (fail <= 1-c) != (b.Lower(c) > limit) {
				t.Errorf("c %g limit %g: at-most fail p %g, lower bound %g", c, limit, fail, b.Lower(c))
			}
		}
	}
}

// TestBootstrapTCoverage is the false-pass rate of "mean at least mu" and
// "mean at most mu" when the true mean is exactly mu, at one-sided 95 %: the
// rate at which the lower (upper) bound lies above (below) the true mean. R
// samples of n values, B = 400 resamples each; the rate must be at most
// 0.05 plus 3 binomial standard errors sqrt(0.05 0.95 / R) (0.0146 at
// R = 2000, 0.0231 at 800, 0.0377 at 300). The skewed cases are a
// contrast-like Beta(10, 2) (mean 5/6, skewness -0.82) and a lognormal
// (sigma 0.5, skewness 1.75). Measured (this seed) 0.034-0.065; the
// percentile bootstrap's 6-11 % on skewed contrast (issue 8) would fail the
// n = 60 rows.
func TestBootstrapTCoverage(t *testing.T) {
	const resamples = 400
	src := rand.New(rand.NewPCG(11, 12))
	beta := distuv.Beta{Alpha: 10, Beta: 2, Src: src}
	for _, d := range []struct {
		name string
		draw func() float64
		mean float64
	}{
		{"normal", src.NormFloat64, 0},
		{"beta(10,2)", beta.Rand, 10.0 / 12},
		{"lognormal(0.5)", func() float64 { return math.Exp(0.5 * src.NormFloat64()) }, math.Exp(0.125)},
	} {
		for _, c := range []struct{ n, reps int }{{60, 2000}, {200, 800}, {1000, 300}} {
			if c.n == 1000 && d.name != "beta(10,2)" {
				continue // time: the contrast-like shape covers n = 1000
			}
			x := make([]float64, c.n)
			low, high := 0, 0
			for range c.reps {
				for i := range x {
					x[i] = d.draw()
				}
				b := MeanBootstrapT(x, resamples, src)
				if b.Lower(0.95) >= d.mean {
					low++
				}
				if b.Upper(0.95) <= d.mean {
					high++
				}
			}
			se := math.Sqrt(0.05 * 0.95 / float64(c.reps))
			for _, k := range []struct {
				side string
				miss int
			}{{"lower", low}, {"upper", high}} {
				rate := float64(k.miss) / float64(c.reps)
				t.Logf("%s n %d: %s bound misses %.4f (R %d, se %.4f)", d.name, c.n, k.side, rate, c.reps, se)
				if rate > 0.05+3*se {
					t.Errorf("%s n %d: %s bound misses the mean %.4f of the time, want at most 0.05 (tol 3 se = %.4f)", d.name, c.n, k.side, rate, 3*se)
				}
			}
		}
	}
}
