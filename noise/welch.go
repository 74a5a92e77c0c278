package noise

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/dsp/fourier"
)

// Welch returns Welch's estimate of the one-sided PSD of the series x, whose
// samples are dtS seconds apart, in unit^2/Hz at the frequencies
// freqHz[j] = j/(segment dtS), j = 0, ..., segment/2.
//
// x is cut into segments of the given even length overlapping by half
// (K = (len(x) - segment)/(segment/2) + 1 of them; samples past the last
// whole segment are unused). Each segment has its mean removed and is weighted
// by the periodic Hann window w_k = sin²(π k/segment); with X_j its DFT and
// U = Σ_k w_k², the estimate is
//
//	S_j = 2 dt/(K U) Σ_segments |X_j|²,
//
// so that each S_j estimates S(f_j), the end bins j = 0 and segment/2
// included (scipy.signal.welch reports those two at half this value), and the
// trapezoidal integral of the estimate, Σ_j S_j Δf with half weight on the end
// bins, equals the window-weighted mean square of the segments (Parseval):
// the integral of the estimate is the variance.
//
// Removing each segment's mean leaves bin 0 and, because the window spreads
// it over bins 0 and ±1, bin 1 biased low: for white noise they come out at
// 1/3 and 5/6 of S. Read spectra from bin 2 up. Elsewhere the estimate of a
// Gaussian process has a relative standard deviation of about sqrt(1.06/K)
// (the 1.06 accounts for the 17% correlation of half-overlapping Hann
// segments, F. J. Harris, Proc. IEEE 66, 51 (1978), Table 1), sqrt(2) more at
// the Nyquist bin, whose coefficient is real; neighbouring bins are correlated
// through the window.
//
// Welch panics if segment is not even and at least 4, or exceeds len(x), or
// dtS is not positive.
//
// References:
//   - P. D. Welch, The use of fast Fourier transform for the estimation of
//     power spectra, IEEE Trans. Audio Electroacoust. 15, 70 (1967).
func Welch(x []float64, dtS float64, segment int) (freqHz, density []float64) {
	if segment < 4 || segment%2 != 0 || segment > len(x) {
		panic(fmt.Sprintf("noise: Welch segment length %d is not even, at least 4 and at most the %d samples", segment, len(x)))
	}
	if !(dtS > 0) {
		panic(fmt.Sprintf("noise: Welch time step %g s is not positive", dtS))
	}
	window := make([]float64, segment)
	var u float64
	for k := range window {
		s := math.Sin(math.Pi * float64(k) / float64(segment))
		window[k] = s * s
		u += window[k] * window[k]
	}

	fft := fourier.NewFFT(segment)
	seg := make([]float64, segment)
	coeff := make([]complex128, segment/2+1)
	density = make([]float64, segment/2+1)
	hop := segment / 2
	k := 0
	for start := 0; start+segment <= len(x); start += hop {
		part := x[start : start+segment]
		var mean float64
		for _, v := range part {
			mean += v
		}
		mean /= float64(segment)
		for i, v := range part {
			seg[i] = (v - mean) * window[i]
		}
		fft.Coefficients(coeff, seg)
		for j, c := range coeff {
			density[j] += real(c)*real(c) + imag(c)*imag(c)
		}
		k++
	}

	freqHz = make([]float64, len(density))
	scale := dtS / (float64(k) * u)
	for j := range density {
		density[j] *= 2 * scale
		freqHz[j] = float64(j) / (float64(segment) * dtS)
	}
	return freqHz, density
}
