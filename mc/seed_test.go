package mc

import (
	"math"
	"sync"
	"testing"

	"rampart/stats"
)

func TestMix64(t *testing.T) {
	// splitmix64 seeded with 0: the first three outputs mix64(k * 0x9e3779b97f4a7c15),
	// k = 1, 2, 3 (from memory of the published test vectors of Vigna's
	// splitmix64.c; exact integers, no tolerance).
	want := []uint64{0xe220a8397b1dcdaf, 0x6e789e6aa1b965f4, 0x06c45d188009454f}
	var s uint64
	for k, w := range want {
		s += 0x9e3779b97f4a7c15
		if got := mix64(s); got != w {
			t.Errorf("output %d: got %#x, want %#x", k+1, got, w)
		}
	}
}

func TestStreamReproducible(t *testing.T) {
	// Exact equality: the same (seed, i, purpose) must give the same numbers.
	for _, c := range []struct {
		seed    uint64
		i       int
		purpose string
	}{
		{0, 0, ""}, {1, 0, ""}, {1, 1, "static"}, {42, 999_999, "noise/rin"}, {math.MaxUint64, math.MaxInt, "x"},
	} {
		a, b := Substream(c.seed, c.i, c.purpose), Substream(c.seed, c.i, c.purpose)
		for k := range 16 {
			if x, y := a.Uint64(), b.Uint64(); x != y {
				t.Fatalf("%+v draw %d: got %#x and %#x", c, k, x, y)
			}
		}
	}
	s, u := Stream(7, 3), Substream(7, 3, "")
	for k := range 16 {
		if x, y := s.Uint64(), u.Uint64(); x != y {
			t.Fatalf("Stream(7, 3) draw %d: got %#x, Substream(7, 3, \"\") %#x", k, x, y)
		}
	}
}

func TestStreamDistinct(t *testing.T) {
	// Streams differing in one of (seed, i, purpose) must differ in their first
	// output: a coincidence has probability 2^-64 per pair.
	first := func(seed uint64, i int, purpose string) uint64 { return Substream(seed, i, purpose).Uint64() }
	base := first(1, 10, "static")
	for _, c := range []struct {
		name string
		got  uint64
	}{
		{"next realisation", first(1, 11, "static")},
		{"previous realisation", first(1, 9, "static")},
		{"next seed", first(2, 10, "static")},
		{"other purpose", first(1, 10, "noise")},
		{"empty purpose", first(1, 10, "")},
	} {
		if c.got == base {
			t.Errorf("%s: same first output %#x as (1, 10, static)", c.name, base)
		}
	}
}

func TestStreamNeighboursIndependent(t *testing.T) {
	// N = 20000 neighbouring streams: the mean of their first uniforms has
	// standard error sqrt(1/12/N) = 0.0020, and the correlation between the first
	// uniforms of streams i and i+1 has standard error 1/sqrt(N) = 0.0071 if they
	// are independent; tolerance 4 standard errors each.
	const n = 20000
	u := make([]float64, n+1)
	for i := range u {
		u[i] = Stream(2024, i).Float64()
	}
	if m := stats.Mean(u); math.Abs(m-0.5) > 4*math.Sqrt(1.0/12/n) {
		t.Errorf("mean of first uniforms: got %v, want 0.5 (tol %g)", m, 4*math.Sqrt(1.0/12/n))
	}
	r := correlation(u[:n], u[1:])
	if tol := 4 / math.Sqrt(n); math.Abs(r) > tol {
		t.Errorf("lag-1 correlation across streams: got %v, want 0 (tol %g)", r, tol)
	}
}

func TestStreamOrderIndependent(t *testing.T) {
	// Realisations drawn by 4 goroutines, each taking every 4th index in reverse
	// order, must equal those drawn in order by one (exact equality).
	const n = 200
	want := make([]uint64, n)
	for i := range want {
		want[i] = Substream(5, i, "noise").Uint64()
	}
	got := make([]uint64, n)
	var wg sync.WaitGroup
	for w := range 4 {
		wg.Go(func() {
			for i := n - 1 - w; i >= 0; i -= 4 {
				got[i] = Substream(5, i, "noise").Uint64()
			}
		})
	}
	wg.Wait()
	for i := range want {
		if got[i] != want[i] {
			t.Fatalf("realisation %d: got %#x, want %#x", i, got[i], want[i])
		}
	}
}

func TestStreamNegativeIndexPanics(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("Stream(1, -1) did not panic")
		}
	}()
	Stream(1, -1)
}

// correlation returns Pearson's correlation coefficient of x and y.
func correlation(x, y []float64) float64 {
	mx, my := stats.Mean(x), stats.Mean(y)
	var sxy, sxx, syy float64
	for k := range x {
		dx, dy := x[k]-mx, y[k]-my
		sxy += dx * dy
		sxx += dx * dx
		syy += dy * dy
	}
	return sxy / math.Sqrt(sxx*syy)
}
