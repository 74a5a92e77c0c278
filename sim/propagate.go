package sim

import (
	"math"

	"rampart/internal/kernel"
)

// propagator advances the states of one arm in the frame co-moving with
// that arm's lattice, where
//
//	H'(t) = E_rot l^2 - hbar w(t) l + g(t) V,   w = da/dt,
//
// V the lattice of depth v0 at angle 0 and g the relative depth. While the
// drive changes it takes symmetric (Strang) split steps
//
//	exp(-i K[t, t+dt/2]) exp(-i g(t+dt/2) V dt) exp(-i K[t+dt/2, t+dt]),
//
// where K[t1, t2] = E_rot l^2 (t2 - t1) - l (a(t2) - a(t1)) is the kinetic
// part integrated exactly (it commutes with itself at all times), so lattice
// jitter enters through the angle alone. The lattice factor is exact: in
// every class block V is -v0/2 - (v0/4) times the tridiagonal matrix of ones,
// diagonalised by the type-I discrete sine transform.
//
// References:
//
//	G. Strang, "On the construction and comparison of difference schemes",
//	SIAM J. Numer. Anal. 5, 506 (1968).
type propagator struct {
	b   Basis
	rot float64 // E_rot/hbar, rad/s
	v0  float64 // V0/hbar of this arm at g = 1, rad/s

	*sineBasis // the DST-I of the block, shared by every propagator of the block size

	scheme scheme

	// Noisy cruise (sim/reduced.go): gridCruise forces the full grid;
	// tailEst is the largest error estimate of the band basis, fellBack
	// records a stretch redone on the full grid.
	gridCruise bool
	tailEst    float64
	fellBack   bool
	cutBands   int

	kin  *kineticCache // exp(-i rot l^2 h), shareable by the propagators of one goroutine
	lat  latticeCache  // exp(-i g v0 lam dt) for the last few g dt
	s, d []float64     // scratch: even and odd halves, K/2 x 2W
	y    []float64     // scratch: K x 2W

	// ring, if not nil, is the arm's ring potential, applied with every
	// lattice factor and over every constant stretch (sim/ringexact.go).
	ring *ringOp

	ops    []splitOp             // scratch: the factors of a split-step pass
	cr, ci [chainBatch][]float64 // scratch: e^{i l da} of a batch of kinetic factors
}

func newPropagator(b Basis, r Ring, v0 float64, levels int) *propagator {
	return newSharedPropagator(b, r, v0, levels, new(kineticCache))
}

// newSharedPropagator is newPropagator with the kinetic tables of kin,
// which propagators of the same basis and ring used by one goroutine (the
// two arms of a shot) share.
func newSharedPropagator(b Basis, r Ring, v0 float64, levels int, kin *kineticCache) *propagator {
	k := b.Block
	p := &propagator{b: b, rot: r.rotationalRate(), v0: v0, scheme: defaultScheme, kin: kin}
	p.sineBasis = sineBasisOf(k)
	cols := 2 * b.Sites * levels
	p.s = make([]float64, k/2*cols)
	p.d = make([]float64, k/2*cols)
	p.y = make([]float64, k*cols)
	for i := range chainBatch {
		p.cr[i], p.ci[i] = make([]float64, b.Size()), make([]float64, b.Size())
	}
	return p
}

// sine applies the DST-I matrix to every column of x, leaving the result
// in p.y. Rows j and K-1-j of the matrix agree up to the sign (-1)^m, so
// the sums over j fold into K/2 terms on the even and odd combinations,
// each output row a combination of the folded rows (kernel.Combine).
func (p *propagator) sine(x []float64, cols int) {
	k, h := p.b.Block, p.b.Block/2
	for j := range h {
		kernel.Fold(p.s[j*cols:(j+1)*cols], p.d[j*cols:(j+1)*cols], x[j*cols:(j+1)*cols], x[(k-1-j)*cols:(k-j)*cols])
	}
	for m := range k {
		src := p.s
		if m%2 == 1 {
			src = p.d
		}
		kernel.Combine(p.y[m*cols:(m+1)*cols], src, cols, p.ut[m*h:(m+1)*h])
	}
}

// latticeStep applies exp(-i g V dt) to f.
func (p *propagator) latticeStep(f *field, g, dt float64) {
	w := f.width()
	cols := 2 * w
	p.sine(f.x, cols)
	cs, sn := p.lat.phases(p, g, dt)
	for m := range p.b.Block {
		row := p.y[m*cols : (m+1)*cols]
		kernel.Rotate(row[:w], row[w:cols], cs[m], sn[m])
	}
	p.sine(p.y, cols)
	copy(f.x, p.y)
}

// diagonalPhase multiplies every level of f by tab[l] e^{i l da} (tab nil:
// by e^{i l da} alone), the phases built by recurrence in l.
func (p *propagator) diagonalPhase(f *field, tab []complex128, da float64) {
	b := p.b
	n, w := b.Sites, f.width()
	step := cis(da)
	cur := cis(float64(b.LMin()) * da)
	for j := range b.Block {
		row := f.x[2*w*j : 2*w*(j+1)]
		re, im := row[:w], row[w:]
		for c := range n {
			ph := cur
			if tab != nil {
				ph *= tab[n*j+c]
			}
			cur *= step
			cs, sn := real(ph), imag(ph)
			for q := c; q < w; q += n {
				a, bb := re[q], im[q]
				re[q] = cs*a - sn*bb
				im[q] = sn*a + cs*bb
			}
		}
	}
}

// chainBatch is how many kinetic factors' phase recurrences kineticChains
// runs side by side: each is a chain of dependent complex products, whose
// latency the others hide.
const chainBatch = 4

// kineticChains fills p.cr[k], p.ci[k] with e^{i l da[k]} for every l of
// the basis, k < len(da) <= chainBatch, by the recurrence
// e^{i (l+1) da} = e^{i l da} e^{i da} from l = LMin (the products of the
// one-factor loop, in its order).
func (p *propagator) kineticChains(da []float64) {
	var cur, step [chainBatch]complex128
	for k := range chainBatch {
		x := 0.0
		if k < len(da) {
			x = da[k]
		}
		step[k] = cis(x)
		cur[k] = cis(float64(p.b.LMin()) * x)
	}
	c0r, c0i := p.cr[0], p.ci[0]
	c1r, c1i := p.cr[1][:len(c0r)], p.ci[1][:len(c0r)]
	c2r, c2i := p.cr[2][:len(c0r)], p.ci[2][:len(c0r)]
	c3r, c3i := p.cr[3][:len(c0r)], p.ci[3][:len(c0r)]
	c0i = c0i[:len(c0r)]
	a0, a1, a2, a3 := cur[0], cur[1], cur[2], cur[3]
	s0, s1, s2, s3 := step[0], step[1], step[2], step[3]
	for l := range c0r {
		c0r[l], c0i[l] = real(a0), imag(a0)
		c1r[l], c1i[l] = real(a1), imag(a1)
		c2r[l], c2i[l] = real(a2), imag(a2)
		c3r[l], c3i[l] = real(a3), imag(a3)
		a0 *= s0
		a1 *= s1
		a2 *= s2
		a3 *= s3
	}
}

// kineticStep applies exp(-i rot l^2 h + i l da) to f, with e^{i l da} the
// chain k of the last kineticChains: every level times (e^{i l da}
// e^{-i rot l^2 h}).
func (p *propagator) kineticStep(f *field, h float64, k int) {
	tr, ti := p.kin.table(p.b, p.rot, h)
	cr, ci := p.cr[k], p.ci[k]
	n := p.b.Sites
	p.rowSegments(f, func(re, im []float64, l int) {
		kernel.PhaseRotate(re, im, cr[l:l+n], ci[l:l+n], tr[l:l+n], ti[l:l+n])
	})
}

// rowSegments calls fn with every level's segment of N classes of every
// row j of f (its real and imaginary parts) and l = N j, the index of the
// segment's first element in the basis's tables of e^{i l ...}.
func (p *propagator) rowSegments(f *field, fn func(re, im []float64, l int)) {
	n, w := p.b.Sites, f.width()
	for j := range p.b.Block {
		row := f.x[2*w*j : 2*w*(j+1)]
		re, im := row[:w], row[w:]
		l := n * j
		for q := 0; q < w; q += n {
			fn(re[q:q+n], im[q:q+n], l)
		}
	}
}

// motion is what the propagator needs to know of an arm: the lattice angle
// a(t) in the inertial frame and the relative depth g(t).
type motion interface {
	angle(t float64) float64
	depth(t float64) float64
}

// scheme is a splitting of one step dt into alternating kinetic and
// lattice factors,
//
//	exp(-i K a_0 dt) exp(-i V b_0 dt) exp(-i K a_1 dt) ... exp(-i V b_{m-1} dt) exp(-i K a_m dt),
//
// with len(a) = len(b) + 1, sum a = sum b = 1 (a negative weight steps back
// in time). Kinetic factors are integrated exactly over their own time
// interval, so each lattice factor sees the time at which it acts.
type scheme struct {
	a, b []float64
}

// composition returns the scheme of Strang steps of w_i dt in turn.
func composition(w ...float64) scheme {
	s := scheme{a: []float64{w[0] / 2}, b: w}
	for i := 1; i < len(w); i++ {
		s.a = append(s.a, (w[i-1]+w[i])/2)
	}
	s.a = append(s.a, w[len(w)-1]/2)
	return s
}

var (
	strang = composition(1)
	// suzuki4 is Suzuki's fourth-order fractal composition
	// S(p) S(p) S(1-4p) S(p) S(p), p = 1/(4 - 4^(1/3)).
	//
	// References:
	//
	//	M. Suzuki, "Fractal decomposition of exponential operators with
	//	applications to many-body theories and Monte Carlo simulations",
	//	Phys. Lett. A 146, 319 (1990).
	suzuki4 = func() scheme {
		p := 1 / (4 - math.Cbrt(4))
		return composition(p, p, 1-4*p, p, p)
	}()
	// blanesMoan6 is the six-stage fourth-order splitting S6 of Blanes and
	// Moan, whose error constants are about ten times smaller than those of
	// the fractal compositions (coefficients as published, a_i on the
	// kinetic and b_i on the lattice factors, symmetric).
	//
	// References:
	//
	//	S. Blanes and P. C. Moan, "Practical symplectic partitioned
	//	Runge-Kutta and Runge-Kutta-Nystrom methods", J. Comput. Appl.
	//	Math. 142, 313 (2002), table 2.
	blanesMoan6 = func() scheme {
		a1, a2, a3 := 0.0792036964311957, 0.353172906049774, -0.0420650803577195
		a4 := 1 - 2*(a1+a2+a3)
		b1, b2 := 0.209515106613362, -0.143851773179818
		b3 := 0.5 - (b1 + b2)
		return scheme{a: []float64{a1, a2, a3, a4, a3, a2, a1}, b: []float64{b1, b2, b3, b3, b2, b1}}
	}()
	// defaultScheme is the splitting Simulator uses.
	defaultScheme = blanesMoan6
)

// splitOp is one kinetic factor of a split-step pass, exp(-i rot l^2 h +
// i l da), and, if lattice, the lattice factor exp(-i g V tau) after it.
type splitOp struct {
	h, da, g, tau float64
	alpha         float64 // the lattice's angle relative to the apparatus (ring potential)
	lattice       bool
}

// splitSteps advances f from t0 to t1 in n steps of the propagator's scheme.
// The last kinetic factor of a step and the first of the next are merged.
// The factors' times, angles and depths are listed first (m is a pure
// function of time), so that the kinetic phases of chainBatch factors are
// built side by side.
func (p *propagator) splitSteps(f *field, m motion, t0, t1 float64, n int) {
	if n < 1 || t1 <= t0 {
		return
	}
	sch := p.scheme
	if sch.b == nil {
		sch = strang
	}
	dt := (t1 - t0) / float64(n)
	t, a := t0, m.angle(t0)
	pending := 0.0 // kinetic time owed from the previous step
	ops := p.ops[:0]
	for range n {
		for i, bw := range sch.b {
			h := pending + sch.a[i]*dt
			tn := t + sch.a[i]*dt
			an := m.angle(tn)
			ops = append(ops, splitOp{h: h, da: an - a})
			t, a, pending = tn, an, 0
			op := &ops[len(ops)-1]
			op.g, op.tau, op.lattice = m.depth(t), bw*dt, true
			if p.ring != nil {
				op.alpha = an - p.ring.omega*t
			}
		}
		pending = sch.a[len(sch.b)] * dt
		t += pending
	}
	ops = append(ops, splitOp{h: pending, da: m.angle(t1) - a})
	p.ops = ops
	var da [chainBatch]float64
	for i := 0; i < len(ops); i += chainBatch {
		batch := ops[i:min(i+chainBatch, len(ops))]
		for k, op := range batch {
			da[k] = op.da
		}
		p.kineticChains(da[:len(batch)])
		for k, op := range batch {
			p.kineticStep(f, op.h, k)
			if op.lattice {
				p.latticeStep(f, op.g, op.tau)
				if p.ring != nil {
					// U commutes with the lattice factor (both diagonal in
					// angle): together exp(-i (gV + U) tau).
					p.ring.split(f, op.alpha, op.g, op.tau)
				}
			}
		}
	}
}

// exactStep advances f by tau under the constant H'(w) at relative depth g,
// using (and returning) its eigensystem; es may be nil to have it computed.
func (p *propagator) exactStep(f *field, es *eigensystem, w, g, tau float64) *eigensystem {
	if es == nil {
		e := diagonalise(p.b, p.rot, w, g*p.v0)
		es = &e
	}
	if tau == 0 {
		return es
	}
	k, n, wd := p.b.Block, p.b.Sites, f.width()
	cols := 2 * wd
	coef := make([]float64, 2*k)
	for c := range n {
		vecs, vals := es.vecs[c], es.vals[c]
		for lev := range f.levels {
			q := lev*n + c
			// coefficients in the eigenbasis, times the phase
			for m := range k {
				var re, im float64
				for j := range k {
					v := vecs[j*k+m]
					re += v * f.x[j*cols+q]
					im += v * f.x[j*cols+wd+q]
				}
				sn, cs := math.Sincos(-vals[m] * tau)
				coef[2*m], coef[2*m+1] = cs*re-sn*im, sn*re+cs*im
			}
			for j := range k {
				var re, im float64
				for m := range k {
					v := vecs[j*k+m]
					re += v * coef[2*m]
					im += v * coef[2*m+1]
				}
				f.x[j*cols+q], f.x[j*cols+wd+q] = re, im
			}
		}
	}
	return es
}

// groundPopulation returns the population of f's level lev in the lowest
// band of the eigensystem es: the sum over classes of |<u_0,c|x_c>|^2.
func groundPopulation(f *field, es *eigensystem, lev int) float64 {
	k, n, wd := f.b.Block, f.b.Sites, f.width()
	cols := 2 * wd
	var pop float64
	for c := range n {
		q := lev*n + c
		var re, im float64
		for j := range k {
			v := es.vecs[c][j*k]
			re += v * f.x[j*cols+q]
			im += v * f.x[j*cols+wd+q]
		}
		pop += re*re + im*im
	}
	return pop
}
