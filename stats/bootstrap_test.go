package stats

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

func TestBootstrapCoverage(t *testing.T) {
	// R = 2000 experiments, each a sample of n = 50 standard normals and a 95%
	// percentile interval for the mean from B = 1000 resamples. For large B the
	// interval is close to mean +- 1.96 s sqrt((n-1)/n) / sqrt(n), so its coverage
	// is P(|t_49| < 1.96 sqrt(49/50)) = 0.94189 (scipy.stats.t, SciPy 1.10.1,
	// testdata/reference/stats_reference.json), a little under the nominal 0.95
	// as the percentile interval is known to be. The binomial standard error of
	// the observed coverage is sqrt(0.95 0.05 / R) = 0.0049; tolerance 3 standard
	// errors, 0.015, about 0.94189.
	const r, n, b = 2000, 50, 1000
	var want float64
	for _, c := range reference(t).PercentileCoverage {
		if c.N == n && c.Confidence == 0.95 {
			want = c.Coverage
		}
	}
	rng := rand.New(rand.NewPCG(2024, 1))
	x := make([]float64, n)
	covered := 0
	for range r {
		for k := range x {
			x[k] = rng.NormFloat64()
		}
		if Bootstrap(x, Mean, b, 0.95, rng).Contains(0) {
			covered++
		}
	}
	cov := float64(covered) / r
	t.Logf("coverage %v in %d experiments", cov, r)
	if tol := 3 * math.Sqrt(0.95*0.05/r); !(math.Abs(cov-want) <= tol) {
		t.Errorf("coverage: got %v, want %v (tol %g)", cov, want, tol)
	}
}

func TestBootstrapReproducibleAndPure(t *testing.T) {
	// The same seed gives the same interval exactly; the sample is not reordered
	// although the statistic sorts its argument.
	x := []float64{3, 1, 4, 1, 5, 9, 2, 6, 5, 3, 5}
	orig := slices.Clone(x)
	median := func(s []float64) float64 { slices.Sort(s); return QuantileSorted(s, 0.5) }
	a := Bootstrap(x, median, 300, 0.9, rand.New(rand.NewPCG(1, 2)))
	b := Bootstrap(x, median, 300, 0.9, rand.New(rand.NewPCG(1, 2)))
	if a != b {
		t.Errorf("same seed: got %v and %v", a, b)
	}
	if !slices.Equal(x, orig) {
		t.Errorf("sample reordered: got %v, want %v", x, orig)
	}
	if a.Value != 4 || !(a.Lo <= a.Value && a.Value <= a.Hi) {
		t.Errorf("median estimate: got %v, want value 4 (the sample median, exact) inside its interval", a)
	}
}

func TestPairedBootstrap(t *testing.T) {
	// Common random numbers: y_i = x_i + 0.1 + 0.01 e_i with x_i and e_i standard
	// normal, n = 400. The paired difference of means is mean(y - x), whose
	// standard error is 0.01/sqrt(n) = 0.0005, against sqrt(2)/sqrt(n) = 0.071
	// for independent samples. Checks: the value is exactly Mean(y) - Mean(x) up
	// to rounding (1e-12), the 95% interval holds the true 0.1 (a 95% event for
	// this seed; it is deterministic), and it is narrower than 4 x 1.96 x 0.0005.
	const n = 400
	rng := rand.New(rand.NewPCG(7, 7))
	x, y := make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = rng.NormFloat64()
		y[i] = x[i] + 0.1 + 0.01*rng.NormFloat64()
	}
	e := PairedBootstrap(y, x, Mean, 1000, 0.95, rng)
	if want := Mean(y) - Mean(x); math.Abs(e.Value-want) > 1e-12 {
		t.Errorf("value: got %v, want %v (tol 1e-12)", e.Value, want)
	}
	if !e.Contains(0.1) {
		t.Errorf("interval %v does not hold the true difference 0.1", e)
	}
	if w, max := e.Hi-e.Lo, 4*1.96*0.0005; w > max {
		t.Errorf("interval width: got %v, want below %v", w, max)
	}
}

func TestBootstrapPanics(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	for _, c := range []struct {
		name string
		f    func()
	}{
		{"empty", func() { Bootstrap(nil, Mean, 10, 0.95, rng) }},
		{"no resamples", func() { Bootstrap([]float64{1}, Mean, 0, 0.95, rng) }},
		{"confidence 1", func() { Bootstrap([]float64{1}, Mean, 10, 1, rng) }},
		{"nil source", func() { Bootstrap([]float64{1}, Mean, 10, 0.95, nil) }},
		{"unpaired lengths", func() { PairedBootstrap([]float64{1}, []float64{1, 2}, Mean, 10, 0.95, rng) }},
	} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("%s: did not panic", c.name)
				}
			}()
			c.f()
		}()
	}
}

func ExampleBootstrap() {
	contrast := []float64{0.91, 0.95, 0.89, 0.97, 0.93, 0.94, 0.90, 0.96, 0.92, 0.95}
	rng := rand.New(rand.NewPCG(1, 2)) // seeded: the interval is reproducible
	e := Bootstrap(contrast, Mean, 2000, 0.95, rng)
	fmt.Printf("mean contrast %.3f, 95%% interval [%.3f, %.3f]\n", e.Value, e.Lo, e.Hi)
	// Output:
	// mean contrast 0.932, 95% interval [0.917, 0.948]
}

func BenchmarkBootstrapMean(b *testing.B) {
	for _, n := range []int{100, 10000} {
		b.Run(fmt.Sprintf("n=%d/B=1000", n), func(b *testing.B) {
			rng := rand.New(rand.NewPCG(1, 2))
			x := make([]float64, n)
			for k := range x {
				x[k] = rng.Float64()
			}
			for b.Loop() {
				Bootstrap(x, Mean, 1000, 0.95, rng)
			}
		})
	}
}
