package atom

import "fmt"

// Pair is the spin pair of the two arms: Lower is a state of F = 1,
// Upper a state of F = 2.
//
// Its differential shift is the change of the transition frequency
//
//	delta_nu(B) = [E(Upper, B) - E(Lower, B)]/h - [E(Upper, B0) - E(Lower, B0)]/h
//	            ~ Linear (B - B0) + Quadratic (B - B0)^2
//
// about the bias field B0. It is the shift of the F = 2 arm relative to
// the F = 1 arm: if the arm s = +1 carries Upper, a shot's phase moves by
// -2 pi integral delta_nu dt (docs/model.md, Perturbations).
type Pair struct {
	Lower State // F = 1
	Upper State // F = 2
}

// Validate reports whether p is a pair of an F = 1 and an F = 2 state.
func (p Pair) Validate() error {
	if p.Lower.F != 1 || p.Upper.F != 2 {
		return fmt.Errorf("spin pair %v-%v: need an F = 1 state and an F = 2 state, in that order", p.Lower, p.Upper)
	}
	if err := p.Lower.Validate(); err != nil {
		return err
	}
	return p.Upper.Validate()
}

// String returns |1,m1>-|2,m2>.
func (p Pair) String() string { return p.Lower.String() + "-" + p.Upper.String() }

// SplittingHz returns the transition frequency [E(Upper) - E(Lower)]/h at
// b gauss.
func (p Pair) SplittingHz(b float64) float64 {
	return p.Upper.EnergyHz(b) - p.Lower.EnergyHz(b)
}

// Coefficients returns the differential Zeeman coefficients of p at the
// bias field b gauss: the linear one d(delta_nu)/dB in Hz/G and the
// quadratic one (1/2) d^2(delta_nu)/dB^2 in Hz/G^2, both from the
// analytic derivatives of the Breit-Rabi formula.
func (p Pair) Coefficients(b float64) (linearHzPerG, quadraticHzPerG2 float64) {
	if err := p.Validate(); err != nil {
		panic("atom: " + err.Error())
	}
	_, u1, u2 := p.Upper.derivatives(b)
	_, l1, l2 := p.Lower.derivatives(b)
	return u1 - l1, (u2 - l2) / 2
}

// Preset names a spin pair used in spin-dependent lattices.
type Preset struct {
	Key  string
	Pair Pair
	Note string
}

// Presets are the rubidium-87 ground-state pairs a scenario can name.
var Presets = []Preset{
	{"rb87-clock", Pair{State{1, 0}, State{2, 0}}, "|1,0>-|2,0>: no linear shift at zero field"},
	{"rb87-stretched", Pair{State{1, -1}, State{2, -2}}, "|1,-1>-|2,-2>: about -2.1 MHz/G, the usual spin-dependent pair"},
	{"rb87-stretched-plus", Pair{State{1, 1}, State{2, 2}}, "|1,1>-|2,2>: about +2.1 MHz/G"},
	{"rb87-magic-3.23G", Pair{State{1, -1}, State{2, 1}}, "|1,-1>-|2,1>: linear coefficient -2.79 kHz/G at zero field, zero near 3.23 G"},
	{"rb87-11-2m1", Pair{State{1, 1}, State{2, -1}}, "|1,1>-|2,-1>: +2.79 kHz/G at zero field, 431 Hz/G^2"},
	{"rb87-1m1-2m1", Pair{State{1, -1}, State{2, -1}}, "|1,-1>-|2,-1>: about -1.40 MHz/G"},
}

// LookupPreset returns the preset with the key k.
func LookupPreset(k string) (Preset, error) {
	var keys []string
	for _, p := range Presets {
		if p.Key == k {
			return p, nil
		}
		keys = append(keys, p.Key)
	}
	return Preset{}, fmt.Errorf("spin pair %q is not a preset; presets: %v", k, keys)
}
