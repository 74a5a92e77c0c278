package mc

import (
	"math"
	"testing"
)

func TestSobolTwoDimensionalReference(t *testing.T) {
	// docs/model.md, Statistics: unscrambled 2-D points in Gray-code order (exact
	// dyadic rationals, so exact equality).
	want := [][2]float64{
		{0, 0}, {.5, .5}, {.75, .25}, {.25, .75},
		{.375, .375}, {.875, .875}, {.625, .125}, {.125, .625},
	}
	s := NewSobol(2, len(want), 0, Unscrambled)
	x := make([]float64, 2)
	for i, w := range want {
		s.Point(i, x)
		if x[0] != w[0] || x[1] != w[1] {
			t.Errorf("point %d: got %v, want %v (exact)", i, x, w)
		}
	}
}

func TestSobolFirstPointsFromTable(t *testing.T) {
	// Points 1 to 3 of dimensions 1 to 8, worked by hand from the direction-number
	// table itself (Joe and Kuo, new-joe-kuo-6.21201, rows d = 2..8; exact):
	// point 1 (Gray code 1) is V_1 = m_1/2 = 1/2 in every dimension, point 2 (Gray
	// code 3) is V_1 XOR V_2 and point 3 (Gray code 2) is V_2 = m_2/4. m_2 is 1 in
	// dimension 1 (van der Corput), 3 in dimension 2 (the recurrence for x + 1
	// gives m_2 = 2 m_1 XOR m_1), and 3, 3, 1, 1, 3, 1 from the table for
	// d = 3..8; 1/2 XOR 1/4 = 3/4 and 1/2 XOR 3/4 = 1/4.
	want := [][]float64{
		1: {.5, .5, .5, .5, .5, .5, .5, .5},
		2: {.75, .25, .25, .25, .75, .75, .25, .75},
		3: {.25, .75, .75, .75, .25, .25, .75, .25},
	}
	s := NewSobol(8, 4, 0, Unscrambled)
	x := make([]float64, 8)
	for i := 1; i <= 3; i++ {
		s.Point(i, x)
		for k := range x {
			if x[k] != want[i][k] {
				t.Errorf("point %d dimension %d: got %v, want %v (exact)", i, k+1, x[k], want[i][k])
			}
		}
	}
}

func TestSobolAgainstSciPy(t *testing.T) {
	// scipy.stats.qmc.Sobol(d, scramble=False) (SciPy 1.10.1, which uses the same
	// Joe-Kuo set and Gray-code order; testdata/reference/stats_reference.json):
	// points 0..63 in 32 dimensions, and points 2^20-3 .. 2^20+4 in 256
	// dimensions, which use the recurrence beyond the initial numbers in every
	// dimension. Exact equality: all are multiples of 2^-30.
	for _, ref := range reference(t).SobolUnscrambled {
		s := NewSobol(ref.Dim, ref.Start+len(ref.Points), 0, Unscrambled)
		x := make([]float64, ref.Dim)
		for j, want := range ref.Points {
			i := ref.Start + j
			s.Point(i, x)
			for k := range x {
				if x[k] != want[k] {
					t.Fatalf("d=%d point %d dimension %d: got %v, want %v (exact)", ref.Dim, i, k+1, x[k], want[k])
				}
			}
		}
	}
}

func TestSobolNetProperty(t *testing.T) {
	// Exact: the first 2^m points of every dimension put one point in each interval
	// [j/2^m, (j+1)/2^m), and those of dimensions 1 and 2 form a (0, m, 2)-net,
	// one point in every elementary box [j/2^a, (j+1)/2^a) x [l/2^(m-a), (l+1)/2^(m-a))
	// (Sobol' 1967; Owen 1995 for the scrambled case, which keeps the net).
	const m = 8
	n := 1 << m
	for _, sc := range []Scrambling{Unscrambled, DigitalShift, Owen} {
		cols := columns(NewSobol(SobolMaxDim, n, 3, sc))
		for k, col := range cols {
			seen := make([]bool, n)
			for i, x := range col {
				j := int(x * float64(n))
				if seen[j] {
					t.Fatalf("%v dimension %d: point %d shares interval %d", sc, k+1, i, j)
				}
				seen[j] = true
			}
		}
		for a := 0; a <= m; a++ {
			seen := make(map[[2]int]bool)
			for i := range n {
				box := [2]int{int(cols[0][i] * float64(int(1)<<a)), int(cols[1][i] * float64(int(1)<<(m-a)))}
				if seen[box] {
					t.Fatalf("%v boxes 2^-%d x 2^-%d: point %d shares box %v", sc, a, m-a, i, box)
				}
				seen[box] = true
			}
		}
	}
}

func TestSobolScramblingSeeded(t *testing.T) {
	// Scrambled points depend on the seed and only on it: same seed gives the
	// same points exactly, another seed or no scrambling gives others.
	const n, d = 64, 6
	for _, sc := range []Scrambling{DigitalShift, Owen} {
		a := columns(NewSobol(d, n, 17, sc))
		b := columns(NewSobol(d, n, 17, sc))
		c := columns(NewSobol(d, n, 18, sc))
		u := columns(NewSobol(d, n, 17, Unscrambled))
		var differSeed, differPlain int
		for k := range a {
			for i := range a[k] {
				if a[k][i] != b[k][i] {
					t.Fatalf("%v dim %d point %d: got %v and %v from seed 17", sc, k, i, a[k][i], b[k][i])
				}
				if a[k][i] != c[k][i] {
					differSeed++
				}
				if a[k][i] != u[k][i] {
					differPlain++
				}
			}
		}
		if differSeed == 0 || differPlain == 0 {
			t.Errorf("%v: %d coordinates differ between seeds, %d from unscrambled; want some", sc, differSeed, differPlain)
		}
	}
}

func TestSobolIntegration(t *testing.T) {
	// Integral over [0,1]^8 of prod_k (1 + (x_k - 1/2)) is exactly 1. Its variance
	// is (13/12)^8 - 1 = 0.898, so independent points at N = 4096 have standard
	// error 0.0148; a low-discrepancy sequence must do ten times better (tol
	// 0.0015 absolute). The mean over 8 Owen seeds tests unbiasedness of the
	// scrambled estimate to the same tolerance.
	const n, d = 4096, 8
	integral := func(s Sampler) float64 {
		x := make([]float64, d)
		var sum float64
		for i := range n {
			s.Point(i, x)
			f := 1.0
			for _, u := range x {
				f *= 1 + (u - 0.5)
			}
			sum += f
		}
		return sum / n
	}
	const tol = 0.0015
	if got := integral(NewSobol(d, n, 0, Unscrambled)); math.Abs(got-1) > tol {
		t.Errorf("unscrambled: got %v, want 1 (tol %g)", got, tol)
	}
	var mean float64
	for seed := range uint64(8) {
		got := integral(NewSobol(d, n, seed, Owen))
		if math.Abs(got-1) > tol {
			t.Errorf("Owen seed %d: got %v, want 1 (tol %g)", seed, got, tol)
		}
		mean += got / 8
	}
	if math.Abs(mean-1) > tol {
		t.Errorf("Owen mean over seeds: got %v, want 1 (tol %g)", mean, tol)
	}
}

func TestScramblingString(t *testing.T) {
	for sc, want := range map[Scrambling]string{Unscrambled: "none", DigitalShift: "shift", Owen: "owen", 9: "Scrambling(9)"} {
		if got := sc.String(); got != want {
			t.Errorf("Scrambling(%d).String(): got %q, want %q", int(sc), got, want)
		}
	}
}
