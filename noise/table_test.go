package noise

import (
	"math"
	"strings"
	"testing"
)

func TestNewTableErrors(t *testing.T) {
	// Each invalid table gets its own message; want is a substring of it.
	nan := math.NaN()
	tests := []struct {
		name    string
		f, s    []float64
		wantErr string
	}{
		{"length mismatch", []float64{1, 2}, []float64{1}, "2 frequencies but 1 densities"},
		{"empty", nil, nil, "no points"},
		{"NaN frequency", []float64{1, nan}, []float64{1, 1}, "point 1: frequency NaN Hz is not finite"},
		{"zero frequency", []float64{0, 1}, []float64{1, 1}, "point 0: frequency 0 Hz is not positive"},
		{"repeated frequency", []float64{1, 1}, []float64{1, 1}, "point 1: frequency 1 Hz is not above the previous point (1 Hz)"},
		{"decreasing frequency", []float64{2, 1}, []float64{1, 1}, "point 1: frequency 1 Hz is not above"},
		{"infinite density", []float64{1, 2}, []float64{1, math.Inf(1)}, "point 1: density +Inf is not finite"},
		{"zero density", []float64{1, 2}, []float64{0, 1}, "point 0: density 0 is not positive"},
	}
	for _, tt := range tests {
		_, err := NewTable(tt.f, tt.s)
		if err == nil || !strings.Contains(err.Error(), tt.wantErr) {
			t.Errorf("%s: got error %v, want one containing %q", tt.name, err, tt.wantErr)
		}
	}
}

func TestTable(t *testing.T) {
	// Points 1e-20 at 10 Hz, 1e-22 at 100 Hz (slope -2), 1e-22 at 1 kHz (flat).
	tab, err := NewTable([]float64{10, 100, 1000}, []float64{1e-20, 1e-22, 1e-22})
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name      string
		got, want float64
		tol       float64 // relative
	}{
		// Log-log interpolation passes through the points and, at the geometric
		// mean of two frequencies, gives the geometric mean of their densities.
		{"at a point", tab.Density(100), 1e-22, 1e-15},
		{"geometric midpoint", tab.Density(math.Sqrt(10 * 100)), 1e-21, 1e-14},
		{"on the f^-2 segment", tab.Density(20), 1e-20 / 4, 1e-14},
		// Constant extrapolation outside the table (documented choice).
		{"below the table", tab.Density(1), 1e-20, 0},
		{"at zero", tab.Density(0), 1e-20, 0},
		{"above the table", tab.Density(1e6), 1e-22, 0},
		// Integrals by hand: 1e-20 × 10 below 10 Hz; ∫_10^100 1e-18 f^-2 =
		// 1e-18 (1/10 - 1/100) = 9e-20; 1e-22 × 900 up to 1 kHz; 1e-22 × 1000 above.
		{"integral below", tab.Integral(0, 10), 1e-19, 1e-15},
		{"integral of the f^-2 segment", tab.Integral(10, 100), 9e-20, 1e-14},
		{"integral across all pieces", tab.Integral(0, 2000), 1e-19 + 9e-20 + 9e-20 + 1e-19, 1e-14},
		{"integral inside one segment", tab.Integral(20, 50), 1e-18 * (1.0/20 - 1.0/50), 1e-14},
		{"integral above", tab.Integral(2000, 3000), 1e-19, 1e-14},
		// Invariant: the closed form agrees with quadrature of Density, taken
		// piece by piece because Gauss-Legendre is not exact across a kink.
		{"integral vs quadrature", tab.Integral(3, 3000), Variance(densityOnly{tab}, 3, 10) +
			Variance(densityOnly{tab}, 10, 100) + Variance(densityOnly{tab}, 100, 1000) +
			Variance(densityOnly{tab}, 1000, 3000), 1e-13},
	}
	for _, tt := range tests {
		if e := relErr(tt.got, tt.want); e > tt.tol {
			t.Errorf("%s: got %v, want %v (rel tol %g)", tt.name, tt.got, tt.want, tt.tol)
		}
	}
}

func TestTableSinglePoint(t *testing.T) {
	// One point is a white PSD under constant extrapolation.
	tab, err := NewTable([]float64{50}, []float64{4})
	if err != nil {
		t.Fatal(err)
	}
	if got, want := tab.Integral(0, 10), 40.0; relErr(got, want) > 1e-15 {
		t.Errorf("got %v, want %v (rel tol 1e-15)", got, want)
	}
}

func TestNewTableCopies(t *testing.T) {
	f, s := []float64{1, 2}, []float64{1, 1}
	tab, err := NewTable(f, s)
	if err != nil {
		t.Fatal(err)
	}
	s[0] = 100
	if got := tab.Density(1); got != 1 {
		t.Errorf("Density after the caller changed its slice: got %v, want 1", got)
	}
}
