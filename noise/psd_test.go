package noise

import (
	"math"
	"testing"
)

// relErr returns |got - want| / |want|, or |got| when want is zero.
func relErr(got, want float64) float64 {
	if want == 0 {
		return math.Abs(got)
	}
	return math.Abs(got-want) / math.Abs(want)
}

// densityOnly hides any Integral method, forcing Variance onto quadrature.
type densityOnly struct{ PSD }

func TestWhiteAndSum(t *testing.T) {
	// All wants are closed forms: a constant integrates to level × width, and
	// the densities and integrals of a sum add.
	sum := Sum{White{Level: 3}, PowerLaw{H: 2, Alpha: -1}}
	tests := []struct {
		name      string
		got, want float64
		tol       float64 // relative
	}{
		{"White density", White{Level: 3}.Density(17), 3, 0},
		{"White integral", White{Level: 3}.Integral(2, 7), 15, 1e-15},
		{"Sum density at 4 Hz", sum.Density(4), 3 + 2.0/4, 1e-15},
		{"Sum integral [1, e] Hz", sum.Integral(1, math.E), 3*(math.E-1) + 2, 1e-15},
		{"Sum of a quadrature-only term", Sum{densityOnly{White{Level: 3}}}.Integral(2, 7), 15, 1e-14},
	}
	for _, tt := range tests {
		if e := relErr(tt.got, tt.want); e > tt.tol {
			t.Errorf("%s: got %v, want %v (rel tol %g)", tt.name, tt.got, tt.want, tt.tol)
		}
	}
}

func TestPowerLawIntegralNearFlicker(t *testing.T) {
	// As alpha -> -1 the closed form (b^k - a^k)/k, k = alpha+1, tends to
	// ln(b/a); the expm1 form must follow it smoothly instead of cancelling.
	// Want: ln(100) + k ln(100)²/2 (first-order Taylor term of (e^{kL}-1)/k).
	const l = 4.605170185988092 // ln 100
	for _, k := range []float64{0, 1e-12, -1e-9, 1e-6} {
		got := powerLawIntegral(1, 1, -1+k, 1, 100)
		want := l + k*l*l/2
		if e := relErr(got, want); e > 1e-11 {
			t.Errorf("k = %g: got %v, want %v (rel tol 1e-11)", k, got, want)
		}
	}
}
