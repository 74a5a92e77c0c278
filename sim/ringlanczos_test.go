package sim

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// TestExpLanczos checks the Lanczos exponential of the ring potential's
// first Magnus term (sim/ringlanczos.go) against exp(-i frac H1) x from
// the eigen-decomposition of H1 itself (dense: H1 assembled column by
// column from mulH1, as the real symmetric matrix [[Re, -Im], [Im, Re]]
// of twice the size, gonum's EigenSym), on the benchmark ring's cruise of
// one lap and of 100 laps, whose H1 reaches 1-norms of 1.5 to 30 through
// near-resonant terms between high bands. The state is a packet in the
// lowest band of every class with 1e-4 of its amplitude spread over all
// bands (a ramp leaves about that), and a state spread evenly over all
// bands. The difference must be below the bound expLanczos stops at
// (magnusTol of the state) plus 1e-13 for rounding (seen: 1.1e-13 to
// 6.5e-12 of the state); the Taylor series, the fallback, within its own
// bound (magnusTol in the 1-norm: seen 8e-13 to 1e-10 of the state in the
// 2-norm, within magnusTol |x|_1 / |x|_2).
func TestExpLanczos(t *testing.T) {
	if testing.Short() {
		t.Skip("dense eigen-decompositions of 720 x 720 matrices")
	}
	s, err := NewSimulator(benchConfig(t, 100))
	if err != nil {
		t.Fatal(err)
	}
	b, cfg := s.basis, s.cfg
	v0 := 2 * math.Pi * cfg.DepthHz
	n, k, size := b.Sites, b.Block, b.Size()
	rng := rand.New(rand.NewPCG(3, 4))
	packet := make([]complex128, size)
	spread := make([]complex128, size)
	for i := range packet {
		packet[i] = 1e-4 * complex(rng.NormFloat64(), rng.NormFloat64())
		spread[i] = complex(rng.NormFloat64(), rng.NormFloat64())
	}
	for c := range n {
		packet[c*k] = cis(rng.Float64() * 2 * math.Pi)
	}
	p := RingPotential{TiltRad: 1e-3, LowRad: 1, Harmonics: []DepthHarmonic{{Order: 2, Rel: 1e-3}}}
	for _, tc := range []struct {
		depthRel, tau float64
	}{
		{1, 2 * math.Pi / 500},       // one lap at 500 rad/s
		{1, 100 * 2 * math.Pi / 500}, // 100 laps
		{1.0123, 100 * 2 * math.Pi / 500},
	} {
		es := diagonalise(b, cfg.Ring.rotationalRate(), 500, tc.depthRel*v0)
		r := newRingOp(p.waves(cfg.Ring, v0, 1), 0)
		r.build(b, &es, 0.3, 500, 1, tc.tau)
		// Dense H1 as a real symmetric matrix of size 2 size.
		h := mat.NewSymDense(2*size, nil)
		col, e := make([]complex128, size), make([]complex128, size)
		for j := range size {
			clear(e)
			e[j] = 1
			r.mag.mulH1(col, e, k)
			for i, z := range col {
				if i < j {
					continue
				}
				h.SetSym(i, j, real(z))
				h.SetSym(size+i, size+j, real(z))
				h.SetSym(size+i, j, imag(z))
				h.SetSym(i, size+j, -imag(z))
			}
		}
		var eig mat.EigenSym
		if !eig.Factorize(h, true) {
			t.Fatal("EigenSym failed")
		}
		vals := eig.Values(nil)
		var vecs mat.Dense
		eig.VectorsTo(&vecs)
		for _, frac := range []float64{1, 0.5} {
			for name, x := range map[string][]complex128{"packet": packet, "spread": spread} {
				t.Run(fmt.Sprintf("depth %g tau %.3g s frac %g %s, H1 1-norm %.3g", tc.depthRel, tc.tau, frac, name, r.mag.norm), func(t *testing.T) {
					// exp(-i frac H) on the real form: the real
					// embedding of a Hermitian H has each eigenvalue
					// twice, with pairs (u, J u); exp(-i frac H) x =
					// sum_j e^{-i frac l_j} <u_j|x> u_j over a complex
					// basis, i.e. in the real form cos(frac l) and
					// sin(frac l) J.
					xr := mat.NewVecDense(2*size, nil)
					for i, z := range x {
						xr.SetVec(i, real(z))
						xr.SetVec(size+i, imag(z))
					}
					var cx, sx mat.VecDense
					var coef mat.VecDense
					coef.MulVec(vecs.T(), xr)
					cc, ss := mat.NewVecDense(2*size, nil), mat.NewVecDense(2*size, nil)
					for j, l := range vals {
						cc.SetVec(j, math.Cos(frac*l)*coef.AtVec(j))
						ss.SetVec(j, math.Sin(frac*l)*coef.AtVec(j))
					}
					cx.MulVec(&vecs, cc) // cos(frac H) x
					sx.MulVec(&vecs, ss) // sin(frac H) x
					// exp(-i frac H) x = cos x - i sin x, with i acting as
					// J (re, im) -> (-im, re).
					want := make([]complex128, size)
					for i := range want {
						want[i] = complex(cx.AtVec(i)+sx.AtVec(size+i), cx.AtVec(size+i)-sx.AtVec(i))
					}
					var nx float64
					for _, z := range x {
						nx += real(z)*real(z) + imag(z)*imag(z)
					}
					nx = math.Sqrt(nx)
					for _, method := range []string{"lanczos", "taylor"} {
						copy(r.mag.coef, x)
						if method == "lanczos" {
							if !r.expLanczos(k, frac) {
								t.Fatalf("Lanczos did not meet its bound in %d steps", lanczosMax)
							}
						} else {
							r.expTaylor(k, frac)
						}
						var d float64
						for i, z := range r.mag.coef {
							d += sq(cmplxAbs(z - want[i]))
						}
						d = math.Sqrt(d) / nx
						// Lanczos bounds the error in the 2-norm; the Taylor
						// series in the 1-norm (|Re| + |Im|), which allows
						// magnusTol |x|_1 in the 2-norm.
						tol := magnusTol
						if method == "taylor" {
							tol *= cnorm1(x) / nx
						}
						t.Logf("%s: error %.3g of the state (tolerance %.3g + 1e-13)", method, d, tol)
						if d > tol+1e-13 {
							t.Errorf("%s: error %.3g of the state, want below %.3g + 1e-13", method, d, tol)
						}
					}
				})
			}
		}
	}
}

func sq(x float64) float64 { return x * x }
