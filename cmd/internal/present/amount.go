package present

import (
	"fmt"
	"math"

	"rampart/mc"
	"rampart/sim"
)

// Amount formats a static source's SI amplitude in its lab unit, "20 ns".
// A relative error (the scenario's "_rel" keys, a fraction) reads as a
// percentage from 0.1 %, in ppm from 1 ppm and in ppb below: "1 %",
// "2 ppm", "20 ppb", never "2e-06 %".
func Amount(s mc.Source, si float64) string {
	v := s.Scale * si
	if s.Unit != mc.Relative {
		return Sig(v, 3) + " " + s.Unit
	}
	switch a := v; {
	case a == 0:
		return "0"
	case a >= 1e-3:
		return Sig(100*v, 3) + " %"
	case a >= 1e-6:
		return Sig(1e6*v, 3) + " ppm"
	default:
		return Sig(1e9*v, 3) + " ppb"
	}
}

// ClampNote says how often a shot's start temperature is drawn below 0 K
// and clamped there (docs/model.md, Perturbations: the start temperature
// T + dT is clamped at 0), when that lies within mc.DrawSigmas
// standard deviations; "" otherwise. The probability is Phi(-T/sigma) =
// erfc(T / (sigma sqrt 2)) / 2.
func ClampNote(cfg sim.Config, b mc.Budget) string {
	s, t := b.TemperatureSpreadK, cfg.TemperatureK
	if !(s > 0) || t > mc.DrawSigmas*s {
		return ""
	}
	p := math.Erfc(t/(s*math.Sqrt2)) / 2
	return fmt.Sprintf("Temperature draws below 0 K (start %s nK, spread %s nK: probability %s per shot) are clamped at 0 K.", Sig(t*1e9, 3), Sig(s*1e9, 3), Sig(p, 2))
}
