package atom

import (
	"fmt"
	"math"
)

// dipoleLines are the D lines with their share of the ground state's
// oscillator strength for linearly polarised light: 1/3 for D1 and 2/3 for
// D2 (Grimm et al. 2000, eq. (19) with P = 0).
var dipoleLines = [2]struct {
	line  *Line
	share float64
}{{&D1, 1.0 / 3}, {&D2, 2.0 / 3}}

// DipolePotential returns the light shift U/I of a rubidium-87 ground
// state in linearly polarised light of vacuum wavelength wavelengthM, in
// J per W/m^2 (negative: attractive), from the D1 and D2 lines with their
// counter-rotating terms:
//
//	U = -sum_i w_i (3 pi c^2 / (2 omega_i^3)) Gamma_i [1/(omega_i - omega) + 1/(omega_i + omega)] I,
//
// w_1 = 1/3, w_2 = 2/3 (Grimm et al. 2000, eqs. (10) and (19)). The
// hyperfine splittings are neglected against the detuning (a 0.1 %
// correction at 785 nm, more within a few nm of a line).
//
// References:
//
//	R. Grimm, M. Weidemueller and Yu. B. Ovchinnikov, Optical dipole traps
//	for neutral atoms, Adv. At. Mol. Opt. Phys. 42, 95 (2000).
func DipolePotential(wavelengthM float64) float64 {
	w := angular(wavelengthM)
	var u float64
	for _, d := range dipoleLines {
		w0 := 2 * math.Pi * d.line.FrequencyHz
		u -= d.share * 3 * math.Pi * SpeedOfLight * SpeedOfLight / (2 * w0 * w0 * w0) *
			d.line.DecayRateS * (1/(w0-w) + 1/(w0+w))
	}
	return u
}

// ScatteringRate returns the photon scattering rate Gamma_sc/I in 1/s per
// W/m^2 in linearly polarised light of vacuum wavelength wavelengthM:
//
//	Gamma_sc = sum_i w_i (3 pi c^2 / (2 hbar omega_i^3)) (omega/omega_i)^3 Gamma_i^2
//	           [1/(omega_i - omega) + 1/(omega_i + omega)]^2 I
//
// (Grimm et al. 2000, eq. (11) per line, weighted as eq. (19)). The lines
// scatter incoherently in this sum, as in Grimm et al.'s treatment.
func ScatteringRate(wavelengthM float64) float64 {
	w := angular(wavelengthM)
	hbar := Planck / (2 * math.Pi)
	var g float64
	for _, d := range dipoleLines {
		w0 := 2 * math.Pi * d.line.FrequencyHz
		a := 1/(w0-w) + 1/(w0+w)
		r := w / w0
		g += d.share * 3 * math.Pi * SpeedOfLight * SpeedOfLight / (2 * hbar * w0 * w0 * w0) *
			r * r * r * d.line.DecayRateS * d.line.DecayRateS * a * a
	}
	return g
}

// ScatteringPerDepth returns the scattering rate of an atom at the bottom
// of a lattice per unit of depth, Gamma_sc / (|U|/h), in 1/s per Hz, for
// linear polarisation at vacuum wavelength wavelengthM. The atom is taken
// at the intensity where |U| is the depth (the bright sites of a
// red-detuned lattice); the rate of a depth V0/h is V0/h times this.
// Near the tune-out wavelength (790.0 nm), where U changes sign, it
// diverges.
func ScatteringPerDepth(wavelengthM float64) float64 {
	return ScatteringRate(wavelengthM) / math.Abs(DipolePotential(wavelengthM)/Planck)
}

// RecoilHz returns the photon recoil energy E_r/h = h/(2 m lambda^2) of
// rubidium-87 at vacuum wavelength wavelengthM, the unit lattice depths
// are quoted in.
func RecoilHz(wavelengthM float64) float64 {
	return Planck / (2 * MassKg * wavelengthM * wavelengthM)
}

// CheckWavelength reports whether wavelengthM is a far-detuned lattice
// wavelength the formulas hold for: at least 1 nm from each D line (the
// hyperfine structure, neglected here, spans below 0.02 nm) and positive.
func CheckWavelength(wavelengthM float64) error {
	if !(wavelengthM > 0) || math.IsInf(wavelengthM, 0) {
		return fmt.Errorf("lattice wavelength %g m is not a positive length", wavelengthM)
	}
	for _, d := range dipoleLines {
		l0 := SpeedOfLight / d.line.FrequencyHz
		if math.Abs(wavelengthM-l0) < 1e-9 {
			return fmt.Errorf("lattice wavelength %.4f nm is within 1 nm of the %s line (%.4f nm): the far-detuned formulas do not hold there", wavelengthM*1e9, d.line.Name, l0*1e9)
		}
	}
	return nil
}

func angular(wavelengthM float64) float64 { return 2 * math.Pi * SpeedOfLight / wavelengthM }
