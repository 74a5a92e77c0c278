package noise

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

func TestAllanDeviationExact(t *testing.T) {
	const tau0 = 0.5
	n := 64
	drift := make([]float64, n)
	alternating := make([]float64, n)
	constant := make([]float64, n)
	const d = 1e-3 // frequency drift per second
	for i := range n {
		drift[i] = d * (float64(i) + 0.5) * tau0 // average of y = d t over sample i
		alternating[i] = float64(1 - 2*(i%2))
		constant[i] = 7
	}
	tests := []struct {
		name string
		y    []float64
		m    int
		want float64
		tol  float64 // absolute
	}{
		// Linear frequency drift D gives σ_y(τ) = D τ/√2 (Riley, NIST SP 1065,
		// section on drift; follows from the definition).
		{"drift m=1", drift, 1, d * tau0 / math.Sqrt2, 1e-15},
		{"drift m=8", drift, 8, d * 8 * tau0 / math.Sqrt2, 1e-14},
		{"drift m=32", drift, 32, d * 32 * tau0 / math.Sqrt2, 1e-14},
		// ±1 alternating: successive values differ by 2, σ² = 2²/2; averages
		// over pairs are all 0. By hand from the definition.
		{"alternating m=1", alternating, 1, math.Sqrt2, 1e-15},
		{"alternating m=2", alternating, 2, 0, 1e-15},
		{"constant", constant, 4, 0, 0},
	}
	for _, tt := range tests {
		got := AllanDeviation(tt.y, tau0, []int{tt.m})[0]
		if math.Abs(got-tt.want) > tt.tol {
			t.Errorf("%s: got %v, want %v (abs tol %g)", tt.name, got, tt.want, tt.tol)
		}
	}
}

// allanExpected returns the expected overlapping Allan variance at τ = m τ0 of
// point samples, τ0 = 1 s apart, of a stationary process with one-sided PSD s
// restricted to band: averaging m samples and differencing has the transfer
// function 2 sin⁴(π f m)/(m sin π f)², so
//
//	E σ_y²(m) = ∫_band S(f) 2 sin⁴(π f m)/(m sin π f)² df,
//
// which tends to the continuous 2 ∫ S sin⁴(π f τ)/(π f τ)² df of IEEE Std
// 1139 for m >> 1. It is integrated by 16-point Gauss-Legendre on quarter
// decades up to 1/(8m) and on cells of width 1/(8m) above.
func allanExpected(s PSD, band Band, m int) float64 {
	g := func(f float64) float64 {
		x := math.Sin(math.Pi * f * float64(m))
		d := float64(m) * math.Sin(math.Pi*f)
		return s.Density(f) * 2 * x * x * x * x / (d * d)
	}
	gl := func(a, b float64) float64 {
		var sum float64
		for k, x := range gaussLegendre16.x {
			sum += gaussLegendre16.w[k] * g(a+(x+1)/2*(b-a))
		}
		return sum * (b - a) / 2
	}
	cell := 1 / (8 * float64(m))
	var v float64
	a := band.LowHz
	for a < math.Min(cell, band.HighHz) {
		b := math.Min(a*math.Pow(10, 0.25), math.Min(cell, band.HighHz))
		v += gl(a, b)
		a = b
	}
	for a < band.HighHz {
		b := math.Min(a+cell, band.HighHz)
		v += gl(a, b)
		a = b
	}
	return v
}

func TestAllanPowerLaws(t *testing.T) {
	// IEEE Std 1139 relations between S_y(f) = h_α f^α and the Allan variance
	// (white and random walk FM as tabulated from the standard in the
	// allantools examples ieee1139_white_fm.py and ieee1139_randomwalk_fm.py;
	// flicker FM from memory, re-derived: σ² = 2 ∫ S_y sin⁴(πfτ)/(πfτ)² df
	// gives 2 h_-1 ∫_0^∞ sin⁴x/x³ dx = 2 ln2 h_-1, the integral checked
	// numerically to 1e-7):
	//   white FM       α =  0:  σ² = h_0/(2τ)
	//   flicker FM     α = -1:  σ² = 2 ln2 h_-1
	//   random walk FM α = -2:  σ² = (2π²/3) h_-2 τ
	// They assume an infinite band and τ-averages; synthesised series are
	// band-limited point samples, whose expected Allan variance allanExpected
	// computes. Their relative difference is allowed on top of 4 standard
	// errors of the mean over R realisations (sample standard deviation / √R).
	// It is below 0.1% for white FM, 0.9% for flicker at m = 8 (sampling) and
	// 1.5% for random walk at m = 4; the random walk band starts at
	// 1/(64 n τ0) because the default 1/(n τ0) would remove 3τ/(n τ0) of it.
	const tau0, r = 1.0, 200
	tests := []struct {
		name    string
		s       PowerLaw
		n       int
		band    Band
		factors []int
		sigma2  func(tau float64) float64
	}{
		{"white FM", PowerLaw{H: 2e-20, Alpha: 0}, 4096, Band{}, []int{1, 4, 16, 64},
			func(tau float64) float64 { return 2e-20 / (2 * tau) }},
		{"flicker FM", PowerLaw{H: 3e-22, Alpha: -1}, 4096, Band{}, []int{8, 16, 32, 64},
			func(float64) float64 { return 2 * math.Ln2 * 3e-22 }},
		{"random walk FM", PowerLaw{H: 5e-24, Alpha: -2}, 2048, Band{LowHz: 1.0 / (64 * 2048)}, []int{4, 8, 16, 32},
			func(tau float64) float64 { return 2 * math.Pi * math.Pi / 3 * 5e-24 * tau }},
	}
	rng := rand.New(rand.NewPCG(7, 1))
	for _, tt := range tests {
		z, err := NewSynthesizer(tt.s, tt.n, tau0, tt.band)
		if err != nil {
			t.Fatal(err)
		}
		y := make([]float64, tt.n)
		sum := make([]float64, len(tt.factors))
		sum2 := make([]float64, len(tt.factors))
		for range r {
			z.Synthesize(y, rng)
			for i, a := range AllanDeviation(y, tau0, tt.factors) {
				sum[i] += a * a
				sum2[i] += a * a * a * a
			}
		}
		for i, m := range tt.factors {
			mean := sum[i] / r
			se := math.Sqrt((sum2[i]/r - mean*mean) * r / (r - 1) / r)
			want := tt.sigma2(float64(m) * tau0)
			bias := math.Abs(allanExpected(tt.s, z.Band(), m) - want)
			tol := 4*se + bias
			t.Logf("%s m=%d: got/want %.4f, se %.4f, bias %.4f", tt.name, m, mean/want, se/want, bias/want)
			if math.Abs(mean-want) > tol {
				t.Errorf("%s τ = %d τ0: σ² got %v, want %v (tol %.3g = 4 standard errors + band bias %.3g)", tt.name, m, mean, want, tol, bias)
			}
		}
	}
}

func TestOctaveFactors(t *testing.T) {
	// 2^⌊log2((n-1)/2)⌋ is the largest factor (MATLAB allanvar's default grid).
	tests := []struct {
		n    int
		want []int
	}{
		{2, nil},
		{3, []int{1}},
		{10, []int{1, 2, 4}},
		{17, []int{1, 2, 4, 8}},
		{4096, []int{1, 2, 4, 8, 16, 32, 64, 128, 256, 512, 1024}},
	}
	for _, tt := range tests {
		if got := OctaveFactors(tt.n); !slices.Equal(got, tt.want) {
			t.Errorf("OctaveFactors(%d): got %v, want %v", tt.n, got, tt.want)
		}
	}
}

func TestAllanDeviationPanics(t *testing.T) {
	y := make([]float64, 10)
	for _, m := range []int{0, 6} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("factor %d: AllanDeviation did not panic", m)
				}
			}()
			AllanDeviation(y, 1, []int{m})
		}()
	}
}

func BenchmarkAllanDeviation(b *testing.B) {
	for _, n := range []int{1024, 4096, 16384} {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			rng := rand.New(rand.NewPCG(1, 3))
			y := make([]float64, n)
			for i := range y {
				y[i] = rng.NormFloat64()
			}
			m := OctaveFactors(n)
			for b.Loop() {
				AllanDeviation(y, 1, m)
			}
		})
	}
}
