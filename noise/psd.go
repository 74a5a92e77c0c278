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

// powerLawIntegral returns ∫_a^b s0 (f/f0)^alpha df for 0 < a <= b. With
// k = alpha + 1 and L = ln(b/a) it is written from the end that dominates,
//
//	s0 (b/f0)^alpha b (1 - exp(-k L))/k   for k > 0,
//	s0 (a/f0)^alpha a (exp(k L) - 1)/k    for k < 0,
//	s0 (a/f0)^alpha a L                   for k = 0,
//
// so that neither cancellation as k -> 0 nor overflow of exp(k L) over a wide
// band spoils a finite result.
func powerLawIntegral(s0, f0, alpha, a, b float64) float64 {
	if a == b {
		return 0
	}
	k := alpha + 1
	l := logRatio(b, a)
	switch {
	case k > 0:
		return s0 * ratioPow(b, f0, alpha) * b * (-math.Expm1(-k*l) / k)
	case k < 0:
		return s0 * ratioPow(a, f0, alpha) * a * (math.Expm1(k*l) / k)
	}
	return s0 * ratioPow(a, f0, alpha) * a * l
}

// logRatio returns ln(b/a) for positive a, b, from the ratio where it is a
// normal float64 (more accurate) and from the two logarithms where it would
// overflow or underflow.
func logRatio(b, a float64) float64 {
	if r := b / a; r >= 0x1p-1022 && r <= math.MaxFloat64 {
		return math.Log(r)
	}
	return math.Log(b) - math.Log(a)
}

// ratioPow returns (b/a)^alpha for positive a, b, also where b/a itself is
// out of the range of float64.
func ratioPow(b, a, alpha float64) float64 {
	if r := b / a; r >= 0x1p-1022 && r <= math.MaxFloat64 {
		return math.Pow(r, alpha)
	}
	return math.Exp(alpha * logRatio(b, a))
}
