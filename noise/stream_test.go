package noise

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

func pcg(a, b uint64) func() *rand.Rand {
	return func() *rand.Rand { return rand.New(rand.NewPCG(a, b)) }
}

func TestStreamWelch(t *testing.T) {
	// One long streamed record, read in chunks that straddle the blocks,
	// reproduces S(f_j) under Welch's estimate (welch.go) from bin 2 up:
	// K half-overlapping Hann segments give a per-bin relative standard
	// error of sqrt(1.06/K) (welch.go: F. J. Harris, Proc. IEEE 66, 51
	// (1978), Table 1), sqrt(2) more at Nyquist. Tolerance: 5 standard
	// errors plus, for the red spectra, the Hann window's smoothing bias
	// S'' σ²/2 / S with σ² = 1/3 bin² (TestSynthesizeWelch): 1/j² at bin j
	// for S ∝ f^-2, compared from bin 16 as there; the table falls as
	// f^-2 from 1 to 100 Hz and is flat above, so the same bound holds.
	// Measured: the largest error is 0.5 to 0.65 of its tolerance.
	const (
		dt, l = 1e-3, 256
		n     = 1 << 19
		k     = (n-l)/(l/2) + 1
	)
	table, err := NewTable([]float64{1, 20, 100, 500}, []float64{1e-2, 2.5e-5, 1e-6, 1e-6})
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name     string
		s        PSD
		firstBin int
		bias     func(j int) float64
	}{
		{"white", White{Level: 2e-3}, 2, func(int) float64 { return 0 }},
		{"random walk 1/f²", PowerLaw{H: 1e-2, Alpha: -2}, 16, func(j int) float64 { return 1 / float64(j*j) }},
		{"table", table, 16, func(j int) float64 { return 1 / float64(j*j) }},
	}
	se := math.Sqrt(1.06 / k)
	for i, tt := range tests {
		z, err := NewStreamSynthesizer(tt.s, dt, Band{LowHz: 1})
		if err != nil {
			t.Fatal(err)
		}
		st := z.NewStream(pcg(7, uint64(i)))
		x := make([]float64, n)
		for c := 0; c < n; c += 999 {
			st.Read(x[c:min(n, c+999)])
		}
		freq, s := Welch(x, dt, l)
		worst := 0.0
		for j := tt.firstBin; j <= l/2; j++ {
			want := tt.s.Density(freq[j])
			tol := 5*se + tt.bias(j)
			if j == l/2 {
				tol = 5*se*math.Sqrt2 + tt.bias(j)
			}
			worst = math.Max(worst, math.Abs(s[j]/want-1)/tol)
			if e := math.Abs(s[j]/want - 1); e > tol {
				t.Errorf("%s bin %d (%g Hz): got %v, want %v (rel err %.3g, tol %.3g)", tt.name, j, freq[j], s[j], want, e, tol)
			}
		}
		t.Logf("%s: largest error %.2f of its tolerance (5 standard errors %.3g)", tt.name, worst, 5*se)
	}
}

func TestStreamVarianceIsBandIntegral(t *testing.T) {
	// Σ_j W_j tiles the band, so the variance is the band integral
	// (PowerLaw.Integral, closed form) to rounding; and the sample variance
	// of a long record agrees within 5 standard errors. The standard error
	// of the sample variance of a Gaussian process is sqrt(2 Σ_τ c(τ)²/n)
	// (M. B. Priestley, Spectral Analysis and Time Series (1981), eq.
	// 5.3.21): white noise has c(τ) = σ² δ_τ, giving σ² sqrt(2/n).
	const dt, n = 1e-4, 1 << 20
	for _, s := range []PSD{White{Level: 3e-6}, PowerLaw{H: 2e-3, Alpha: -1}} {
		band := Band{LowHz: 3, HighHz: 2000}
		z, err := NewStreamSynthesizer(s, dt, band)
		if err != nil {
			t.Fatal(err)
		}
		want := s.(Integrable).Integral(band.LowHz, band.HighHz)
		if e := math.Abs(z.Variance()/want - 1); e > 1e-12 {
			t.Errorf("%T: variance %v, band integral %v", s, z.Variance(), want)
		}
	}
	z, err := NewStreamSynthesizer(White{Level: 3e-6}, dt, Band{LowHz: 3})
	if err != nil {
		t.Fatal(err)
	}
	x := make([]float64, n)
	z.NewStream(pcg(1, 2)).Read(x)
	var v float64
	for _, y := range x {
		v += y * y / n
	}
	want := z.Variance()
	if e := math.Abs(v/want - 1); e > 5*math.Sqrt(2.0/n)+3/(5000.0) {
		// plus the variance of the band below 3 Hz left out of a flat
		// spectrum: 3/5000 of it, an upper bound on its effect on c(τ).
		t.Errorf("sample variance %v, process variance %v", v, want)
	}
}

func TestStreamReproducible(t *testing.T) {
	// The k-th sample depends only on the source and k: chunk sizes and a
	// Reset do not change the record.
	z, err := NewStreamSynthesizer(PowerLaw{H: 1e-3, Alpha: -2}, 1e-3, Band{LowHz: 0.5})
	if err != nil {
		t.Fatal(err)
	}
	const n = 20000
	a, b := make([]float64, n), make([]float64, n)
	st := z.NewStream(pcg(3, 9))
	st.Read(a)
	st.Reset()
	for c := 0; c < n; c += 37 {
		st.Read(b[c:min(n, c+37)])
	}
	for i := range a {
		if a[i] != b[i] {
			t.Fatalf("sample %d: %v read at once, %v in chunks after Reset", i, a[i], b[i])
		}
	}
	if st.Pos() != n {
		t.Errorf("Pos = %d, want %d", st.Pos(), n)
	}
	c := make([]float64, n)
	z.NewStream(pcg(3, 10)).Read(c)
	if a[100] == c[100] {
		t.Error("another source gave the same sample")
	}
}

func TestStreamMemoryIndependentOfLength(t *testing.T) {
	// Reading does not allocate: a stream's memory is fixed when it is made,
	// whatever the length of the record read from it.
	z, err := NewStreamSynthesizer(White{Level: 1}, 1e-5, Band{LowHz: 10})
	if err != nil {
		t.Fatal(err)
	}
	st := z.NewStream(pcg(1, 1))
	buf := make([]float64, 5000)
	if a := testing.AllocsPerRun(200, func() { st.Read(buf) }); a != 0 {
		t.Errorf("Read allocates %v times per call, want 0", a)
	}
}

func TestNewStreamSynthesizerErrors(t *testing.T) {
	w := White{Level: 1}
	for _, tc := range []struct {
		dt   float64
		band Band
		want string
	}{
		{0, Band{LowHz: 1}, "time step"},
		{1e-3, Band{}, "explicit lower edge"},
		{1e-3, Band{LowHz: 10, HighHz: 5}, "empty"},
		{1e-3, Band{LowHz: 1, HighHz: 600}, "Nyquist"},
		{1e-6, Band{LowHz: 1e-3}, "raise the lower edge"},
	} {
		_, err := NewStreamSynthesizer(w, tc.dt, tc.band)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("dt %g band %+v: error %v, want one mentioning %q", tc.dt, tc.band, err, tc.want)
		}
	}
}
