package sim

import (
	"math"

	"gonum.org/v1/gonum/lapack"
	"gonum.org/v1/gonum/lapack/gonum"

	"rampart/internal/kernel"
)

// steqr computes all eigenvalues and eigenvectors of the symmetric
// tridiagonal matrix with diagonal d (n) and off-diagonal e (n-1) by the
// implicit QL/QR method: LAPACK dsteqr with compz = 'I', transcribed from
// gonum's Dsteqr (v0.17.0, BSD licence) operation for operation, so that
// its results are those of gonum's bit for bit, but with the eigenvectors
// stored transposed: zt[k*n+j] is component j of eigenvector k. The plane
// rotations that dsteqr applies to pairs of columns of Z then act on pairs
// of contiguous rows of zt (kernel.Rotate, the same products and sums).
// On return d holds the eigenvalues in ascending order; work needs 2n-2
// elements. It reports whether the iteration converged.
//
// References:
//
//	E. Anderson et al., LAPACK Users' Guide, 3rd ed. (SIAM, 1999), dsteqr.
//	The gonum authors, gonum.org/v1/gonum/lapack/gonum, Dsteqr.
func steqr(n int, d, e, zt, work []float64) bool {
	if n == 0 {
		return true
	}
	clear(zt[:n*n])
	for i := range n {
		zt[i*n+i] = 1
	}
	if n == 1 {
		return true
	}
	var impl gonum.Implementation
	const (
		eps    = 0x1p-53
		eps2   = eps * eps
		safmin = 0x1p-1022
		safmax = 1 / safmin
	)
	ssfmax := math.Sqrt(safmax) / 3
	ssfmin := math.Sqrt(safmin) / eps2
	// rotate applies the rotations (work[i], work[n-1+i]), i = 0 .. mm-2,
	// to the column pairs (l+i, l+i+1) of Z, backward or forward, as
	// Dlasr(Right, Variable, direct, n, mm, ..., z[l:], ldz).
	rotate := func(l, mm int, cs, sn []float64, backward bool) {
		apply := func(j int) {
			c, s := cs[j], sn[j]
			if c != 1 || s != 0 {
				kernel.Rotate(zt[(l+j+1)*n:(l+j+2)*n], zt[(l+j)*n:(l+j+1)*n], c, s)
			}
		}
		if backward {
			for j := mm - 2; j >= 0; j-- {
				apply(j)
			}
			return
		}
		for j := 0; j < mm-1; j++ {
			apply(j)
		}
	}

	const maxit = 30
	nmaxit := n * maxit
	jtot := 0
	l1 := 0
	nm1 := n - 1
	const (
		down = iota + 1
		up
	)
	var iscale int
	for {
		if l1 > n-1 {
			// Selection sort of the eigenvalues, swapping the vectors.
			for ii := 1; ii < n; ii++ {
				i := ii - 1
				k := i
				p := d[i]
				for j := ii; j < n; j++ {
					if d[j] < p {
						k = j
						p = d[j]
					}
				}
				if k != i {
					d[k] = d[i]
					d[i] = p
					a, b := zt[i*n:(i+1)*n], zt[k*n:(k+1)*n]
					for q := range a {
						a[q], b[q] = b[q], a[q]
					}
				}
			}
			return true
		}
		if l1 > 0 {
			e[l1-1] = 0
		}
		var m int
		if l1 <= nm1 {
			for m = l1; m < nm1; m++ {
				test := math.Abs(e[m])
				if test == 0 {
					break
				}
				if test <= (math.Sqrt(math.Abs(d[m]))*math.Sqrt(math.Abs(d[m+1])))*eps {
					e[m] = 0
					break
				}
			}
		}
		l := l1
		lsv := l
		lend := m
		lendsv := lend
		l1 = m + 1
		if lend == l {
			continue
		}

		anorm := impl.Dlanst(lapack.MaxAbs, lend-l+1, d[l:], e[l:])
		switch {
		case anorm == 0:
			continue
		case anorm > ssfmax:
			iscale = down
			impl.Dlascl(lapack.General, 0, 0, anorm, ssfmax, lend-l+1, 1, d[l:], 1)
			impl.Dlascl(lapack.General, 0, 0, anorm, ssfmax, lend-l, 1, e[l:], 1)
		case anorm < ssfmin:
			iscale = up
			impl.Dlascl(lapack.General, 0, 0, anorm, ssfmin, lend-l+1, 1, d[l:], 1)
			impl.Dlascl(lapack.General, 0, 0, anorm, ssfmin, lend-l, 1, e[l:], 1)
		}

		if math.Abs(d[lend]) < math.Abs(d[l]) {
			lend = lsv
			l = lendsv
		}
		if lend > l {
			// QL iteration.
			for {
				if l != lend {
					for m = l; m < lend; m++ {
						v := math.Abs(e[m])
						if v*v <= (eps2*math.Abs(d[m]))*math.Abs(d[m+1])+safmin {
							break
						}
					}
				} else {
					m = lend
				}
				if m < lend {
					e[m] = 0
				}
				p := d[l]
				if m == l {
					l++
					if l > lend {
						break
					}
					continue
				}
				if m == l+1 {
					d[l], d[l+1], work[l], work[n-1+l] = impl.Dlaev2(d[l], e[l], d[l+1])
					rotate(l, 2, work[l:], work[n-1+l:], true)
					e[l] = 0
					l += 2
					if l > lend {
						break
					}
					continue
				}
				if jtot == nmaxit {
					break
				}
				jtot++

				g := (d[l+1] - p) / (2 * e[l])
				r := impl.Dlapy2(g, 1)
				g = d[m] - p + e[l]/(g+math.Copysign(r, g))
				s := 1.0
				c := 1.0
				p = 0.0
				for i := m - 1; i >= l; i-- {
					f := s * e[i]
					b := c * e[i]
					c, s, r = dlartg(g, f)
					if i != m-1 {
						e[i+1] = r
					}
					g = d[i+1] - p
					r = (d[i]-g)*s + 2*c*b
					p = s * r
					d[i+1] = g + p
					g = c*r - b
					work[i] = c
					work[n-1+i] = -s
				}
				rotate(l, m-l+1, work[l:], work[n-1+l:], true)
				d[l] -= p
				e[l] = g
			}
		} else {
			// QR iteration.
			for {
				if l != lend {
					for m = l; m > lend; m-- {
						v := math.Abs(e[m-1])
						if v*v <= (eps2*math.Abs(d[m])*math.Abs(d[m-1]) + safmin) {
							break
						}
					}
				} else {
					m = lend
				}
				if m > lend {
					e[m-1] = 0
				}
				p := d[l]
				if m == l {
					l--
					if l < lend {
						break
					}
					continue
				}
				if m == l-1 {
					d[l-1], d[l], work[m], work[n-1+m] = impl.Dlaev2(d[l-1], e[l-1], d[l])
					rotate(l-1, 2, work[m:], work[n-1+m:], false)
					e[l-1] = 0
					l -= 2
					if l < lend {
						break
					}
					continue
				}
				if jtot == nmaxit {
					break
				}
				jtot++

				g := (d[l-1] - p) / (2 * e[l-1])
				r := impl.Dlapy2(g, 1)
				g = d[m] - p + (e[l-1])/(g+math.Copysign(r, g))
				s := 1.0
				c := 1.0
				p = 0.0
				for i := m; i < l; i++ {
					f := s * e[i]
					b := c * e[i]
					c, s, r = dlartg(g, f)
					if i != m {
						e[i-1] = r
					}
					g = d[i] - p
					r = (d[i+1]-g)*s + 2*c*b
					p = s * r
					d[i] = g + p
					g = c*r - b
					work[i] = c
					work[n-1+i] = s
				}
				rotate(m, l-m+1, work[m:], work[n-1+m:], false)
				d[l] -= p
				e[l-1] = g
			}
		}

		switch iscale {
		case down:
			impl.Dlascl(lapack.General, 0, 0, ssfmax, anorm, lendsv-lsv+1, 1, d[lsv:], 1)
			impl.Dlascl(lapack.General, 0, 0, ssfmax, anorm, lendsv-lsv, 1, e[lsv:], 1)
		case up:
			impl.Dlascl(lapack.General, 0, 0, ssfmin, anorm, lendsv-lsv+1, 1, d[lsv:], 1)
			impl.Dlascl(lapack.General, 0, 0, ssfmin, anorm, lendsv-lsv, 1, e[lsv:], 1)
		}
		if jtot >= nmaxit {
			break
		}
	}
	for i := 0; i < n-1; i++ {
		if e[i] != 0 {
			return false
		}
	}
	return true
}

// dlartg is gonum's Dlartg (v0.17.0) with its constants folded: the plane
// rotation [c s; -s c] [f; g] = [r; 0], the same operations in the same
// order, inlined into steqr's inner loop.
func dlartg(f, g float64) (cs, sn, r float64) {
	const (
		safmin = 0x1p-1022
		safmax = 1 / safmin
		rtmin  = 0x1p-511 // sqrt(safmin)
	)
	if g == 0 {
		return 1, 0, f
	}
	g1 := math.Abs(g)
	if f == 0 {
		return 0, math.Copysign(1, g), g1
	}
	f1 := math.Abs(f)
	if rtmin < f1 && f1 < dlartgRtmax && rtmin < g1 && g1 < dlartgRtmax {
		d := math.Sqrt(f*f + g*g)
		cs = f1 / d
		r = math.Copysign(d, f)
		sn = g / r
		return cs, sn, r
	}
	u := math.Min(math.Max(safmin, math.Max(f1, g1)), safmax)
	fs := f / u
	gs := g / u
	d := math.Sqrt(fs*fs + gs*gs)
	cs = math.Abs(fs) / d
	r = math.Copysign(d, f)
	sn = gs / r
	r *= u
	return cs, sn, r
}

// dlartgRtmax is sqrt(safmax/2) as gonum's Dlartg computes it.
var dlartgRtmax = math.Sqrt(0x1p1022 / 2)
