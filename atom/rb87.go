package atom

// Rubidium-87 ground state 5S_1/2 and D-line data.
//
// Source: D. A. Steck, "Rubidium 87 D Line Data", revision 2.1.5
// (13 January 2015), http://steck.us/alkalidata. The numbers below are
// from memory of that document's tables 3, 5 and 6 (not re-read here);
// the hyperfine splitting and the g-factors have been stable across
// revisions since 2.0.1 (2 May 2008).
const (
	// NuclearSpin is I of rubidium-87 (Steck, table 2).
	NuclearSpin = 1.5

	// HyperfineHz is the ground-state hyperfine splitting
	// Delta E_hfs / h = 6 834 682 610.904 290 Hz (Steck, table 6;
	// from memory).
	HyperfineHz = 6.834682610904290e9

	// ElectronG is the fine-structure Lande factor g_J(5S_1/2) = 2.00233113
	// (Steck, table 6; from memory).
	ElectronG = 2.00233113

	// NuclearG is the nuclear g-factor g_I = -0.0009951414 (Steck,
	// table 6, sign convention of Steck's eq. (24); from memory).
	NuclearG = -0.0009951414

	// BohrMagnetonHzPerG is mu_B / h = 1.399 624 493 61 MHz/G (CODATA
	// 2018: 13.996 244 936 1 GHz/T).
	BohrMagnetonHzPerG = 1.39962449361e6
)

// Line is one of the D lines seen from the ground state.
type Line struct {
	Name string
	// FrequencyHz is the line centre nu_0 (vacuum).
	FrequencyHz float64
	// DecayRateS is the natural decay rate Gamma = 1/tau of the excited
	// state in 1/s.
	DecayRateS float64
}

// SpeedOfLight is c in m/s (exact in the SI).
const SpeedOfLight = 299792458.0

// D1 is the 5S_1/2 -> 5P_1/2 line: nu_0 = 377.107 463 380 THz
// (794.978 851 156 nm), tau = 27.679 ns, Gamma = 2 pi x 5.7500 MHz
// (Steck, table 3; from memory).
var D1 = Line{Name: "D1", FrequencyHz: 377.107463380e12, DecayRateS: 1 / 27.679e-9}

// D2 is the 5S_1/2 -> 5P_3/2 line: nu_0 = 384.230 484 468 5 THz
// (780.241 209 686 nm), tau = 26.2348 ns, Gamma = 2 pi x 6.0666 MHz
// (Steck, table 4; from memory).
var D2 = Line{Name: "D2", FrequencyHz: 384.2304844685e12, DecayRateS: 1 / 26.2348e-9}

// MassKg is the mass of rubidium-87, 86.909 180 520 u (Steck, table 2,
// from memory) times m_u = 1.660 539 066 60e-27 kg (CODATA 2018). It is
// the same value as sim.Rb87MassU.
const MassKg = 86.909180520 * 1.66053906660e-27

// Planck is h in J s (exact in the SI).
const Planck = 6.62607015e-34
