package mc

import (
	"math/rand/v2"
	"testing"

	"rampart/stats"
)

// TestRankMeanLostShots: a ramp with 3 lost shots in 200 (contrast 0, the
// others Beta(50, 1), mean 0.98) gets the interval of stats.ZeroMixture,
// drawn first from Substream(seed, 0, "rank"), and it stays near the
// mean; the bootstrap-t of all contrasts ran to about 0 on such data
// (the user's report: [0.00000, 0.99515]).
func TestRankMeanLostShots(t *testing.T) {
	rng := rand.New(rand.NewPCG(86, 1))
	a := onLimit(200, lostMixture(rng, 0))
	for _, i := range []int{5, 77, 140} {
		a[i].Contrast = 0
	}
	b := onLimit(200, func() (float64, float64) { return 0.8 + 0.05*rng.Float64(), 0 })
	r, err := Rank([]string{"a", "b"}, [][]Record{a, b}, MetricMean, Spec{}, 0.95, 7)
	if err != nil {
		t.Fatal(err)
	}
	x := make([]float64, len(a))
	for i := range a {
		x[i] = a[i].Contrast
	}
	lo, hi := stats.MeanZeroMixture(x, 1, false, DecisionResamples, Substream(7, 0, "rank")).Interval(0.95)
	p := r.Ranking[0]
	t.Logf("ramp a: %.5f [%.5f, %.5f]", p.Value, p.Lo, p.Hi)
	if p.Name != "a" || p.Lo != lo || p.Hi != hi || !(p.Lo > 0.9) {
		t.Errorf("first place %s [%v, %v], want a with the mixture interval [%v, %v] above 0.9", p.Name, p.Lo, p.Hi, lo, hi)
	}
}
