package noise

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// lineWeights returns W_j, the variance carried by line j of z.
func lineWeights(z *Synthesizer) []float64 {
	w := make([]float64, len(z.amp))
	for j, a := range z.amp {
		if j == len(z.amp)-1 {
			w[j] = a * a
		} else {
			w[j] = 4 * a * a
		}
	}
	return w
}

// autocovariance returns c(τ) = Σ_j W_j cos(2π j τ/m) for τ = 0 .. n-1
// samples, the exact covariance of the synthesised process.
func autocovariance(z *Synthesizer) []float64 {
	w := lineWeights(z)
	m := float64(z.FFTLength())
	c := make([]float64, z.Len())
	for tau := range c {
		for j := z.lo; j <= z.hi; j++ {
			c[tau] += w[j] * math.Cos(2*math.Pi*float64(j)*float64(tau)/m)
		}
	}
	return c
}

func TestNewSynthesizerErrors(t *testing.T) {
	white := White{Level: 1}
	tests := []struct {
		name    string
		s       PSD
		n       int
		dt      float64
		band    Band
		wantErr string
	}{
		{"one sample", white, 1, 1e-3, Band{}, "at least 2 samples, got 1"},
		{"zero step", white, 100, 0, Band{}, "time step 0 s is not positive and finite"},
		{"NaN step", white, 100, math.NaN(), Band{}, "time step NaN s"},
		{"inverted band", white, 100, 1e-3, Band{LowHz: 300, HighHz: 200}, "band [300, 200] Hz is empty or not positive"},
		{"negative low edge", white, 100, 1e-3, Band{LowHz: -1}, "band [-1, 500] Hz is empty"},
		{"above Nyquist", white, 100, 1e-3, Band{HighHz: 600}, "upper edge 600 Hz is above the Nyquist frequency 500 Hz"},
		{"low edge too low", white, 100, 1e-3, Band{LowHz: 1e-6}, "needs an FFT of 1e+09 points"},
		{"negative PSD", White{Level: -1}, 100, 1e-3, Band{}, "PSD integral over [10, 11.25] Hz is -1.25"},
		{"NaN PSD", PowerLaw{H: math.NaN()}, 100, 1e-3, Band{}, "is NaN, want finite and non-negative"},
	}
	for _, tt := range tests {
		_, err := NewSynthesizer(tt.s, tt.n, tt.dt, tt.band)
		if err == nil || !strings.Contains(err.Error(), tt.wantErr) {
			t.Errorf("%s: got error %v, want one containing %q", tt.name, err, tt.wantErr)
		}
	}
}

func TestSynthesizerVarianceIsBandIntegral(t *testing.T) {
	// The line weights are integrals of S over cells that tile the band, so
	// their sum is ∫_band S df to rounding (the closed forms of
	// powerlaw_test.go and table_test.go, or quadrature).
	tab, err := ReadPhaseNoise("testdata/phase_noise.csv")
	if err != nil {
		t.Fatal(err)
	}
	const n, dt = 1000, 1e-4
	tests := []struct {
		name string
		s    PSD
		band Band
	}{
		{"white, default band", White{Level: 2}, Band{}},
		{"1/f², default band", PowerLaw{H: 1, Alpha: -2}, Band{}},
		{"1/f, band below 1/(n dt)", PowerLaw{H: 1, Alpha: -1}, Band{LowHz: 0.37, HighHz: 4321}},
		{"phase-noise table", tab, Band{}},
		{"quadrature-only 1/f²", densityOnly{PowerLaw{H: 1, Alpha: -2}}, Band{LowHz: 3.3}},
	}
	for _, tt := range tests {
		z, err := NewSynthesizer(tt.s, n, dt, tt.band)
		if err != nil {
			t.Fatal(err)
		}
		b := z.Band()
		want := Variance(tt.s, b.LowHz, b.HighHz)
		if got := z.Variance(); relErr(got, want) > 1e-12 {
			t.Errorf("%s: got %v, want %v (rel tol 1e-12)", tt.name, got, want)
		}
		var sum float64
		for _, w := range lineWeights(z) {
			sum += w
		}
		if relErr(sum, want) > 1e-12 {
			t.Errorf("%s: line weights sum to %v, want %v (rel tol 1e-12)", tt.name, sum, want)
		}
		if m := z.FFTLength(); m < oversampling*n || float64(m) < 1/(b.LowHz*dt) || m%2 != 0 {
			t.Errorf("%s: FFT length %d, want even, >= %d and >= 1/(LowHz dt)", tt.name, m, oversampling*n)
		}
	}
}

func TestSynthesizerDefaultBand(t *testing.T) {
	// Band{} means 1/(n dt) .. 1/(2 dt): 10 Hz .. 5 kHz for n = 1000, dt = 0.1 ms.
	z, err := NewSynthesizer(White{Level: 1}, 1000, 1e-4, Band{})
	if err != nil {
		t.Fatal(err)
	}
	if got, want := z.Band(), (Band{LowHz: 10, HighHz: 5000}); relErr(got.LowHz, want.LowHz) > 1e-15 || relErr(got.HighHz, want.HighHz) > 1e-15 {
		t.Errorf("got %+v, want %+v (rel tol 1e-15)", got, want)
	}
}

func TestFastEvenLength(t *testing.T) {
	// Smallest even 2^a 3^b 5^c at or above k, by hand.
	tests := []struct{ k, want int }{
		{1, 2}, {3, 4}, {7, 8}, {11, 12}, {13, 16}, {4000, 4000}, {4001, 4050}, {4097, 4320}, {999999, 1000000},
	}
	for _, tt := range tests {
		if got := fastEvenLength(tt.k); got != tt.want {
			t.Errorf("fastEvenLength(%d): got %d, want %d", tt.k, got, tt.want)
		}
	}
}

func TestSynthesizerLineApproximation(t *testing.T) {
	// The variance of a weighted sum Σ_k h_k x_k of synthesised samples is
	// Σ_j W_j |H(f_j)|², H(f) = Σ_k h_k e^{2πi f k dt}; for the continuous
	// band-limited process it is ∫_band S |H|² df (computed here by 16-point
	// Gauss-Legendre on cells of width 1/(8 n dt)). Rows and tolerances
	// (relative) follow the measurements quoted at oversampling in
	// synthesize.go: the padding must remove the circular artefact on the
	// end-to-end difference x_{n-1} - x_0 (at m = n it comes out at 2% for
	// 1/f²), while the linear trend, dominated by the band's lower edge, is
	// over-weighted by about 10% for 1/f² at m = 4n.
	const n, dt = 256, 1e-3
	ends := func(k int) float64 {
		switch k {
		case 0:
			return -1
		case n - 1:
			return 1
		}
		return 0
	}
	trend := func(k int) float64 { return float64(k) - (n-1)/2.0 }
	tests := []struct {
		name   string
		alpha  float64
		weight func(k int) float64
		tol    float64
	}{
		{"end-to-end, white", 0, ends, 0.01},
		{"end-to-end, 1/f", -1, ends, 0.01},
		{"end-to-end, 1/f²", -2, ends, 0.01},
		{"linear trend, white", 0, trend, 0.06},
		{"linear trend, 1/f²", -2, trend, 0.12},
	}
	for _, tt := range tests {
		s := PowerLaw{H: 1, Alpha: tt.alpha}
		z, err := NewSynthesizer(s, n, dt, Band{})
		if err != nil {
			t.Fatal(err)
		}
		h2 := func(f float64) float64 {
			var re, im float64
			for k := range n {
				sin, cos := math.Sincos(2 * math.Pi * f * float64(k) * dt)
				re += tt.weight(k) * cos
				im += tt.weight(k) * sin
			}
			return re*re + im*im
		}
		w := lineWeights(z)
		df := 1 / (float64(z.FFTLength()) * dt)
		var got float64
		for j := z.lo; j <= z.hi; j++ {
			got += w[j] * h2(float64(j)*df)
		}
		b := z.Band()
		var want float64
		cell := 1 / (8 * n * dt)
		for a := b.LowHz; a < b.HighHz; a += cell {
			hi := math.Min(a+cell, b.HighHz)
			for k, x := range gaussLegendre16.x {
				f := a + (x+1)/2*(hi-a)
				want += gaussLegendre16.w[k] * (hi - a) / 2 * s.Density(f) * h2(f)
			}
		}
		t.Logf("%s: lines/continuous = %.4f", tt.name, got/want)
		if relErr(got, want) > tt.tol {
			t.Errorf("%s: got %v, want %v (rel tol %g)", tt.name, got, want, tt.tol)
		}
	}
}

func TestSynthesizeVariance(t *testing.T) {
	// The mean of x_k² over samples and R realisations estimates ∫_band S df
	// (closed form, powerlaw_test.go). Its standard error is exact for a
	// Gaussian process (L. Isserlis, Biometrika 12, 134 (1918):
	// Cov(x_k², x_l²) = 2 c(k-l)², with c the exact covariance of the lines):
	//   Var(mean over one series) = (2/n²) Σ_{k,l} c(k-l)²,
	// divided by R; the tolerance is 4 standard errors.
	const n, dt, r = 1024, 1e-3, 400
	tests := []struct {
		name string
		s    PSD
	}{
		{"white", White{Level: 3e-6}},
		{"random walk 1/f²", PowerLaw{H: 1e-4, Alpha: -2}},
		{"flicker 1/f", PowerLaw{H: 1e-4, Alpha: -1}},
	}
	rng := rand.New(rand.NewPCG(3, 1))
	for _, tt := range tests {
		z, err := NewSynthesizer(tt.s, n, dt, Band{})
		if err != nil {
			t.Fatal(err)
		}
		b := z.Band()
		want := Variance(tt.s, b.LowHz, b.HighHz)
		c := autocovariance(z)
		v := n * c[0] * c[0]
		for tau := 1; tau < n; tau++ {
			v += 2 * float64(n-tau) * c[tau] * c[tau]
		}
		se := math.Sqrt(2 * v / (n * n) / r)

		x := make([]float64, n)
		var sum float64
		for range r {
			z.Synthesize(x, rng)
			for _, v := range x {
				sum += v * v
			}
		}
		got := sum / (n * r)
		if math.Abs(got-want) > 4*se {
			t.Errorf("%s: got %v, want %v (tol %g = 4 standard errors)", tt.name, got, want, 4*se)
		}
	}
}

func TestSynthesizeWelch(t *testing.T) {
	// Welch estimates of synthesised series reproduce S(f_j) from bin 2 up
	// (welch.go: bins 0 and 1 are lowered by mean removal). R realisations of
	// K segments give a per-bin relative standard error of sqrt(1.06/(R K))
	// (welch.go, from memory), sqrt(2) more at Nyquist; tolerance 5 standard
	// errors plus, for 1/f², the window's smoothing bias: the Hann power
	// window has a second moment of 1/3 bin² (from Σ w'² / (4π² Σ w²)), so
	// S'' σ²/2 / S = 1/j² at bin j for S ∝ f^-2; compared from bin 16 (0.4%).
	const (
		n, l, dt, r = 16384, 256, 1e-3, 32
		k           = (n-l)/(l/2) + 1
	)
	tests := []struct {
		name     string
		s        PSD
		firstBin int
		bias     func(j int) float64
	}{
		{"white", White{Level: 2e-3}, 2, func(int) float64 { return 0 }},
		{"random walk 1/f²", PowerLaw{H: 1e-2, Alpha: -2}, 16, func(j int) float64 { return 1 / float64(j*j) }},
	}
	rng := rand.New(rand.NewPCG(4, 1))
	for _, tt := range tests {
		z, err := NewSynthesizer(tt.s, n, dt, Band{})
		if err != nil {
			t.Fatal(err)
		}
		x := make([]float64, n)
		mean := make([]float64, l/2+1)
		var freq []float64
		for range r {
			z.Synthesize(x, rng)
			f, s := Welch(x, dt, l)
			freq = f
			for j, v := range s {
				mean[j] += v / r
			}
		}
		se := math.Sqrt(1.06 / (r * k))
		for j := tt.firstBin; j <= l/2; j++ {
			want := tt.s.Density(freq[j])
			tol := 5*se + tt.bias(j)
			if j == l/2 {
				tol = 5*se*math.Sqrt2 + tt.bias(j)
			}
			if e := relErr(mean[j], want); e > tol {
				t.Errorf("%s bin %d (%g Hz): got %v, want %v (rel tol %.3g)", tt.name, j, freq[j], mean[j], want, tol)
			}
		}
	}
}

func TestSynthesizePair(t *testing.T) {
	// Pooled over R realisations of white noise (nearly independent samples),
	// the sample correlation of N = R n pairs has standard error
	// (1 - rho²)/sqrt(N) (large-N theory for the bivariate normal, R. A.
	// Fisher, Biometrika 10, 507 (1915); from memory); tolerance 4 standard
	// errors. rho = ±1 must give x2 = ±x1 exactly.
	const n, r = 8192, 8
	z, err := NewSynthesizer(White{Level: 1}, n, 1e-3, Band{})
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(5, 1))
	x1, x2 := make([]float64, n), make([]float64, n)
	for _, rho := range []float64{0, 0.5, -0.9, 0.99} {
		var s11, s22, s12 float64
		for range r {
			z.SynthesizePair(x1, x2, rho, rng)
			for k := range x1 {
				s11 += x1[k] * x1[k]
				s22 += x2[k] * x2[k]
				s12 += x1[k] * x2[k]
			}
		}
		got := s12 / math.Sqrt(s11*s22)
		tol := 4 * (1 - rho*rho) / math.Sqrt(n*r)
		if math.Abs(got-rho) > tol {
			t.Errorf("rho %v: got %v (abs tol %.3g)", rho, got, tol)
		}
	}
	for _, rho := range []float64{1, -1} {
		z.SynthesizePair(x1, x2, rho, rng)
		for k := range x1 {
			if x2[k] != rho*x1[k] {
				t.Fatalf("rho %v: x2[%d] = %v, want %v", rho, k, x2[k], rho*x1[k])
			}
		}
	}
	for _, rho := range []float64{1.01, math.NaN()} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("rho %v: SynthesizePair did not panic", rho)
				}
			}()
			z.SynthesizePair(x1, x2, rho, rng)
		}()
	}
}

func TestSynthesizeReproducible(t *testing.T) {
	// Equal seeds give equal series, from a clone too; the PSD level only
	// scales a realisation (common random numbers): S × 4 gives x × 2.
	z1, err := NewSynthesizer(White{Level: 1}, 500, 1e-3, Band{})
	if err != nil {
		t.Fatal(err)
	}
	z4, err := NewSynthesizer(White{Level: 4}, 500, 1e-3, Band{})
	if err != nil {
		t.Fatal(err)
	}
	a := z1.Synthesize(nil, rand.New(rand.NewPCG(6, 1)))
	b := z1.Clone().Synthesize(nil, rand.New(rand.NewPCG(6, 1)))
	c := z4.Synthesize(nil, rand.New(rand.NewPCG(6, 1)))
	for k := range a {
		if a[k] != b[k] {
			t.Fatalf("clone: sample %d is %v, want %v", k, b[k], a[k])
		}
		if math.Abs(c[k]-2*a[k]) > 1e-12*math.Abs(a[k])+1e-15 {
			t.Fatalf("level ×4: sample %d is %v, want %v", k, c[k], 2*a[k])
		}
	}

	defer func() {
		if recover() == nil {
			t.Errorf("Synthesize into a short slice did not panic")
		}
	}()
	z1.Synthesize(make([]float64, 499), rand.New(rand.NewPCG(6, 1)))
}

func BenchmarkSynthesize(b *testing.B) {
	for _, n := range []int{1024, 4096, 16384} {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			z, err := NewSynthesizer(PowerLaw{H: 1, Alpha: -2}, n, 1e-6, Band{})
			if err != nil {
				b.Fatal(err)
			}
			rng := rand.New(rand.NewPCG(1, 4))
			x := make([]float64, n)
			b.ReportAllocs()
			for b.Loop() {
				z.Synthesize(x, rng)
			}
		})
	}
}

func BenchmarkSynthesizePair(b *testing.B) {
	for _, n := range []int{1024, 4096, 16384} {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			z, err := NewSynthesizer(PowerLaw{H: 1, Alpha: -2}, n, 1e-6, Band{})
			if err != nil {
				b.Fatal(err)
			}
			rng := rand.New(rand.NewPCG(1, 5))
			x1, x2 := make([]float64, n), make([]float64, n)
			b.ReportAllocs()
			for b.Loop() {
				z.SynthesizePair(x1, x2, 0.5, rng)
			}
		})
	}
}

func BenchmarkNewSynthesizer(b *testing.B) {
	tab, err := ReadPhaseNoise("testdata/phase_noise.csv")
	if err != nil {
		b.Fatal(err)
	}
	for _, n := range []int{1024, 4096, 16384} {
		b.Run(fmt.Sprintf("table/n=%d", n), func(b *testing.B) {
			for b.Loop() {
				if _, err := NewSynthesizer(tab, n, 1e-6, Band{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
