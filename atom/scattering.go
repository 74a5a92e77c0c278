package atom

import (
	"fmt"
	"math"
)

// dipoleLines are the D lines of rubidium-87.
var dipoleLines = [2]*Line{&D1, &D2}

// lineShares returns the D1 and D2 lines' shares of the ground state's
// oscillator strength for light of circular polarisation p (0 linear, +-1
// sigma+-) on a state with g_F m_F = gm:
//
//	w_1 = (1 - p g_F m_F)/3,   w_2 = (2 + p g_F m_F)/3
//
// (Grimm et al. 2000, eq. (20)); with p = 0 they are 1/3 and 2/3 (their
// eq. (19)). For p = +1 on |2,2> (g_F m_F = 1) the D1 share vanishes: the
// stretched state has no sigma+ transition on the D1 line.
func lineShares(p, gm float64) [2]float64 {
	return [2]float64{(1 - p*gm) / 3, (2 + p*gm) / 3}
}

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
	return dipolePotential(wavelengthM, lineShares(0, 0))
}

func dipolePotential(wavelengthM float64, share [2]float64) float64 {
	w := angular(wavelengthM)
	var u float64
	for i, l := range dipoleLines {
		w0 := 2 * math.Pi * l.FrequencyHz
		u -= share[i] * 3 * math.Pi * SpeedOfLight * SpeedOfLight / (2 * w0 * w0 * w0) *
			l.DecayRateS * (1/(w0-w) + 1/(w0+w))
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
	return scatteringRate(wavelengthM, lineShares(0, 0))
}

func scatteringRate(wavelengthM float64, share [2]float64) float64 {
	w := angular(wavelengthM)
	hbar := Planck / (2 * math.Pi)
	var g float64
	for i, l := range dipoleLines {
		w0 := 2 * math.Pi * l.FrequencyHz
		a := 1/(w0-w) + 1/(w0+w)
		r := w / w0
		g += share[i] * 3 * math.Pi * SpeedOfLight * SpeedOfLight / (2 * hbar * w0 * w0 * w0) *
			r * r * r * l.DecayRateS * l.DecayRateS * a * a
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

// Light is the light of the lattice that carries one arm: its vacuum
// wavelength and its degree of circular polarisation P in [-1, 1]
// (0 linear, +1 sigma+, -1 sigma-, relative to the bias field's axis).
type Light struct {
	WavelengthM  float64
	Polarisation float64
}

// StateShares returns the D-line shares of state s in light l
// (Grimm et al. 2000, eq. (20)), with the angular-momentum g_F of the
// formula, g_F = +-1/2 for F = 2 and F = 1 (g_J = 2, the nuclear moment
// left out, as in the line strengths the formula comes from).
func stateShares(l Light, s State) [2]float64 {
	gm := float64(s.M) / 2
	if s.F == 1 {
		gm = -gm
	}
	return lineShares(l.Polarisation, gm)
}

// StatePotential returns the light shift U/I of state s in light l, in J
// per W/m^2, with the shares of Grimm et al. 2000, eq. (20).
func StatePotential(l Light, s State) float64 {
	s.mustValidate()
	return dipolePotential(l.WavelengthM, stateShares(l, s))
}

// StateScatteringPerDepth returns the scattering rate per unit of depth,
// Gamma_sc / (|U|/h) in 1/s per Hz, of state s in light l: a spin-dependent
// lattice's arms see the light with different line shares, so they trap
// and scatter differently. As for ScatteringPerDepth, the atom sits where
// |U| is the depth; for a state the light repels (U > 0), which sits at
// the dark sites of a standing wave, this is an upper bound. It refuses a
// wavelength the far-detuned formulas do not hold at, a polarisation
// outside [-1, 1], and a state the light does not shift (its tune-out).
func StateScatteringPerDepth(l Light, s State) (float64, error) {
	if err := CheckWavelength(l.WavelengthM); err != nil {
		return 0, err
	}
	if err := s.Validate(); err != nil {
		return 0, err
	}
	if !(l.Polarisation >= -1 && l.Polarisation <= 1) {
		return 0, fmt.Errorf("circular polarisation %g: want a degree in [-1, 1] (0 linear, +1 sigma+, -1 sigma-)", l.Polarisation)
	}
	sh := stateShares(l, s)
	u := dipolePotential(l.WavelengthM, sh)
	g := scatteringRate(l.WavelengthM, sh)
	// Within 1e-6 of the linear light shift's scale the state is at its
	// tune-out: the lattice does not hold it, whatever the depth says.
	if math.Abs(u) < 1e-6*math.Abs(scaleOfShift(l.WavelengthM)) {
		return 0, fmt.Errorf("state %v in light of %.4f nm, polarisation %g: the light shift vanishes (a tune-out), so no lattice of this light holds the state", s, l.WavelengthM*1e9, l.Polarisation)
	}
	return g / math.Abs(u/Planck), nil
}

// scaleOfShift is the size of the D-line light shift at wavelengthM, the
// sum of the two lines' magnitudes with linear shares, against which a
// state's shift is judged to vanish.
func scaleOfShift(wavelengthM float64) float64 {
	return math.Abs(dipolePotential(wavelengthM, [2]float64{1.0 / 3, 0})) + math.Abs(dipolePotential(wavelengthM, [2]float64{0, 2.0 / 3}))
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
		l0 := SpeedOfLight / d.FrequencyHz
		if math.Abs(wavelengthM-l0) < 1e-9 {
			return fmt.Errorf("lattice wavelength %.4f nm is within 1 nm of the %s line (%.4f nm): the far-detuned formulas do not hold there", wavelengthM*1e9, d.Name, l0*1e9)
		}
	}
	return nil
}

func angular(wavelengthM float64) float64 { return 2 * math.Pi * SpeedOfLight / wavelengthM }
