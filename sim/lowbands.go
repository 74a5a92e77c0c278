package sim

import (
	"math"

	"gonum.org/v1/gonum/lapack/gonum"
)

// lowestBands returns the eigenvalues of every class block of H'(w) at
// depth v0 and the eigenvectors of the lowest count bands only, which is
// all a start state needs: the eigenvalues by the QL method without vectors
// (LAPACK dsterf, O(K^2)), each vector by inverse iteration on the shifted
// tridiagonal block (O(K) per iteration). Where a vector's residual is not
// at round-off (a near-degenerate band) the block falls back to the full
// eigensolver. Columns count and above of vecs are zero.
//
// References:
//
//	J. W. Demmel, Applied Numerical Linear Algebra (SIAM, 1997), sec. 5.3.3
//	(inverse iteration).
func lowestBands(b Basis, rot, w, v0 float64, count int) eigensystem {
	var es eigensystem
	lowestBandsOver(b, rot, w, v0, count, &es)
	return es
}

// lowestBandsOver is lowestBands into es, reusing its storage when it has
// the basis's shape (a shot's start lattice, sim/shotwork.go).
func lowestBandsOver(b Basis, rot, w, v0 float64, count int, es *eigensystem) {
	k := b.Block
	count = min(count, k)
	if len(es.vals) != b.Sites || len(es.vals[0]) != k || len(es.vecs[0]) != k*k {
		*es = eigensystem{vals: make([][]float64, b.Sites), vecs: make([][]float64, b.Sites)}
	}
	d, e := make([]float64, k), make([]float64, k)
	x, y := make([]float64, k), make([]float64, k)
	scratch := make([]float64, 4*k)
	var impl gonum.Implementation
	for c := range b.Sites {
		blockHamiltonian(b, c, rot, w, v0, d, e)
		vals := append(es.vals[c][:0], d...)
		ee := append([]float64(nil), e[:k-1]...)
		if !impl.Dsterf(k, vals, ee) {
			panic("sim: tridiagonal eigenvalue solver did not converge")
		}
		vecs := es.vecs[c]
		if vecs == nil {
			vecs = make([]float64, k*k)
		} else {
			clear(vecs)
		}
		scale := math.Abs(vals[0]) + math.Abs(vals[k-1]) + math.Abs(v0)
		ok := true
		for n := 0; n < count && ok; n++ {
			// A shift just off the eigenvalue keeps the factorisation
			// regular; two solves give the vector to round-off.
			shift := vals[n] + 1e-10*scale
			for j := range x {
				x[j] = 1 / math.Sqrt(float64(k))
			}
			for range 3 {
				solveShifted(d, e, shift, x, y, scratch)
				normalise(y)
				x, y = y, x
			}
			if residual(d, e, vals[n], x) > 1e-9*scale {
				ok = false
				break
			}
			for j := range k {
				vecs[j*k+n] = x[j]
			}
		}
		if !ok {
			full := diagonaliseBlock(b, c, rot, w, v0)
			es.vals[c], es.vecs[c] = full.vals, full.vecs
			continue
		}
		es.vals[c], es.vecs[c] = vals, vecs
	}
	es.gen = nextEigenGen()
}

// solveShifted solves (T - shift I) y = x for the symmetric tridiagonal T
// with diagonal d and off-diagonal e, by Gaussian elimination with partial
// pivoting (as LAPACK dgtsv); scratch holds 4 len(d) elements.
func solveShifted(d, e []float64, shift float64, x, y, scratch []float64) {
	n := len(d)
	// Rows of the working matrix: sub (l), diagonal (m), super (u), and a
	// second super-diagonal (u2) that pivoting can fill.
	scratch = scratch[:4*n]
	clear(scratch)
	m, u, u2, l := scratch[:n], scratch[n:2*n], scratch[2*n:3*n], scratch[3*n:]
	copy(y, x)
	for i := range n {
		m[i] = d[i] - shift
		if i < n-1 {
			u[i] = e[i]
			l[i+1] = e[i]
		}
	}
	for i := 0; i < n-1; i++ {
		if math.Abs(m[i]) >= math.Abs(l[i+1]) {
			f := l[i+1] / m[i]
			m[i+1] -= f * u[i]
			y[i+1] -= f * y[i]
			continue
		}
		// swap rows i and i+1
		f := m[i] / l[i+1]
		m[i], l[i+1] = l[i+1], 0
		ui, ui1 := u[i], u[i+1]
		u[i] = m[i+1]
		u2[i] = ui1
		m[i+1] = ui - f*m[i+1]
		u[i+1] = -f * ui1
		y[i], y[i+1] = y[i+1], y[i]-f*y[i+1]
	}
	tiny := 1e-300
	for i := n - 1; i >= 0; i-- {
		s := y[i]
		if i+1 < n {
			s -= u[i] * y[i+1]
		}
		if i+2 < n {
			s -= u2[i] * y[i+2]
		}
		if math.Abs(m[i]) < tiny {
			m[i] = tiny
		}
		y[i] = s / m[i]
	}
}

func normalise(x []float64) {
	var s float64
	for _, v := range x {
		s += v * v
	}
	s = 1 / math.Sqrt(s)
	for i := range x {
		x[i] *= s
	}
}

// residual returns |(T - lambda) x|.
func residual(d, e []float64, lambda float64, x []float64) float64 {
	n := len(d)
	var s float64
	for i := range n {
		r := (d[i] - lambda) * x[i]
		if i > 0 {
			r += e[i-1] * x[i-1]
		}
		if i+1 < n {
			r += e[i] * x[i+1]
		}
		s += r * r
	}
	return math.Sqrt(s)
}
