package stats

import (
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

func TestClopperPearsonAgainstSciPy(t *testing.T) {
	// Two-sided intervals from scipy.stats.beta.ppf (SciPy 1.10.1,
	// testdata/reference/stats_reference.json); relative tolerance 1e-9 for
	// gonum's inverse incomplete beta against SciPy's (Cephes incbi).
	const tol = 1e-9
	for _, r := range reference(t).ClopperPearson {
		e := ClopperPearson(r.K, r.N, r.Confidence)
		if math.Abs(e.Lo-r.Lower) > tol*r.Lower || math.Abs(e.Hi-r.Upper) > tol*r.Upper {
			t.Errorf("ClopperPearson(%d, %d, %v): got [%v, %v], want [%v, %v] (rel tol %g)",
				r.K, r.N, r.Confidence, e.Lo, e.Hi, r.Lower, r.Upper, tol)
		}
		if want := float64(r.K) / float64(r.N); e.Value != want || e.Confidence != r.Confidence {
			t.Errorf("ClopperPearson(%d, %d, %v): value %v confidence %v, want %v and %v",
				r.K, r.N, r.Confidence, e.Value, e.Confidence, want, r.Confidence)
		}
	}
}

func TestClopperPearsonModelDocument(t *testing.T) {
	// docs/model.md, Statistics, printed to 5 decimals: absolute tolerance 5e-6.
	for _, c := range []struct {
		k, n   int
		lo, hi float64
	}{
		{0, 10, 0, 0.30850},
		{5, 10, 0.18709, 0.81291},
	} {
		e := ClopperPearson(c.k, c.n, 0.95)
		if math.Abs(e.Lo-c.lo) > 5e-6 || math.Abs(e.Hi-c.hi) > 5e-6 {
			t.Errorf("%d/%d at 95%%: got [%v, %v], want [%v, %v] (tol 5e-6)", c.k, c.n, e.Lo, e.Hi, c.lo, c.hi)
		}
	}
}

func TestClopperPearsonCoverage(t *testing.T) {
	// The exact interval's coverage sum_k Binom(k; n, p) [p in CI(k)] is at least
	// the confidence for every p (Clopper and Pearson, Biometrika 26, 404 (1934));
	// checked exactly (up to 1e-12 of summation rounding) on a grid of p for
	// n = 20 and 37 at 90% and 95%.
	for _, n := range []int{20, 37} {
		for _, conf := range []float64{0.90, 0.95} {
			cis := make([]Estimate, n+1)
			for k := range cis {
				cis[k] = ClopperPearson(k, n, conf)
			}
			for j := 1; j < 200; j++ {
				p := float64(j) / 200
				b := distuv.Binomial{N: float64(n), P: p}
				var cover float64
				for k, ci := range cis {
					if ci.Contains(p) {
						cover += b.Prob(float64(k))
					}
				}
				if cover < conf-1e-12 {
					t.Errorf("n=%d conf=%v p=%v: coverage %v below confidence", n, conf, p, cover)
				}
			}
		}
	}
}

func TestOneSidedBounds(t *testing.T) {
	// Identities of the Beta quantiles (exact up to rounding, relative tolerance
	// 1e-12): a two-sided interval at confidence c is the pair of one-sided
	// bounds at (1+c)/2.
	for _, c := range []struct{ k, n int }{{0, 10}, {3, 10}, {10, 10}, {17, 200}} {
		two := ClopperPearson(c.k, c.n, 0.90)
		lo, hi := ClopperPearsonLower(c.k, c.n, 0.95), ClopperPearsonUpper(c.k, c.n, 0.95)
		if math.Abs(lo-two.Lo) > 1e-12*two.Lo || math.Abs(hi-two.Hi) > 1e-12*two.Hi {
			t.Errorf("%d/%d: one-sided 95%% [%v, %v], two-sided 90%% [%v, %v] (rel tol 1e-12)", c.k, c.n, lo, hi, two.Lo, two.Hi)
		}
	}
}

func TestZeroFailureUpper(t *testing.T) {
	// 1 - 0.05^(1/n) and scipy.stats.beta.ppf(0.95, 1, n) (SciPy 1.10.1,
	// testdata/reference/stats_reference.json); relative tolerance 1e-12 for the
	// closed form and 1e-9 for the Beta quantile.
	for _, r := range reference(t).ZeroFailureUpper {
		if got := ZeroFailureUpper(r.N, r.Confidence); math.Abs(got-r.Upper) > 1e-12*r.Upper {
			t.Errorf("ZeroFailureUpper(%d, %v): got %v, want %v (rel tol 1e-12)", r.N, r.Confidence, got, r.Upper)
		}
		if got := ClopperPearsonUpper(0, r.N, r.Confidence); math.Abs(got-r.BetaPPF) > 1e-9*r.BetaPPF {
			t.Errorf("ClopperPearsonUpper(0, %d, %v): got %v, want %v (rel tol 1e-9)", r.N, r.Confidence, got, r.BetaPPF)
		}
	}
}

func TestRuleOfThree(t *testing.T) {
	// Hanley and Lippman-Hand, JAMA 249, 1743 (1983): with no events in n trials
	// the one-sided 95% upper bound is 1 - 0.05^(1/n), approximately 3/n. 3/n is
	// always the larger, since 1 - e^-x < x and -ln 0.05 = 2.9957 < 3, and the
	// expansion 1 - e^-x = x (1 - x/2 + ...) puts its relative excess at about
	// (3/2.9957)(1 + 1.5/n) - 1, so within 2/n + 0.0015 for n >= 10 (our algebra).
	for _, n := range []int{1, 10, 30, 100, 1000, 100000} {
		exact := ZeroFailureUpper(n, 0.95)
		r3 := RuleOfThree(n)
		if r3 != 3/float64(n) {
			t.Errorf("RuleOfThree(%d): got %v, want %v (exact)", n, r3, 3/float64(n))
		}
		if r3 <= exact {
			t.Errorf("n=%d: 3/n = %v not above the exact bound %v", n, r3, exact)
		}
		if tol := 2/float64(n) + 0.0015; n >= 10 && r3/exact-1 > tol {
			t.Errorf("n=%d: 3/n = %v exceeds the exact bound %v by more than %g relative", n, r3, exact, tol)
		}
	}
	// The rule of three is one-sided: docs/model.md, Statistics gives the two-sided
	// 95% upper limit for 0/10 as 0.30850, above both 3/10 and 0.25887.
	if two := ClopperPearson(0, 10, 0.95).Hi; two <= RuleOfThree(10) {
		t.Errorf("two-sided 0/10 upper %v not above 3/10", two)
	}
}

func TestAdditionalTrials(t *testing.T) {
	// 0 failures in 10, failure-rate spec 0.1, 95% two-sided: the upper limit
	// 1 - 0.025^(1/N) falls below 0.1 once N > ln 0.025 / ln 0.9 = 35.01, so
	// N = 36 and 26 more trials (closed form of the k = 0 Clopper-Pearson limit;
	// exact integers).
	if extra, ok := AdditionalTrials(0, 10, 0.95, 0.1); !ok || extra != 26 {
		t.Errorf("AdditionalTrials(0, 10, 0.95, 0.1): got %d, %v, want 26, true", extra, ok)
	}
	// Already clear: 0/100 at 95% has upper limit 0.0362 (SciPy file), below 0.05.
	if extra, ok := AdditionalTrials(0, 100, 0.95, 0.05); !ok || extra != 0 {
		t.Errorf("AdditionalTrials(0, 100, 0.95, 0.05): got %d, %v, want 0, true", extra, ok)
	}
	// Never: the observed fraction equals the threshold.
	if _, ok := AdditionalTrials(5, 10, 0.95, 0.5); ok {
		t.Error("AdditionalTrials(5, 10, 0.95, 0.5): ok, want not ok")
	}
	// Minimality, by the definition: at N = n + extra the interval for fraction
	// k/n is clear of the threshold and at N - 1 it is not.
	for _, c := range []struct {
		k, n      int
		threshold float64
	}{{47, 50, 0.9}, {45, 50, 0.99}, {3, 40, 0.02}, {990, 1000, 0.995}} {
		extra, ok := AdditionalTrials(c.k, c.n, 0.95, c.threshold)
		if !ok {
			t.Errorf("%+v: not ok", c)
			continue
		}
		p := float64(c.k) / float64(c.n)
		clearAt := func(n int) bool {
			lo, hi := clopperPearson(p*float64(n), float64(n), 0.95)
			return c.threshold < lo || c.threshold > hi
		}
		if N := c.n + extra; !clearAt(N) || (extra > 0 && clearAt(N-1)) {
			t.Errorf("%+v: extra %d is not the smallest that clears", c, extra)
		}
	}
}

func ExampleClopperPearson() {
	yield := ClopperPearson(5, 10, 0.95)
	fmt.Printf("%.5f [%.5f, %.5f]\n", yield.Value, yield.Lo, yield.Hi)
	fmt.Printf("0 of 10 failed: upper %.5f two-sided, %.5f one-sided, rule of three %.1f\n",
		ClopperPearson(0, 10, 0.95).Hi, ZeroFailureUpper(10, 0.95), RuleOfThree(10))
	// Output:
	// 0.50000 [0.18709, 0.81291]
	// 0 of 10 failed: upper 0.30850 two-sided, 0.25887 one-sided, rule of three 0.3
}
