package sim

import (
	"math"

	"gonum.org/v1/gonum/lapack"
	"gonum.org/v1/gonum/lapack/gonum"

	"rampart/internal/kernel"
)

// expLanczos replaces mg.coef by exp(-i frac H1) of it by the Lanczos
// process, with a bound on its error computed along the way, and reports whether
// the bound met magnusTol within lanczosMax steps (if not, mg.coef is
// unchanged and the caller sums the Taylor series).
//
// After m steps from v_1 = x/|x|, H1 V_m = V_m T_m + beta_m v_{m+1} e_m^T
// (T_m tridiagonal, alpha_j on its diagonal, beta_j beside it), and y =
// |x| V_m exp(-i frac T_m) e_1 approximates exp(-i frac H1) x. Along s in
// [0, frac] the relation gives the error e' = -i H1 e - i beta_m |x|
// v_{m+1} f_m(s), f_m(s) = e_m^T exp(-i s T_m) e_1, so that, H1 being
// Hermitian, |e(frac)| <= |x| beta_m integral_0^frac |f_m(s)| ds. The same
// argument inside T_m, which relates to its leading block T_{m-1} as H1
// to T_m, gives |f_m(s)| <= beta_{m-1} integral_0^s |f_{m-1}(u)| du with
// |f_1| = 1, hence
//
//	|exp(-i frac H1) x - y| <= |x| beta_1 beta_2 ... beta_m |frac|^m / m!,
//
// which the steps run until it is below magnusTol |x|. The bound holds
// whether or not rounding has cost the v_j their orthogonality (it uses
// the three-term relation only, which holds to rounding: Paige), so no
// reorthogonalisation is needed. Unlike the Taylor series' rest, bounded
// by the norm of all of H1, it involves only the couplings the state's
// Krylov chain meets: a packet in the lowest bands needs few steps even
// when H1 is large between high bands it does not occupy (near-resonant
// terms over a long cruise, up to a norm of 30 in a static ensemble of
// the benchmark ring at 100 laps, where the Taylor series took over 100
// products a factor).
//
// References:
//
//	Y. Saad, "Analysis of some Krylov subspace approximations to the
//	matrix exponential operator", SIAM J. Numer. Anal. 29, 209 (1992).
//	M. Hochbruck and C. Lubich, "On Krylov subspace approximations to the
//	matrix exponential operator", SIAM J. Numer. Anal. 34, 1911 (1997).
//	C. C. Paige, "Accuracy and effectiveness of the Lanczos algorithm for
//	the symmetric eigenproblem", Linear Algebra Appl. 34, 235 (1980).
//	T. Jawecki, W. Auzinger and O. Koch, "Computable upper error bounds
//	for Krylov approximations to matrix exponentials and associated
//	phi-functions", BIT Numer. Math. 60, 157 (2020).
//
// (docs/model.md, Perturbations, the ring potential.)
func (r *ringOp) expLanczos(k int, frac float64) bool {
	mg := &r.mag
	x := mg.coef
	size := len(x)
	var nx float64
	for _, v := range x {
		nx += real(v)*real(v) + imag(v)*imag(v)
	}
	nx = math.Sqrt(nx)
	if nx == 0 {
		return true
	}
	lz := &mg.lanczos
	if len(lz.v) < (lanczosMax+1)*size {
		lz.v = make([]complex128, (lanczosMax+1)*size)
		lz.w = make([]complex128, size)
		lz.alpha, lz.beta = make([]float64, lanczosMax), make([]float64, lanczosMax)
		lz.d, lz.e = make([]float64, lanczosMax), make([]float64, lanczosMax)
		lz.q, lz.work = make([]float64, lanczosMax*lanczosMax), make([]float64, 2*lanczosMax)
	}
	vec := func(j int) []complex128 { return lz.v[j*size : (j+1)*size] }
	v0 := vec(0)
	inv := complex(1/nx, 0)
	for i, v := range x {
		v0[i] = v * inv
	}
	var impl gonum.Implementation
	w := lz.w
	logBound, logTol := 0.0, math.Log(magnusTol)
	for m := 1; m <= lanczosMax; m++ {
		vj := vec(m - 1)
		mg.mulH1(w, vj, k)
		var a float64
		for i, v := range vj {
			a += real(v)*real(w[i]) + imag(v)*imag(w[i])
		}
		lz.alpha[m-1] = a
		kernel.AxpyTo(w, w, complex(-a, 0), vj)
		if m > 1 {
			kernel.AxpyTo(w, w, complex(-lz.beta[m-2], 0), vec(m-2))
		}
		var b float64
		for _, v := range w {
			b += real(v)*real(v) + imag(v)*imag(v)
		}
		b = math.Sqrt(b)
		lz.beta[m-1] = b
		// The bound |x| beta_1 ... beta_m frac^m / m! (see above).
		logBound += math.Log(b) + math.Log(math.Abs(frac)) - math.Log(float64(m))
		if lanczosTrace != nil {
			lanczosTrace(m, b, math.Exp(logBound))
		}
		if b == 0 || logBound <= logTol {
			// y = |x| V_m Q exp(-i frac D) Q^T e_1.
			d, e, q := lz.d[:m], lz.e[:m], lz.q[:m*m]
			copy(d, lz.alpha[:m])
			copy(e, lz.beta[:m-1])
			if !impl.Dsteqr(lapack.EVTridiag, m, d, e, q, m, lz.work) {
				return false
			}
			clear(x)
			for row := range m {
				var u complex128
				for j := range m {
					u += complex(q[row*m+j]*q[j], 0) * cis(-frac*d[j])
				}
				kernel.AxpyTo(x, x, u*complex(nx, 0), vec(row))
			}
			return true
		}
		next := vec(m)
		inv := complex(1/b, 0)
		for i, v := range w {
			next[i] = v * inv
		}
	}
	return false
}

// lanczosMax is the most Lanczos steps expLanczos takes before it leaves
// the factor to the Taylor series.
const lanczosMax = 40

// lanczosWork is expLanczos's scratch: the Lanczos vectors, T_m and its
// eigensystem.
type lanczosWork struct {
	v, w              []complex128
	alpha, beta, d, e []float64
	q, work           []float64
}

var lanczosTrace func(m int, b, bound float64)
