package mc

import "math/rand/v2"

// randomPurpose names the substream of pseudo-random sampler points.
const randomPurpose = "sampler/random"

// Random is a design of independent pseudo-random points, uniform on [0,1)^d.
// Coordinate k of point i is the (k+1)-th 64-bit output of
// Substream(seed, i, "sampler/random"), its top 53 bits scaled to [0, 1).
type Random struct {
	dim, n int
	seed   uint64
}

// NewRandom returns a pseudo-random design of n points of dimension dim.
func NewRandom(dim, n int, seed uint64) *Random {
	checkDesign(dim, n)
	return &Random{dim: dim, n: n, seed: seed}
}

// Dim returns the dimension of the points.
func (r *Random) Dim() int { return r.dim }

// Len returns the number of points.
func (r *Random) Len() int { return r.n }

// Point writes point i into dst.
func (r *Random) Point(i int, dst []float64) {
	checkPoint(i, r.n, r.dim, dst)
	var src rand.PCG
	src.Seed(streamSeeds(r.seed, i, randomPurpose))
	for k := range dst {
		dst[k] = unitFloat(src.Uint64())
	}
}
