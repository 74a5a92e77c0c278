package scenario

import (
	"fmt"
	"math"

	"rampart/atom"
	"rampart/sim"
)

// presetKeys returns the names of the spin-pair presets (atom.Presets).
func presetKeys() []string {
	out := make([]string, len(atom.Presets))
	for i, p := range atom.Presets {
		out[i] = p.Key
	}
	return out
}

// Zeeman returns the differential Zeeman coefficients of the arm s = +1
// against the arm s = -1: those of the preset atom.spin_pair at
// atom.bias_field_g (atom.Pair.Coefficients, Breit-Rabi, with the F = 2
// state in the arm s = +1), or the coefficients the file gives; zero if
// it gives neither.
func (s *Scenario) Zeeman() (sim.Zeeman, error) {
	a := s.Atom
	if a.SpinPair == "" {
		return sim.Zeeman{LinearHzPerG: a.ZeemanLinearHzPerG, QuadraticHzPerG2: a.ZeemanQuadraticHzPerG2}, nil
	}
	p, err := atom.LookupPreset(a.SpinPair)
	if err != nil {
		return sim.Zeeman{}, err
	}
	lin, quad := p.Pair.Coefficients(a.BiasFieldG)
	return sim.Zeeman{LinearHzPerG: lin, QuadraticHzPerG2: quad}, nil
}

// ScatteringRates returns each arm's photon scattering rate at the lattice
// depth, 1/s: from lattice.wavelength_nm, V0/h times the scattering per
// unit depth (Grimm et al. 2000, both D lines with their counter-rotating
// terms): with linear light the same for both arms; with a spin pair and
// the polarisation of each arm's light, each arm's state with its own line
// shares (atom.StateScatteringPerDepth; the F = 2 state rides the arm
// s = +1). Otherwise the rates the file gives. The decoder has checked
// that the states are not at a tune-out, so the rates are finite.
func (s *Scenario) ScatteringRates() [2]float64 {
	l := s.Lattice
	if l.WavelengthNM <= 0 {
		return [2]float64{l.ScatteringPlusPerS, l.ScatteringMinusPerS}
	}
	states, ok := s.armStates()
	if !ok {
		r := atom.ScatteringPerDepth(l.WavelengthNM*1e-9) * l.DepthKHz * 1e3
		return [2]float64{r, r}
	}
	var rates [2]float64
	for a, p := range [2]float64{l.PolarisationPlus, l.PolarisationMinus} {
		r, err := atom.StateScatteringPerDepth(atom.Light{WavelengthM: l.WavelengthNM * 1e-9, Polarisation: p}, states[a])
		if err != nil {
			return [2]float64{math.NaN(), math.NaN()}
		}
		rates[a] = r * l.DepthKHz * 1e3
	}
	return rates
}

// armStates returns the states of the arms s = +1 and s = -1 from the spin
// pair preset (the F = 2 state in the arm s = +1, docs/model.md,
// Perturbations), and false without a preset.
func (s *Scenario) armStates() ([2]atom.State, bool) {
	if s.Atom.SpinPair == "" {
		return [2]atom.State{}, false
	}
	p, err := atom.LookupPreset(s.Atom.SpinPair)
	if err != nil {
		return [2]atom.State{}, false
	}
	return [2]atom.State{p.Pair.Upper, p.Pair.Lower}, true
}

// Apparatus returns the shot the scenario's apparatus makes without noise
// (docs/model.md, Perturbations): the spin pair's Zeeman coefficients with
// the static field offset, the photon scattering rates (as the mean of a
// cloud: an ensemble draws each realisation's scattering instead), the
// radius error, and the ring's tilt and depth harmonic. `shot` runs it;
// an ensemble's realisations start from it (mc.Budget.Apparatus).
func (s *Scenario) Apparatus() (sim.Shot, error) {
	z, err := s.Zeeman()
	if err != nil {
		return sim.Shot{}, &Error{File: s.Name, Key: "atom.spin_pair", Err: err}
	}
	sh := sim.Shot{
		Field: sim.FieldShift{Zeeman: z, OffsetG: s.Atom.FieldOffsetUG * 1e-6,
			// uG/um is G/m.
			GradientGPerM: s.Atom.FieldGradientUGPerUM, GradientRad: s.Atom.FieldGradientDeg * math.Pi / 180},
		Scattering: sim.Scattering{RateS: s.ScatteringRates(), Cloud: true},
		RadiusRel:  s.Ring.RadiusErrorPPM * 1e-6,
		Potential: sim.RingPotential{
			TiltRad: s.Ring.TiltMrad * 1e-3,
			LowRad:  s.Ring.LowDeg * math.Pi / 180,
		},
	}
	if r := s.Ring; r.HarmonicOrder > 0 && r.HarmonicRel != 0 {
		sh.Potential.Harmonics = []sim.DepthHarmonic{{Order: r.HarmonicOrder, Rel: r.HarmonicRel, PhaseRad: r.HarmonicPhaseDeg * math.Pi / 180}}
	}
	return sh, nil
}

// rb87Agreement is how far atom.mass_u may be from rubidium-87's mass for
// the rubidium-87 data (spin-pair presets, scattering from the wavelength)
// to apply: a relative 1e-9, above the rounding of a written value.
const rb87Agreement = 1e-9

// checkApparatus tests the apparatus keys that must fit together.
func (d *decoder) checkApparatus() error {
	s := d.s
	given := func(name string) bool { return d.byKey[name] != nil }
	rb87 := math.Abs(s.Atom.MassU-sim.Rb87MassU) <= rb87Agreement*sim.Rb87MassU
	if s.Atom.SpinPair != "" {
		for _, k := range []string{"atom.zeeman_linear_hz_g", "atom.zeeman_quadratic_hz_g2"} {
			if given(k) {
				return d.fail(k, fmt.Errorf("%s and atom.spin_pair are both given: the preset's coefficients come from the Breit-Rabi formula, so give one of them", k))
			}
		}
		if !rb87 {
			return d.fail("atom.spin_pair", fmt.Errorf("atom.spin_pair = %q is a rubidium-87 pair but atom.mass_u = %g is not rubidium-87's %g: give the Zeeman coefficients instead", s.Atom.SpinPair, s.Atom.MassU, sim.Rb87MassU))
		}
	} else if given("atom.bias_field_g") {
		return d.fail("atom.bias_field_g", fmt.Errorf("atom.bias_field_g is given without atom.spin_pair: it is where a preset's Zeeman coefficients are taken, so name the pair (presets: %v)", presetKeys()))
	}
	zeeman := s.Atom.SpinPair != "" || s.Atom.ZeemanLinearHzPerG != 0 || s.Atom.ZeemanQuadraticHzPerG2 != 0
	if !zeeman {
		offset := "atom.field_offset_ug"
		if v, _ := s.Number("noise.field.offset_ug"); v > 0 {
			offset = "noise.field.offset_ug"
		} else if v, _ := s.Number("noise.field.mains_ug"); v > 0 {
			offset = "noise.field.mains_ug"
		} else if s.Noise.FieldUG2PerHz > 0 {
			offset = "noise.field.noise_ug2_hz"
		} else if s.Noise.FieldFlickerUG2 > 0 {
			offset = "noise.field.flicker_ug2"
		} else if s.Noise.FieldRandomWalkUG2Hz > 0 {
			offset = "noise.field.random_walk_ug2_hz"
		} else if v, _ := s.Number("noise.field.gradient_ug_um"); v > 0 {
			offset = "noise.field.gradient_ug_um"
		} else if s.Atom.FieldGradientUGPerUM != 0 {
			offset = "atom.field_gradient_ug_um"
		} else if s.Atom.FieldOffsetUG == 0 {
			offset = ""
		}
		if offset != "" {
			return d.fail(offset, fmt.Errorf("%s is given but the spin pair is not: a field acts through the pair's Zeeman shift, so give atom.spin_pair (presets: %v) or atom.zeeman_linear_hz_g", offset, presetKeys()))
		}
	}
	if l := s.Lattice; l.WavelengthNM > 0 {
		for _, k := range []string{"lattice.scattering_plus_per_s", "lattice.scattering_minus_per_s"} {
			if given(k) {
				return d.fail(k, fmt.Errorf("%s and lattice.wavelength_nm are both given: the wavelength gives both arms' rates, so give one of them", k))
			}
		}
		if !rb87 {
			return d.fail("lattice.wavelength_nm", fmt.Errorf("lattice.wavelength_nm gives rubidium-87's scattering rate but atom.mass_u = %g is not rubidium-87's %g: give lattice.scattering_plus_per_s and scattering_minus_per_s instead", s.Atom.MassU, sim.Rb87MassU))
		}
		if err := atom.CheckWavelength(l.WavelengthNM * 1e-9); err != nil {
			return d.fail("lattice.wavelength_nm", err)
		}
	}
	for a, k := range []string{"lattice.polarisation_plus", "lattice.polarisation_minus"} {
		p := [2]float64{s.Lattice.PolarisationPlus, s.Lattice.PolarisationMinus}[a]
		if p == 0 {
			continue
		}
		if s.Lattice.WavelengthNM <= 0 || s.Atom.SpinPair == "" {
			return d.fail(k, fmt.Errorf("%s = %g needs lattice.wavelength_nm and atom.spin_pair: the polarisation sets the scattering of the arm's state in the lattice light (presets: %v)", k, p, presetKeys()))
		}
		states, _ := s.armStates()
		if _, err := atom.StateScatteringPerDepth(atom.Light{WavelengthM: s.Lattice.WavelengthNM * 1e-9, Polarisation: p}, states[a]); err != nil {
			return d.fail(k, err)
		}
	}
	// A harmonic is on when its order and amplitude are both non-zero; a
	// zero order or amplitude (say from --set) switches it off, but a key
	// without its partner is a mistake.
	if r := s.Ring; r.HarmonicOrder > 0 && !given("ring.harmonic_rel") {
		return d.fail("ring.harmonic_order", fmt.Errorf("ring.harmonic_order = %d needs ring.harmonic_rel, the harmonic's relative amplitude (ring.harmonic_phase_deg is optional)", r.HarmonicOrder))
	}
	for _, k := range []string{"ring.harmonic_rel", "ring.harmonic_phase_deg"} {
		if given(k) && !given("ring.harmonic_order") {
			return d.fail(k, fmt.Errorf("%s needs ring.harmonic_order, the harmonic's order k > 0", k))
		}
	}
	return nil
}
