package mc

import (
	"math"
	"testing"
)

// TestMinYieldSamples checks the fewest realisations with which n of n
// inside reaches the yield: the one-sided Clopper-Pearson lower bound at
// k = n is (1-c)^(1/n) (a fact of the trade), so n is the least integer
// with (1-c)^(1/n) >= yield; the literal rows are that bound solved by hand.
func TestMinYieldSamples(t *testing.T) {
	tests := []struct {
		yield, conf float64
		want        int
	}{
		{0.9, 0.95, 29},   // 0.9^28 = 0.0523 > 0.05 >= 0.9^29 = 0.0471
		{0.99, 0.95, 299}, // ln 0.05 / ln 0.99 = 298.07
		{0.5, 0.9, 4},     // 0.5^3 = 0.125 > 0.1 >= 0.5^4
		{0, 0.95, 0},      // no yield requirement
	}
	for _, tt := range tests {
		n := MinYieldSamples(Requirements{YieldMin: tt.yield, Confidence: tt.conf})
		if n != tt.want {
			t.Errorf("yield %g at %g: %d samples, want %d", tt.yield, tt.conf, n, tt.want)
		}
		if n > 0 {
			if lo := math.Pow(1-tt.conf, 1/float64(n)); lo < tt.yield {
				t.Errorf("yield %g at %g: bound %g at n = %d is below the yield", tt.yield, tt.conf, lo, n)
			}
			if lo := math.Pow(1-tt.conf, 1/float64(n-1)); lo >= tt.yield {
				t.Errorf("yield %g at %g: n = %d is not the fewest (%g at n-1)", tt.yield, tt.conf, n, lo)
			}
		}
	}
}
