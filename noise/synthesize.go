package noise

import (
	"fmt"
	"math"
	"math/rand/v2"

	"gonum.org/v1/gonum/dsp/fourier"
)

// Band is a band of Fourier frequencies [LowHz, HighHz] in Hz.
//
// For synthesis, a zero LowHz means 1/(n dt), the lowest frequency an n-sample
// grid of step dt resolves, and a zero HighHz means the Nyquist frequency
// 1/(2 dt). Noise below LowHz is left out: over a shot of length n dt it would
// look like an offset and a drift, which callers usually model separately. A
// lower LowHz includes it, at the cost of an FFT of about 1/(LowHz dt) points.
type Band struct {
	LowHz, HighHz float64
}

// oversampling is the minimum ratio of the FFT length m to the series length n.
//
// The synthesised process is periodic with period m dt. With m = n the end of
// a series is correlated with its start as if they were neighbours: for f^-2
// noise E[(x_{n-1} - x_0)²] comes out at 2% of its value for the continuous
// process in the same band. Padding to m >= 2n removes that, and the residual
// error is that each line stands for the power of a cell of width 1/(m dt):
// quantities dominated by frequencies near the band's lower edge, such as the
// linear trend of an f^-2 series, are over-weighted by 42% at m = 2n, 10% at
// m = 4n and 2.5% at m = 8n, while the end-to-end difference and
// well-separated frequencies are right to better than 0.5% from m = 4n on
// (measured for n = 400 by comparing Σ_j W_j |H(f_j)|² with ∫ S |H|² df for
// those weightings H; TestSynthesizerLineApproximation repeats the m = 4n
// figures at n = 256). Four is the chosen compromise at twice the cost of the
// minimum.
const oversampling = 4

// maxFFTLength bounds the FFT a Synthesizer may need (2^24 points, 0.4 GB of
// scratch).
const maxFFTLength = 1 << 24

// Synthesizer draws realisations of a stationary Gaussian process with a
// given one-sided PSD on a uniform time grid, reusing its FFT plan and scratch
// space between calls.
//
// White Gaussian noise is filtered in the frequency domain: on an FFT of
// length m >= 4n (the smallest even 2^a 3^b 5^c, and long enough that the
// line spacing Δf = 1/(m dt) resolves the band's lower edge), line f_j = j Δf
// gets a complex Gaussian amplitude whose variance is the integral of S over
// the part of its cell [f_j - Δf/2, f_j + Δf/2] inside the band,
//
//	W_j = ∫_{[f_j-Δf/2, f_j+Δf/2] ∩ [fLow, fHigh]} S(f) df,
//	x_k = Σ_j sqrt(W_j) (a_j cos 2π f_j t_k - b_j sin 2π f_j t_k),  a_j, b_j ~ N(0, 1),
//
// (the Nyquist line has a cosine term only), and the first n of the m samples
// are returned. Because the cells tile the band, each sample's variance is
// Σ_j W_j = ∫_fLow^fHigh S(f) df exactly (to rounding), whatever the shape of
// S, including power laws that vary strongly across a cell. The process is
// stationary; its spectrum is a set of lines 1/(m dt) apart that carry the
// power of S in their cells.
//
// A Synthesizer is not safe for concurrent use; give each goroutine its own,
// for example with Clone.
type Synthesizer struct {
	n        int
	dt       float64
	band     Band
	amp      []float64 // amplitude of line j, shared between clones
	lo, hi   int       // lines whose cells meet the band
	variance float64

	fft   *fourier.FFT
	coeff []complex128
	work  []float64
}

// NewSynthesizer returns a Synthesizer of n-sample series with time step dtS
// seconds and one-sided PSD s restricted to band (see Band for its zero
// value). It returns an error if n < 2, dtS is not positive and finite, the
// band is empty or reaches above the Nyquist frequency, its lower edge needs
// an FFT longer than 2^24 points, or s has a negative or non-finite integral
// over part of the band.
func NewSynthesizer(s PSD, n int, dtS float64, band Band) (*Synthesizer, error) {
	if n < 2 {
		return nil, fmt.Errorf("noise: synthesis needs at least 2 samples, got %d", n)
	}
	if !(dtS > 0) || math.IsInf(dtS, 1) {
		return nil, fmt.Errorf("noise: time step %g s is not positive and finite", dtS)
	}
	nyquist := 1 / (2 * dtS)
	if band.LowHz == 0 {
		band.LowHz = 1 / (float64(n) * dtS)
	}
	if band.HighHz == 0 {
		band.HighHz = nyquist
	}
	if !(0 < band.LowHz && band.LowHz < band.HighHz) {
		return nil, fmt.Errorf("noise: band [%g, %g] Hz is empty or not positive", band.LowHz, band.HighHz)
	}
	if band.HighHz > nyquist {
		return nil, fmt.Errorf("noise: band upper edge %g Hz is above the Nyquist frequency %g Hz of a %g s grid", band.HighHz, nyquist, dtS)
	}
	need := math.Max(oversampling*float64(n), math.Ceil(1/(band.LowHz*dtS)))
	if need > maxFFTLength {
		return nil, fmt.Errorf("noise: band lower edge %g Hz with a %g s step needs an FFT of %.3g points, more than %d; raise the lower edge", band.LowHz, dtS, need, maxFFTLength)
	}
	m := fastEvenLength(int(need))
	df := 1 / (float64(m) * dtS)

	z := &Synthesizer{n: n, dt: dtS, band: band, amp: make([]float64, m/2+1), lo: -1}
	for j := range z.amp {
		a := math.Max((float64(j)-0.5)*df, band.LowHz)
		b := math.Min((float64(j)+0.5)*df, band.HighHz)
		if a >= b {
			continue
		}
		if z.lo < 0 {
			z.lo = j
		}
		z.hi = j
		w := Variance(s, a, b)
		if !(w >= 0) || math.IsInf(w, 1) {
			return nil, fmt.Errorf("noise: PSD integral over [%g, %g] Hz is %g, want finite and non-negative", a, b, w)
		}
		z.variance += w
		if j == m/2 {
			z.amp[j] = math.Sqrt(w)
		} else {
			z.amp[j] = math.Sqrt(w) / 2
		}
	}
	z.alloc(m)
	return z, nil
}

func (z *Synthesizer) alloc(m int) {
	z.fft = fourier.NewFFT(m)
	z.coeff = make([]complex128, m/2+1)
	z.work = make([]float64, m)
}

// Clone returns a Synthesizer of the same process with its own FFT plan and
// scratch space, without recomputing the spectrum.
func (z *Synthesizer) Clone() *Synthesizer {
	c := *z
	c.alloc(len(z.work))
	return &c
}

// Len returns the number of samples in a series.
func (z *Synthesizer) Len() int { return z.n }

// Band returns the band the process is restricted to, with defaults filled in.
func (z *Synthesizer) Band() Band { return z.band }

// FFTLength returns the length m of the FFT behind each series.
func (z *Synthesizer) FFTLength() int { return len(z.work) }

// Variance returns the variance of each sample, Σ_j W_j, which equals the
// integral of S over the band to rounding.
func (z *Synthesizer) Variance() float64 { return z.variance }

// Synthesize fills dst with one realisation, drawing normal variates from rng,
// and returns dst; if dst is nil a new slice is allocated. It panics if dst is
// not nil and len(dst) != z.Len().
//
// The number of variates drawn depends only on the grid and the band, not on
// the PSD, so equal seeds give realisations of different PSDs on the same
// grid that share their white noise (common random numbers).
func (z *Synthesizer) Synthesize(dst []float64, rng *rand.Rand) []float64 {
	if dst == nil {
		dst = make([]float64, z.n)
	} else if len(dst) != z.n {
		panic(fmt.Sprintf("noise: destination has %d samples, want %d", len(dst), z.n))
	}
	// Lines outside [lo, hi] stay zero from alloc; Sequence does not write coeff.
	nyq := len(z.amp) - 1
	for j := z.lo; j <= z.hi; j++ {
		a := z.amp[j]
		if j == nyq {
			z.coeff[j] = complex(a*rng.NormFloat64(), 0)
		} else {
			z.coeff[j] = complex(a*rng.NormFloat64(), a*rng.NormFloat64())
		}
	}
	z.fft.Sequence(z.work, z.coeff)
	copy(dst, z.work)
	return dst
}

// SynthesizePair fills x1 and x2 with two realisations whose samples have
// correlation coefficient rho,
//
//	x2 = rho x1 + sqrt(1 - rho²) y,
//
// with y an independent realisation; both have the Synthesizer's PSD, and
// their cross-spectrum is rho S(f). It is the drive phase noise of two arms
// that share part of their optical path. It panics unless -1 <= rho <= 1 and
// both slices have z.Len() samples.
func (z *Synthesizer) SynthesizePair(x1, x2 []float64, rho float64, rng *rand.Rand) {
	if !(-1 <= rho && rho <= 1) {
		panic(fmt.Sprintf("noise: correlation %g is outside [-1, 1]", rho))
	}
	if len(x1) != z.n || len(x2) != z.n {
		panic(fmt.Sprintf("noise: pair has %d and %d samples, want %d", len(x1), len(x2), z.n))
	}
	z.Synthesize(x1, rng)
	z.Synthesize(x2, rng)
	c := math.Sqrt(1 - rho*rho)
	for k, y := range x2 {
		x2[k] = rho*x1[k] + c*y
	}
}

// Synthesize returns one n-sample realisation, time step dtS seconds, of the
// stationary Gaussian process with one-sided PSD s restricted to band; see
// Synthesizer, which avoids the set-up cost when many are needed.
func Synthesize(s PSD, n int, dtS float64, band Band, rng *rand.Rand) ([]float64, error) {
	z, err := NewSynthesizer(s, n, dtS, band)
	if err != nil {
		return nil, err
	}
	return z.Synthesize(nil, rng), nil
}

// fastEvenLength returns the smallest even m >= k of the form 2^a 3^b 5^c,
// lengths the FFT handles with its fastest radices.
func fastEvenLength(k int) int {
	best := 2
	for best < k {
		best *= 2
	}
	for p5 := 2; p5 < best; p5 *= 5 {
		for p := p5; p < best; p *= 3 {
			q := p
			for q < k {
				q *= 2
			}
			best = min(best, q)
		}
	}
	return best
}
