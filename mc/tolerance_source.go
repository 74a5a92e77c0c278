package mc

import (
	"fmt"
	"math"
	"strings"

	"rampart/noise"
)

// Tolerance sources: the static parameters by their budget names, the two
// noise processes, and the whole budget scaled together.
const (
	SourceTemperature = "temperature_spread_k"
	SourcePulse       = "pulse_area_rel"
	SourceRIN         = "rin"
	SourcePhase       = "phase"
	SourceBudget      = "budget"
)

// Sources lists the noise sources a tolerance search can vary one at a time,
// in budget order.
var Sources = []string{
	ParamDepthCommon, ParamDepthDifferential, ParamClock, ParamSpeed, ParamSkew,
	SourceTemperature, SourcePulse, SourceRIN, SourcePhase,
}

// Reference amplitudes: where a search of a source that the budget switches
// off starts. They are typical of a well-built apparatus (common practice,
// not measurements): a 0.1% depth stabilisation, a 1 ppm clock and drive
// frequency, 10 ns of skew, 10 nK of temperature spread, 1% pulse area,
// and white intensity and phase noise floors at -120 dB/Hz and -120 dBc/Hz.
const (
	RefDepthRel      = 1e-3
	RefClockRel      = 1e-6
	RefSpeedRel      = 1e-6
	RefSkewS         = 10e-9
	RefTemperatureK  = 10e-9
	RefPulseAreaRel  = 1e-2
	RefRINDBPerHz    = -120
	RefPhaseDBcPerHz = -120
)

// The largest amplitudes a search tries, whatever its Range: beyond them a
// static error is no longer a small perturbation of the sequence.
const (
	maxRelativeSigma = 0.3   // relative depth and pulse area errors
	maxRateSigma     = 0.1   // clock and drive-frequency errors, 1e5 ppm
	maxSkewS         = 10e-6 // a tenth of a typical ramp
	maxTemperatureK  = 1e-6  // far above a lattice-loaded start
)

// source is one axis of a tolerance search: the budget with that source at
// search amplitude a (an SI standard deviation for a static source, the rms
// scale of a reference PSD for a noise process, the factor of Budget.Scaled
// for the whole budget), and the unit an engineer buys hardware in.
type source struct {
	name, unit string
	nominal    float64 // the budget's amplitude; 0 if off
	ref        float64 // where the search starts
	max        float64 // the largest amplitude searched; +Inf: none
	set        func(a float64) Budget
	display    func(a float64) float64 // a in unit
}

// newSource returns the search axis of the named source of budget b, the
// others held at their values in b.
func newSource(b Budget, name string) (source, error) {
	static := func(unit string, scale, ref, max, nominal float64, set func(*Budget, float64)) source {
		s := source{name: name, unit: unit, nominal: nominal, ref: ref, max: max,
			display: func(a float64) float64 { return scale * a }}
		if s.nominal > 0 {
			s.ref = s.nominal
		}
		s.set = func(a float64) Budget { c := b; set(&c, a); return c }
		return s
	}
	switch name {
	case ParamDepthCommon:
		return static("%", 100, RefDepthRel, maxRelativeSigma, b.DepthCommonRel, func(c *Budget, a float64) { c.DepthCommonRel = a }), nil
	case ParamDepthDifferential:
		return static("%", 100, RefDepthRel, maxRelativeSigma, b.DepthDifferentialRel, func(c *Budget, a float64) { c.DepthDifferentialRel = a }), nil
	case ParamClock:
		return static("ppm", 1e6, RefClockRel, maxRateSigma, b.ClockRel, func(c *Budget, a float64) { c.ClockRel = a }), nil
	case ParamSpeed:
		return static("ppm", 1e6, RefSpeedRel, maxRateSigma, b.SpeedRel, func(c *Budget, a float64) { c.SpeedRel = a }), nil
	case ParamSkew:
		return static("ns", 1e9, RefSkewS, maxSkewS, b.SkewS, func(c *Budget, a float64) { c.SkewS = a }), nil
	case SourceTemperature:
		return static("nK", 1e9, RefTemperatureK, maxTemperatureK, b.TemperatureSpreadK, func(c *Budget, a float64) { c.TemperatureSpreadK = a }), nil
	case SourcePulse:
		return static("%", 100, RefPulseAreaRel, maxRelativeSigma, b.PulseAreaRel, func(c *Budget, a float64) { c.PulseAreaRel = a }), nil
	case SourceRIN:
		return psdSource(name, b.RIN, noise.White{Level: noise.IntensityFromRIN(RefRINDBPerHz)}, "dB/Hz", noise.RINFromIntensity,
			func(p noise.PSD) Budget { c := b; c.RIN = p; return c }), nil
	case SourcePhase:
		return psdSource(name, b.Phase, noise.White{Level: noise.PhaseFromDBc(RefPhaseDBcPerHz)}, "dBc/Hz", noise.DBcFromPhase,
			func(p noise.PSD) Budget { c := b; c.Phase = p; return c }), nil
	case SourceBudget:
		return budgetSource(b)
	}
	return source{}, fmt.Errorf("unknown noise source %q: want one of %s, or %s for the whole budget", name, strings.Join(Sources, ", "), SourceBudget)
}

// psdSource is the axis of a noise process: the search amplitude a scales
// the rms of the nominal PSD (or of def, a white floor, if the budget has
// none), so the PSD is a^2 S. A white PSD is reported as its level in unit
// (level converts a density to it); a table as the scale factor a.
func psdSource(name string, nominal, def noise.PSD, unit string, level func(float64) float64, set func(noise.PSD) Budget) source {
	s := source{name: name, ref: 1, max: math.Inf(1)}
	base := def
	if nominal != nil {
		s.nominal, base = 1, nominal
	}
	s.set = func(a float64) Budget {
		if a == 0 {
			return set(nil)
		}
		return set(scalePSD(base, a*a))
	}
	if w, ok := base.(noise.White); ok {
		s.unit = unit
		s.display = func(a float64) float64 { return level(a * a * w.Level) }
	} else {
		s.unit = "x rms"
		s.display = func(a float64) float64 { return a }
	}
	return s
}

// budgetSource is the axis of the whole budget scaled by a, up to the scale
// at which the first static source reaches its largest amplitude.
func budgetSource(b Budget) (source, error) {
	s := source{name: SourceBudget, unit: "x budget", nominal: 1, ref: 1, max: math.Inf(1),
		display: func(a float64) float64 { return a }}
	active := b.Dynamic()
	for _, name := range Sources[:7] {
		one, _ := newSource(b, name)
		if one.nominal > 0 {
			active = true
			s.max = math.Min(s.max, one.max/one.nominal)
		}
	}
	if !active {
		return source{}, fmt.Errorf("the budget has no active noise source to scale")
	}
	s.set = func(a float64) Budget {
		c := b.Scaled(a)
		if b.RIN != nil {
			c.RIN = scalePSD(b.RIN, a*a)
		}
		if b.Phase != nil {
			c.Phase = scalePSD(b.Phase, a*a)
		}
		if a == 0 {
			c.RIN, c.Phase = nil, nil
		}
		return c
	}
	return s, nil
}

// highest returns the largest amplitude a search of s tries: Range above
// the start, but not beyond the source's largest sensible amplitude unless
// the start already is.
func (s source) highest(o ToleranceOptions) float64 {
	return math.Max(s.ref, math.Min(s.ref*o.Range, s.max))
}
