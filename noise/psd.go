package noise

import "math"

// PSD is a one-sided power spectral density: Density returns S(f) in unit^2/Hz
// for a Fourier frequency f >= 0 in Hz. The integral of S over f >= 0 is the
// variance of the process.
type PSD interface {
	Density(f float64) float64
}

// Integrable is a PSD that knows its integral over a band in closed form.
// Variance and RMS use it instead of quadrature when a PSD implements it.
type Integrable interface {
	PSD
	// Integral returns ∫_fLow^fHigh S(f) df for 0 <= fLow <= fHigh,
	// in unit^2; it may be +Inf.
	Integral(fLow, fHigh float64) float64
}

// White is a flat one-sided PSD, S(f) = Level in unit^2/Hz.
type White struct {
	Level float64
}

// Density returns w.Level for every f.
func (w White) Density(f float64) float64 { return w.Level }

// Integral returns w.Level (fHigh - fLow).
func (w White) Integral(fLow, fHigh float64) float64 { return w.Level * (fHigh - fLow) }

// Sum is the PSD of a sum of independent processes: the densities add. The
// usual IEEE Std 1139 model of an oscillator is a Sum of PowerLaw terms.
type Sum []PSD

// Density returns the sum of the terms' densities at f.
func (s Sum) Density(f float64) float64 {
	var d float64
	for _, p := range s {
		d += p.Density(f)
	}
	return d
}

// Integral returns the sum of the terms' band integrals, each computed as
// Variance does.
func (s Sum) Integral(fLow, fHigh float64) float64 {
	var v float64
	for _, p := range s {
		v += Variance(p, fLow, fHigh)
	}
	return v
}

// powerLawIntegral returns ∫_a^b s0 (f/f0)^alpha df for 0 < a <= b, written as
//
//	s0 (a/f0)^alpha a (exp(k ln(b/a)) - 1)/k,  k = alpha + 1,
//
// which stays accurate as k -> 0, where it tends to s0 (a/f0)^alpha a ln(b/a).
func powerLawIntegral(s0, f0, alpha, a, b float64) float64 {
	if a == b {
		return 0
	}
	k := alpha + 1
	l := math.Log(b / a)
	g := l
	if k != 0 {
		g = math.Expm1(k*l) / k
	}
	return s0 * math.Pow(a/f0, alpha) * a * g
}
