package mc

import (
	"math"
	"strconv"

	"rampart/noise"
)

// SourceAmplitude returns the amplitude of the named source in budget b in
// the unit of the tolerance table (ToleranceResult.Unit, the row's Unit),
// and whether b switches it on. nominal is the budget a search started
// from: a noise process given as a table has as amplitude its rms scale
// against the nominal one, and SourceBudget the factor by which b scales
// nominal (read off its first active source, statics first).
func SourceAmplitude(name string, nominal, b Budget) (float64, bool) {
	if name == SourceBudget {
		return budgetAmplitude(nominal, b)
	}
	s, ok := LookupSource(name)
	if !ok {
		return 0, false
	}
	return s.amplitude(nominal, b)
}

// amplitude is the source's amplitude in b in its Unit.
func (s Source) amplitude(nominal, b Budget) (float64, bool) {
	if s.Kind == Static {
		v := s.labValue(*s.Sigma(&b))
		return v, v > 0
	}
	return psdAmplitude(*s.PSD(&nominal), *s.PSD(&b), s.Level)
}

// budgetAmplitude is the factor by which b scales nominal.
func budgetAmplitude(nominal, b Budget) (float64, bool) {
	for _, s := range Sources {
		if s.Kind != Static {
			continue
		}
		if n, on := s.amplitude(nominal, nominal); on {
			v, _ := s.amplitude(nominal, b)
			return v / n, v > 0
		}
	}
	for _, s := range Sources {
		if s.Kind == Process && *s.PSD(&nominal) != nil {
			k := psdScale(*s.PSD(&nominal), *s.PSD(&b))
			return k, k > 0
		}
	}
	return 0, false
}

// psdAmplitude is the amplitude of a noise process of PSD p: a white floor's
// level (converted by level), otherwise the rms scale of p against the
// nominal PSD.
func psdAmplitude(nominal, p noise.PSD, level func(float64) float64) (float64, bool) {
	if p == nil {
		return 0, false
	}
	if w, ok := p.(noise.White); ok {
		return level(w.Level), true
	}
	return psdScale(nominal, p), true
}

// psdScale is the rms scale of PSD p against q, the square root of their
// ratio at 1 Hz: p is q scaled by a constant in a search.
func psdScale(q, p noise.PSD) float64 {
	if p == nil {
		return 0
	}
	return math.Sqrt(p.Density(1) / q.Density(1))
}

// labValue converts a static amplitude in SI to the source's lab unit for
// display (round12).
func (s Source) labValue(si float64) float64 { return round12(s.Scale * si) }

// round12 rounds v to 12 significant digits: a file's number goes to SI
// through FileScale and comes back through Scale, and the round trip
// should not show as 99.99999999999999 uG for a budget's 100 uG. Only
// displayed values are rounded; searches keep the exact amplitudes.
func round12(v float64) float64 {
	if v == 0 || math.IsInf(v, 0) || math.IsNaN(v) {
		return v
	}
	r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 12, 64), 64)
	return r
}
