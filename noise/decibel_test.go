package noise

import (
	"math"
	"testing"
)

func TestDecibelConversions(t *testing.T) {
	// IEEE Std 1139-2008: L(f) = S_φ(f)/2, so L = -100 dBc/Hz is
	// S_φ = 2 × 10^-10 rad²/Hz and L = 0 dBc/Hz is 2 rad²/Hz. RIN is
	// 10 log10 S_ε (one-sided, common practice of laser data sheets), so
	// -140 dB/Hz is 1e-14 /Hz and -3.0103 dB/Hz (10 log10 0.5) is 0.5 /Hz.
	tests := []struct {
		name      string
		got, want float64
		tol       float64 // relative for densities, absolute (dB) for levels
	}{
		{"L -100 dBc/Hz to S_phi", PhaseFromDBc(-100), 2e-10, 1e-15},
		{"L 0 dBc/Hz to S_phi", PhaseFromDBc(0), 2, 1e-15},
		{"S_phi 2e-10 to L", DBcFromPhase(2e-10), -100, 1e-12},
		{"S_phi 2e-13 to L", DBcFromPhase(2e-13), -130, 1e-12},
		{"RIN -140 dB/Hz to S_eps", IntensityFromRIN(-140), 1e-14, 1e-15},
		{"RIN 10 log10 0.5 to S_eps", IntensityFromRIN(10 * math.Log10(0.5)), 0.5, 1e-15},
		{"S_eps 1e-14 to RIN", RINFromIntensity(1e-14), -140, 1e-12},
	}
	for _, tt := range tests {
		var e float64
		if tt.want < 0 {
			e = math.Abs(tt.got - tt.want)
		} else {
			e = relErr(tt.got, tt.want)
		}
		if e > tt.tol {
			t.Errorf("%s: got %v, want %v (tol %g)", tt.name, tt.got, tt.want, tt.tol)
		}
	}
	// Invariant: the conversions are inverse pairs.
	for _, l := range []float64{-170, -93.5, 0, 12} {
		if got := DBcFromPhase(PhaseFromDBc(l)); math.Abs(got-l) > 1e-12 {
			t.Errorf("L round trip %v dBc/Hz: got %v (abs tol 1e-12)", l, got)
		}
		if got := RINFromIntensity(IntensityFromRIN(l)); math.Abs(got-l) > 1e-12 {
			t.Errorf("RIN round trip %v dB/Hz: got %v (abs tol 1e-12)", l, got)
		}
	}
}
