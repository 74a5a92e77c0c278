package mc

import (
	"math"
	"testing"
)

func TestLatinHypercubeStratified(t *testing.T) {
	// Exact: in every dimension each stratum [s/n, (s+1)/n) holds exactly one
	// point (McKay, Beckman and Conover, Technometrics 21, 239 (1979)), for sizes
	// that fill the Feistel domain exactly (4, 64, 1024), nearly (5, 65) and
	// sparsely, and the edge cases 1 and 2.
	for _, n := range []int{1, 2, 3, 4, 5, 7, 64, 65, 100, 1000, 1024} {
		for _, seed := range []uint64{0, 1, 0xdeadbeef} {
			s := NewLatinHypercube(4, n, seed)
			for k, col := range columns(s) {
				seen := make([]int, n)
				for i, x := range col {
					st := int(math.Floor(x * float64(n)))
					if st < 0 || st >= n {
						t.Fatalf("n=%d seed=%d point %d dim %d: %v outside [0, 1)", n, seed, i, k, x)
					}
					if st != s.Stratum(k, i) {
						t.Fatalf("n=%d seed=%d point %d dim %d: in stratum %d, Stratum says %d", n, seed, i, k, st, s.Stratum(k, i))
					}
					seen[st]++
				}
				for st, c := range seen {
					if c != 1 {
						t.Fatalf("n=%d seed=%d dim %d: stratum %d holds %d points, want 1", n, seed, k, st, c)
					}
				}
			}
		}
	}
}

func TestLatinHypercubePermutationsIndependent(t *testing.T) {
	// n = 2000: for independent random permutations the correlation of the
	// strata of two dimensions, or of one dimension under two seeds, has
	// standard error 1/sqrt(n-1) = 0.022; tolerance 4 standard errors. The
	// strata must also not be the identity in order (correlation with i).
	const n = 2000
	tol := 4 / math.Sqrt(n-1)
	a, b := NewLatinHypercube(3, n, 1), NewLatinHypercube(3, n, 2)
	strata := func(l *LatinHypercube, k int) []float64 {
		s := make([]float64, n)
		for i := range s {
			s[i] = float64(l.Stratum(k, i))
		}
		return s
	}
	index := make([]float64, n)
	for i := range index {
		index[i] = float64(i)
	}
	for _, c := range []struct {
		name string
		x, y []float64
	}{
		{"dims 0 and 1", strata(a, 0), strata(a, 1)},
		{"dims 1 and 2", strata(a, 1), strata(a, 2)},
		{"seeds 1 and 2", strata(a, 0), strata(b, 0)},
		{"dim 0 and index", strata(a, 0), index},
	} {
		if r := correlation(c.x, c.y); math.Abs(r) > tol {
			t.Errorf("%s: correlation got %v, want 0 (tol %g)", c.name, r, tol)
		}
	}
}

func TestInStratum(t *testing.T) {
	// Exact: floor(x n) must equal s even where (s + u) / n rounds across an edge.
	// The cases are floating-point facts: (48 + (1 - 2^-53)) rounds to 49, and
	// 1/49 * 49 = 0.9999999999999999 in IEEE double.
	for _, c := range []struct {
		s, n int
		u    float64
	}{
		{48, 49, 1 - 0x1p-53},
		{1, 49, 0},
		{0, 1, 1 - 0x1p-53},
		{999, 1000, 1 - 0x1p-53},
		{3, 10, 0},
	} {
		x := inStratum(c.s, c.n, c.u)
		if got := int(math.Floor(x * float64(c.n))); got != c.s || x >= 1 {
			t.Errorf("inStratum(%d, %d, %v) = %v: stratum %d, want %d", c.s, c.n, c.u, x, got, c.s)
		}
	}
}
