package sim

import "math"

// The noisy cruise in the band basis (docs/model.md, Numerics, noise
// during the cruise).
//
// During the cruise the commanded motion is constant, and the interval
// method (stretch) alternates the exact step A(tau) = exp(-i H'_0 tau) with
// the noise factor of each interval,
//
//	N_i = exp(i l dd_i/2) exp(-i eps_i V tau) exp(i l dd_i/2),
//
// dd_i the change of the jitter angle over the interval and eps_i the depth
// deviation. Both noise generators, l and V, keep the quasi-momentum
// classes, so every class block evolves on its own. In the eigenbasis
// |c, n> of H'_0 (band n of class c, energy E_cn) A is diagonal, and the
// noise couples the bands through the real symmetric matrices
//
//	L_nm = <c,n| l |c,m>,   V_nm = <c,n| V |c,m>.
//
// The cut basis keeps the m lowest bands: the fewest that leave at most
// reducedOutside of population outside at the start of the stretch, and
// two more (the tail). In it the interval's factor is replaced by
//
//	exp(i (dd_i (L - l0) - eps_i tau V)) on bands n < m,   exp(i l0 dd_i) on all,
//
// with l0 = L_00 of the class: the constant l0 commutes with everything and
// is applied exactly to every band; the single exponential differs from the
// split factor N_i by the double commutators of the two small generators,
// O(dd^2 eps tau V0 l) per interval (measured: 3e-8 rad in phase at RIN
// -100 dB/Hz and L -90 dBc/Hz over a lap). It is applied by its Taylor
// series, summed to rounding (sub-steps keep the generator's norm below
// 1/2). Bands n >= m keep their free evolution exactly.
//
// Error control: the cut drops the noise's coupling out of the m bands.
// Its size is estimated, as by the last coefficients of a spectral
// expansion, by the noise-driven amplitude that reached the two tail
// bands: every reducedSegment intervals, delta_s, the norm of the tail's
// departure from its free evolution over the segment. Where delta_s
// exceeds reducedTailTol/sqrt(segments) the segment is redone with two more
// bands (heating moves population up the bands as the cruise goes on); the
// stretch's estimate is the quadrature sum of the delta_s. The dropped
// coupling moves an amplitude of the tail's order further out, which
// changes the arms' overlap at order delta^2 (the moved amplitude is
// orthogonal to what stays). Where the basis would grow past K/2 bands, no
// longer cheaper than the grid, the stretch is redone on the full grid.
//
// Cost: an interval costs about 9 m^2 operations per class, against about
// 6 K^2 on the grid; the band basis is tried only where the starting m is
// at most K/reducedGain. On the benchmark ring (K = 18) the sin2 and
// inverse ramps leave 1e-10 of population out to band 9 or 10, so it is not
// tried there; it pays on larger blocks (K = 30: 4 to 6 times faster, from
// TestReducedCruiseAccuracy and TestReducedCruiseLongLaps).
//
// References:
//
//	J. P. Boyd, Chebyshev and Fourier Spectral Methods, 2nd ed. (Dover,
//	2001), ch. 2 (the last retained coefficients as the truncation error
//	estimate; chapter from memory).
//	C. Moler and C. Van Loan, "Nineteen dubious ways to compute the
//	exponential of a matrix, twenty-five years later", SIAM Rev. 45, 3
//	(2003) (Taylor series with scaling, their method 1).

// reducedTailTol bounds the error estimate of a stretch in the band
// basis: the noise-driven amplitude of the tail bands, added in quadrature
// over the segments (per level, summed over classes). The overlap's
// truncation error is then near reducedTailTol^2 = 1e-8, a hundredth of
// the phase target.
const reducedTailTol = 1e-4

// reducedOutside bounds the population (summed over classes and levels)
// of the bands left out of the cut basis at the start of the stretch: the
// noise cannot move more than that amplitude, sqrt(1e-16) = 1e-8, whatever
// it does to those bands.
const reducedOutside = 1e-10

// reducedTail is the number of bands kept above the populated ones, and the
// step by which the cut basis grows.
const reducedTail = 2

// reducedSegment is the number of noise intervals between checks of the
// tail.
const reducedSegment = 256

// bandNoise is the cut band basis of one eigensystem: the generators'
// matrix elements per class.
type bandNoise struct {
	m      int
	l0     []float64    // <c,0| l |c,0>
	lt, vt [][]float64  // (L - l0) and V/v0 on the m lowest bands, m x m
	nl, nv []float64    // their 1-norms
	half   []complex128 // exp(-i E_cn tau/2), classes x m
}

func newBandNoise(b Basis, es *eigensystem, m int, tau float64) *bandNoise {
	k, n := b.Block, b.Sites
	bn := &bandNoise{m: m, l0: make([]float64, n), lt: make([][]float64, n), vt: make([][]float64, n),
		nl: make([]float64, n), nv: make([]float64, n), half: make([]complex128, n*m)}
	bv := make([]float64, k)
	for c := range n {
		v := es.vecs[c]
		var l0 float64
		for j := range k {
			l0 += v[j*k] * v[j*k] * float64(b.L(c, j))
		}
		lt, vt := make([]float64, m*m), make([]float64, m*m)
		for q := range m {
			// bv = B v_q, B the unit-depth block -1/2 - (1/4) tridiag(1).
			for j := range k {
				x := -0.5 * v[j*k+q]
				if j > 0 {
					x -= 0.25 * v[(j-1)*k+q]
				}
				if j < k-1 {
					x -= 0.25 * v[(j+1)*k+q]
				}
				bv[j] = x
			}
			for p := range m {
				var sl, sv float64
				for j := range k {
					sl += v[j*k+p] * v[j*k+q] * (float64(b.L(c, j)) - l0)
					sv += v[j*k+p] * bv[j]
				}
				lt[p*m+q], vt[p*m+q] = sl, sv
			}
			bn.half[c*m+q] = cis(-es.vals[c][q] * tau / 2)
		}
		bn.l0[c], bn.lt[c], bn.vt[c] = l0, lt, vt
		bn.nl[c], bn.nv[c] = norm1(lt, m), norm1(vt, m)
	}
	return bn
}

// norm1 returns the largest column sum of |a|, a m x m.
func norm1(a []float64, m int) float64 {
	var best float64
	for q := range m {
		var s float64
		for p := range m {
			s += math.Abs(a[p*m+q])
		}
		best = math.Max(best, s)
	}
	return best
}

// reducedBands returns the number of bands the cut basis starts with for
// the band amplitudes a (blocks x K, real and imaginary parts): the fewest
// that leave at most reducedOutside of population outside, and the tail.
func reducedBands(ar, ai []float64, k, blocks int) int {
	var out float64
	top := k - 1
	for ; top > 0; top-- {
		for q := range blocks {
			x, y := ar[q*k+top], ai[q*k+top]
			out += x*x + y*y
		}
		if out > reducedOutside {
			break
		}
	}
	return min(k, top+1+reducedTail)
}

// stretchReduced advances f over the noisy constant stretch [t0, t1] in the
// cut band basis of es, in n intervals, as stretch does on the full grid.
// The basis grows by reducedTail bands, and the segment is redone, where a
// segment's tail estimate exceeds its share of reducedTailTol. It returns
// false, leaving f unchanged, if the starting basis has more than K/reducedGain
// bands or would grow past K/2 (no longer cheaper than the grid), and
// the error estimate.
func (p *propagator) stretchReduced(f *field, d Drive, es *eigensystem, t0, t1 float64, n int) (bool, float64) {
	b := p.b
	k, ns, wd := b.Block, b.Sites, f.width()
	cols := 2 * wd
	blocks := f.levels * ns
	tau := (t1 - t0) / float64(n)
	// Band amplitudes a[q*k + band], q = lev*ns + c.
	ar, ai := make([]float64, blocks*k), make([]float64, blocks*k)
	for q := range blocks {
		v := es.vecs[q%ns]
		for nb := range k {
			var re, im float64
			for j := range k {
				re += v[j*k+nb] * f.x[j*cols+q]
				im += v[j*k+nb] * f.x[j*cols+wd+q]
			}
			ar[q*k+nb], ai[q*k+nb] = re, im
		}
	}
	m := reducedBands(ar, ai, k, blocks) + reducedExtra
	if m > k/reducedGain {
		return false, math.Inf(1)
	}
	bn := newBandNoise(b, es, m, tau)
	segs := (n + reducedSegment - 1) / reducedSegment
	segTol := reducedTailTol / math.Sqrt(float64(segs))
	saveR, saveI := make([]float64, blocks*k), make([]float64, blocks*k)
	g := make([]float64, k*k)
	tr, ti, ur, ui := make([]float64, k), make([]float64, k), make([]float64, k), make([]float64, k)
	var est2 float64
	for i0 := 0; i0 < n; {
		i1 := min(n, i0+reducedSegment)
		copy(saveR, ar)
		copy(saveI, ai)
		p.reducedSegment(bn, d, t0, tau, i0, i1, ar, ai, g, tr, ti, ur, ui)
		// The tail's departure from its free evolution over the segment.
		var tail float64
		for q := range blocks {
			c := q % ns
			for nb := m - reducedTail; nb < m; nb++ {
				z := complex(saveR[q*k+nb], saveI[q*k+nb]) * cis(-es.vals[c][nb]*tau*float64(i1-i0))
				dz := complex(ar[q*k+nb], ai[q*k+nb]) - z
				tail += real(dz)*real(dz) + imag(dz)*imag(dz)
			}
		}
		if math.Sqrt(tail) > segTol {
			if m+reducedTail > k/2 {
				// No longer cheaper than the grid.
				return false, math.Inf(1)
			}
			copy(ar, saveR)
			copy(ai, saveI)
			m += reducedTail
			bn = newBandNoise(b, es, m, tau)
			continue
		}
		est2 += tail
		i0 = i1
	}
	// Bands above the cut evolved freely; every band takes exp(i l0 dJ).
	// (The cut bands took their free phases interval by interval.)
	dj := d.Jitter.At(t1) - d.Jitter.At(t0)
	for q := range blocks {
		c := q % ns
		glob := cis(bn.l0[c] * dj)
		for nb := range k {
			z := complex(ar[q*k+nb], ai[q*k+nb])
			if nb >= m {
				z *= cis(-es.vals[c][nb] * (t1 - t0))
			}
			z *= glob
			ar[q*k+nb], ai[q*k+nb] = real(z), imag(z)
		}
	}
	for q := range blocks {
		v := es.vecs[q%ns]
		for j := range k {
			var re, im float64
			for nb := range k {
				re += v[j*k+nb] * ar[q*k+nb]
				im += v[j*k+nb] * ai[q*k+nb]
			}
			f.x[j*cols+q], f.x[j*cols+wd+q] = re, im
		}
	}
	p.cutBands = max(p.cutBands, m)
	return true, math.Sqrt(est2)
}

// reducedSegment takes the intervals i0 .. i1-1 of the stretch from t0 in
// steps of tau, each A(tau/2) exp(i G_i) A(tau/2) on the m cut bands, with
// G_i = dd_i (L - l0) - eps_i tau V.
func (p *propagator) reducedSegment(bn *bandNoise, d Drive, t0, tau float64, i0, i1 int, ar, ai, g, tr, ti, ur, ui []float64) {
	m, ns, k := bn.m, p.b.Sites, p.b.Block
	blocks := len(ar) / k
	g = g[:m*m]
	rotate := func() {
		for q := range blocks {
			c := q % ns
			r, i := ar[q*k:q*k+m], ai[q*k:q*k+m]
			for nb, z := range bn.half[c*m : (c+1)*m] {
				cs, sn := real(z), imag(z)
				r[nb], i[nb] = cs*r[nb]-sn*i[nb], sn*r[nb]+cs*i[nb]
			}
		}
	}
	eps := 0.0
	for i := i0; i < i1; i++ {
		ta, tb := t0+float64(i)*tau, t0+float64(i+1)*tau
		dd := d.Jitter.At(tb) - d.Jitter.At(ta)
		if d.DepthNoise != nil {
			eps = d.DepthNoise.At((ta + tb) / 2)
		}
		ev := -eps * tau * p.v0
		rotate()
		for c := range ns {
			lt, vt := bn.lt[c], bn.vt[c]
			for x := range g {
				g[x] = dd*lt[x] + ev*vt[x]
			}
			size := math.Abs(dd)*bn.nl[c] + math.Abs(ev)*bn.nv[c]
			for q := c; q < blocks; q += ns {
				expiSym(g, m, size, ar[q*k:q*k+m], ai[q*k:q*k+m], tr[:m], ti[:m], ur[:m], ui[:m])
			}
		}
		rotate()
	}
}

// expiSym replaces (xr, xi) by exp(i G) (xr + i xi) for the real symmetric
// m x m matrix G whose 1-norm is at most size, by the Taylor series in
// sub-steps of norm at most 1/2, each summed until its terms fall below
// rounding. tr, ti, ur, ui are scratch of length m.
func expiSym(g []float64, m int, size float64, xr, xi, tr, ti, ur, ui []float64) {
	if size == 0 {
		return
	}
	steps := max(1, int(math.Ceil(2*size)))
	h := 1 / float64(steps)
	for range steps {
		copy(tr, xr)
		copy(ti, xi)
		var xmax float64
		for p := range m {
			xmax = math.Max(xmax, math.Abs(xr[p])+math.Abs(xi[p]))
		}
		for kk := 1; kk < 40; kk++ {
			// t <- (i h / kk) G t
			s := h / float64(kk)
			var tmax float64
			for p := range m {
				row := g[p*m : (p+1)*m]
				var a, bb float64
				for q, x := range row {
					a += x * tr[q]
					bb += x * ti[q]
				}
				ur[p], ui[p] = -s*bb, s*a
				tmax = math.Max(tmax, math.Abs(ur[p])+math.Abs(ui[p]))
			}
			for p := range m {
				tr[p], ti[p] = ur[p], ui[p]
				xr[p] += ur[p]
				xi[p] += ui[p]
			}
			if tmax <= 1e-17*xmax {
				break
			}
		}
	}
}

// reducedGain is the least ratio K/m for which the band basis is tried: an
// interval costs about 4.2 times as much per m^2 in the band basis as per
// K^2 on the grid (measured on the benchmark ring at m = 12, K = 18), so
// at K/m = 3 the band basis is about twice as fast, and it may still grow.
const reducedGain = 3

// reducedExtra adds bands to the cut basis (tests compare against it).
var reducedExtra = 0
