// Package noise synthesises stationary Gaussian noise of a given power spectral
// density on a uniform time grid, and provides the spectral models, unit
// conversions and estimators (Welch PSD, overlapping Allan deviation) used to
// describe and check it.
//
// # Conventions
//
// Every power spectral density (PSD) in this package is one-sided: S(f) is
// defined for Fourier frequencies f >= 0 in Hz, in unit^2/Hz, and its integral
// over f >= 0 is the variance of the process,
//
//	var x = ∫_0^∞ S(f) df.
//
// Two-sided densities used by some standards (for example IEEE Std 952 for
// gyroscopes) are half as large: S_two(f) = S(f)/2 for f != 0.
//
// The quantities the rest of rampart feeds through this package are
//
//	drive phase noise     S_φ(f)  rad^2/Hz, or L(f) = 10 log10(S_φ(f)/2) dBc/Hz
//	intensity noise       S_ε(f)  1/Hz,     or RIN(f) = 10 log10 S_ε(f) dB/Hz
//	fractional frequency  S_y(f)  1/Hz,     S_y(f) = h_α f^α (power-law model)
//
// following the definitions of IEEE Std 1139. Times are in seconds and
// frequencies in Hz throughout; function and field names carry the unit where a
// bare float could be misread.
//
// References:
//   - IEEE Std 1139-2008, IEEE Standard Definitions of Physical Quantities for
//     Fundamental Frequency and Time Metrology—Random Instabilities (2008).
//   - P. D. Welch, The use of fast Fourier transform for the estimation of power
//     spectra, IEEE Trans. Audio Electroacoust. 15, 70 (1967).
//   - W. J. Riley, Handbook of Frequency Stability Analysis, NIST Special
//     Publication 1065 (2008).
package noise
