package mc

import (
	"fmt"
	"math/bits"
)

// SobolMaxDim is the largest dimension of a [Sobol] design: the embedded
// direction numbers cover dimensions 1 to 256 of Joe and Kuo's set.
const SobolMaxDim = len(joeKuo) + 1

// sobolMaxLen is the number of points 32-bit direction numbers can give.
const sobolMaxLen = 1 << 32

// sobolOwenPurpose and sobolShiftPurpose key the scramblings.
const (
	sobolOwenPurpose  = "sampler/sobol/owen"
	sobolShiftPurpose = "sampler/sobol/shift"
)

// Scrambling selects the randomisation of a Sobol' design.
type Scrambling int

const (
	// Unscrambled gives the points of Joe and Kuo's construction; the seed is
	// not used. The first point is the origin.
	Unscrambled Scrambling = iota
	// DigitalShift XORs every coordinate of dimension k with one pseudo-random
	// 32-bit word per dimension (a random digital shift in base 2).
	DigitalShift
	// Owen applies nested uniform scrambling in base 2: bit b of a coordinate
	// is flipped or not according to a pseudo-random bit of the node given by
	// the b higher-order bits of the unscrambled coordinate.
	Owen
)

// String returns the scrambling's name as used in scenario files.
func (s Scrambling) String() string {
	switch s {
	case Unscrambled:
		return "none"
	case DigitalShift:
		return "shift"
	case Owen:
		return "owen"
	}
	return fmt.Sprintf("Scrambling(%d)", int(s))
}

// Sobol is a design of the first n points of the Sobol' sequence in dimension
// d, in Gray-code order, with 32-bit precision (n <= 2^32). With direction
// numbers V_kb = m_kb / 2^b (b = 1..32), point i has coordinates
//
//	x_ik = XOR over the bits b of g(i) of V_kb,  g(i) = i XOR (i >> 1),
//
// the Antonov-Saleev (Gray-code) order, so each point is computed directly from
// i. For b <= s_k the m_kb are Joe and Kuo's initial numbers; beyond, Bratley
// and Fox's recurrence for the primitive polynomial of degree s_k with inner
// coefficients a_1..a_(s-1):
//
//	m_b = 2 a_1 m_(b-1) XOR 4 a_2 m_(b-2) XOR ... XOR 2^s m_(b-s) XOR m_(b-s).
//
// Dimension 1 has m_1b = 1 (van der Corput). For n = 2^m the points form a
// (t, m, d)-net in base 2, and each one-dimensional projection has exactly one
// point in each interval [j/n, (j+1)/n); scrambling keeps both properties.
//
// References:
//   - I. M. Sobol', "On the distribution of points in a cube and the approximate
//     evaluation of integrals", USSR Comput. Math. Math. Phys. 7, 86 (1967).
//   - I. A. Antonov and V. M. Saleev, USSR Comput. Math. Math. Phys. 19, 252
//     (1979) (Gray-code order).
//   - P. Bratley and B. L. Fox, "Algorithm 659: Implementing Sobol's
//     quasirandom sequence generator", ACM Trans. Math. Softw. 14, 88 (1988).
//   - S. Joe and F. Y. Kuo, "Constructing Sobol sequences with better
//     two-dimensional projections", SIAM J. Sci. Comput. 30, 2635 (2008)
//     (direction numbers new-joe-kuo-6.21201).
//   - A. B. Owen, "Randomly permuted (t,m,s)-nets and (t,s)-sequences", in
//     Monte Carlo and Quasi-Monte Carlo Methods in Scientific Computing,
//     Lecture Notes in Statistics 106, 299 (1995).
type Sobol struct {
	dim, n     int
	scrambling Scrambling
	v          []uint32 // v[32k + b-1] = V_kb scaled by 2^32
	keys       []uint64 // per-dimension shift or Owen key
}

// NewSobol returns the first n points of the dim-dimensional Sobol' sequence,
// randomised from seed as scrambling says. It panics if dim exceeds
// [SobolMaxDim] or n exceeds 2^32.
func NewSobol(dim, n int, seed uint64, scrambling Scrambling) *Sobol {
	checkDesign(dim, n)
	if dim > SobolMaxDim {
		panic(fmt.Sprintf("mc: Sobol' dimension %d exceeds the %d with direction numbers", dim, SobolMaxDim))
	}
	if uint64(n) > sobolMaxLen {
		panic(fmt.Sprintf("mc: Sobol' length %d exceeds 2^32", n))
	}
	s := &Sobol{dim: dim, n: n, scrambling: scrambling, v: make([]uint32, 32*dim)}
	for k := range dim {
		directionNumbers(k, s.v[32*k:32*(k+1)])
	}
	var purpose string
	switch scrambling {
	case Unscrambled:
		return s
	case DigitalShift:
		purpose = sobolShiftPurpose
	case Owen:
		purpose = sobolOwenPurpose
	default:
		panic(fmt.Sprintf("mc: unknown Sobol' scrambling %d", int(scrambling)))
	}
	base := mix64(mix64(seed) ^ fnv1a(purpose))
	s.keys = make([]uint64, dim)
	for k := range s.keys {
		s.keys[k] = mix64(base ^ mix64(uint64(k)))
	}
	return s
}

// directionNumbers fills v with V_kb scaled by 2^32, b = 1..32, for dimension
// k (from 0).
func directionNumbers(k int, v []uint32) {
	if k == 0 {
		for b := range v {
			v[b] = 1 << (31 - b)
		}
		return
	}
	row := joeKuo[k-1]
	s := int(row.s)
	for b := range v {
		if b < s {
			v[b] = row.m[b] << (31 - b)
			continue
		}
		x := v[b-s] ^ v[b-s]>>s
		for j := 1; j < s; j++ {
			if row.a>>(s-1-j)&1 == 1 {
				x ^= v[b-j]
			}
		}
		v[b] = x
	}
}

// Dim returns the dimension of the points.
func (s *Sobol) Dim() int { return s.dim }

// Len returns the number of points.
func (s *Sobol) Len() int { return s.n }

// Scrambling returns the randomisation of the design.
func (s *Sobol) Scrambling() Scrambling { return s.scrambling }

// Point writes point i into dst.
func (s *Sobol) Point(i int, dst []float64) {
	checkPoint(i, s.n, s.dim, dst)
	g := uint32(i ^ i>>1)
	for k := range dst {
		v := s.v[32*k : 32*(k+1)]
		var x uint32
		for t := g; t != 0; t &= t - 1 {
			x ^= v[bits.TrailingZeros32(t)]
		}
		switch s.scrambling {
		case DigitalShift:
			x ^= uint32(s.keys[k] >> 32)
		case Owen:
			x = owenScramble(x, s.keys[k])
		}
		dst[k] = float64(x) * 0x1p-32
	}
}

// owenScramble applies base-2 nested uniform scrambling with the given key to
// the 32-bit digits of x. The flip of the digit below the b leading digits
// p = x >> (32-b) is the top bit of mix64(key XOR (2^b + p)): 2^b + p numbers the
// nodes of the binary tree of digit prefixes uniquely, so every node gets its
// own pseudo-random bit.
func owenScramble(x uint32, key uint64) uint32 {
	var flips uint32
	for b := range 32 {
		node := uint64(1)<<b | uint64(x>>(32-b))
		flips |= uint32(mix64(key^node)>>63) << (31 - b)
	}
	return x ^ flips
}
