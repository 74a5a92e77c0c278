package mc

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestSummaryContrastMeanLostShots: with lost shots the contrast mean's
// interval is contrastMeanMixture's (the other entries draw as without
// them), and its coverage holds: on 5 % lost + Beta(50, 1) at n = 200
// (bootstrap-t path) and 1.5 % lost at n = AsymptoticMin (skewness-corrected
// t path), true mean (1 - p0) 50/51 (Beta mean a/(a + b)), each end of the
// 95 % interval misses at most 2.5 % within 3 binomial standard errors.
func TestSummaryContrastMeanLostShots(t *testing.T) {
	rng := rand.New(rand.NewPCG(85, 1))
	recs := onLimit(200, lostMixture(rng, 0.05))
	s := Summarise(recs, 7, 0, 1, 0.95, Spec{})
	var fringe []float64
	for _, r := range recs {
		if !r.Lost() {
			fringe = append(fringe, r.Contrast)
		}
	}
	if want := contrastMeanMixture(fringe, len(recs), 7, 0.95, false); s.Lost == 0 || s.Contrast.CI["mean"] != want {
		t.Errorf("lost %d: mean interval %v, want %v", s.Lost, s.Contrast.CI["mean"], want)
	}
	for _, c := range []struct {
		p0      float64
		n, reps int
	}{{0.05, 200, 400}, {0.015, AsymptoticMin, 200}} {
		mu := (1 - c.p0) * 50 / 51
		draw := lostMixture(rng, c.p0)
		below, above := 0, 0
		for i := range c.reps {
			fringe := fringe[:0]
			for range c.n {
				if v, _ := draw(); v != 0 {
					fringe = append(fringe, v)
				}
			}
			ci := contrastMeanMixture(fringe, c.n, uint64(i), 0.95, false)
			if ci[0] > mu {
				below++
			}
			if ci[1] < mu {
				above++
			}
		}
		lo, hi := float64(below)/float64(c.reps), float64(above)/float64(c.reps)
		tol := 3 * math.Sqrt(0.025*0.975/float64(c.reps))
		t.Logf("lost %.3f n %d: misses below %.4f above %.4f", c.p0, c.n, lo, hi)
		if lo > 0.025+tol || hi > 0.025+tol {
			t.Errorf("lost %.3f n %d: the 95 %% interval misses %.4f below and %.4f above, want each at most 0.025 (tol 3 se = %.4f)", c.p0, c.n, lo, hi, tol)
		}
	}
}
