package kernel

import (
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/cmplxs"
)

// TestAxpyToMatchesLoop checks the vector kernel bit for bit against the
// portable loop and against gonum's cmplxs.AddScaledTo (the reference
// library it replaces in sim), for lengths that exercise the pairs and
// the single tail, with dst a separate slice and dst = y.
func TestAxpyToMatchesLoop(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	c := func() complex128 { return complex(rng.NormFloat64(), rng.NormFloat64()) }
	for _, n := range []int{0, 1, 2, 3, 4, 5, 7, 400, 401} {
		x, y := make([]complex128, n), make([]complex128, n)
		for i := range x {
			x[i], y[i] = c(), c()
		}
		a := c()
		got, loop, lib := make([]complex128, n), make([]complex128, n), make([]complex128, n)
		AxpyTo(got, y, a, x)
		axpyToGo(loop, y, a, x)
		cmplxs.AddScaledTo(lib, y, a, x)
		inPlace := append([]complex128(nil), y...)
		AxpyTo(inPlace, inPlace, a, x)
		for i := range got {
			if got[i] != loop[i] || got[i] != lib[i] || inPlace[i] != loop[i] {
				t.Fatalf("n %d, element %d: kernel %v, in place %v, loop %v, gonum %v", n, i, got[i], inPlace[i], loop[i], lib[i])
			}
		}
	}
}

// TestAxpyToShortPanics checks the length check.
func TestAxpyToShortPanics(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("AxpyTo with a short x did not panic")
		}
	}()
	AxpyTo(make([]complex128, 3), make([]complex128, 3), 1, make([]complex128, 2))
}

func BenchmarkAxpyTo(b *testing.B) {
	x, y := make([]complex128, 400), make([]complex128, 400)
	for i := range x {
		x[i], y[i] = complex(float64(i), 1), complex(1, float64(i))
	}
	b.Run("kernel", func(b *testing.B) {
		for b.Loop() {
			AxpyTo(y, y, 1e-9i, x)
		}
	})
	b.Run("gonum", func(b *testing.B) {
		for b.Loop() {
			cmplxs.AddScaled(y, 1e-9i, x)
		}
	})
}

// TestAxpy2ToMatchesTwoAxpys checks the pair kernel bit for bit against
// two AxpyTo passes and against the portable loop, for lengths that
// exercise the pairs and the single tail, with dst separate and dst = y.
func TestAxpy2ToMatchesTwoAxpys(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	c := func() complex128 { return complex(rng.NormFloat64(), rng.NormFloat64()) }
	for _, n := range []int{0, 1, 2, 3, 4, 5, 7, 400, 401} {
		xa, xb, y := make([]complex128, n), make([]complex128, n), make([]complex128, n)
		for i := range xa {
			xa[i], xb[i], y[i] = c(), c(), c()
		}
		a, b := c(), c()
		got, two, loop := make([]complex128, n), make([]complex128, n), make([]complex128, n)
		Axpy2To(got, y, a, xa, b, xb)
		AxpyTo(two, y, a, xa)
		AxpyTo(two, two, b, xb)
		axpy2ToGo(loop, y, a, xa, b, xb)
		inPlace := append([]complex128(nil), y...)
		Axpy2To(inPlace, inPlace, a, xa, b, xb)
		for i := range got {
			if got[i] != two[i] || got[i] != loop[i] || inPlace[i] != two[i] {
				t.Fatalf("n %d, element %d: kernel %v, in place %v, two passes %v, loop %v", n, i, got[i], inPlace[i], two[i], loop[i])
			}
		}
	}
}

// TestAxpy2ToShortPanics checks the length check.
func TestAxpy2ToShortPanics(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("Axpy2To with a short xb did not panic")
		}
	}()
	Axpy2To(make([]complex128, 3), make([]complex128, 3), 1, make([]complex128, 3), 1, make([]complex128, 2))
}

func BenchmarkAxpy2To(b *testing.B) {
	x, y, z := make([]complex128, 400), make([]complex128, 400), make([]complex128, 400)
	for i := range x {
		x[i], y[i], z[i] = complex(float64(i), 1), complex(1, float64(i)), complex(2, float64(i))
	}
	b.Run("pair", func(b *testing.B) {
		for b.Loop() {
			Axpy2To(y, y, 1e-9i, x, 2e-9i, z)
		}
	})
	b.Run("two-axpys", func(b *testing.B) {
		for b.Loop() {
			AxpyTo(y, y, 1e-9i, x)
			AxpyTo(y, y, 2e-9i, z)
		}
	})
}

// TestAxpy2PlanesMatchesInterleaved checks the planar pair kernel bit for
// bit against Axpy2To on the interleaved vectors and against the portable
// loop (and the planar single tap AxpyPlanes against AxpyTo), for lengths that exercise the blocks of four and the tail, with
// the destination separate and in place.
func TestAxpy2PlanesMatchesInterleaved(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	for _, n := range []int{0, 1, 3, 4, 5, 7, 8, 9, 360, 363} {
		pl := func() ([]float64, []float64, []complex128) {
			re, im, z := make([]float64, n), make([]float64, n), make([]complex128, n)
			for i := range z {
				re[i], im[i] = rng.NormFloat64(), rng.NormFloat64()
				z[i] = complex(re[i], im[i])
			}
			return re, im, z
		}
		yr, yi, y := pl()
		xar, xai, xa := pl()
		xbr, xbi, xb := pl()
		a, b := complex(rng.NormFloat64(), rng.NormFloat64()), complex(rng.NormFloat64(), rng.NormFloat64())
		want := make([]complex128, n)
		Axpy2To(want, y, a, xa, b, xb)
		dr, di := make([]float64, n), make([]float64, n)
		Axpy2Planes(dr, di, yr, yi, a, xar, xai, b, xbr, xbi)
		lr, li := make([]float64, n), make([]float64, n)
		axpy2PlanesGo(lr, li, yr, yi, a, xar, xai, b, xbr, xbi)
		Axpy2Planes(yr, yi, yr, yi, a, xar, xai, b, xbr, xbi)
		one := make([]complex128, n)
		AxpyTo(one, y, a, xa)
		sr, si := make([]float64, n), make([]float64, n)
		if n > 0 {
			AxpyPlanes(sr, si, y2r(y), y2i(y), a, xar, xai)
		}
		for i := range one {
			if sr[i] != real(one[i]) || si[i] != imag(one[i]) {
				t.Fatalf("n %d, element %d: AxpyPlanes (%v, %v), AxpyTo %v", n, i, sr[i], si[i], one[i])
			}
		}
		for i := range want {
			if dr[i] != real(want[i]) || di[i] != imag(want[i]) || lr[i] != dr[i] || li[i] != di[i] || yr[i] != dr[i] || yi[i] != di[i] {
				t.Fatalf("n %d, element %d: planes (%v, %v), loop (%v, %v), in place (%v, %v), interleaved %v", n, i, dr[i], di[i], lr[i], li[i], yr[i], yi[i], want[i])
			}
		}
	}
}

// TestAxpy2PlanesShortPanics checks the length check.
func TestAxpy2PlanesShortPanics(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("Axpy2Planes with a short plane did not panic")
		}
	}()
	z := make([]float64, 3)
	Axpy2Planes(z, z, z, z, 1, z, z, 1, z, make([]float64, 2))
}

func BenchmarkAxpy2Planes(b *testing.B) {
	p := func(v float64) []float64 {
		x := make([]float64, 400)
		for i := range x {
			x[i] = v + float64(i)
		}
		return x
	}
	yr, yi, xar, xai, xbr, xbi := p(1), p(2), p(3), p(4), p(5), p(6)
	for b.Loop() {
		Axpy2Planes(yr, yi, yr, yi, 1e-9i, xar, xai, 2e-9i, xbr, xbi)
	}
}

func y2r(z []complex128) []float64 {
	out := make([]float64, len(z))
	for i, v := range z {
		out[i] = real(v)
	}
	return out
}

func y2i(z []complex128) []float64 {
	out := make([]float64, len(z))
	for i, v := range z {
		out[i] = imag(v)
	}
	return out
}
