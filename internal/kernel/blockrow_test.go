package kernel

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestBlockRowMatchesLoop checks BlockRow bit for bit against the plain
// loop of sim's block exponential (one output at a time, summed over j in
// order), for lane counts that exercise the blocks of four and the tail.
func TestBlockRowMatchesLoop(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	for _, n := range []int{1, 3, 4, 5, 8, 20, 23} {
		for _, k := range []int{0, 1, 7, 18} {
			a, x := make([]float64, 2*n*k), make([]float64, 2*n*k)
			for i := range a {
				a[i], x[i] = rng.NormFloat64(), rng.NormFloat64()
			}
			yr, yi := make([]float64, n), make([]float64, n)
			for i := range yr {
				yr[i], yi[i] = math.NaN(), math.NaN() // BlockRow must overwrite
			}
			BlockRow(yr, yi, a, x, k)
			for c := range n {
				var sr, si float64
				for j := range k {
					rr, ri := a[j*2*n+c], a[j*2*n+n+c]
					xr, xi := x[j*2*n+c], x[j*2*n+n+c]
					sr += rr*xr - ri*xi
					si += rr*xi + ri*xr
				}
				if math.Float64bits(yr[c]) != math.Float64bits(sr) || math.Float64bits(yi[c]) != math.Float64bits(si) {
					t.Fatalf("n %d k %d lane %d: (%v, %v), loop (%v, %v)", n, k, c, yr[c], yi[c], sr, si)
				}
			}
		}
	}
}

func BenchmarkBlockRow(b *testing.B) {
	n, k := 20, 18
	a, x := make([]float64, 2*n*k), make([]float64, 2*n*k)
	for i := range a {
		a[i], x[i] = float64(i%7), float64(i%5)
	}
	yr, yi := make([]float64, n), make([]float64, n)
	for b.Loop() {
		BlockRow(yr, yi, a, x, k)
	}
}
