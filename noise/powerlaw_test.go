package noise

import (
	"math"
	"testing"
)

func TestPowerLaw(t *testing.T) {
	// Wants are the closed forms ∫_a^b h f^α df = h (b^(α+1) - a^(α+1))/(α+1)
	// and h ln(b/a) for α = -1, worked by hand.
	inf := math.Inf(1)
	tests := []struct {
		name      string
		p         PowerLaw
		fLow, fHi float64
		want      float64
		tol       float64 // relative
	}{
		{"white", PowerLaw{H: 3, Alpha: 0}, 2, 7, 15, 1e-15},
		{"white from 0", PowerLaw{H: 3, Alpha: 0}, 0, 7, 21, 1e-15},
		{"random walk 1/f²", PowerLaw{H: 2, Alpha: -2}, 1, 4, 1.5, 1e-15},
		{"flicker 1/f", PowerLaw{H: 2, Alpha: -1}, 10, 1000, 2 * math.Log(100), 1e-15},
		{"f² (white phase in S_y)", PowerLaw{H: 3, Alpha: 2}, 1, 2, 7, 1e-15},
		{"f² from 0", PowerLaw{H: 3, Alpha: 2}, 0, 2, 8, 1e-15},
		{"f^-1/2 from 0", PowerLaw{H: 1, Alpha: -0.5}, 0, 4, 4, 1e-15},
		{"flicker from 0 diverges", PowerLaw{H: 1, Alpha: -1}, 0, 4, inf, 0},
		{"1/f² from 0 diverges", PowerLaw{H: 1, Alpha: -2}, 0, 4, inf, 0},
		{"zero level from 0", PowerLaw{H: 0, Alpha: -2}, 0, 4, 0, 0},
		{"empty band", PowerLaw{H: 1, Alpha: -2}, 3, 3, 0, 0},
	}
	for _, tt := range tests {
		got := tt.p.Integral(tt.fLow, tt.fHi)
		if math.IsInf(tt.want, 1) {
			if !math.IsInf(got, 1) {
				t.Errorf("%s: got %v, want +Inf", tt.name, got)
			}
			continue
		}
		if e := relErr(got, tt.want); e > tt.tol {
			t.Errorf("%s: got %v, want %v (rel tol %g)", tt.name, got, tt.want, tt.tol)
		}
	}

	// Density: h f^α by definition (IEEE Std 1139).
	if got, want := (PowerLaw{H: 2e-20, Alpha: -2}).Density(10), 2e-22; relErr(got, want) > 1e-15 {
		t.Errorf("Density: got %v, want %v (rel tol 1e-15)", got, want)
	}
}
