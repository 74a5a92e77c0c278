package noise

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/integrate/quad"
)

// Variance returns the variance of the process with one-sided PSD s restricted
// to the band [fLow, fHigh] in Hz,
//
//	σ² = ∫_fLow^fHigh S(f) df,
//
// in unit^2. If s is Integrable its closed form is used. Otherwise the
// integral is computed in u = ln f, ∫ S(e^u) e^u du, by 16-point
// Gauss-Legendre quadrature on each quarter decade, accurate to rounding for
// power laws f^α with |α| up to about 10 and for sums of them; that path
// needs 0 < fLow and fHigh < Inf, and panics otherwise. Variance panics unless 0 <= fLow <= fHigh.
func Variance(s PSD, fLow, fHigh float64) float64 {
	if !(0 <= fLow && fLow <= fHigh) {
		panic(fmt.Sprintf("noise: band [%g, %g] Hz is not 0 <= fLow <= fHigh", fLow, fHigh))
	}
	if fLow == fHigh {
		return 0
	}
	if p, ok := s.(Integrable); ok {
		return p.Integral(fLow, fHigh)
	}
	if fLow == 0 {
		panic("noise: numerical band integral of a PSD needs fLow > 0")
	}
	if math.IsInf(fHigh, 1) {
		panic("noise: numerical band integral of a PSD needs a finite fHigh")
	}
	return logQuadrature(s, fLow, fHigh)
}

// RMS returns the root-mean-square amplitude sqrt(Variance(s, fLow, fHigh)) of
// the process with one-sided PSD s in the band [fLow, fHigh] Hz, in unit.
func RMS(s PSD, fLow, fHigh float64) float64 {
	return math.Sqrt(Variance(s, fLow, fHigh))
}

// gaussLegendre16 holds the 16-point Gauss-Legendre nodes and weights on
// [-1, 1]: exact for polynomials of degree 31.
var gaussLegendre16 = func() (r struct{ x, w [16]float64 }) {
	quad.Legendre{}.FixedLocations(r.x[:], r.w[:], -1, 1)
	return r
}()

// logQuadrature integrates s over [a, b], 0 < a < b < Inf, in u = ln f.
func logQuadrature(s PSD, a, b float64) float64 {
	const segment = math.Ln10 / 4
	ua, ub := math.Log(a), math.Log(b)
	n := max(int(math.Ceil((ub-ua)/segment)), 1)
	h := (ub - ua) / float64(n)
	var sum float64
	for i := range n {
		mid := ua + (float64(i)+0.5)*h
		for j, x := range gaussLegendre16.x {
			f := math.Exp(mid + x*h/2)
			sum += gaussLegendre16.w[j] * s.Density(f) * f
		}
	}
	return sum * h / 2
}
