package mc

import (
	"math"
	"math/rand/v2"
	"testing"

	"rampart/stats"
)

// lostMixture draws a contrast with lost shots: exactly 0 (Record.Lost)
// with probability p0, else Beta(50, 1) by inverse CDF (U^(1/50)).
func lostMixture(rng *rand.Rand, p0 float64) func() (float64, float64) {
	return func() (float64, float64) {
		if rng.Float64() < p0 {
			return 0, 0
		}
		return math.Pow(rng.Float64(), 1.0/50), 0
	}
}

// TestQualifyMeanLostShotsOnLimit: the mean contrast of shots lost with
// probability p0 (contrast 0) and Beta(50, 1) otherwise sits on the limit
// (1 - p0) 50/51 (Beta mean a/(a + b)); the mixture test of
// stats.ZeroMixture must pass at most alpha_1 within 3 binomial standard
// errors. 5 % lost at n = 200 and 1.5 % at n = 1000, where a sample
// without a lost shot has probability 3.5e-5 and 2.7e-7 (the mixture
// applies from the first lost shot; see docs/model.md, Statistics).
func TestQualifyMeanLostShotsOnLimit(t *testing.T) {
	rng := rand.New(rand.NewPCG(83, 1))
	for _, c := range []struct {
		p0      float64
		n, reps int
	}{{0.05, 200, 300}, {0.015, 1000, 100}} {
		limit := (1 - c.p0) * 50 / 51
		pass := 0
		for i := range c.reps {
			if Qualify(onLimit(c.n, lostMixture(rng, c.p0)), Requirements{ContrastMeanMin: limit}, 1, uint64(i)).Verdict == Pass {
				pass++
			}
		}
		p := float64(pass) / float64(c.reps)
		t.Logf("lost %.3f n %d: false pass %.4f", c.p0, c.n, p)
		if tol := rateTol(c.reps); p > alpha1+tol {
			t.Errorf("lost %.3f n %d: mean on the limit passes %.4f, want at most %.4f (tol 3 se = %.4f, R = %d)", c.p0, c.n, p, alpha1, tol, c.reps)
		}
	}
}

// TestQualifyMeanLostShotsBound: 200 shots, 3 lost, the others Beta(50, 1)
// (mean 0.98): the bound is the product of the factors' and clears 0.9,
// which the bootstrap-t of all contrasts did not (its resamples without a
// lost shot have t* of order 50: the defect this fixes).
func TestQualifyMeanLostShotsBound(t *testing.T) {
	rng := rand.New(rand.NewPCG(84, 1))
	recs := onLimit(200, lostMixture(rng, 0))
	for _, i := range []int{17, 90, 151} {
		recs[i].Contrast = 0
	}
	q := Qualify(recs, Requirements{ContrastMeanMin: 0.9}, 1, 7)
	cr := q.Criteria[0]
	x := make([]float64, len(recs))
	for i, r := range recs {
		x[i] = r.Contrast
	}
	c := q.LookConfidence
	z := stats.MeanZeroMixture(x, 1, false, DecisionResamples, Substream(7, 0, "qualify/contrast.mean"))
	if cr.Lo != z.Lower(c) || z.Zeros != 3 {
		t.Errorf("lower bound %v, want stats.ZeroMixture's %v (zeros %d)", cr.Lo, z.Lower(c), z.Zeros)
	}
	old := stats.MeanBootstrapT(x, DecisionResamples, Substream(7, 0, "qualify/contrast.mean")).Lower(c)
	t.Logf("lower bound %.5f (bootstrap-t of all values %.5f), verdict %v", cr.Lo, old, cr.Verdict)
	if cr.Verdict != Pass || !(cr.Lo > 0.9) {
		t.Errorf("verdict %v with lower bound %v, want pass above 0.9", cr.Verdict, cr.Lo)
	}
}
