package mc

import (
	"math"
	"testing"
)

func TestHistogramBins(t *testing.T) {
	// Bins of [0.1, 0.7) in 6: edges 0.1 + k 0.1 in floating point. Each value
	// goes to the bin whose reported edges hold it, including values exactly on
	// an edge (half-open bins, exact).
	h := NewHistogram(0.1, 0.7, 6)
	for k := range h.Bins() {
		lo, hi := h.Edge(k), h.Edge(k+1)
		for _, x := range []float64{lo, math.Nextafter(lo, hi), 0.5 * (lo + hi), math.Nextafter(hi, lo)} {
			if got := h.Bin(x); got != k {
				t.Errorf("Bin(%v): got %d, want %d (edges [%v, %v))", x, got, k, lo, hi)
			}
		}
	}
	for _, c := range []struct {
		x    float64
		want int
	}{{0.0999, -1}, {math.Inf(-1), -1}, {0.7, 6}, {math.Inf(1), 6}, {math.NaN(), 6}} {
		if got := h.Bin(c.x); got != c.want {
			t.Errorf("Bin(%v): got %d, want %d", c.x, got, c.want)
		}
	}
}

func TestHistogramCounts(t *testing.T) {
	// Hand-counted: 10 values into 4 bins of [0, 1).
	h := NewHistogram(0, 1, 4)
	h.Add(-0.5, 0, 0.1, 0.25, 0.3, 0.74, 0.75, 0.999, 1, math.NaN())
	want := []int{2, 2, 1, 2}
	for k, w := range want {
		if h.Counts[k] != w {
			t.Errorf("bin %d: got %d, want %d", k, h.Counts[k], w)
		}
	}
	if h.Underflow != 1 || h.Overflow != 1 || h.NaN != 1 || h.Total() != 10 {
		t.Errorf("under %d over %d NaN %d total %d, want 1 1 1 10", h.Underflow, h.Overflow, h.NaN, h.Total())
	}
	if c := h.Center(1); c != 0.375 {
		t.Errorf("Center(1): got %v, want 0.375 (exact)", c)
	}
}
