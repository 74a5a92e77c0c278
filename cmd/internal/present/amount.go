package present

import "rampart/mc"

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
