package sim

import (
	"math"

	"rampart/internal/kernel"
)

// responseRampTol is the relative truncation of a ramp's sampled series
// (pivoted Gram-Schmidt, lowRankOf): every sample is kept to within this
// share of the largest sample's norm.
var responseRampTol = 1e-5

// responsePruneTol prunes the cruise's closed forms: of the terms
// A_kk' e^{i (g_k - g_k') s} of a cruise series (newCruiseTerms), the
// smallest whose moduli add up to at most responsePruneTol times the
// terms' root-sum-square are dropped, which moves the series by at most
// that at every instant.
var responsePruneTol = 1e-6

// lowRank is a set of n vectors v_j = sum_i q_i r[i][j] with orthonormal
// q_i: a ramp's samples in few directions.
type lowRank struct {
	q [][]complex128 // rank vectors of the basis size
	r [][]complex128 // rank rows of n coefficients
}

// lowRankOf compresses cols by Gram-Schmidt with column pivoting (each
// direction orthogonalised twice): it stops when every residual is at most
// tol times the largest column's norm, so that |v_j - sum_i q_i r_ij| <=
// tol max_j |v_j|; r = Q^dagger V, the least-squares coefficients.
func lowRankOf(cols [][]complex128, tol float64) lowRank {
	n := len(cols)
	var out lowRank
	if n == 0 {
		return out
	}
	res := make([][]complex128, n)
	var top float64
	for j, c := range cols {
		res[j] = append([]complex128(nil), c...)
		top = math.Max(top, norm2(c))
	}
	for len(out.q) < n {
		best, bn := -1, 0.0
		for j, c := range res {
			if v := norm2(c); v > bn {
				best, bn = j, v
			}
		}
		if best < 0 || math.Sqrt(bn) <= tol*math.Sqrt(top) {
			break
		}
		v := append([]complex128(nil), res[best]...)
		for range 2 {
			for _, q := range out.q {
				axpy(-dot(q, v), q, v)
			}
		}
		nv := math.Sqrt(norm2(v))
		if nv == 0 {
			break
		}
		for i := range v {
			v[i] /= complex(nv, 0)
		}
		out.q = append(out.q, v)
		for _, c := range res {
			axpy(-dot(v, c), v, c)
		}
	}
	for _, q := range out.q {
		row := make([]complex128, n)
		for j, c := range cols {
			row[j] = dot(q, c)
		}
		out.r = append(out.r, row)
	}
	return out
}

func norm2(v []complex128) float64 {
	var s float64
	for _, x := range v {
		s += real(x)*real(x) + imag(x)*imag(x)
	}
	return s
}

// axpy sets y += a x (kernel.AxpyTo: the bits of y[i] += a*x[i]).
func axpy(a complex128, x, y []complex128) {
	kernel.AxpyTo(y[:len(x)], y, a, x)
}

// phaseInt returns I1(x) = int_0^tau e^{i x s} ds given e = e^{i x tau}, by
// its series where |x tau| < 1e-2 (relative error below 1e-13).
func phaseInt(x, tau float64, e complex128) complex128 {
	y := x * tau
	if math.Abs(y) < 1e-2 {
		iy := complex(0, y)
		return complex(tau, 0) * (1 + iy/2 + iy*iy/6 + iy*iy*iy/24 + iy*iy*iy*iy/120)
	}
	return (e - 1) * complex(0, -1/x)
}

// orderedPhaseInt returns I2(a, b) = int_0^tau ds e^{i a s} int_0^s ds'
// e^{i b s'} in closed form, by the form that does not cancel: through b
// where |b tau| >= 1/2, through a where |a tau| >= 1/2, else by its double
// series sum_{m,n} (ia)^m (ib)^n tau^{m+n+2} / (m! (n+1)! (m+n+2)).
func orderedPhaseInt(a, b, tau float64) complex128 {
	i1 := func(x float64) complex128 { return phaseInt(x, tau, cis(x*tau)) }
	switch {
	case math.Abs(b*tau) >= 0.5:
		return (i1(a+b) - i1(a)) * complex(0, -1/b)
	case math.Abs(a*tau) >= 0.5:
		return (cis(a*tau)*i1(b) - i1(a+b)) * complex(0, -1/a)
	}
	ia, ib := complex(0, a*tau), complex(0, b*tau)
	var s complex128
	pa := complex(1, 0) // (ia)^m / m!
	for m := range 24 {
		pb := complex(1, 0) // (ib)^n / (n+1)!
		for n := 0; m+n < 24; n++ {
			pb /= complex(float64(n+1), 0)
			s += pa * pb / complex(float64(m+n+2), 0)
			pb *= ib
		}
		pa *= ia / complex(float64(m+1), 0)
	}
	return complex(tau*tau, 0) * s
}
