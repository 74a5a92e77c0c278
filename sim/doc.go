// Package sim simulates one atom in a ring-shaped optical lattice whose two
// spin-dependent copies are counter-rotated to form a guided Sagnac
// interferometer.
//
// Units are SI throughout: angles in rad, times in s, angular velocities in
// rad/s, lengths in m, masses in kg. Energies enter as angular frequencies
// E/hbar in rad/s inside the propagator; exported quantities named ...Hz are
// E/h in Hz, the cold-atom habit.
//
// Conventions (docs/model.md, Hamiltonian and Interferometer and signs):
//
//	V(theta) = -V0 cos^2(N (theta - a) / 2),  V0 > 0
//	H        = E_rot l^2 + V,                 E_rot = hbar^2 / (2 I),  I = m R^2
//	a_s(t)   = s phi(t) + Omega_bg t,         s = +1, -1 (the two arms)
//	z        = <psi_-(T) | psi_+(T)>,         C = |z|,  Phi = arg z
//
// An adiabatic sequence gives z ~ exp(+i Phi_S) with the Sagnac phase
// Phi_S = 2 I phi(T) Omega_bg / hbar.
//
// Each arm is propagated in the frame that moves with its lattice, where the
// Hamiltonian is
//
//	H' = E_rot l^2 - hbar w(t) l + V(theta),  w = da/dt,
//
// which splits into N independent blocks (quasi-momentum classes l mod N),
// each a real symmetric tridiagonal matrix. While w and the depth are
// constant, H' does not depend on time and a stretch of any length is one
// exact step in the eigenbasis of the blocks.
//
// Numerics (docs/model.md, Numerics). The truncated momentum window shifts
// the blocks' eigenvalues, and an exact step of length T turns that shift
// into a phase error that grows with T, so AutoNumerics widens the window
// with the sequence time (CruiseTail) to hold the contrast to
// ContrastTarget and the phase to PhaseTargetRad up to at least 10^4 laps.
// EstimateError measures a nominal shot's error against a shot on twice the
// grid and half the step (what `shot --check` prints), and says what to set
// when the targets are missed.
//
// Gyroscope figures (docs/model.md, Gyroscope figures). Simulator.Gyro
// splits a shot's phase into the bias at zero rotation and the scale factor
// dPhi/dOmega (IEEE Std 952-1997 terms), from a central difference in
// Omega; in the adiabatic limit the scale factor of the open arms is the
// nominal K whatever the speed, clock or skew error (the separation phase
// cancels the extra enclosed angle). Config.Warnings names inputs outside
// the model's validity.
package sim
