package noise

import "math"

// PhaseFromDBc converts single-sideband phase noise L(f) in dBc/Hz to the
// one-sided phase PSD S_φ(f) in rad^2/Hz,
//
//	S_φ(f) = 2 · 10^(L(f)/10),
//
// which is the definition of L(f) in IEEE Std 1139-2008 (L(f) = S_φ(f)/2),
// not the small-angle approximation of a measured sideband ratio.
func PhaseFromDBc(dBcHz float64) float64 { return 2 * math.Pow(10, dBcHz/10) }

// DBcFromPhase converts a one-sided phase PSD S_φ(f) in rad^2/Hz to L(f) in
// dBc/Hz, L(f) = 10 log10(S_φ(f)/2); the inverse of PhaseFromDBc.
func DBcFromPhase(rad2Hz float64) float64 { return 10 * math.Log10(rad2Hz/2) }

// IntensityFromRIN converts relative intensity noise RIN(f) in dB/Hz to the
// one-sided PSD of the fractional intensity ε = δI/I in 1/Hz,
//
//	S_ε(f) = 10^(RIN(f)/10).
//
// RIN figures are one-sided by the usual convention of laser data sheets; a
// two-sided figure must first be raised by 10 log10 2 ≈ 3.01 dB.
func IntensityFromRIN(dBHz float64) float64 { return math.Pow(10, dBHz/10) }

// RINFromIntensity converts a one-sided fractional-intensity PSD S_ε(f) in
// 1/Hz to RIN(f) = 10 log10 S_ε(f) in dB/Hz; the inverse of IntensityFromRIN.
func RINFromIntensity(perHz float64) float64 { return 10 * math.Log10(perHz) }
