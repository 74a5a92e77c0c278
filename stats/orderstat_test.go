package stats

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"testing"
)

// orderReference is testdata/reference/order_stats.json, written by
// testdata/reference/order_stats.py (Python 3.11.2, SciPy 1.10.1 from Debian
// 12; the file records the versions).
type orderReference struct {
	Versions map[string]string
	Bounds   []struct {
		N             int
		P, Confidence float64
		Lower, Upper  int
		CoverageLower *float64 `json:"coverage_lower"`
	}
	MinNLower []struct {
		Rank, N       int
		P, Confidence float64
	} `json:"min_n_lower"`
}

func readOrderReference(t *testing.T) orderReference {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "testdata", "reference", "order_stats.json"))
	if err != nil {
		t.Fatalf("read SciPy order-statistic reference: %v", err)
	}
	var r orderReference
	if err := json.Unmarshal(b, &r); err != nil {
		t.Fatal(err)
	}
	return r
}

func TestOrderRanksAgainstSciPy(t *testing.T) {
	// Ranks are integers: exact agreement with scipy.stats.binom (SciPy 1.10.1,
	// order_stats.json), 280 cases; coverage_lower to relative 1e-10.
	ref := readOrderReference(t)
	if len(ref.Bounds) < 200 {
		t.Fatalf("reference holds %d cases, want the full table", len(ref.Bounds))
	}
	for _, c := range ref.Bounds {
		r, ok := LowerRank(c.N, c.P, c.Confidence)
		if ok != (c.Lower > 0) || r != c.Lower {
			t.Errorf("LowerRank(%d, %g, %g) = %d, %v, want %d (SciPy)", c.N, c.P, c.Confidence, r, ok, c.Lower)
		}
		s, ok := UpperRank(c.N, c.P, c.Confidence)
		if ok != (c.Upper > 0) || s != c.Upper {
			t.Errorf("UpperRank(%d, %g, %g) = %d, %v, want %d (SciPy)", c.N, c.P, c.Confidence, s, ok, c.Upper)
		}
		if c.CoverageLower != nil {
			got, want := BinomialSurvival(c.Lower, c.N, c.P), *c.CoverageLower
			if math.Abs(got-want) > 1e-10*want {
				t.Errorf("coverage of X(%d), n %d, p %g: got %v, want %v (tol rel 1e-10)", c.Lower, c.N, c.P, got, want)
			}
		}
	}
	for _, c := range ref.MinNLower {
		if got := MinSamplesLower(c.Rank, c.P, c.Confidence); got != c.N {
			t.Errorf("MinSamplesLower(%d, %g, %g) = %d, want %d (SciPy)", c.Rank, c.P, c.Confidence, got, c.N)
		}
	}
}

func TestWilks(t *testing.T) {
	// Wilks, Ann. Math. Stat. 12, 91 (1941), the 95/95 rule: 59 observations
	// for a one-sided bound on the 5th or 95th percentile by the extreme,
	// 93 by the second, 299 for the 1st percentile.
	for _, c := range []struct {
		name string
		got  int
		want int
	}{
		{"p05 lower, X(1)", MinSamplesLower(1, 0.05, 0.95), 59},
		{"p95 upper, X(n)", MinSamplesUpper(1, 0.95, 0.95), 59},
		{"p05 lower, X(2)", MinSamplesLower(2, 0.05, 0.95), 93},
		{"p01 lower, X(1)", MinSamplesLower(1, 0.01, 0.95), 299},
		{"p99 upper, X(n)", MinSamplesUpper(1, 0.99, 0.95), 299},
	} {
		if c.got != c.want {
			t.Errorf("%s: got %d, want %d (Wilks 1941)", c.name, c.got, c.want)
		}
	}
	x := make([]float64, 58)
	if b := QuantileLower(x, 0.05, 0.95); b.OK || b.MinSamples != 59 || !math.IsNaN(b.Value) {
		t.Errorf("QuantileLower at n = 58: %+v, want no bound and MinSamples 59", b)
	}
	x = append(x, 0)
	if b := QuantileLower(x, 0.05, 0.95); !b.OK || b.Rank != 1 {
		t.Errorf("QuantileLower at n = 59: %+v, want X(1)", b)
	}
}

// TestQuantileTestsAreDualToBounds checks on random samples with ties that
// the p-value tests reject at 1 - c exactly when the bounds clear the
// limit, for limits at, between and beyond the observations.
func TestQuantileTestsAreDualToBounds(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 1))
	for trial := range 300 {
		n := 1 + rng.IntN(400)
		x := make([]float64, n)
		for i := range x {
			x[i] = float64(rng.IntN(50)) // ties on purpose
		}
		slices.Sort(x)
		p := []float64{0.01, 0.05, 0.5, 0.95, 0.99}[trial%5]
		c := []float64{0.9, 0.95, 0.99}[trial%3]
		for _, limit := range []float64{-1, 0, 7, 7.5, 25, 49, 50} {
			lo, hi := QuantileLower(x, p, c), QuantileUpper(x, p, c)
			pass, fail := QuantileAtLeast(x, p, limit)
			if (pass <= 1-c) != (lo.OK && lo.Value >= limit) {
				t.Fatalf("n %d p %g c %g limit %g: at-least pass p-value %g, lower bound %+v", n, p, c, limit, pass, lo)
			}
			if (fail <= 1-c) != (hi.OK && hi.Value < limit) {
				t.Fatalf("n %d p %g c %g limit %g: at-least fail p-value %g, upper bound %+v", n, p, c, limit, fail, hi)
			}
			pass, fail = QuantileAtMost(x, p, limit)
			if (pass <= 1-c) != (hi.OK && hi.Value <= limit) {
				t.Fatalf("n %d p %g c %g limit %g: at-most pass p-value %g, upper bound %+v", n, p, c, limit, pass, hi)
			}
			if (fail <= 1-c) != (lo.OK && lo.Value > limit) {
				t.Fatalf("n %d p %g c %g limit %g: at-most fail p-value %g, lower bound %+v", n, p, c, limit, fail, lo)
			}
		}
	}
}

// TestQuantileBoundCoverage draws R samples of n values from a normal and a
// lognormal distribution and counts how often each bound misses the true
// quantile. For a continuous distribution the miss rate of X(r) is exactly
// P(Bin(n, p) < r) <= 1 - c; the check is that the observed rate is within 3
// binomial standard errors sqrt(m (1 - m) / R) of that exact rate (R = 4000:
// 0.0034 at m = 0.05), so a bound one rank too optimistic (miss rate up by
// about a third at these n) fails.
func TestQuantileBoundCoverage(t *testing.T) {
	const reps = 4000
	type dist struct {
		name     string
		draw     func(*rand.Rand) float64
		quantile func(p float64) float64
	}
	normal := dist{"normal", func(r *rand.Rand) float64 { return r.NormFloat64() }, func(p float64) float64 { return math.Sqrt2 * math.Erfinv(2*p-1) }}
	lognormal := dist{"lognormal", func(r *rand.Rand) float64 { return math.Exp(r.NormFloat64()) },
		func(p float64) float64 { return math.Exp(math.Sqrt2 * math.Erfinv(2*p-1)) }}
	for _, d := range []dist{normal, lognormal} {
		for _, n := range []int{60, 100, 300, 1000} {
			rng := rand.New(rand.NewPCG(uint64(n), 3))
			x := make([]float64, n)
			type tally struct {
				p, c        float64
				lower       bool
				misses, ran int
			}
			cases := []*tally{
				{p: 0.05, c: 0.95, lower: true}, {p: 0.05, c: 0.95}, {p: 0.95, c: 0.95},
				{p: 0.95, c: 0.95, lower: true}, {p: 0.5, c: 0.9, lower: true},
			}
			if n >= 300 {
				cases = append(cases, &tally{p: 0.01, c: 0.95, lower: true}, &tally{p: 0.99, c: 0.95})
			}
			for range reps {
				for i := range x {
					x[i] = d.draw(rng)
				}
				slices.Sort(x)
				for _, c := range cases {
					q := d.quantile(c.p)
					if c.lower {
						b := QuantileLower(x, c.p, c.c)
						if b.Value > q {
							c.misses++
						}
					} else {
						b := QuantileUpper(x, c.p, c.c)
						if b.Value < q {
							c.misses++
						}
					}
				}
			}
			for _, c := range cases {
				var exact float64
				if c.lower {
					r, _ := LowerRank(n, c.p, c.c)
					exact = BinomialCDF(r-1, n, c.p)
				} else {
					s, _ := UpperRank(n, c.p, c.c)
					exact = BinomialSurvival(s, n, c.p)
				}
				got := float64(c.misses) / reps
				se := math.Sqrt(exact * (1 - exact) / reps)
				if exact > 1-c.c+1e-12 || math.Abs(got-exact) > 3*se {
					t.Errorf("%s n %d p %g c %g lower %v: miss rate %.4f, exact %.4f (nominal at most %.3f, tol 3 se = %.4f)",
						d.name, n, c.p, c.c, c.lower, got, exact, 1-c.c, 3*se)
				}
			}
		}
	}
}

func TestQuantileIntervalCoverage(t *testing.T) {
	// Two-sided 95 % intervals of p01, p05 and p50 of a standard normal, the
	// case the percentile bootstrap covered 39 % of the time at n = 50 for
	// p01. R = 4000 samples: coverage must be at least 0.95 less 3
	// standard errors (0.0034). n = 400: the p01 interval, each end at 97.5 %,
	// needs 368 (MinSamplesLower(1, 0.01, 0.975)).
	const reps, n = 4000, 400
	rng := rand.New(rand.NewPCG(5, 5))
	x := make([]float64, n)
	for _, p := range []float64{0.01, 0.05, 0.5} {
		q := math.Sqrt2 * math.Erfinv(2*p-1)
		covered := 0
		for range reps {
			for i := range x {
				x[i] = rng.NormFloat64()
			}
			slices.Sort(x)
			lo, hi := QuantileInterval(x, p, 0.95)
			if lo.OK && hi.OK && lo.Value <= q && q <= hi.Value {
				covered++
			}
		}
		got := float64(covered) / reps
		if se := math.Sqrt(0.95 * 0.05 / reps); got < 0.95-3*se {
			t.Errorf("p %g: two-sided coverage %.4f, want at least 0.95 (tol 3 se = %.4f)", p, got, 3*se)
		}
	}
}
