package sim

import (
	"math"

	"gonum.org/v1/gonum/dsp/fourier"
)

// responseSetup is what every operator's spectra share: the nominal start
// levels, their weights, both arms' U(T), the partner states m_a pulled
// back into each arm's time-0 picture, and the sample and frequency grids.
type responseSetup struct {
	b       Basis
	v0      float64
	drives  [2]Drive
	props   [2]*propagator
	starts  [][]complex128 // psi0 of each level
	weights []float64      // p_n
	ut      [2]blockMat    // U_a(T)
	da      float64        // a_+(T) - a_-(T), nominal
	partner [2][][]complex128
	z0      []complex128 // per level
	h       float64
	nt      int
	l       int // FFT length
	m       int // highest frequency index kept
	// progress, if not nil, is told of the frequencies done (summed over
	// the operators and levels), from any goroutine, one call at a time.
	progress func(done int)
}

// opSpectra holds one operator's spectra for frequency indices 0 .. m, at
// +omega_m ([0]) and -omega_m ([1]), omega_m = 2 pi m / (L h), each summed
// over the levels with weights p_n:
//
//	R_a(w) = <m_a| Yhat_a(w)>,            Yhat_a(w) = int e^{-i w t} U_a^+ W U_a psi0 dt
//	J_a(w) = int_{t>t'} e^{i w (t-t')} <W~_a(t) m_a | W~_a(t') psi0>
//	X(w)   = <Yhat_-(w)| M Yhat_+(w)>,    M = U_-(T)^+ D U_+(T)
//
// and Q2_a = int <m_a| U_a^+ W2 U_a |psi0> dt for a second-order operator.
type opSpectra struct {
	r, j [2][2][]complex128 // [arm][sign][m]
	x    [2][]complex128    // [sign][m]
	q2   [2]complex128
}

// responseOps are the operators whose spectra the kernels need: the depth
// modulation V, and the lattice displacement -V' with its second order
// V”/2 and its kick of the start state.
var responseOps = [2]opSpec{{op: opLattice}, {op: opSlope, second: true, kick: true}}

// opSpec is an operator with its optional second-order operator (V”/2)
// and start kick (l).
type opSpec struct {
	op           responseOp
	second, kick bool
}

// sampledSpectra returns the spectra of responseOps by spectraSampled.
func (s *Simulator) sampledSpectra(rs *responseSetup) [2]*opSpectra {
	var out [2]*opSpectra
	for i, o := range responseOps {
		out[i] = s.spectraSampled(rs, o.op, o.second, o.kick)
	}
	return out
}

// spectraSampled samples operator op (with optional second-order operator
// and start kick, for the lattice displacement) along both arms, cruise
// included, and returns its spectra by FFTs of the samples: the reference
// the closed form of the cruise (closedSpectra) is tested against.
func (s *Simulator) spectraSampled(rs *responseSetup, op responseOp, second, kick bool) *opSpectra {
	b := rs.b
	dim := b.Size()
	L, nt, h, M := rs.l, rs.nt, rs.h, rs.m
	lev := len(rs.starts)
	fft := fourier.NewCmplxFFT(L)
	// With L even, every series is transformed at length L/2 (it holds
	// nt+1 <= L/4 samples, so no lag of the correlation wraps), the odd
	// bins of Yhat by a second, twiddled transform (halfTransforms).
	half := L%2 == 0
	var fft2 *fourier.CmplxFFT
	var tw []complex128
	if half {
		fft2 = fourier.NewCmplxFFT(L / 2)
		for j := 0; j <= nt; j++ {
			tw = append(tw, cis(-2*math.Pi*float64(j)/float64(L)))
		}
	}
	// kickHat[a][n] is the transform of sum_c conj(yInit_c) Lambda_c(t)
	// (the start kick's cross term), at length L.
	var kickHat [2][][]complex128
	out := &opSpectra{}
	for a := range 2 {
		for sg := range 2 {
			out.r[a][sg] = make([]complex128, M+1)
			out.j[a][sg] = make([]complex128, M+1)
		}
	}
	for sg := range 2 {
		out.x[sg] = make([]complex128, M+1)
	}
	// kept[a][n][sg][m] is h Yhat + kick vector of level n at +-omega_m.
	var kept [2][][2][][]complex128
	for a := range 2 {
		// series[n][0] is Y (from psi0), [1] is Lambda (from m_a), each
		// dim components of L samples, weighted by the trapezoid rule.
		series := make([][2][]complex128, lev)
		for n := range lev {
			series[n] = [2][]complex128{make([]complex128, dim*L), make([]complex128, dim*L)}
		}
		phi, wv, y := make([]complex128, dim), make([]complex128, dim), make([]complex128, dim)
		var q2 complex128
		weight := func(j int) float64 {
			if j == 0 || j == nt {
				return 0.5
			}
			return 1
		}
		store := func(dst []complex128, j int, v []complex128, w float64) {
			for c, x := range v {
				dst[c*L+j] = complex(w, 0) * x
			}
		}
		onRamp := func(j int, u blockMat) {
			w := weight(j)
			for n := range lev {
				for which, v := range [2][]complex128{rs.starts[n], rs.partner[a][n]} {
					u.mul(b, v, phi)
					op.apply(b, rs.v0, phi, wv)
					u.mulH(b, wv, y)
					store(series[n][which], j, y, w)
				}
				if second {
					u.mul(b, rs.starts[n], phi)
					opCurvature.apply(b, rs.v0, phi, wv)
					u.mul(b, rs.partner[a][n], y)
					q2 += complex(rs.weights[n]*h*w, 0) * dot(y, wv)
				}
			}
		}
		var coef [][2][]complex128 // eigen coefficients of psi0 and m_a per level
		var we, w2e blockMat
		qa, qb, ua, ph := make([]complex128, dim), make([]complex128, dim), make([]complex128, dim), make([]complex128, dim)
		inCruise := func(j int, ts float64, cf *cruiseFrame) {
			if coef == nil {
				coef = make([][2][]complex128, lev)
				for n := range lev {
					coef[n] = [2][]complex128{cf.eigenCoefficients(b, rs.starts[n]), cf.eigenCoefficients(b, rs.partner[a][n])}
				}
				we = cf.operatorInEigenbasis(b, op, rs.v0)
				if second {
					w2e = cf.operatorInEigenbasis(b, opCurvature, rs.v0)
				}
			}
			w := weight(j)
			for c := range b.Sites {
				for kk, v := range cf.es.vals[c] {
					ph[b.Sites*kk+c] = cis(-v * ts)
				}
			}
			for n := range lev {
				for which := range 2 {
					for i, x := range coef[n][which] {
						qa[i] = x * ph[i]
					}
					we.mul(b, qa, ua)
					for i, x := range ua {
						qb[i] = x * complexConj(ph[i])
					}
					cf.b.mul(b, qb, y)
					store(series[n][which], j, y, w)
				}
				if second {
					for i, x := range coef[n][0] {
						qa[i] = x * ph[i]
					}
					w2e.mul(b, qa, ua)
					for i, x := range coef[n][1] {
						qb[i] = x * ph[i]
					}
					q2 += complex(rs.weights[n]*h*w, 0) * dot(qb, ua)
				}
			}
		}
		s.responseWalk(rs.props[a], rs.drives[a], h, nt, onRamp, inCruise)
		out.q2[a] = q2

		// Fourier transforms of every component, and the ordered
		// correlation P(nu) = sum_n p_n sum_c conj(Lambdahat) Yhat.
		var cp []complex128
		if half {
			cp = rs.halfTransforms(series, &kickHat[a], kick, fft, fft2, tw)
		} else {
			cp = rs.fullTransforms(series, &kickHat[a], kick, fft)
		}
		index := func(m, sg int) int {
			if sg == 0 || m == 0 {
				return m
			}
			return L - m
		}
		h2 := complex(h*h, 0)
		for m := 0; m <= M; m++ {
			out.j[a][0][m] = h2 * cp[(L-m)%L]
			out.j[a][1][m] = h2 * cp[m]
		}
		kept[a] = make([][2][][]complex128, lev)
		for n := range lev {
			pw := complex(rs.weights[n], 0)
			var yInit, lInit []complex128
			if kick {
				yInit, lInit = make([]complex128, dim), make([]complex128, dim)
				opMomentum.apply(b, 0, rs.starts[n], yInit)
				opMomentum.apply(b, 0, rs.partner[a][n], lInit)
			}
			yh := series[n][0]
			for sg := range 2 {
				kept[a][n][sg] = make([][]complex128, M+1)
				for m := 0; m <= M; m++ {
					nu := index(m, sg)
					v := make([]complex128, dim)
					var kj complex128
					for c := range dim {
						v[c] = complex(h, 0) * yh[c*L+nu]
						if kick {
							v[c] += yInit[c]
						}
					}
					if kick {
						// sum_c yInit_c conj(h Lambdahat_c) = h conj(shat), shat
						// the transform of sum_c conj(yInit_c) Lambda_c(t).
						x := kickHat[a][n][nu]
						kj = complex(h*real(x), -h*imag(x))
					}
					kept[a][n][sg][m] = v
					out.r[a][sg][m] += pw * dot(rs.partner[a][n], v)
					if kick {
						// The kick at t = 0 precedes every sample; its own
						// ordered square is half of <l m|l psi0>.
						out.j[a][sg][m] += pw * (kj + 0.5*dot(lInit, yInit))
					}
				}
			}
		}
	}
	// X(+-w) = sum_n p_n <Yhat_-|M Yhat_+>.
	t1, t2 := make([]complex128, dim), make([]complex128, dim)
	for n := range lev {
		pw := complex(rs.weights[n], 0)
		for sg := range 2 {
			for m := 0; m <= M; m++ {
				rs.ut[0].mul(b, kept[0][n][sg][m], t1)
				for i := range t1 {
					t1[i] *= cis(-float64(b.LMin()+i) * rs.da)
				}
				rs.ut[1].mulH(b, t1, t2)
				out.x[sg][m] += pw * dot(kept[1][n][sg][m], t2)
			}
		}
	}
	return out
}

// dot returns <u|v>.
func dot(u, v []complex128) complex128 {
	var s complex128
	for i, a := range u {
		s += complex(real(a), -imag(a)) * v[i]
	}
	return s
}

// fftLength returns the smallest n >= k whose prime factors are 2, 3 and 5.
func fftLength(k int) int {
	for n := max(k, 1); ; n++ {
		m := n
		for _, p := range []int{2, 3, 5} {
			for m%p == 0 {
				m /= p
			}
		}
		if m == 1 {
			return n
		}
	}
}

// phaseIntegrals returns I(w) = int_0^T e^{-i w t} dt and
// kappa(w) = int_0^T dt int_0^t dt' e^{i w (t - t')}, by their series where
// w T is small.
func phaseIntegrals(w, T float64) (complex128, complex128) {
	x := w * T
	if math.Abs(x) < 1e-4 {
		i := complex(T, 0) * (1 - complex(0, x/2) - complex(x*x/6, 0))
		k := complex(T*T, 0) * (0.5 + complex(0, x/6) - complex(x*x/24, 0))
		return i, k
	}
	e := cis(x)
	iw := complex(0, w)
	i := (1 - cis(-x)) / iw
	k := ((e-1)/iw - complex(T, 0)) / iw
	return i, k
}

// kickSeries returns, when the operator kicks, the transform at length L
// of sum_c conj(yInit_c) Lambda_c(t) for level n (yInit = l psi0, the
// kick's vector), from the untransformed series lh; nil otherwise.
func (rs *responseSetup) kickSeries(lh []complex128, n int, kick bool, fft *fourier.CmplxFFT) []complex128 {
	if !kick {
		return nil
	}
	dim, L := rs.b.Size(), rs.l
	yInit := make([]complex128, dim)
	opMomentum.apply(rs.b, 0, rs.starts[n], yInit)
	out := make([]complex128, L)
	for c, y := range yInit {
		yc := complex(real(y), -imag(y))
		for j, x := range lh[c*L : c*L+rs.nt+1] {
			out[j] += yc * x
		}
	}
	return fft.Coefficients(out, out)
}

// dropped reports, per component of level n's series, whether it carries
// less than 1e-24 of their total squared norm (high momenta the operators
// barely reach): its share of any spectrum is below 1e-12, and it is
// cleared rather than transformed.
func (rs *responseSetup) dropped(series [2][]complex128) []bool {
	dim, L, nt := rs.b.Size(), rs.l, rs.nt
	norms := make([]float64, dim)
	var total float64
	for which := range 2 {
		for c := range dim {
			for _, x := range series[which][c*L : c*L+nt+1] {
				norms[c] += real(x)*real(x) + imag(x)*imag(x)
			}
		}
	}
	for _, v := range norms {
		total += v
	}
	out := make([]bool, dim)
	for c, v := range norms {
		out[c] = v < 1e-24*total
	}
	return out
}

// fullTransforms transforms every component of the series at length L in
// place and returns the transform of the ordered lag correlation
// c'(k) = (1/L) FFT(P)(k) for lags 0 <= k <= nt (k = 0 halved), P(nu) =
// sum_n p_n sum_c conj(Lambdahat_c) Yhat_c, from which J(+w_m) = h^2
// c'hat(L-m) and J(-w_m) = h^2 c'hat(m).
func (rs *responseSetup) fullTransforms(series [][2][]complex128, kickHat *[][]complex128, kick bool, fft *fourier.CmplxFFT) []complex128 {
	dim, L, nt := rs.b.Size(), rs.l, rs.nt
	p := make([]complex128, L)
	for n := range series {
		*kickHat = append(*kickHat, rs.kickSeries(series[n][1], n, kick, fft))
		drop := rs.dropped(series[n])
		for which := range 2 {
			ser := series[n][which]
			for c := range dim {
				col := ser[c*L : (c+1)*L]
				if drop[c] {
					clear(col)
					continue
				}
				fft.Coefficients(col, col)
			}
		}
		yh, lh := series[n][0], series[n][1]
		pw := complex(rs.weights[n], 0)
		for c := range dim {
			yc, lc := yh[c*L:(c+1)*L], lh[c*L:(c+1)*L]
			for nu := range L {
				x := lc[nu]
				p[nu] += pw * complex(real(x), -imag(x)) * yc[nu]
			}
		}
	}
	return lagTransform(p, L, nt, fft, L, fft)
}

// halfTransforms is fullTransforms for an even L at half the cost of the
// Lambda series: a series of nt+1 <= L/4 samples zero-padded to L has
//
//	Xhat_L(2q) = Xhat_{L/2}(q),   Xhat_L(2q+1) = FFT_{L/2}(x_j e^{-2 pi i j/L})(q),
//
// so Yhat at every bin costs two transforms of length L/2, and the
// correlation P needs Lambdahat only at the even bins (the lags of
// two series of nt+1 samples stay within 2 nt < L/2: none wraps). The
// Lambda series keep only their even-bin transform, in their first L/2
// entries.
func (rs *responseSetup) halfTransforms(series [][2][]complex128, kickHat *[][]complex128, kick bool, fft, fft2 *fourier.CmplxFFT, tw []complex128) []complex128 {
	dim, L, nt := rs.b.Size(), rs.l, rs.nt
	l2 := L / 2
	p := make([]complex128, l2)
	odd, even := make([]complex128, l2), make([]complex128, l2)
	for n := range series {
		*kickHat = append(*kickHat, rs.kickSeries(series[n][1], n, kick, fft))
		drop := rs.dropped(series[n])
		yh, lh := series[n][0], series[n][1]
		for c := range dim {
			ycol, lcol := yh[c*L:(c+1)*L], lh[c*L:(c+1)*L]
			if drop[c] {
				clear(ycol)
				clear(lcol)
				continue
			}
			fft2.Coefficients(lcol[:l2], lcol[:l2])
			clear(odd)
			for j, w := range tw {
				odd[j] = ycol[j] * w
			}
			fft2.Coefficients(odd, odd)
			fft2.Coefficients(even, ycol[:l2])
			for q := range l2 {
				ycol[2*q], ycol[2*q+1] = even[q], odd[q]
			}
		}
		pw := complex(rs.weights[n], 0)
		for c := range dim {
			yc, lc := yh[c*L:(c+1)*L], lh[c*L:(c+1)*L]
			for q := range l2 {
				x := lc[q]
				p[q] += pw * complex(real(x), -imag(x)) * yc[2*q]
			}
		}
	}
	return lagTransform(p, l2, nt, fft2, L, fft)
}

// lagTransform turns P (length n, transformed with fftN) into the
// transform at length L (fftL) of the ordered lag correlation c'(k) =
// (1/n) FFT_n(P)(k), 0 <= k <= nt, the k = 0 term halved.
func lagTransform(p []complex128, n, nt int, fftN *fourier.CmplxFFT, L int, fftL *fourier.CmplxFFT) []complex128 {
	fftN.Coefficients(p, p)
	cp := make([]complex128, L)
	cp[0] = p[0] / complex(2*float64(n), 0)
	for k := 1; k <= nt; k++ {
		cp[k] = p[k] / complex(float64(n), 0)
	}
	return fftL.Coefficients(cp, cp)
}
