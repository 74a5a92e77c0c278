package kernel

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// TestCombineMatchesLoop checks that Combine and CombineFused return the
// bits of their portable loops (the package's promise) and, within
// round-off, the plain sum, for every remainder of len(y) modulo 16 and of len(c) modulo 4.
func TestCombineMatchesLoop(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, n := range []int{0, 1, 3, 4, 5, 15, 16, 17, 31, 40, 80, 83} {
		for _, h := range []int{0, 1, 2, 3, 4, 5, 8, 9, 10, 11, 50} {
			stride := n + rng.IntN(3)
			x := make([]float64, h*stride)
			for i := range x {
				x[i] = rng.NormFloat64() * math.Pow(10, float64(rng.IntN(7)-3))
			}
			c := make([]float64, h)
			for i := range c {
				c[i] = rng.NormFloat64()
			}
			got := make([]float64, n)
			for i := range got {
				got[i] = math.NaN() // Combine must overwrite
			}
			want := make([]float64, n)
			Combine(got, x, stride, c)
			combineGo(want, x, stride, c)
			fused, fusedLoop := make([]float64, n), make([]float64, n)
			for i := range fused {
				fused[i] = math.NaN()
			}
			CombineFused(fused, x, stride, c)
			combineFusedGo(fusedLoop, x, stride, c)
			for q := range n {
				if math.Float64bits(got[q]) != math.Float64bits(want[q]) {
					t.Fatalf("n=%d h=%d q=%d: got %v, want the portable loop's %v (bit for bit)", n, h, q, got[q], want[q])
				}
				if math.Float64bits(fused[q]) != math.Float64bits(fusedLoop[q]) {
					t.Fatalf("n=%d h=%d q=%d: CombineFused %v, want its portable loop's %v (bit for bit)", n, h, q, fused[q], fusedLoop[q])
				}
				var plain, scale float64
				for j := range h {
					plain += c[j] * x[j*stride+q]
					scale += math.Abs(c[j] * x[j*stride+q])
				}
				// Summation error bound: h eps sum|terms| (Higham, Accuracy
				// and Stability of Numerical Algorithms, 2nd ed., eq. 4.4).
				if tol := float64(h+1) * 0x1p-52 * scale; math.Abs(got[q]-plain) > tol {
					t.Fatalf("n=%d h=%d q=%d: got %v, want %v (tol %g)", n, h, q, got[q], plain, tol)
				}
				if tol := float64(h+1) * 0x1p-52 * scale; math.Abs(fused[q]-plain) > tol {
					t.Fatalf("n=%d h=%d q=%d: CombineFused %v, want %v (tol %g)", n, h, q, fused[q], plain, tol)
				}
			}
		}
	}
}

func TestCombineShortPanics(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("Combine with x shorter than its rows did not panic")
		}
	}()
	Combine(make([]float64, 4), make([]float64, 7), 4, []float64{1, 2})
}

func BenchmarkCombineFused(b *testing.B) {
	n, h := 36, 144 // a class's rows in the ring potential's Magnus product
	x := make([]float64, n*h)
	for i := range x {
		x[i] = float64(i % 7)
	}
	c := make([]float64, h)
	for i := range c {
		c[i] = 0.1 * float64(i)
	}
	y := make([]float64, n)
	b.Run("fused", func(b *testing.B) {
		for b.Loop() {
			CombineFused(y, x, n, c)
		}
	})
	b.Run("plain", func(b *testing.B) {
		for b.Loop() {
			Combine(y, x, n, c)
		}
	})
}

func BenchmarkCombine(b *testing.B) {
	for _, sz := range [][2]int{{40, 9}, {80, 9}, {40, 10}, {400, 50}} {
		n, h := sz[0], sz[1]
		x := make([]float64, n*h)
		for i := range x {
			x[i] = float64(i % 7)
		}
		c := make([]float64, h)
		for i := range c {
			c[i] = 0.1 * float64(i)
		}
		y := make([]float64, n)
		b.Run(fmt.Sprintf("n=%d/h=%d", n, h), func(b *testing.B) {
			for b.Loop() {
				Combine(y, x, n, c)
			}
		})
		b.Run(fmt.Sprintf("n=%d/h=%d/go", n, h), func(b *testing.B) {
			for b.Loop() {
				combineGo(y, x, n, c)
			}
		})
	}
}

// TestFoldRotateMatchLoops checks that Fold and Rotate return the bits of
// the portable loops for every remainder of the length modulo 4.
func TestFoldRotateMatchLoops(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for n := range 19 {
		a, b := make([]float64, n), make([]float64, n)
		for i := range a {
			a[i], b[i] = rng.NormFloat64(), rng.NormFloat64()*1e3
		}
		s, d := make([]float64, n), make([]float64, n)
		ws, wd := make([]float64, n), make([]float64, n)
		Fold(s, d, a, b)
		foldGo(ws, wd, a, b)
		re, im := append([]float64(nil), a...), append([]float64(nil), b...)
		wre, wim := append([]float64(nil), a...), append([]float64(nil), b...)
		c, sn := 0.6, -0.8
		Rotate(re, im, c, sn)
		rotateGo(wre, wim, c, sn)
		for q := range n {
			if s[q] != ws[q] || d[q] != wd[q] {
				t.Fatalf("Fold n=%d q=%d: got %v, %v, want %v, %v (bit for bit)", n, q, s[q], d[q], ws[q], wd[q])
			}
			if math.Float64bits(re[q]) != math.Float64bits(wre[q]) || math.Float64bits(im[q]) != math.Float64bits(wim[q]) {
				t.Fatalf("Rotate n=%d q=%d: got %v, %v, want %v, %v (bit for bit)", n, q, re[q], im[q], wre[q], wim[q])
			}
			// The rotation by a unit number keeps the modulus (exact
			// identity, to round-off).
			if m0, m1 := math.Hypot(a[q], b[q]), math.Hypot(re[q], im[q]); math.Abs(m1-m0) > 4e-16*m0 {
				t.Fatalf("Rotate n=%d q=%d: modulus %v, want %v (tol %g relative)", n, q, m1, m0, 4e-16)
			}
		}
	}
}

// TestPhaseRotateMatchesLoop checks PhaseRotate against the portable loop
// bit for bit for every remainder of the length modulo 4, and against the
// product of three unit complex numbers (modulus kept to round-off).
func TestPhaseRotateMatchesLoop(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	for n := range 23 {
		re, im := make([]float64, n), make([]float64, n)
		cr, ci, tr, ti := make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
		for i := range re {
			re[i], im[i] = rng.NormFloat64(), rng.NormFloat64()
			s, c := math.Sincos(rng.Float64() * 7)
			cr[i], ci[i] = c, s
			s, c = math.Sincos(rng.Float64() * 7)
			tr[i], ti[i] = c, s
		}
		wre, wim := append([]float64(nil), re...), append([]float64(nil), im...)
		m0 := make([]float64, n)
		for i := range re {
			m0[i] = math.Hypot(re[i], im[i])
		}
		PhaseRotate(re, im, cr, ci, tr, ti)
		phaseRotateGo(wre, wim, cr, ci, tr, ti)
		for q := range n {
			if math.Float64bits(re[q]) != math.Float64bits(wre[q]) || math.Float64bits(im[q]) != math.Float64bits(wim[q]) {
				t.Fatalf("n=%d q=%d: got %v, %v, want %v, %v (bit for bit)", n, q, re[q], im[q], wre[q], wim[q])
			}
			if m1 := math.Hypot(re[q], im[q]); math.Abs(m1-m0[q]) > 1e-15*m0[q] {
				t.Fatalf("n=%d q=%d: modulus %v, want %v (tol %g relative)", n, q, m1, m0[q], 1e-15)
			}
		}
	}
}

// TestRotateByMatchesLoop holds RotateBy to its portable loop bit for bit
// (the AVX lanes do the loop's operations in its order) and to the
// modulus a unit factor keeps.
func TestRotateByMatchesLoop(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	for n := range 23 {
		re, im := make([]float64, n), make([]float64, n)
		cr, ci := make([]float64, n), make([]float64, n)
		for i := range re {
			re[i], im[i] = rng.NormFloat64(), rng.NormFloat64()
			ci[i], cr[i] = math.Sincos(rng.Float64() * 7)
		}
		wre, wim := append([]float64(nil), re...), append([]float64(nil), im...)
		m0 := make([]float64, n)
		for i := range re {
			m0[i] = math.Hypot(re[i], im[i])
		}
		RotateBy(re, im, cr, ci)
		rotateByGo(wre, wim, cr, ci)
		for q := range n {
			if math.Float64bits(re[q]) != math.Float64bits(wre[q]) || math.Float64bits(im[q]) != math.Float64bits(wim[q]) {
				t.Fatalf("RotateBy n=%d q=%d: got %v, %v, want %v, %v (bit for bit)", n, q, re[q], im[q], wre[q], wim[q])
			}
			if m1 := math.Hypot(re[q], im[q]); math.Abs(m1-m0[q]) > 1e-15*m0[q] { // a few ulps: the factor is unit to 1 ulp, the products round
				t.Fatalf("RotateBy n=%d q=%d: modulus changed to %v from %v", n, q, m1, m0[q])
			}
		}
	}
}

// TestRotateTwiceToMatchesTwoPasses holds RotateTwiceTo to copying and two
// RotateBy passes, bit for bit, and to its portable loop.
func TestRotateTwiceToMatchesTwoPasses(t *testing.T) {
	rng := rand.New(rand.NewPCG(13, 14))
	for n := range 23 {
		sr, si := make([]float64, n), make([]float64, n)
		cr, ci := make([]float64, n), make([]float64, n)
		for i := range sr {
			sr[i], si[i] = rng.NormFloat64(), rng.NormFloat64()
			ci[i], cr[i] = math.Sincos(rng.Float64() * 7)
		}
		wr, wi := append([]float64(nil), sr...), append([]float64(nil), si...)
		RotateBy(wr, wi, cr, ci)
		RotateBy(wr, wi, cr, ci)
		dr, di := make([]float64, n), make([]float64, n)
		RotateTwiceTo(dr, di, sr, si, cr, ci)
		gr, gi := make([]float64, n), make([]float64, n)
		rotateTwiceToGo(gr, gi, sr, si, cr, ci)
		for q := range n {
			for _, got := range [][2]float64{{dr[q], di[q]}, {gr[q], gi[q]}} {
				if math.Float64bits(got[0]) != math.Float64bits(wr[q]) || math.Float64bits(got[1]) != math.Float64bits(wi[q]) {
					t.Fatalf("n=%d q=%d: got %v, want %v, %v (bit for bit two RotateBy passes)", n, q, got, wr[q], wi[q])
				}
			}
		}
	}
}
