package mc

import (
	"fmt"

	"gonum.org/v1/gonum/mathext"
)

// Sampler is a design of Len points in the unit hypercube [0,1)^Dim. Point i
// depends only on the sampler's construction (dimension, length, seed) and i, so
// points may be computed in any order, concurrently, or again after a resume.
type Sampler interface {
	// Dim is the dimension d of the points.
	Dim() int
	// Len is the number of points n in the design.
	Len() int
	// Point writes point i, 0 <= i < Len, into dst, which must have length Dim.
	// Point must be safe for concurrent use.
	Point(i int, dst []float64)
}

// Normal returns a sampler whose points are those of s mapped coordinate by
// coordinate to standard normal variates,
//
//	x_k = Phi^-1(max(u_k, 2^-53)),
//
// where Phi^-1 is the inverse standard normal distribution function. The clamp
// keeps a coordinate exactly 0 finite (about -8.2); an unscrambled Sobol'
// sequence starts at the origin, so draw normal variates from a scrambled one.
// Scale and shift the variates for a parameter of mean mu and standard
// deviation sigma: mu + sigma x.
func Normal(s Sampler) Sampler {
	return normal{s}
}

type normal struct{ Sampler }

func (s normal) Point(i int, dst []float64) {
	s.Sampler.Point(i, dst)
	for k, u := range dst {
		dst[k] = mathext.NormalQuantile(max(u, 0x1p-53))
	}
}

// checkPoint panics unless 0 <= i < n and len(dst) == dim.
func checkPoint(i, n, dim int, dst []float64) {
	if i < 0 || i >= n {
		panic(fmt.Sprintf("mc: point index %d outside [0, %d)", i, n))
	}
	if len(dst) != dim {
		panic(fmt.Sprintf("mc: point buffer has length %d, want dimension %d", len(dst), dim))
	}
}

// checkDesign panics unless dim and n are positive.
func checkDesign(dim, n int) {
	if dim < 1 {
		panic(fmt.Sprintf("mc: sampler dimension %d, want at least 1", dim))
	}
	if n < 1 {
		panic(fmt.Sprintf("mc: sampler length %d, want at least 1", n))
	}
}
