package noise

import (
	"fmt"
	"math"
	"sort"
)

// Table is a PSD tabulated at increasing frequencies and interpolated
// linearly in log f and log S, so that each interval is a power law through
// its end points:
//
//	S(f) = S_i (f/f_i)^k_i,  k_i = ln(S_{i+1}/S_i) / ln(f_{i+1}/f_i),  f_i <= f <= f_{i+1}.
//
// Outside the table the density is held constant: S(f) = S_0 for f < f_0 and
// S(f) = S_last for f > f_last. Constant extrapolation is a choice, not a
// model: a phase-noise floor is usually flat above the last point, but noise
// that still rises below the first point is underestimated there, so tables
// should cover the band they are used on.
type Table struct {
	freq    []float64
	density []float64
	slope   []float64 // k_i of interval i
}

// NewTable returns the log-log interpolated Table through the points
// (freqHz[i], density[i]). Frequencies must be positive, finite and strictly
// increasing, densities positive and finite (log-log interpolation cannot pass
// through zero), and there must be at least one point. NewTable copies the
// slices.
func NewTable(freqHz, density []float64) (*Table, error) {
	if len(freqHz) != len(density) {
		return nil, fmt.Errorf("noise: table has %d frequencies but %d densities", len(freqHz), len(density))
	}
	if len(freqHz) == 0 {
		return nil, fmt.Errorf("noise: table has no points")
	}
	for i, f := range freqHz {
		s := density[i]
		switch {
		case math.IsNaN(f) || math.IsInf(f, 0):
			return nil, fmt.Errorf("noise: table point %d: frequency %g Hz is not finite", i, f)
		case f <= 0:
			return nil, fmt.Errorf("noise: table point %d: frequency %g Hz is not positive", i, f)
		case i > 0 && f <= freqHz[i-1]:
			return nil, fmt.Errorf("noise: table point %d: frequency %g Hz is not above the previous point (%g Hz)", i, f, freqHz[i-1])
		case math.IsNaN(s) || math.IsInf(s, 0):
			return nil, fmt.Errorf("noise: table point %d: density %g is not finite", i, s)
		case s <= 0:
			return nil, fmt.Errorf("noise: table point %d: density %g is not positive", i, s)
		}
	}
	return newTable(append([]float64(nil), freqHz...), append([]float64(nil), density...)), nil
}

// newTable builds a Table on the given slices, which it keeps; they must
// satisfy the conditions NewTable checks.
func newTable(freqHz, density []float64) *Table {
	t := &Table{freq: freqHz, density: density, slope: make([]float64, len(freqHz)-1)}
	for i := range t.slope {
		t.slope[i] = logRatio(t.density[i+1], t.density[i]) / logRatio(t.freq[i+1], t.freq[i])
	}
	return t
}

// Density returns the interpolated density at f, or the end value outside
// the table.
func (t *Table) Density(f float64) float64 {
	last := len(t.freq) - 1
	switch {
	case f <= t.freq[0]:
		return t.density[0]
	case f >= t.freq[last]:
		return t.density[last]
	}
	i := sort.SearchFloat64s(t.freq, f)
	if t.freq[i] == f {
		return t.density[i]
	}
	// f is inside interval i-1.
	return t.density[i-1] * ratioPow(f, t.freq[i-1], t.slope[i-1])
}

// Integral returns ∫_fLow^fHigh S(f) df exactly for the interpolant: each
// interval is integrated as the power law it is, the extrapolated ends as
// constants.
func (t *Table) Integral(fLow, fHigh float64) float64 {
	last := len(t.freq) - 1
	var v float64
	if fLow < t.freq[0] {
		v += t.density[0] * (math.Min(fHigh, t.freq[0]) - fLow)
	}
	if fHigh > t.freq[last] {
		v += t.density[last] * (fHigh - math.Max(fLow, t.freq[last]))
	}
	// Intervals before the one holding fLow contribute nothing.
	for i := max(sort.SearchFloat64s(t.freq, fLow)-1, 0); i < last && t.freq[i] < fHigh; i++ {
		a := math.Max(fLow, t.freq[i])
		b := math.Min(fHigh, t.freq[i+1])
		if a < b {
			v += powerLawIntegral(t.density[i], t.freq[i], t.slope[i], a, b)
		}
	}
	return v
}
