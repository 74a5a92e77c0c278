package sim

import "math"

// Physical constants, CODATA 2018 (h and k_B are exact in the 2019 SI).
const (
	Planck         = 6.62607015e-34         // h, J s
	Hbar           = Planck / (2 * math.Pi) // J s
	Boltzmann      = 1.380649e-23           // k_B, J/K
	AtomicMassUnit = 1.66053906660e-27      // m_u, kg
)

// Rb87MassU is the mass of rubidium-87 in atomic mass units, the value of
// D. A. Steck, "Rubidium 87 D Line Data" (table 2) that docs/model.md
// (Units and constants) quotes; the revision was not checked here (2.3.x, from memory).
// The mass in kg is Rb87MassU times AtomicMassUnit (CODATA 2018), not the
// kg value older revisions print with an older m_u.
const Rb87MassU = 86.909180520
