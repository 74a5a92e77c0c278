package mc

import (
	"fmt"
	"math"
)

// Histogram counts values in Bins equal bins spanning [Lo, Hi). Bin k holds
// the values x with Edge(k) <= x < Edge(k+1), Edge(k) = Lo + k (Hi - Lo) / Bins;
// values below Lo go to Underflow, values at or above Hi to Overflow, and NaN to
// NaN, so that Total counts every value added.
type Histogram struct {
	Lo, Hi    float64
	Counts    []int
	Underflow int
	Overflow  int
	NaN       int
}

// NewHistogram returns an empty histogram of bins equal bins on [lo, hi). It
// panics unless lo < hi are finite and bins >= 1.
func NewHistogram(lo, hi float64, bins int) *Histogram {
	if !(lo < hi) || math.IsInf(lo, 0) || math.IsInf(hi, 0) || bins < 1 {
		panic(fmt.Sprintf("mc: histogram of %d bins on [%g, %g)", bins, lo, hi))
	}
	return &Histogram{Lo: lo, Hi: hi, Counts: make([]int, bins)}
}

// Bins returns the number of bins.
func (h *Histogram) Bins() int { return len(h.Counts) }

// Edge returns the lower edge of bin k; Edge(Bins()) is Hi.
func (h *Histogram) Edge(k int) float64 {
	if k == len(h.Counts) {
		return h.Hi
	}
	return h.Lo + float64(k)*(h.Hi-h.Lo)/float64(len(h.Counts))
}

// Center returns the midpoint of bin k.
func (h *Histogram) Center(k int) float64 {
	return 0.5 * (h.Edge(k) + h.Edge(k+1))
}

// Bin returns the bin that x falls in, -1 below Lo, Bins() at or above Hi and
// for NaN. It agrees with Edge exactly, including at bin edges.
func (h *Histogram) Bin(x float64) int {
	bins := len(h.Counts)
	switch {
	case math.IsNaN(x) || x >= h.Hi:
		return bins
	case x < h.Lo:
		return -1
	}
	k := min(int((x-h.Lo)/(h.Hi-h.Lo)*float64(bins)), bins-1)
	for k > 0 && x < h.Edge(k) {
		k--
	}
	for k < bins-1 && x >= h.Edge(k+1) {
		k++
	}
	return k
}

// Add counts the values xs.
func (h *Histogram) Add(xs ...float64) {
	for _, x := range xs {
		switch k := h.Bin(x); {
		case math.IsNaN(x):
			h.NaN++
		case k < 0:
			h.Underflow++
		case k == len(h.Counts):
			h.Overflow++
		default:
			h.Counts[k]++
		}
	}
}

// Total returns the number of values added, including under- and overflow
// and NaN.
func (h *Histogram) Total() int {
	t := h.Underflow + h.Overflow + h.NaN
	for _, c := range h.Counts {
		t += c
	}
	return t
}
