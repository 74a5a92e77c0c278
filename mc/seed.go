package mc

import "math/rand/v2"

// Stream returns the random number generator of realisation i in an ensemble
// seeded with seed. It is the stream named by the empty purpose:
//
//	Stream(seed, i) == Substream(seed, i, "")
//
// Use [Substream] with a name for each separate use of randomness within a
// realisation, so that adding a use does not change the numbers of the others.
func Stream(seed uint64, i int) *rand.Rand {
	return Substream(seed, i, "")
}

// Substream returns the random number generator of realisation i for the named
// purpose (for example "static" for static parameters or "noise/rin" for one
// noise series) in an ensemble seeded with seed. The generator is a PCG
// (math/rand/v2) whose two seed words are
//
//	h   = mix(mix(mix(seed) ^ i) ^ fnv1a(purpose))
//	PCG(h, mix(h ^ 0x9e3779b97f4a7c15))
//
// where mix is the splitmix64 finaliser (a bijection on 64-bit words with full
// avalanche) and fnv1a is the 64-bit FNV-1a hash of the purpose's bytes. The
// numbers depend on (seed, i, purpose) only, never on which goroutine asks or
// when. Because each step is a bijection for fixed other inputs, distinct i give
// distinct PCG seeds for the same seed and purpose, and the mixing makes
// neighbouring i as unrelated as distant ones.
//
// Substream panics if i is negative.
//
// References:
//   - G. L. Steele, D. Lea and C. H. Flood, "Fast splittable pseudorandom number
//     generators", OOPSLA 2014, 453 (splitmix64).
//   - M. E. O'Neill, "PCG: A family of simple fast space-efficient statistically
//     good algorithms for random number generation", HMC-CS-2014-0905 (2014).
func Substream(seed uint64, i int, purpose string) *rand.Rand {
	hi, lo := streamSeeds(seed, i, purpose)
	return rand.New(rand.NewPCG(hi, lo))
}

// streamSeeds returns the two PCG seed words documented at [Substream].
func streamSeeds(seed uint64, i int, purpose string) (uint64, uint64) {
	if i < 0 {
		panic("mc: negative realisation index")
	}
	h := mix64(mix64(mix64(seed)^uint64(i)) ^ fnv1a(purpose))
	return h, mix64(h ^ 0x9e3779b97f4a7c15)
}

// mix64 is the splitmix64 output function (Steele, Lea and Flood 2014).
func mix64(z uint64) uint64 {
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// fnv1a is the 64-bit FNV-1a hash.
func fnv1a(s string) uint64 {
	h := uint64(0xcbf29ce484222325)
	for i := 0; i < len(s); i++ {
		h ^= uint64(s[i])
		h *= 0x100000001b3
	}
	return h
}

// unitFloat maps the top 53 bits of x to [0, 1).
func unitFloat(x uint64) float64 {
	return float64(x>>11) * 0x1p-53
}
