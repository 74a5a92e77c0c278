package noise

import (
	"fmt"
	"math"
	"math/rand/v2"

	"gonum.org/v1/gonum/dsp/fourier"
)

// StreamSynthesizer draws realisations of a stationary Gaussian process with
// a given one-sided PSD on a uniform time grid, in blocks, so that a record
// of any length needs memory set by the band's lower edge alone.
//
// The process is a moving average of white Gaussian noise,
//
//	x_k = Σ_{j=0}^{L-1} h_j w_{k-j},   w_k ~ N(0, 1) independent,
//
// with a kernel of L taps (L even) built from the cell integrals of S on the
// grid of L lines f_j = j/(L dt),
//
//	W_j = ∫_{[f_j-Δf/2, f_j+Δf/2] ∩ [fLow, fHigh]} S(f) df,
//	h_k = (1/L) Σ_{j=-L/2+1}^{L/2} A_|j| e^{2πi j (k - L/2)/L},
//	A_0 = sqrt(L W_0),  A_j = sqrt(L W_j / 2),  A_{L/2} = sqrt(L W_{L/2}).
//
// A moving average of white noise is exactly stationary and Gaussian, its
// one-sided PSD is 2 dt |H(f)|² with H the kernel's transfer function, and
// at the lines H(f_j) = A_j e^{-iπ j} (the DFT of the centred kernel), so the
// PSD at f_j is W_j/Δf: the cell average of S, exactly. Between the lines H
// is the Dirichlet interpolation of the A_j, which follows S where S varies
// little across a cell; near a sharp band edge it rings over a few cells.
// By Parseval each sample's variance is Σ h_k² = Σ_j W_j = ∫_fLow^fHigh S df,
// exactly (to rounding), for any S: white, power laws h_α f^α, tables.
// The kernel resolves the lower band edge with at least streamCells cells
// below it, L >= streamCells/(fLow dt).
//
// The convolution runs by overlap-save on FFTs of length M >= 2L: each block
// draws B = M - L + 1 new variates and returns B samples, keeping the last
// L - 1 variates. A Stream therefore holds O(M) numbers whatever the length
// of the record, and the k-th sample depends only on the random source and
// k, not on how the record is read.
//
// References:
//
//	A. V. Oppenheim and R. W. Schafer, Discrete-Time Signal Processing,
//	3rd ed. (Pearson, 2010), ch. 8 (overlap-save block convolution;
//	chapter from memory).
//	A. Papoulis and S. U. Pillai, Probability, Random Variables and
//	Stochastic Processes, 4th ed. (McGraw-Hill, 2002), ch. 9 (the PSD of a
//	linear system's output, S_y = |H|² S_x; chapter from memory).
type StreamSynthesizer struct {
	dt       float64
	band     Band
	taps     int          // L
	m        int          // FFT length M
	spec     []complex128 // H at the M-point FFT grid, times 1/M
	variance float64
}

// streamCells is the minimum number of kernel cells below the band's lower
// edge: the kernel's line spacing is at most LowHz/streamCells.
const streamCells = 2

// MaxStreamTaps bounds the kernel of a StreamSynthesizer (2^18 taps: a
// stream then holds 2M = 2^20 numbers, 8 MB, and its group's scratch about
// as much again).
const MaxStreamTaps = 1 << 18

// StreamTaps returns the number of kernel taps a StreamSynthesizer with step
// dtS needs for a band whose lower edge is lowHz.
func StreamTaps(lowHz, dtS float64) int {
	l := int(math.Ceil(streamCells / (lowHz * dtS)))
	return l + l%2
}

// NewStreamSynthesizer returns a StreamSynthesizer of step dtS seconds and
// one-sided PSD s restricted to band. The band needs an explicit lower edge
// (a stream has no length to take it from) and a zero HighHz means the
// Nyquist frequency. It returns an error if dtS is not positive and finite,
// the band is empty, not positive or above the Nyquist frequency, its lower
// edge needs more than MaxStreamTaps taps, or s has a negative or non-finite
// integral over part of the band.
func NewStreamSynthesizer(s PSD, dtS float64, band Band) (*StreamSynthesizer, error) {
	if !(dtS > 0) || math.IsInf(dtS, 1) {
		return nil, fmt.Errorf("noise: time step %g s is not positive and finite", dtS)
	}
	nyquist := 1 / (2 * dtS)
	if band.HighHz == 0 {
		band.HighHz = nyquist
	}
	if !(0 < band.LowHz && band.LowHz < band.HighHz) {
		return nil, fmt.Errorf("noise: band [%g, %g] Hz is empty or not positive (a streamed record needs an explicit lower edge)", band.LowHz, band.HighHz)
	}
	if band.HighHz > nyquist {
		return nil, fmt.Errorf("noise: band upper edge %g Hz is above the Nyquist frequency %g Hz of a %g s grid", band.HighHz, nyquist, dtS)
	}
	if need := math.Ceil(streamCells / (band.LowHz * dtS)); need > MaxStreamTaps {
		return nil, fmt.Errorf("noise: band lower edge %g Hz with a %g s step needs a streaming kernel of %.3g taps, more than %d; raise the lower edge to at least %.3g Hz", band.LowHz, dtS, need, MaxStreamTaps, streamCells/(MaxStreamTaps*dtS))
	}
	l := max(StreamTaps(band.LowHz, dtS), 2)
	df := 1 / (float64(l) * dtS)
	amp := make([]float64, l/2+1)
	z := &StreamSynthesizer{dt: dtS, band: band, taps: l}
	for j := range amp {
		a := math.Max((float64(j)-0.5)*df, band.LowHz)
		b := math.Min((float64(j)+0.5)*df, band.HighHz)
		if a >= b {
			continue
		}
		w := Variance(s, a, b)
		if !(w >= 0) || math.IsInf(w, 1) {
			return nil, fmt.Errorf("noise: PSD integral over [%g, %g] Hz is %g, want finite and non-negative", a, b, w)
		}
		z.variance += w
		switch j {
		case 0, l / 2:
			amp[j] = math.Sqrt(float64(l) * w)
		default:
			amp[j] = math.Sqrt(float64(l) * w / 2)
		}
	}
	// The centred kernel h_k = (1/L) Σ_j A_j e^{iπ j} e^{2πi j k/L}: the
	// phase e^{iπ j} = (-1)^j moves the zero-phase kernel to k = L/2.
	coeff := make([]complex128, l/2+1)
	for j, a := range amp {
		if j%2 == 1 {
			a = -a
		}
		coeff[j] = complex(a/float64(l), 0)
	}
	h := fourier.NewFFT(l).Sequence(nil, coeff)
	// Overlap-save on M >= 2L points, M of the fast form.
	z.m = fastEvenLength(2 * l)
	pad := make([]float64, z.m)
	copy(pad, h)
	fft := fourier.NewFFT(z.m)
	z.spec = fft.Coefficients(nil, pad)
	for j := range z.spec {
		z.spec[j] /= complex(float64(z.m), 0)
	}
	return z, nil
}

// Taps returns the kernel length L.
func (z *StreamSynthesizer) Taps() int { return z.taps }

// Block returns the number of samples each FFT of a stream produces.
func (z *StreamSynthesizer) Block() int { return z.m - z.taps + 1 }

// Band returns the band the process is restricted to, with defaults filled in.
func (z *StreamSynthesizer) Band() Band { return z.band }

// Variance returns the variance of each sample, Σ_j W_j, which equals the
// integral of S over the band to rounding.
func (z *StreamSynthesizer) Variance() float64 { return z.variance }

// StepS returns the time step.
func (z *StreamSynthesizer) StepS() float64 { return z.dt }

// Stream is one realisation of a StreamSynthesizer's process, read in order
// and restartable: Reset rewinds it to its first sample, which it then
// reproduces exactly. It is not safe for concurrent use.
type Stream struct {
	z      *StreamSynthesizer
	source func() *rand.Rand
	rng    *rand.Rand
	*streamScratch
	white []float64 // the last M variates, oldest first
	buf   []float64 // the last FFT's output
	out   []float64 // the current block's samples, a tail of buf
	next  int       // index in out of the next sample
	pos   int       // index of the next sample in the record
}

// NewStream returns a realisation whose variates come from the generators
// source returns: source is called once now and once per Reset, and must
// return a generator in the same state each time (for example a new
// rand.Rand seeded alike).
func (z *StreamSynthesizer) NewStream(source func() *rand.Rand) *Stream {
	return z.NewStreams(1, source)[0]
}

// streamScratch is the FFT plan and spectrum scratch that streams read in
// turn can share.
type streamScratch struct {
	fft   *fourier.FFT
	coeff []complex128
}

// NewStreams returns k streams, all started from source (Restart gives
// each its own), that share one FFT plan and scratch: they may be read in
// any interleaving, but not concurrently. Each holds 2M numbers of its own
// and the group 3M more.
func (z *StreamSynthesizer) NewStreams(k int, source func() *rand.Rand) []*Stream {
	sc := &streamScratch{fft: fourier.NewFFT(z.m), coeff: make([]complex128, z.m/2+1)}
	out := make([]*Stream, k)
	for i := range out {
		s := &Stream{z: z, source: source, streamScratch: sc, white: make([]float64, z.m), buf: make([]float64, z.m)}
		s.Reset()
		out[i] = s
	}
	return out
}

// Restart makes s the realisation whose variates come from source (as in
// NewStream), reusing its buffers, and rewinds it.
func (s *Stream) Restart(source func() *rand.Rand) {
	s.source = source
	s.Reset()
}

// Reset rewinds the stream to its first sample.
func (s *Stream) Reset() {
	s.rng = s.source()
	// The kernel's first L - 1 inputs precede the record.
	l := s.z.taps
	clear(s.white)
	for i := s.z.m - l + 1; i < s.z.m; i++ {
		s.white[i] = s.rng.NormFloat64()
	}
	s.out, s.next, s.pos = nil, 0, 0
}

// Pos returns the index of the next sample Read returns.
func (s *Stream) Pos() int { return s.pos }

// block computes the next B samples.
func (s *Stream) block() {
	m, b := s.z.m, s.z.Block()
	copy(s.white, s.white[b:])
	for i := m - b; i < m; i++ {
		s.white[i] = s.rng.NormFloat64()
	}
	s.fft.Coefficients(s.coeff, s.white)
	for j, h := range s.z.spec {
		s.coeff[j] *= h
	}
	s.fft.Sequence(s.buf, s.coeff)
	// Output k = m - b + i is Σ_j h_j w_{k-j} with k - j >= 0 for every tap.
	s.out = s.buf[m-b:]
	s.next = 0
}

// Read fills dst with the next len(dst) samples of the record.
func (s *Stream) Read(dst []float64) {
	for len(dst) > 0 {
		if s.next == len(s.out) {
			s.block()
		}
		n := copy(dst, s.out[s.next:])
		s.next += n
		s.pos += n
		dst = dst[n:]
	}
}
