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
