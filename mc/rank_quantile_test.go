package mc

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"testing"

	"rampart/stats"
)

// TestOrderStatsMatchesQuantile checks the counting shortcut against
// Quantile of the resample itself, which sorts it: the two must agree
// exactly (same order statistics, same interpolation), ties and
// single-value samples included.
func TestOrderStatsMatchesQuantile(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	for _, n := range []int{1, 2, 7, 100} {
		for _, ties := range []bool{false, true} {
			t.Run(fmt.Sprintf("n%d/ties%v", n, ties), func(t *testing.T) {
				x := make([]float64, n)
				for i := range x {
					x[i] = rng.NormFloat64()
					if ties {
						x[i] = float64(rng.IntN(3))
					}
				}
				o := newOrderStats(x)
				idx := make([]int, n)
				buf := make([]float64, n)
				for range 50 {
					for k := range idx {
						idx[k] = rng.IntN(n)
						buf[k] = x[idx[k]]
					}
					for _, p := range []float64{0, 0.05, 0.5, 0.95, 1} {
						if got, want := o.quantile(idx, p), stats.Quantile(buf, p); got != want {
							t.Fatalf("p = %g, resample %v: got %v, want %v (exact)", p, buf, got, want)
						}
					}
				}
				if !slices.Equal(o.count, make([]int, n)) {
					t.Errorf("scratch counts not reset: %v", o.count)
				}
			})
		}
	}
}
