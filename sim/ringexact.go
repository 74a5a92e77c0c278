package sim

import (
	"math"

	"rampart/internal/kernel"
)

// The ring potential in the propagation (docs/model.md, Perturbations,
// the ring potential).
//
// In the frame co-moving with an arm's lattice (phi = theta - a(t), a the
// lattice's angle) the static potential U of the apparatus frame is
// U(phi + alpha(t)), alpha(t) = a(t) - Omega t the lattice's angle relative
// to the apparatus. Its Fourier terms
//
//	U/hbar = sum_w c_w g^{d_w} e^{i k_w alpha} e^{i m_w phi}
//
// shift the angular momentum, (e^{i m phi} psi)_l = psi_{l-m}: in the
// momentum layout (index N j + c) a banded Toeplitz operator that couples
// the classes c -> c + m, which the lattice alone keeps apart.
//
// While the drive changes, exp(-i U tau) joins each lattice factor of the
// split step: U and the lattice are both diagonal in angle, so they
// commute and the pair is exp(-i (gV + U) tau) exactly, at the time the
// lattice factor sees; the splitting keeps its order. The factor is
// applied as a product of Jacobi-Anger series, one per distinct shift m
// (ringOp.split).
//
// Over a stretch of constant commanded speed w (the cruise, or a rest),
// with H0 the constant co-moving Hamiltonian and alpha(s) = alpha0 + w_a s
// (w_a = w - Omega), the state is
//
//	psi(tau) = e^{-i H0 tau} T exp(-i integral_0^tau U_I(s) ds) psi(0),
//	U_I(s) = e^{i H0 s} U(s) e^{-i H0 s},
//
// and the time-ordered exponential is replaced by the exponential of the
// first Magnus term, H1 = integral U_I ds, whose elements between the
// eigenstates |c', n> and |c, p> of H0 are closed forms:
//
//	(H1)_{c'n, cp} = sum_w c_w g^{d_w} e^{i k_w alpha0} <c'n| e^{i m_w phi} |cp> J(E_c'n - E_cp + k_w w_a, tau),
//	J(nu, tau) = integral_0^tau e^{i nu s} ds = (e^{i nu tau} - 1) / (i nu).
//
// exp(-i H1) is unitary. The Magnus terms left out start with the second,
// -1/2 integral integral [U_I(s1), U_I(s2)] ds2 ds1: its largest part is
// the commutator of the potential's band-diagonal part (which differs
// between bands: a depth harmonic modulates the site's trap frequency)
// with its interband part (the force that displaces the packet), which
// acts on packets the ramps left excited. Measured against the split step
// taken through the whole sequence (sim/ringexact_test.go), it stays below
// 1e-7 rad at the demo's 0.5 mrad tilt and 1e-3 second harmonic, and grows
// as the cube of the tilt and the square of a harmonic's amplitude
// (Simulator.RingErrorRad estimates it for a given shot).
//
// A noisy stretch (jitter, depth noise) runs the grid's interval method
// (propagator.stretch), and exp(-i U tau) joins each interval's noise
// factor at its midpoint: noise that excites the packet during the
// cruise lets the potential act on the excited packet all along, which a
// single Magnus factor around the stretch missed (by 9e-4 rad against
// 3e-5 rad for a 1e-3 second harmonic with drive phase noise at -90
// dBc/Hz). The interval's Strang splitting leaves a relative error of
// order (omega tau)^2 / 12, as for the noise itself (0.2 %).
//
// References:
//
//	W. Magnus, "On the exponential solution of differential equations
//	for a linear operator", Commun. Pure Appl. Math. 7, 649 (1954).
//	S. Blanes, F. Casas, J. A. Oteo and J. Ros, "The Magnus expansion and
//	some of its applications", Phys. Rep. 470, 151 (2009).
//	C. Moler and C. Van Loan, "Nineteen dubious ways to compute the
//	exponential of a matrix, twenty-five years later", SIAM Rev. 45, 3
//	(2003).

// ringWave is one Fourier term c e^{i k alpha} e^{i m phi} of U/hbar in
// rad/s, times the relative depth g if depth.
type ringWave struct {
	m, k  int
	c     complex128
	depth bool
}

// waves returns the Fourier terms of p for the arm of sign s on ring r,
// v0 = V0/hbar. Terms of the same m, k and depth dependence are merged;
// every term comes with its partner (-m, -k, conj(c)), so U is Hermitian.
func (p RingPotential) waves(r Ring, v0, sign float64) []ringWave {
	var ws []ringWave
	add := func(m, k int, c complex128, depth bool) {
		for _, s := range [2]float64{1, -1} {
			mm, kk, cc := m, k, c
			if s < 0 {
				mm, kk, cc = -m, -k, complexConj(c)
			}
			merged := false
			for i := range ws {
				if ws[i].m == mm && ws[i].k == kk && ws[i].depth == depth {
					ws[i].c += cc
					merged = true
					break
				}
			}
			if !merged {
				ws = append(ws, ringWave{mm, kk, cc, depth})
			}
		}
	}
	// -G cos(theta - Low) = -(G/2) e^{-i Low} e^{i alpha} e^{i phi} + c.c.
	if p.TiltRad != 0 {
		add(1, 1, complex(-math.Pi*p.GravityHz(r), 0)*cis(-p.LowRad), false)
	}
	// s pi nu_g cos(theta - spinRad).
	if p.spinHz != 0 {
		add(1, 1, complex(sign*math.Pi*p.spinHz/2, 0)*cis(-p.spinRad), false)
	}
	// -g v0 Rel cos(h theta - Phase) cos^2(N phi / 2), cos^2 x = 1/2 +
	// (e^{2ix} + e^{-2ix})/4.
	n := r.Sites
	for _, h := range p.Harmonics {
		c := complex(-v0*h.Rel/2, 0) * cis(-h.PhaseRad)
		add(h.Order, h.Order, c/2, true)
		add(h.Order+n, h.Order, c/4, true)
		add(h.Order-n, h.Order, c/4, true)
	}
	out := ws[:0]
	for _, w := range ws {
		if w.c != 0 {
			out = append(out, w)
		}
	}
	return out
}

// ringOp applies an arm's ring potential in the propagator.
type ringOp struct {
	waves []ringWave
	omega float64 // the apparatus' rotation Omega, rad/s: alpha = a - Omega t

	u   []complex128
	mag ringMagnus

	// scratch of split: the distinct shifts, their taps and the state of
	// one level.
	ms             []int
	taps           []splitTap
	xr, xi, ar, ai []float64

	// pieceRad, if positive, cuts every constant stretch into pieces over
	// which the potential's fastest term turns by at most pieceRad, each
	// with its own first Magnus term (the refined shot of RingErrorRad).
	pieceRad float64
}

// pieces returns how many pieces a stretch of length tau at the speed wa
// relative to the apparatus is cut into (see pieceRad).
func (r *ringOp) pieces(wa, tau float64) int {
	if !(r.pieceRad > 0) {
		return 1
	}
	var kmax float64
	for _, w := range r.waves {
		kmax = math.Max(kmax, math.Abs(float64(w.k)))
	}
	return max(1, int(math.Ceil(kmax*math.Abs(wa)*tau/r.pieceRad)))
}

func newRingOp(waves []ringWave, omega float64) *ringOp {
	return &ringOp{waves: waves, omega: omega}
}

// split applies exp(-i U(alpha, g) tau) to every level of f. The shifts
// e^{i m phi} commute, so exp(-i U tau) is the product over the distinct
// m > 0 of exp(-i tau (u_m e^{i m phi} + conj(u_m) e^{-i m phi})) =
// exp(-i x cos(m phi + theta)), x = 2 tau |u_m|, theta = arg u_m (u_m the
// sum of the terms of that m at alpha and g), times the phase of the
// c-number terms (m = 0). Each factor is the Jacobi-Anger series
//
//	exp(-i x cos(psi)) = sum_n (-i)^n J_n(x) e^{i n psi}
//
// (Abramowitz and Stegun 9.1.41, z = -x), a banded Toeplitz operator with
// taps at multiples of m, cut where sum_{|n| > nmax} |J_n(x)| <= 2
// (x/2)^(nmax+1) / (nmax+1)! falls below splitTol (x is below 1e-2 on a
// split step: five to seven taps). Each factor is applied as J_0(x) (1 +
// sum_{n != 0} t_n S_{n m}), the first tap's pass adding the state itself,
// and the J_0 of every factor and the c-number phase as one scalar at the
// end; J_n(x) by its power series (besselJ), e^{i n theta} as powers of
// e^{i theta}. In the truncated basis the taps that would leave it are
// dropped, where the state holds no amplitude.
func (r *ringOp) split(f *field, alpha, g, tau float64) {
	// u_m at alpha and g, per distinct m (m >= 0).
	u := r.u[:0]
	ms := r.ms[:0]
	for _, w := range r.waves {
		if w.m < 0 || (w.m == 0 && w.k < 0) {
			continue
		}
		c := w.c * cis(float64(w.k)*alpha)
		if w.depth {
			c *= complex(g, 0)
		}
		found := false
		for i, m := range ms {
			if m == w.m {
				u[i] += c
				found = true
				break
			}
		}
		if !found {
			ms, u = append(ms, w.m), append(u, c)
		}
	}
	r.u, r.ms = u, ms
	size := f.b.Size()
	if len(r.xr) != size {
		r.xr, r.xi, r.ar, r.ai = make([]float64, size), make([]float64, size), make([]float64, size), make([]float64, size)
	}
	// The c-number terms (m = 0) with their partners: 2 Re(u_0).
	phase := complex(1, 0)
	for i, m := range ms {
		if m == 0 {
			phase *= cis(-2 * real(u[i]) * tau)
		}
	}
	// The taps of every shift, as factor_m = a0_m (1 + sum_n t_n S_{n m}):
	// the scalars a0_m and the phase are applied once, at the end.
	scale := phase
	taps := r.taps[:0]
	for i, m := range ms {
		if m == 0 || u[i] == 0 {
			continue
		}
		x, theta := 2*math.Abs(tau)*cmplxAbs(u[i]), math.Atan2(imag(u[i]), real(u[i]))
		if tau < 0 {
			// exp(-i tau U) for tau < 0 is exp(+i |tau| U): x cos(psi)
			// with psi shifted by pi.
			theta += math.Pi
		}
		// Above x = 1 the factor is applied as reps factors of x/reps
		// (J_0 stays above 0.7, the taps' division by it harmless).
		reps := max(1, int(math.Ceil(x)))
		x /= float64(reps)
		// nmax: the tail bound 2 (x/2)^(n+1)/(n+1)! below splitTol.
		nmax, t := 0, 2*x/2
		for t > splitTol && nmax < 40 {
			nmax++
			t *= x / 2 / float64(nmax+1)
		}
		var jn [41]float64
		besselJ(jn[:nmax+1], x)
		a0 := jn[0]
		for range reps {
			scale *= complex(a0, 0)
		}
		if nmax == 0 {
			continue
		}
		// (-i)^n J_n e^{+-i n theta} on S_{+-n m}, divided by J_0.
		e1 := cis(theta)
		start := len(taps)
		en := complex(1, 0)
		for n := 1; n <= nmax; n++ {
			en *= e1
			in := [4]complex128{1, -1i, -1, 1i}[n%4]
			c := in * complex(jn[n]/a0, 0)
			taps = append(taps, splitTap{n * m, c * en}, splitTap{-n * m, c * complexConj(en)})
		}
		taps = append(taps, splitTap{}) // the end of shift m's taps
		for range reps - 1 {
			taps = append(taps, taps[start:start+2*nmax+1]...)
		}
	}
	r.taps = taps
	for lev := range f.levels {
		gatherPlanes(f, lev, r.xr, r.xi)
		first := true
		for i := 0; i < len(taps); i++ {
			tp := taps[i]
			if tp.shift == 0 {
				// Shift m done: its result becomes the next one's input.
				r.xr, r.ar = r.ar, r.xr
				r.xi, r.ai = r.ai, r.xi
				first = true
				continue
			}
			xr, xi, ar, ai := r.xr, r.xi, r.ar, r.ai
			br, bi := ar, ai
			if first {
				br, bi = xr, xi
			}
			// The taps come in pairs +-s (s > 0): where both act, one pass
			// (the bits of the two in turn).
			if sh := tp.shift; sh > 0 && 2*sh < size && i+1 < len(taps) && taps[i+1].shift == -sh {
				// The ends, where one tap acts, through the pair kernel with
				// a zero second tap: adding 0 x leaves every non-zero sum's
				// bits as they are.
				b, hi := taps[i+1].c, size-sh
				kernel.Axpy2Planes(ar[:sh], ai[:sh], br[:sh], bi[:sh], b, xr[sh:2*sh], xi[sh:2*sh], 0, xr[:sh], xi[:sh])
				kernel.Axpy2Planes(ar[sh:hi], ai[sh:hi], br[sh:hi], bi[sh:hi], tp.c, xr[:hi-sh], xi[:hi-sh], b, xr[2*sh:], xi[2*sh:])
				kernel.Axpy2Planes(ar[hi:], ai[hi:], br[hi:], bi[hi:], tp.c, xr[hi-sh:size-sh], xi[hi-sh:size-sh], 0, xr[:sh], xi[:sh])
				i++
				first = false
				continue
			}
			// A single tap: ac = xc + c S xc if first (xc where S leaves
			// nothing), ac += c S xc otherwise.
			sh := tp.shift
			lo, hi := min(size, max(0, sh)), max(0, min(size, size+sh))
			if first {
				copy(ar[:lo], xr[:lo])
				copy(ai[:lo], xi[:lo])
				copy(ar[hi:], xr[hi:])
				copy(ai[hi:], xi[hi:])
			}
			if hi > lo {
				kernel.AxpyPlanes(ar[lo:hi], ai[lo:hi], br[lo:hi], bi[lo:hi], tp.c, xr[lo-sh:hi-sh], xi[lo-sh:hi-sh])
			}
			first = false
		}
		scatterPlanesScaled(f, lev, r.xr, r.xi, scale)
	}
}

// splitTap is one term c S_shift of a potential factor in split; a zero
// shift ends a shift's terms.
type splitTap struct {
	shift int
	c     complex128
}

// besselJ sets j[n] = J_n(x), n < len(j): for x below 0.1 by the power
// series J_n(x) = sum_k (-x^2/4)^k (x/2)^n / (k! (n+k)!) (Abramowitz and
// Stegun 9.1.10) summed until the term falls below 1e-18 of the sum,
// otherwise by math.Jn.
func besselJ(j []float64, x float64) {
	if x >= 0.1 {
		for n := range j {
			j[n] = math.Jn(n, x)
		}
		return
	}
	q := -x * x / 4
	lead := 1.0 // (x/2)^n / n!
	for n := range j {
		if n > 0 {
			lead *= x / 2 / float64(n)
		}
		sum, term := 1.0, 1.0
		for k := 1; k < 20; k++ {
			term *= q / float64(k*(n+k))
			sum += term
			if math.Abs(term) < 1e-18*math.Abs(sum) {
				break
			}
		}
		j[n] = lead * sum
	}
}

// splitTol bounds the Jacobi-Anger series' rest in each split-step factor
// of the potential: a shot takes a few hundred such factors, so their
// truncation moves the phase by below 1e-10 rad (the Taylor series of
// exp(-i U tau) summed to the same bound gave the same phases to 1e-11 rad
// in every case of TestRingPotentialExact).
const splitTol = 1e-13

// gatherPlanes copies level lev of f into the planes xr, xi in the
// momentum layout (index N j + c for l = LMin + N j + c): the field's rows
// hold each level's real and imaginary parts as runs of N.
func gatherPlanes(f *field, lev int, xr, xi []float64) {
	n, w := f.b.Sites, f.width()
	for j := range f.b.Block {
		row := f.x[2*w*j:]
		copy(xr[n*j:n*j+n], row[lev*n:lev*n+n])
		copy(xi[n*j:n*j+n], row[w+lev*n:w+lev*n+n])
	}
}

// scatterPlanesScaled is the inverse of gatherPlanes, times s: it sets
// level lev of f to s (xr + i xi), each product as Go forms s x.
func scatterPlanesScaled(f *field, lev int, xr, xi []float64, s complex128) {
	n, w := f.b.Sites, f.width()
	sr, si := real(s), imag(s)
	for j := range f.b.Block {
		row := f.x[2*w*j:]
		re, im := row[lev*n:lev*n+n], row[w+lev*n:w+lev*n+n]
		pr, pi := xr[n*j:n*j+n], xi[n*j:n*j+n]
		for c := range re {
			re[c], im[c] = sr*pr[c]-si*pi[c], sr*pi[c]+si*pr[c]
		}
	}
}

// ringBlock is a block of the upper half B of H1 = B + B^dagger, from
// class from to class to: K x K, row n (band of class to), column p (band
// of class from).
type ringBlock struct {
	from, to int
	h        []complex128
}

// ringMagnus is the first Magnus term H1 of one stretch in the eigenbasis
// of its H0, as the blocks of its upper half B (the terms of m > 0, or m
// = 0 and k > 0; their partners give B^dagger), and the scratch of its
// application.
type ringMagnus struct {
	blocks []ringBlock
	norm   float64 // a bound on the 1-norm of H1
	coef   []complex128
	acc    []complex128
	term   []complex128
	next   []complex128
	ph     []complex128 // e^{i E tau} of every eigenstate, index c*K + n
	// shifts[i*N + c] is the K x K overlap <c'n| e^{i m_i phi} |cp> of the
	// i-th distinct shift m_i in shiftMs, kept for the next build on the
	// same eigensystem (shiftGen: the pieces of a stretch, the next shot's
	// cruise when shotWork reuses its eigensystem).
	shifts   [][]float64
	shiftMs  []int
	shiftGen uint64
	col      []float64

	// wj[i*N + c] is the K x K term of the i-th upper wave (shape
	// wjShapes[i]) from class c per unit amplitude, sh J(nu), for the
	// eigensystem, wa and tau of wjKey; upperWaves is build's scratch.
	wj         [][]complex128
	wjShapes   []waveShape
	wjKey      magnusJKey
	upperWaves []waveShape

	// stack[c] holds the blocks of H1 into class c as real rows for
	// kernel.Combine (stackRows), srcs[c] the class each pair of K-row
	// groups takes its coefficients from; xs and ys are mulH1's scratch.
	stack  [][]float64
	srcs   [][]int
	xs, ys []float64

	lanczos lanczosWork

	// key and keyWaves are the inputs of the last build: a build with the
	// same ones (a repeated shot) keeps blocks and norm as they are.
	built    bool
	key      magnusKey
	keyWaves []ringWave
}

// waveShape is a ring wave's (m, k), what its Magnus term depends on
// besides its amplitude.
type waveShape struct{ m, k int }

// magnusJKey is what the waves' Magnus terms per unit amplitude depend on
// besides their shapes.
type magnusJKey struct {
	gen     uint64
	wa, tau float64
}

// magnusKey is what a build depends on besides the waves.
type magnusKey struct {
	gen                uint64
	alpha0, wa, g, tau float64
}

// sameWaves reports whether a and b hold the same terms in the same order.
func sameWaves(a, b []ringWave) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// upper reports whether w belongs to the upper half B of H1 on a ring of
// n sites: the terms whose class shift r = m mod n lies in (0, n/2), and
// for r = 0 or n/2, whose partners shift by the same r, those of m > 0 or
// m = 0 and k > 0. Each term's partner (-m, -k) then lies in the other
// half, and the blocks of B are those of the shifts in [0, n/2].
func (w ringWave) upper(n int) bool {
	r := ((w.m % n) + n) % n
	if r == 0 || 2*r == n {
		return w.m > 0 || (w.m == 0 && w.k > 0)
	}
	return 2*r < n
}

// build fills r.mag with the first Magnus term of a stretch of length
// tau under H0 (eigensystem es) during which alpha(s) = alpha0 + wa s and
// the relative depth is g. The overlaps of the shifts depend on es alone
// and are kept while its gen is unchanged; the whole term is kept when
// es's gen, the waves, alpha0, wa, g and tau are those of the last build
// (equal inputs, equal bits: a repeated shot, as shotWork reuses the
// eigensystems).
func (r *ringOp) build(b Basis, es *eigensystem, alpha0, wa, g, tau float64) {
	n, k := b.Sites, b.Block
	mg := &r.mag
	key := magnusKey{es.gen, alpha0, wa, g, tau}
	if es.gen != 0 && mg.built && mg.key == key && len(mg.coef) == b.Size() && sameWaves(mg.keyWaves, r.waves) {
		return
	}
	mg.built = false
	if len(mg.coef) != b.Size() {
		size := b.Size()
		mg.coef, mg.acc, mg.term, mg.next = make([]complex128, size), make([]complex128, size), make([]complex128, size), make([]complex128, size)
		mg.ph, mg.col = make([]complex128, size), make([]float64, size)
	}
	// One block per class and residue m mod N of the upper waves; the
	// waves of one m share the overlap matrix.
	var residues, ms []int
	slot := func(m int) int {
		d := ((m % n) + n) % n
		for i, r := range residues {
			if r == d {
				return i
			}
		}
		residues = append(residues, d)
		return len(residues) - 1
	}
	for _, w := range r.waves {
		if !w.upper(n) {
			continue
		}
		slot(w.m)
		seen := false
		for _, m := range ms {
			seen = seen || m == w.m
		}
		if !seen {
			ms = append(ms, w.m)
		}
	}
	need := len(residues) * n
	if cap(mg.blocks) < need {
		mg.blocks = append(mg.blocks[:cap(mg.blocks)], make([]ringBlock, need-cap(mg.blocks))...)
	}
	mg.blocks = mg.blocks[:need]
	for i := range mg.blocks {
		blk := &mg.blocks[i]
		if len(blk.h) != k*k {
			blk.h = make([]complex128, k*k)
		}
		clear(blk.h)
		blk.from = i % n
		blk.to = (blk.from + residues[i/n]) % n
	}
	reuse := es.gen != 0 && mg.shiftGen == es.gen && len(mg.shiftMs) == len(ms)
	for i := range ms {
		reuse = reuse && mg.shiftMs[i] == ms[i]
	}
	if !reuse {
		mg.shiftMs, mg.shiftGen = append(mg.shiftMs[:0], ms...), es.gen
		for len(mg.shifts) < len(ms)*n {
			mg.shifts = append(mg.shifts, nil)
		}
	}
	// The upper waves' shapes (m, k) in order: with es, wa and tau they fix
	// each wave's term per unit amplitude, kept in mg.wj; a shot that
	// changes only the amplitudes (a tilt drawn anew, the start angle, the
	// depth's g) recombines them.
	uw := mg.upperWaves[:0]
	for _, w := range r.waves {
		if w.upper(n) {
			uw = append(uw, waveShape{w.m, w.k})
		}
	}
	mg.upperWaves = uw
	jkey := magnusJKey{es.gen, wa, tau}
	same := reuse && es.gen != 0 && mg.wjKey == jkey && len(mg.wjShapes) == len(uw)
	for i := range uw {
		same = same && mg.wjShapes[i] == uw[i]
	}
	if !same {
		mg.wjShapes, mg.wjKey = append(mg.wjShapes[:0], uw...), jkey
		for len(mg.wj) < len(uw)*n {
			mg.wj = append(mg.wj, nil)
		}
		for c := range n {
			for p, e := range es.vals[c] {
				mg.ph[c*k+p] = cis(e * tau)
			}
		}
	}
	for mi, m := range ms {
		for c := range n {
			cm := c + m
			q := floorDiv(cm, n)
			to := cm - q*n
			// sh[nn*k + p] = sum_j vt[j+q][nn] vf[j][p].
			sh := mg.shifts[mi*n+c]
			if !reuse {
				vf, vt := es.vecs[c], es.vecs[to]
				if len(sh) != k*k {
					sh = make([]float64, k*k)
					mg.shifts[mi*n+c] = sh
				}
				// sh = A^T B with A the rows j + q of vt and B the rows j of
				// vf, j0 <= j < j1: row nn of sh combines the rows of B
				// with the column nn of A (kernel.Combine; gonum's dgemm
				// took five times as long on these 18 x 18 blocks).
				j0, j1 := max(0, -q), min(k, k-q)
				clear(sh)
				if j1 > j0 {
					cf := mg.col[:j1-j0]
					for nn := range k {
						for j := j0; j < j1; j++ {
							cf[j-j0] = vt[(j+q)*k+nn]
						}
						kernel.Combine(sh[nn*k:(nn+1)*k], vf[j0*k:j1*k], k, cf)
					}
				}
			}
			if same {
				continue
			}
			ef, et := es.vals[c], es.vals[to]
			pf, pt := mg.ph[c*k:(c+1)*k], mg.ph[to*k:(to+1)*k]
			for i, u := range uw {
				if u.m != m {
					continue
				}
				// wj[nn*k + p] = sh[nn*k + p] J(nu), nu = E_to,n - E_c,p +
				// k w_a, e^{i nu tau} from the tabulated phases.
				kw := float64(u.k) * wa
				rot := cis(kw * tau)
				wj := mg.wj[i*n+c]
				if len(wj) != k*k {
					wj = make([]complex128, k*k)
					mg.wj[i*n+c] = wj
				}
				for nn := range k {
					en := pt[nn] * rot
					for p := range k {
						e := en * complexConj(pf[p])
						wj[nn*k+p] = complex(sh[nn*k+p], 0) * magnusJPhase(et[nn]-ef[p]+kw, tau, e)
					}
				}
			}
		}
	}
	// H1's blocks: the waves' terms times their amplitudes at alpha0 and g.
	i := 0
	for _, w := range r.waves {
		if !w.upper(n) {
			continue
		}
		a := w.c * cis(float64(w.k)*alpha0)
		if w.depth {
			a *= complex(g, 0)
		}
		sl := slot(w.m)
		for c := range n {
			blk := mg.blocks[sl*n+c].h
			kernel.AxpyTo(blk, blk, a, mg.wj[i*n+c])
		}
		i++
	}
	// 1-norm bound of B + B^dagger: column sums of |B| plus row sums.
	clear(mg.col)
	for _, blk := range mg.blocks {
		col := mg.col[blk.from*k : (blk.from+1)*k]
		for nn := range k {
			row := blk.h[nn*k : (nn+1)*k]
			var rs float64
			for p, z := range row {
				a := math.Abs(real(z)) + math.Abs(imag(z))
				col[p] += a
				rs += a
			}
			mg.col[blk.to*k+nn] += rs
		}
	}
	mg.norm = 0
	for _, v := range mg.col {
		mg.norm = math.Max(mg.norm, v)
	}
	mg.stackRows(n, k)
	mg.built, mg.key, mg.keyWaves = true, key, append(mg.keyWaves[:0], r.waves...)
}

// stackRows lays the blocks of H1 = B + B^dagger out as real rows, per
// destination class c, for y_c = sum_j coef[j] row_j (kernel.Combine,
// rows of 2K: real parts, then imaginary parts, of y_c). A block h of B
// from class f to class t gives class t the rows, for each band p of f,
//
//	[Re h[:,p] | Im h[:,p]]   (coefficient Re x_f[p]),
//	[-Im h[:,p] | Re h[:,p]]  (coefficient Im x_f[p]),
//
// and class f, for B^dagger, the rows, for each band n of t,
//
//	[Re h[n,:] | -Im h[n,:]]  (coefficient Re x_t[n]),
//	[Im h[n,:] | Re h[n,:]]   (coefficient Im x_t[n]).
func (mg *ringMagnus) stackRows(n, k int) {
	if len(mg.stack) != n {
		mg.stack, mg.srcs = make([][]float64, n), make([][]int, n)
	}
	for c := range n {
		mg.srcs[c] = mg.srcs[c][:0]
	}
	for _, blk := range mg.blocks {
		mg.srcs[blk.to] = append(mg.srcs[blk.to], blk.from)
		mg.srcs[blk.from] = append(mg.srcs[blk.from], blk.to)
	}
	for c := range n {
		need := len(mg.srcs[c]) * 2 * k * 2 * k
		if cap(mg.stack[c]) < need {
			mg.stack[c] = make([]float64, need)
		}
		mg.stack[c] = mg.stack[c][:need]
		mg.srcs[c] = mg.srcs[c][:0]
	}
	w := 2 * k
	put := func(c, src int) []float64 {
		i := len(mg.srcs[c])
		mg.srcs[c] = append(mg.srcs[c], src)
		return mg.stack[c][i*2*k*w : (i+1)*2*k*w]
	}
	for _, blk := range mg.blocks {
		h := blk.h
		rows := put(blk.to, blk.from)
		for p := range k {
			r1, r2 := rows[p*w:(p+1)*w], rows[(k+p)*w:(k+p+1)*w]
			for nn := range k {
				z := h[nn*k+p]
				r1[nn], r1[k+nn] = real(z), imag(z)
				r2[nn], r2[k+nn] = -imag(z), real(z)
			}
		}
		rows = put(blk.from, blk.to)
		for nn := range k {
			r1, r2 := rows[nn*w:(nn+1)*w], rows[(k+nn)*w:(k+nn+1)*w]
			for p := range k {
				z := h[nn*k+p]
				r1[p], r1[k+p] = real(z), -imag(z)
				r2[p], r2[k+p] = imag(z), real(z)
			}
		}
	}
}

// magnusJ returns integral_0^tau e^{i nu s} ds.
func magnusJ(nu, tau float64) complex128 {
	return magnusJPhase(nu, tau, cis(nu*tau))
}

// magnusJPhase is magnusJ given e = e^{i nu tau}.
func magnusJPhase(nu, tau float64, e complex128) complex128 {
	x := nu * tau
	if math.Abs(x) < 1e-3 {
		// Taylor series of (e^{ix} - 1)/(i x) to x^4 (relative error
		// below 1e-17 at |x| = 1e-3).
		x2 := x * x
		return complex(tau*(1-x2/6+x2*x2/120), tau*x*(0.5-x2/24))
	}
	return complex(imag(e)/nu, (1-real(e))/nu)
}

func floorDiv(a, n int) int {
	q := a / n
	if a%n != 0 && (a < 0) != (n < 0) {
		q--
	}
	return q
}

// mulH1 sets y = H1 x = B x + B^dagger x, from the rows of stackRows.
func (mg *ringMagnus) mulH1(y, x []complex128, k int) {
	n := len(mg.stack)
	w := 2 * k
	if len(mg.ys) != w {
		mg.ys = make([]float64, w)
	}
	for c := range n {
		srcs := mg.srcs[c]
		if len(srcs) == 0 {
			clear(y[c*k : (c+1)*k])
			continue
		}
		if cap(mg.xs) < len(srcs)*w {
			mg.xs = make([]float64, len(srcs)*w)
		}
		xs := mg.xs[:len(srcs)*w]
		for i, f := range srcs {
			re, im := xs[i*w:i*w+k], xs[i*w+k:(i+1)*w]
			for p, v := range x[f*k : (f+1)*k] {
				re[p], im[p] = real(v), imag(v)
			}
		}
		kernel.CombineFused(mg.ys, mg.stack[c], w, xs)
		yc := y[c*k : (c+1)*k]
		for nn := range yc {
			yc[nn] = complex(mg.ys[nn], mg.ys[k+nn])
		}
	}
}

func cnorm1(x []complex128) float64 {
	var s float64
	for _, v := range x {
		s += math.Abs(real(v)) + math.Abs(imag(v))
	}
	return s
}

// applyMagnus replaces every level of f by exp(-i frac H1) of it.
//
// The exponential is summed as a Taylor series on each level's
// eigencoefficients x after taking out the c-number mu = <x|H1|x>/<x|x>,
// exp(-i H1) x = e^{-i mu} exp(-i (H1 - mu)) x, exact for any number mu:
// on a packet in its site the potential is nearly that number, so the
// series of the rest converges in a few terms. With B the sub-step's
// bound on the 1-norm of H1 - mu, the term after t_k is at most B/(k+1)
// times it, so the rest of the series after t_k is at most
//
//	|t_k| sum_{j >= 1} B^j k! / (k+j)! <= |t_k| min(e^B - 1, rho / (1 - rho)),  rho = B/(k+1) < 1,
//
// (1-norms); terms are summed until that bound is below magnusTol |x|.
// Sub-steps keep B at most 5, so that no term exceeds e^5 |x| and rounding
// costs at most 1.5e-14 of x.
func (r *ringOp) applyMagnus(f *field, es *eigensystem, frac float64) {
	mg := &r.mag
	b := f.b
	n, k, wd := b.Sites, b.Block, f.width()
	cols := 2 * wd
	if mg.norm == 0 {
		return
	}
	for lev := range f.levels {
		for c := range n {
			v := es.vecs[c]
			q := lev*n + c
			co := mg.coef[c*k : (c+1)*k]
			clear(co)
			for j := range k {
				x := complex(f.x[j*cols+q], f.x[j*cols+wd+q])
				row := v[j*k : (j+1)*k]
				for p, a := range row {
					co[p] += complex(a, 0) * x
				}
			}
		}
		if !r.expLanczos(k, frac) {
			r.expTaylor(k, frac)
		}
		for c := range n {
			v := es.vecs[c]
			q := lev*n + c
			co := mg.coef[c*k : (c+1)*k]
			for j := range k {
				row := v[j*k : (j+1)*k]
				var z complex128
				for p, a := range row {
					z += complex(a, 0) * co[p]
				}
				f.x[j*cols+q], f.x[j*cols+wd+q] = real(z), imag(z)
			}
		}
	}
}

// expTaylor replaces mg.coef by exp(-i frac H1) of it.
func (r *ringOp) expTaylor(k int, frac float64) {
	mg := &r.mag
	x := mg.coef
	xn := cnorm1(x)
	if xn == 0 {
		return
	}
	var xx float64
	for _, v := range x {
		xx += real(v)*real(v) + imag(v)*imag(v)
	}
	// mu from the first product, H1 x.
	mg.mulH1(mg.next, x, k)
	var mu float64
	for i, v := range x {
		w := mg.next[i]
		mu += real(v)*real(w) + imag(v)*imag(w)
	}
	mu /= xx
	bound := (mg.norm + math.Abs(mu)) * frac
	// Sub-steps of bound at most 5: the terms can grow no larger than
	// e^5 = 148 times x, which costs at most 1.5e-14 of x in rounding.
	sub := max(1, int(math.Ceil(bound/5)))
	h := frac / float64(sub)
	// The rest of the series after a term t_k is at most t_k times
	// min(e^B - 1, rho/(1 - rho)), rho = B/(k+1) (B the sub-step's bound).
	bs := bound / float64(sub)
	tail0 := math.Expm1(bs)
	for s := range sub {
		if s > 0 {
			mg.mulH1(mg.next, x, k)
		}
		copy(mg.acc, x)
		// term_1 = -i h (H1 - mu) x, already in next as H1 x.
		for kk := 1; kk < 60; kk++ {
			if kk > 1 {
				mg.mulH1(mg.next, mg.term, k)
			}
			src := x
			if kk > 1 {
				src = mg.term
			}
			sc := complex(0, -h/float64(kk))
			for i, v := range mg.next {
				mg.next[i] = sc * (v - complex(mu, 0)*src[i])
			}
			mg.term, mg.next = mg.next, mg.term
			for i, v := range mg.term {
				mg.acc[i] += v
			}
			tail := tail0
			if rho := bs / float64(kk+1); rho < 1 {
				tail = math.Min(tail, rho/(1-rho))
			}
			if cnorm1(mg.term)*tail <= magnusTol*xn {
				break
			}
		}
		copy(x, mg.acc)
	}
	e := cis(-mu * frac)
	for i := range x {
		x[i] *= e
	}
}

// RingRefineRad is the angle by which the potential's fastest term may
// turn over one piece of a constant stretch in the refined shot of
// RingErrorRad: the first Magnus term over such pieces was within 3 % of
// the split-step reference's change in the cases of sim/ringexact_test.go.
const RingRefineRad = 0.05

// RingErrorRad returns the estimated error, in rad, of shot sh's phase
// from the ring potential's first Magnus term over the constant stretches
// (sim/ringexact.go): the change of the phase when every stretch is cut
// into pieces over which the potential's fastest term turns by at most
// RingRefineRad. It is zero for a shot without a potential and for echo
// sequences, whose potential is applied at first order
// (RingPotential.ExcitedBiasRad gives that model error's scale). It costs
// a shot and a refined shot, whose cost grows with the laps (about a
// millisecond per 0.05 rad of the fastest term's turn on the benchmark
// ring).
func (s *Simulator) RingErrorRad(sh Shot) float64 {
	if sh.Potential.withGradient(sh.Field, s.cfg.Ring).zero() || s.cfg.Sequence.echo() {
		return 0
	}
	base := s.Run(sh, nil)
	r := *s
	r.ringPieceRad = RingRefineRad
	return math.Abs(Wrap(r.Run(sh, nil).PhaseRad - base.PhaseRad))
}

// magnusTol bounds the Taylor series' rest of exp(-i H1) relative to the
// state: a shot applies a few such factors (one per constant stretch and
// arm), so their truncation moves the phase by below 1e-10 rad, 40 times
// below the shot's own numerical error on the benchmark ring (4.4e-9 rad,
// README Performance). 1e-13 cost two to three more products a factor.
const magnusTol = 1e-11
