package stats

import (
	"math"
	"testing"
)

func TestAdditionalSamples(t *testing.T) {
	// The 1/sqrt(n) model of AdditionalSamples, worked by hand (exact integers):
	// estimate 1 with interval [0.9, 1.1] from n = 100 and threshold 0.97 needs
	// 0.1 sqrt(100/N) < 0.03, N > 1111.1, so N = 1112 and 1012 more; an
	// asymmetric interval uses the side facing the threshold: [-3, 1] about 0
	// from n = 50 needs N > 50 (3/1.2)^2 = 312.5 for threshold -1.2 and
	// N > 50 (1/0.3)^2 = 555.6 for 0.3. (Cases avoid exact ties, which rounding
	// would decide.)
	for _, c := range []struct {
		name      string
		n         int
		e         Estimate
		threshold float64
		extra     int
		ok        bool
	}{
		{"symmetric", 100, Estimate{Value: 1, Lo: 0.9, Hi: 1.1}, 0.97, 1012, true},
		{"threshold above", 100, Estimate{Value: 1, Lo: 0.9, Hi: 1.1}, 1.03, 1012, true},
		{"asymmetric, long side faces threshold", 50, Estimate{Value: 0, Lo: -3, Hi: 1}, -1.2, 263, true},
		{"asymmetric, short side faces threshold", 50, Estimate{Value: 0, Lo: -3, Hi: 1}, 0.3, 506, true},
		{"already clear", 100, Estimate{Value: 1, Lo: 0.9, Hi: 1.1}, 0.8, 0, true},
		{"on the threshold", 100, Estimate{Value: 1, Lo: 0.9, Hi: 1.1}, 1, 0, false},
		{"out of reach", 10, Estimate{Value: 1, Lo: 0, Hi: 2}, 1 - 1e-9, 0, false},
	} {
		extra, ok := AdditionalSamples(c.n, c.e, c.threshold)
		if extra != c.extra || ok != c.ok {
			t.Errorf("%s: got %d, %v, want %d, %v", c.name, extra, ok, c.extra, c.ok)
		}
		if ok && extra > 0 {
			// The model's interval after n + extra samples is clear, after one fewer not.
			d := c.e.Hi - c.e.Value
			if c.threshold < c.e.Value {
				d = c.e.Value - c.e.Lo
			}
			g := math.Abs(c.e.Value - c.threshold)
			half := func(m int) float64 { return d * math.Sqrt(float64(c.n)/float64(m)) }
			if m := c.n + extra; !(half(m) < g) || half(m-1) < g {
				t.Errorf("%s: %d more is not the smallest that clears", c.name, extra)
			}
		}
	}
}
