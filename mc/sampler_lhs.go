package mc

import (
	"math"
	"math/bits"
	"math/rand/v2"
)

// lhsPurpose names the substream of jitters within the strata of a Latin
// hypercube; lhsPermutation keys its permutations.
const (
	lhsPurpose     = "sampler/lhs"
	lhsPermutation = "sampler/lhs/permutation"
)

// feistelRounds is the number of rounds of the permutation network. Four
// rounds of a pseudo-random round function make a strong pseudo-random
// permutation (Luby and Rackoff 1988).
const feistelRounds = 4

// LatinHypercube is a Latin hypercube design of n points in [0,1)^d: in each
// dimension, each of the n strata [s/n, (s+1)/n) holds exactly one point.
// Coordinate k of point i is
//
//	x_ik = (pi_k(i) + u_ik) / n,
//
// with pi_k a pseudo-random permutation of {0, ..., n-1} keyed by (seed, k) and
// u_ik uniform on [0, 1) from Substream(seed, i, "sampler/lhs") (floor(x_ik n)
// = pi_k(i) holds exactly in floating point). The
// permutations are computed, not stored: pi_k is a four-round Feistel network
// on the smallest even number of bits that covers n, whose round function is
// the splitmix64 finaliser, restricted to {0, ..., n-1} by cycle walking. Each
// point therefore costs O(d) time and the design O(d) memory, and point i
// depends only on (seed, n, i).
//
// References:
//   - M. D. McKay, R. J. Beckman and W. J. Conover, "A comparison of three
//     methods for selecting values of input variables in the analysis of output
//     from a computer code", Technometrics 21, 239 (1979).
//   - M. Luby and C. Rackoff, "How to construct pseudorandom permutations from
//     pseudorandom functions", SIAM J. Comput. 17, 373 (1988).
//   - J. Black and P. Rogaway, "Ciphers with arbitrary finite domains", CT-RSA
//     2002, LNCS 2271, 114 (cycle walking).
type LatinHypercube struct {
	dim, n int
	seed   uint64
	half   uint     // bits in each half of the Feistel block
	keys   []uint64 // feistelRounds keys per dimension
}

// NewLatinHypercube returns a Latin hypercube design of n points of dimension
// dim.
func NewLatinHypercube(dim, n int, seed uint64) *LatinHypercube {
	checkDesign(dim, n)
	half := uint(bits.Len(uint(n-1))+1) / 2
	base := mix64(mix64(seed) ^ fnv1a(lhsPermutation))
	keys := make([]uint64, dim*feistelRounds)
	for k := range keys {
		keys[k] = mix64(base ^ mix64(uint64(k)))
	}
	return &LatinHypercube{dim: dim, n: n, seed: seed, half: half, keys: keys}
}

// Dim returns the dimension of the points.
func (l *LatinHypercube) Dim() int { return l.dim }

// Len returns the number of points.
func (l *LatinHypercube) Len() int { return l.n }

// Point writes point i into dst.
func (l *LatinHypercube) Point(i int, dst []float64) {
	checkPoint(i, l.n, l.dim, dst)
	var src rand.PCG
	src.Seed(streamSeeds(l.seed, i, lhsPurpose))
	for k := range dst {
		dst[k] = inStratum(l.Stratum(k, i), l.n, unitFloat(src.Uint64()))
	}
}

// inStratum returns (s + u) / n, nudged by at most a few units in the last
// place so that floor(x n) = s holds in floating point as well: rounding can
// otherwise carry (n-1 + u) / n up to 1, or s / n just below the stratum.
func inStratum(s, n int, u float64) float64 {
	fs, fn := float64(s), float64(n)
	x := (fs + u) / fn
	for x >= 1 || x*fn >= fs+1 {
		x = math.Nextafter(x, 0)
	}
	for x*fn < fs {
		x = math.Nextafter(x, 1)
	}
	return x
}

// Stratum returns pi_k(i), the stratum that point i occupies in dimension k.
func (l *LatinHypercube) Stratum(k, i int) int {
	if k < 0 || k >= l.dim || i < 0 || i >= l.n {
		panic("mc: Latin hypercube stratum index out of range")
	}
	keys := l.keys[k*feistelRounds : (k+1)*feistelRounds]
	x := uint64(i)
	for {
		x = l.feistel(x, keys)
		if x < uint64(l.n) {
			return int(x)
		}
	}
}

// feistel applies one pass of the balanced Feistel network to x < 2^(2 half).
func (l *LatinHypercube) feistel(x uint64, keys []uint64) uint64 {
	mask := uint64(1)<<l.half - 1
	left, right := x>>l.half, x&mask
	for _, key := range keys {
		left, right = right, left^(mix64(key+right)&mask)
	}
	return left<<l.half | right
}
