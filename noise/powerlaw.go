package noise

import "math"

// PowerLaw is the one-sided PSD
//
//	S(f) = H f^Alpha,
//
// the power-law noise model of IEEE Std 1139. For the fractional frequency
// S_y(f) of an oscillator the usual types are Alpha = 2 (white phase), 1
// (flicker phase), 0 (white frequency), -1 (flicker frequency) and -2 (random
// walk of frequency); H is then h_α in Hz^(-1-α). For other quantities H
// carries unit^2 Hz^(-1-α).
//
// At f = 0 the density is +Inf for Alpha < 0; band integrals that reach f = 0
// diverge for Alpha <= -1, so such noise needs a band with a positive lower
// edge.
type PowerLaw struct {
	H     float64
	Alpha float64
}

// Density returns p.H f^p.Alpha.
func (p PowerLaw) Density(f float64) float64 { return p.H * math.Pow(f, p.Alpha) }

// Integral returns ∫_fLow^fHigh H f^Alpha df in closed form: H (fHigh^(α+1) -
// fLow^(α+1))/(α+1), or H ln(fHigh/fLow) for α = -1. It is +Inf when
// fLow = 0 < fHigh and Alpha <= -1.
func (p PowerLaw) Integral(fLow, fHigh float64) float64 {
	if fLow == fHigh || p.H == 0 {
		return 0
	}
	if fLow == 0 {
		k := p.Alpha + 1
		if k <= 0 {
			return math.Inf(1)
		}
		return p.H * math.Pow(fHigh, k) / k
	}
	return powerLawIntegral(p.H, 1, p.Alpha, fLow, fHigh)
}
