package sim

import "math"

const sqrt2Pi = 2.5066282746310002 // sqrt(2 pi)

// cis returns e^{i x}.
func cis(x float64) complex128 {
	s, c := math.Sincos(x)
	return complex(c, s)
}
