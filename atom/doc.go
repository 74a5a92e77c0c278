// Package atom holds the rubidium-87 data rampart's perturbation sources need:
// the ground-state Zeeman shifts (Breit-Rabi formula) that make a magnetic
// field a differential phase between the two spin states of the arms, and
// the photon scattering rate of a far-detuned lattice from the D1 and D2
// lines.
//
// Units: frequencies are E/h in Hz, magnetic fields in gauss (1 G = 1e-4 T,
// the unit of the atomic-physics tables), wavelengths in m (vacuum),
// rates in 1/s. See docs/model.md, section Perturbations.
//
// Every constant names its source. Values marked "from memory" were not
// checked against the printed table in this repository's history.
package atom
