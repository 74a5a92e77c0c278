package atom

import (
	"encoding/json"
	"math"
	"os"
	"testing"
)

type breitRabiRef struct {
	Numpy    string `json:"numpy"`
	Energies []struct {
		FieldG   float64 `json:"field_g"`
		F, M     int
		EnergyHz float64 `json:"energy_hz"`
	} `json:"energies"`
	Coefficients []struct {
		Lower, Upper [2]int
		BiasG        float64 `json:"bias_g"`
		Linear       float64 `json:"linear_hz_per_g"`
		Quadratic    float64 `json:"quadratic_hz_per_g2"`
	} `json:"coefficients"`
}

func loadBreitRabi(t *testing.T) breitRabiRef {
	t.Helper()
	buf, err := os.ReadFile("../testdata/reference/breit_rabi.json")
	if err != nil {
		t.Fatal(err)
	}
	var r breitRabiRef
	if err := json.Unmarshal(buf, &r); err != nil {
		t.Fatal(err)
	}
	return r
}

// TestEnergyAgainstDiagonalisation compares the Breit-Rabi formula with a
// numpy diagonalisation of the 8x8 hyperfine + Zeeman Hamiltonian
// (testdata/reference/breit_rabi.py), up to 5000 G where the levels have
// crossed into the Paschen-Back regime.
func TestEnergyAgainstDiagonalisation(t *testing.T) {
	ref := loadBreitRabi(t)
	if len(ref.Energies) != 8*8 {
		t.Fatalf("got %d reference energies, want 64", len(ref.Energies))
	}
	// Absolute tolerance 1e-4 Hz: eigh's rounding on levels of 7e9 Hz is
	// about 1e-5 Hz (numpy ref.Numpy); the achieved error is below 1e-5.
	const tol = 1e-4
	for _, e := range ref.Energies {
		got := State{e.F, e.M}.EnergyHz(e.FieldG)
		if math.Abs(got-e.EnergyHz) > tol {
			t.Errorf("|%d,%d> at %g G: got %.6f Hz, want %.6f Hz (numpy %s, tol %g)", e.F, e.M, e.FieldG, got, e.EnergyHz, ref.Numpy, tol)
		}
	}
}

// TestCoefficientsAgainstDiagonalisation checks the analytic derivatives
// against central differences of the diagonalised energies.
func TestCoefficientsAgainstDiagonalisation(t *testing.T) {
	ref := loadBreitRabi(t)
	for _, c := range ref.Coefficients {
		p := Pair{State{c.Lower[0], c.Lower[1]}, State{c.Upper[0], c.Upper[1]}}
		lin, quad := p.Coefficients(c.BiasG)
		// Absolute tolerances: the differences' truncation and rounding
		// (breit_rabi.py's docstring) are about 1e-3 Hz/G and Hz/G^2;
		// the margin is 10x.
		if math.Abs(lin-c.Linear) > 1e-2 {
			t.Errorf("%v at %g G linear: got %.6f Hz/G, want %.6f (tol 1e-2)", p, c.BiasG, lin, c.Linear)
		}
		if math.Abs(quad-c.Quadratic) > 1e-2 {
			t.Errorf("%v at %g G quadratic: got %.6f Hz/G^2, want %.6f (tol 1e-2)", p, c.BiasG, quad, c.Quadratic)
		}
	}
}

// TestPublishedCoefficients checks the figures the literature quotes.
func TestPublishedCoefficients(t *testing.T) {
	for _, c := range []struct {
		name      string
		pair      Pair
		bias      float64
		lin, quad float64
		linTol    float64 // absolute, Hz/G
		quadTol   float64 // absolute, Hz/G^2
	}{
		// Steck, "Rubidium 87 D Line Data", section 2.4.2 (eq. (33)):
		// the clock transition's 575.15 Hz/G^2; no linear shift at 0 G.
		{"clock", Pair{State{1, 0}, State{2, 0}}, 0, 0, 575.15, 1e-9, 0.01},
		// Issue 12's -2.1 MHz/G for |1,-1>-|2,-2>, i.e. -3 x 0.70 MHz/G
		// (g_F = +-1/2, Steck table 6); two digits, so tolerance 0.01 MHz/G.
		{"stretched", Pair{State{1, -1}, State{2, -2}}, 0, -2.1e6, 0, 1e4, 1e3},
	} {
		lin, quad := c.pair.Coefficients(c.bias)
		if math.Abs(lin-c.lin) > c.linTol {
			t.Errorf("%s linear: got %g Hz/G, want %g (tol %g)", c.name, lin, c.lin, c.linTol)
		}
		if c.quadTol > 0 && math.Abs(quad-c.quad) > c.quadTol {
			t.Errorf("%s quadratic: got %g Hz/G^2, want %g (tol %g)", c.name, quad, c.quad, c.quadTol)
		}
	}
	// The "magic" field of the two-photon pair |1,-1>-|2,1>, 3.229 G
	// (common practice in trapped-atom clocks, from memory): the linear
	// coefficient changes sign within 0.01 G of it.
	magic := Pair{State{1, -1}, State{2, 1}}
	lo, _ := magic.Coefficients(3.219)
	hi, _ := magic.Coefficients(3.239)
	if !(lo < 0 && hi > 0) {
		t.Errorf("|1,-1>-|2,1> linear coefficient at 3.219 G and 3.239 G: %g and %g Hz/G, want a sign change (magic field 3.229 G, from memory)", lo, hi)
	}
}

// TestLinearLimit checks dE/dB at zero field against g_F mu_B m_F, and
// g_F against Steck's rounded +-0.70 MHz/G per unit of m_F (table 6).
func TestLinearLimit(t *testing.T) {
	for _, s := range []State{{1, -1}, {1, 0}, {1, 1}, {2, -2}, {2, -1}, {2, 0}, {2, 1}, {2, 2}} {
		_, d1, _ := s.derivatives(0)
		want := s.LandeG() * BohrMagnetonHzPerG * float64(s.M)
		// Relative 1e-12: both are exact expressions of the same constants.
		if math.Abs(d1-want) > 1e-12*BohrMagnetonHzPerG {
			t.Errorf("%v: dE/dB(0) = %.9g Hz/G, want g_F mu_B m = %.9g", s, d1, want)
		}
		perM := s.LandeG() * BohrMagnetonHzPerG
		steck := 0.70e6
		if s.F == 1 {
			steck = -0.70e6
		}
		// Steck prints two digits: tolerance 0.005 MHz/G.
		if math.Abs(perM-steck) > 0.005e6 {
			t.Errorf("%v: g_F mu_B = %g Hz/G, want %g (Steck, tol 5e3)", s, perM, steck)
		}
	}
}

func TestPresetsValid(t *testing.T) {
	for _, p := range Presets {
		if err := p.Pair.Validate(); err != nil {
			t.Errorf("preset %s: %v", p.Key, err)
		}
	}
	if _, err := LookupPreset("nope"); err == nil {
		t.Error("LookupPreset accepted an unknown key")
	}
	if err := (Pair{State{2, 0}, State{1, 0}}).Validate(); err == nil {
		t.Error("a pair in the wrong order validated")
	}
	if err := (State{1, 2}).Validate(); err == nil {
		t.Error("|1,2> validated")
	}
}
