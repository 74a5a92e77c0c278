package main

import (
	"math"

	"rampart/mc"
	"rampart/noise"
)

// sourceAmplitudes give, for each source of a tolerance search, its
// amplitude in budget b in the unit of mc's tolerance table (the unit of
// ToleranceResult.Unit), and whether b switches it on. nominal is the
// budget the search started from, for a noise process given as a table,
// whose amplitude is its rms scale against the nominal one.
var sourceAmplitudes = map[string]func(nominal, b mc.Budget) (float64, bool){
	mc.ParamDepthCommon:       static(func(b mc.Budget) float64 { return 100 * b.DepthCommonRel }),       // %
	mc.ParamDepthDifferential: static(func(b mc.Budget) float64 { return 100 * b.DepthDifferentialRel }), // %
	mc.ParamClock:             static(func(b mc.Budget) float64 { return 1e6 * b.ClockRel }),             // ppm
	mc.ParamSpeed:             static(func(b mc.Budget) float64 { return 1e6 * b.SpeedRel }),             // ppm
	mc.ParamSkew:              static(func(b mc.Budget) float64 { return 1e9 * b.SkewS }),                // ns
	mc.SourceTemperature:      static(func(b mc.Budget) float64 { return 1e9 * b.TemperatureSpreadK }),   // nK
	mc.SourcePulse:            static(func(b mc.Budget) float64 { return 100 * b.PulseAreaRel }),         // %
	mc.SourceRIN: func(nominal, b mc.Budget) (float64, bool) {
		return psdAmplitude(nominal.RIN, b.RIN, noise.RINFromIntensity) // dB/Hz
	},
	mc.SourcePhase: func(nominal, b mc.Budget) (float64, bool) {
		return psdAmplitude(nominal.Phase, b.Phase, noise.DBcFromPhase) // dBc/Hz
	},
}

// static is the amplitude of a static source, on when positive.
func static(value func(mc.Budget) float64) func(nominal, b mc.Budget) (float64, bool) {
	return func(_, b mc.Budget) (float64, bool) {
		v := value(b)
		return v, v > 0
	}
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

// sourceAmplitude is the amplitude of the named source in b, with
// mc.SourceBudget the factor by which b scales the nominal budget.
func sourceAmplitude(name string, nominal, b mc.Budget) (float64, bool) {
	if name != mc.SourceBudget {
		return sourceAmplitudes[name](nominal, b)
	}
	for _, s := range mc.Sources {
		if s == mc.SourceRIN || s == mc.SourcePhase {
			continue
		}
		if n, on := sourceAmplitudes[s](nominal, nominal); on {
			v, _ := sourceAmplitudes[s](nominal, b)
			return v / n, v > 0
		}
	}
	if nominal.RIN != nil {
		k := psdScale(nominal.RIN, b.RIN)
		return k, k > 0
	}
	k := psdScale(nominal.Phase, b.Phase)
	return k, k > 0
}
