package stats

import (
	"math"
	"math/rand/v2"
	"testing"
)

// mixtureSample draws n values of a contrast with lost shots: 0 with
// probability p0, else Beta(50, 1), drawn as U^(1/50) (inverse CDF: the
// Beta(a, 1) CDF is x^a).
func mixtureSample(n int, p0 float64, rng *rand.Rand) []float64 {
	x := make([]float64, n)
	for i := range x {
		if rng.Float64() >= p0 {
			x[i] = math.Pow(rng.Float64(), 1.0/50)
		}
	}
	return x
}

// TestZeroMixtureCoverage is the seeded coverage simulation of the
// one-sided 95 % lower bound on a 1.5 % point mass at 0 plus a Beta(50, 1)
// (mean 0.985 * 50/51, Beta(a, b) mean a/(a+b)): the bound passes "mean at
// least mu" at the true mean mu (a false pass) at most 5 % of the time,
// within two binomial standard errors of the simulation. The plain
// bootstrap-t on the same samples is reported beside it; its bound sits far
// below at n = 100 (the defect the mixture fixes), which the mean-distance
// check shows: the mixture's bound must be closer to mu on average there.
func TestZeroMixtureCoverage(t *testing.T) {
	const p0, c = 0.015, 0.95
	mu := (1 - p0) * 50.0 / 51
	for _, sz := range []struct{ n, reps, resamples int }{{100, 1000, 400}, {1000, 300, 400}} {
		rng := rand.New(rand.NewPCG(41, uint64(sz.n)))
		miss, missT, missSeen := 0, 0, 0
		var gap, gapT float64
		for range sz.reps {
			x := mixtureSample(sz.n, p0, rng)
			z := MeanZeroMixture(x, 1, true, sz.resamples, rng)
			lo := z.Lower(c)
			loT := MeanBootstrapT(x, sz.resamples, rng).Lower(c)
			z.Possible = false // the mixture only once a zero is seen
			if z.Lower(c) >= mu {
				missSeen++
			}
			if lo >= mu {
				miss++
			}
			if loT >= mu {
				missT++
			}
			gap += mu - lo
			gapT += mu - max(loT, 0)
		}
		r := float64(miss) / float64(sz.reps)
		se := math.Sqrt((1 - c) * c / float64(sz.reps))
		t.Logf("n = %d: false pass %.4f (bootstrap-t of all values %.4f, mixture only once a zero is seen %.4f), mean mu - lower %.5f (bootstrap-t %.5f)",
			sz.n, r, float64(missT)/float64(sz.reps), float64(missSeen)/float64(sz.reps), gap/float64(sz.reps), gapT/float64(sz.reps))
		if r > 1-c+2*se {
			t.Errorf("n = %d: false-pass rate %.4f above %.2f + 2 SE (%.4f)", sz.n, r, 1-c, se)
		}
		// At n = 100 the plain bootstrap-t collapses (a resample without a
		// zero has t* of order 50); at n = 1000 every resample has zeros and
		// it is tighter than the Bonferroni product, which is the price of
		// the product's validity at every n.
		if sz.n == 100 && gap >= gapT {
			t.Errorf("n = %d: the mixture bound is no tighter than the plain bootstrap-t (mean gaps %.5f, %.5f)", sz.n, gap/float64(sz.reps), gapT/float64(sz.reps))
		}
	}
}

// fixedBound is a MeanBound with given bounds at every confidence.
type fixedBound struct{ lo, hi float64 }

func (f fixedBound) Lower(float64) float64 { return f.lo }
func (f fixedBound) Upper(float64) float64 { return f.hi }

func TestZeroMixtureBounds(t *testing.T) {
	// The product of the factors' bounds at 1 - alpha/2: with K = 3 of
	// n = 200, the Clopper-Pearson one-sided bounds at 0.975 (the Beta
	// quantiles B^-1(0.975; 4, 197) and B^-1(0.025; 3, 198), via
	// ClopperPearsonUpper/Lower, checked against SciPy in binomial_test.go).
	z := NewZeroMixture(200, 3, 0.98, fixedBound{0.97, 0.99}, 1, false)
	qU, qL := ClopperPearsonUpper(3, 200, 0.975), ClopperPearsonLower(3, 200, 0.975)
	if got, want := z.Lower(0.95), (1-qU)*0.97; got != want {
		t.Errorf("Lower(0.95) = %v, want (1 - qU) mL = %v", got, want)
	}
	if got, want := z.Upper(0.95), (1-qL)*0.99; got != want {
		t.Errorf("Upper(0.95) = %v, want (1 - qL) mU = %v", got, want)
	}
	if got, want := z.Value, 197.0/200*0.98; math.Abs(got-want) > 1e-15 {
		t.Errorf("Value = %v, want %v", got, want)
	}
	// With K = 0 and zeros not known to be possible: exactly the
	// bootstrap-t of the values, drawing the same resamples.
	x := mixtureSample(150, 0, rand.New(rand.NewPCG(5, 5)))
	a := MeanZeroMixture(x, 1, false, 300, rand.New(rand.NewPCG(6, 6)))
	b := MeanBootstrapT(x, 300, rand.New(rand.NewPCG(6, 6)))
	if a.Lower(0.95) != b.Lower(0.95) || a.Upper(0.9) != b.Upper(0.9) {
		t.Errorf("no zero: bounds %v, %v; bootstrap-t %v, %v", a.Lower(0.95), a.Upper(0.9), b.Lower(0.95), b.Upper(0.9))
	}
	// Possible at K = 0: the lower bound carries 1 - qU with
	// qU = 1 - 0.025^(1/150) (Clopper-Pearson at k = 0, closed form).
	a.Possible = true
	if got, want := a.Lower(0.95), math.Pow(0.025, 1.0/150)*b.Lower(0.975); math.Abs(got-want) > 1e-12 {
		t.Errorf("possible, no zero: Lower %v, want %v", got, want)
	}
	// Every value 0: the mean is 0, the lower bound 0 and the upper
	// (1 - qL) Max, qL = 0.025^(1/n) at K = n (closed form).
	z = MeanZeroMixture([]float64{0, 0, 0, 0}, 1, false, 10, rand.New(rand.NewPCG(1, 1)))
	if z.Value != 0 || z.Lower(0.95) != 0 || math.Abs(z.Upper(0.95)-(1-math.Pow(0.025, 0.25))) > 1e-12 {
		t.Errorf("all zero: value %v bounds [%v, %v]", z.Value, z.Lower(0.95), z.Upper(0.95))
	}
}
