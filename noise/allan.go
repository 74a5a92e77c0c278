package noise

import (
	"fmt"
	"math"
)

// AllanDeviation returns the overlapping Allan deviation σ_y(τ) of the
// fractional-frequency series y, whose samples are averages over consecutive
// intervals of tau0S seconds, at τ = m tau0S for each averaging factor m in
// factors. With the phase (time error) x_0 = 0, x_{i+1} = x_i + y_i tau0S,
// and N = len(y),
//
//	σ_y²(m τ0) = Σ_{i=0}^{N-2m} (x_{i+2m} - 2 x_{i+m} + x_i)² / (2 (m τ0)² (N - 2m + 1)).
//
// For a phase series φ_k in rad of a carrier at ν0 Hz sampled every τ0, pass
// y_k = (φ_{k+1} - φ_k)/(2π ν0 τ0). The mean of y does not change the result
// and is removed before summation to keep the phase small.
//
// AllanDeviation panics if tau0S is not positive or any m is not in
// [1, len(y)/2].
//
// References:
//   - IEEE Std 1139-2008.
//   - W. J. Riley, Handbook of Frequency Stability Analysis, NIST Special
//     Publication 1065 (2008) (overlapping Allan variance).
func AllanDeviation(y []float64, tau0S float64, factors []int) []float64 {
	if !(tau0S > 0) {
		panic(fmt.Sprintf("noise: Allan deviation sample time %g s is not positive", tau0S))
	}
	n := len(y)
	var mean float64
	for _, v := range y {
		mean += v
	}
	mean /= float64(n)
	// x in units of tau0S.
	x := make([]float64, n+1)
	for i, v := range y {
		x[i+1] = x[i] + (v - mean)
	}
	adev := make([]float64, len(factors))
	for k, m := range factors {
		if m < 1 || 2*m > n {
			panic(fmt.Sprintf("noise: Allan averaging factor %d is not in [1, %d] for %d samples", m, n/2, n))
		}
		var sum float64
		for i := 0; i+2*m <= n; i++ {
			d := x[i+2*m] - 2*x[i+m] + x[i]
			sum += d * d
		}
		adev[k] = math.Sqrt(sum / (2 * float64(m) * float64(m) * float64(n-2*m+1)))
	}
	return adev
}

// OctaveFactors returns the averaging factors 1, 2, 4, ..., 2^⌊log2((n-1)/2)⌋
// for a series of n samples, the octave τ grid that is common practice (it is,
// for example, the default of MATLAB's allanvar); it is empty for n < 3.
func OctaveFactors(n int) []int {
	var f []int
	for m := 1; 2*m <= n-1; m *= 2 {
		f = append(f, m)
	}
	return f
}
