package noise

import (
	"math"
	"testing"
)

func TestVariance(t *testing.T) {
	// The quadrature path (densityOnly) must reproduce the closed forms of
	// powerlaw_test.go over many decades; the Integrable path is the closed form.
	tests := []struct {
		name      string
		s         PSD
		fLow, fHi float64
		want      float64
		tol       float64 // relative
	}{
		{"quadrature white", densityOnly{White{Level: 3}}, 2, 7, 15, 1e-14},
		{"quadrature 1/f² over 6 decades", densityOnly{PowerLaw{H: 2, Alpha: -2}}, 1e-3, 1e3, 2 * (1e3 - 1e-3), 1e-13},
		{"quadrature 1/f over 8 decades", densityOnly{PowerLaw{H: 1, Alpha: -1}}, 1e-4, 1e4, 8 * math.Ln10, 1e-13},
		{"quadrature f² (white PM)", densityOnly{PowerLaw{H: 3, Alpha: 2}}, 1, 1e3, 1e9 - 1, 1e-13},
		{"quadrature of a narrow band", densityOnly{PowerLaw{H: 1, Alpha: -2}}, 1, 1 + 1e-9, 1 - 1/(1+1e-9), 1e-6},
		{"closed form from 0", White{Level: 3}, 0, 7, 21, 1e-15},
		{"empty band", densityOnly{White{Level: 3}}, 0, 0, 0, 0},
	}
	for _, tt := range tests {
		got := Variance(tt.s, tt.fLow, tt.fHi)
		if e := relErr(got, tt.want); e > tt.tol {
			t.Errorf("%s: got %v, want %v (rel tol %g)", tt.name, got, tt.want, tt.tol)
		}
	}
	// RMS is the square root: sqrt(3 × (7 - 3)) = sqrt(12).
	if got, want := RMS(White{Level: 3}, 3, 7), math.Sqrt(12); relErr(got, want) > 1e-15 {
		t.Errorf("RMS: got %v, want %v (rel tol 1e-15)", got, want)
	}
}

func TestVariancePanics(t *testing.T) {
	tests := []struct {
		name      string
		s         PSD
		fLow, fHi float64
	}{
		{"inverted band", White{Level: 1}, 2, 1},
		{"negative edge", White{Level: 1}, -1, 1},
		{"NaN edge", White{Level: 1}, math.NaN(), 1},
		{"quadrature from 0", densityOnly{White{Level: 1}}, 0, 1},
		{"quadrature to Inf", densityOnly{White{Level: 1}}, 1, math.Inf(1)},
	}
	for _, tt := range tests {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("%s: Variance did not panic", tt.name)
				}
			}()
			Variance(tt.s, tt.fLow, tt.fHi)
		}()
	}
}
