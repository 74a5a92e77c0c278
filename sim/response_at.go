package sim

import "math"

// At returns channel ch's kernels at frequency f between the grid points,
// by band-limited interpolation. A kernel is the Fourier transform of a
// correlation of the shot's response, which vanishes at lags beyond the
// shot's duration T: band-limited in that sense, and the grid's step
// 1/(L h) <= 1/(4 T) samples it at twice its Nyquist rate 1/(2 T), so the
// Whittaker-Shannon series
//
//	K(f) = sum_m K(f_m) sinc(pi (f - f_m) / StepHz)
//
// recovers it; the kernels are even in f (real noise), which gives the
// samples at negative frequencies. The oversampling leaves room to replace
// sinc(pi d) by g(d) = sinc(pi d) sinc^2(pi d/4): its spectrum (a box
// convolved with a triangle) is flat where the kernels have content and
// vanishes before their first image, so the series stays exact while its
// terms fall as d^-3 (common practice for oversampled signals). It is cut
// to atTaps points either side: measured 2.2e-5 of the peak on the
// free-evolution sinc^2, against 4 % for linear interpolation
// (TestKernelsAt). Beyond the grid's last point At returns the last value.
//
// References:
//
//	C. E. Shannon, "Communication in the presence of noise", Proc. IRE
//	37, 10 (1949).
func (k *Kernels) At(ch Channel, f float64) (bias, contrast float64) {
	kc := k.Channel(ch)
	n := len(k.FrequencyHz)
	x := math.Abs(f) / k.StepHz
	if x >= float64(n-1) {
		return kc.Bias[n-1], kc.Contrast[n-1]
	}
	m0 := int(math.Floor(x))
	if x == float64(m0) {
		return kc.Bias[m0], kc.Contrast[m0]
	}
	for m := m0 - atTaps + 1; m <= m0+atTaps; m++ {
		j := m
		if j < 0 {
			j = -j
		}
		if j >= n {
			continue
		}
		d := x - float64(m)
		w := sinc(math.Pi*d) * math.Pow(sinc(math.Pi*d/4), 2)
		bias += w * kc.Bias[j]
		contrast += w * kc.Contrast[j]
	}
	return bias, contrast
}

// atTaps is the half-width of At's windowed series.
const atTaps = 16

func sinc(x float64) float64 {
	if x == 0 {
		return 1
	}
	return math.Sin(x) / x
}
