package sim

import (
	"math"
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

	u   []float64 // DST-I matrix, K x K, symmetric and its own inverse
	lam []float64 // eigenvalues of the unit-depth block lattice, rad/s per (rad/s of v0)

	scheme scheme

	// Noisy cruise (sim/reduced.go): gridCruise forces the full grid;
	// tailEst is the largest error estimate of the band basis, fellBack
	// records a stretch redone on the full grid.
	gridCruise bool
	tailEst    float64
	fellBack   bool
	cutBands   int

	kinTabs [][]complex128 // exp(-i rot l^2 h) for the durations in kinHs
	kinHs   []float64
	s, d    []float64 // scratch: even and odd halves, K/2 x 2W
	y       []float64 // scratch: K x 2W
}

func newPropagator(b Basis, r Ring, v0 float64, levels int) *propagator {
	k := b.Block
	p := &propagator{b: b, rot: r.rotationalRate(), v0: v0, scheme: defaultScheme}
	p.u = make([]float64, k*k)
	p.lam = make([]float64, k)
	norm := math.Sqrt(2 / float64(k+1))
	for j := range k {
		for m := range k {
			p.u[j*k+m] = norm * math.Sin(math.Pi*float64((j+1)*(m+1))/float64(k+1))
		}
	}
	for m := range k {
		p.lam[m] = -0.5 - 0.5*math.Cos(math.Pi*float64(m+1)/float64(k+1))
	}
	cols := 2 * b.Sites * levels
	p.s = make([]float64, k/2*cols)
	p.d = make([]float64, k/2*cols)
	p.y = make([]float64, k*cols)
	return p
}

// sine applies the DST-I matrix to every column of f.x, leaving the result
// in p.y. Rows j and K-1-j of the matrix agree up to the sign (-1)^m, so
// the sums over j fold into K/2 terms on the even and odd combinations.
func (p *propagator) sine(x []float64, cols int) {
	k, h := p.b.Block, p.b.Block/2
	for j := range h {
		a := x[j*cols : (j+1)*cols]
		b := x[(k-1-j)*cols : (k-j)*cols]
		s := p.s[j*cols : (j+1)*cols]
		d := p.d[j*cols : (j+1)*cols]
		for q := range a {
			s[q] = a[q] + b[q]
			d[q] = a[q] - b[q]
		}
	}
	for m := range k {
		src := p.s
		if m%2 == 1 {
			src = p.d
		}
		y := p.y[m*cols : (m+1)*cols]
		clear(y)
		j := 0
		for ; j+4 <= h; j += 4 {
			c0, c1, c2, c3 := p.u[j*k+m], p.u[(j+1)*k+m], p.u[(j+2)*k+m], p.u[(j+3)*k+m]
			r0 := src[j*cols : (j+1)*cols]
			r1 := src[(j+1)*cols : (j+2)*cols]
			r2 := src[(j+2)*cols : (j+3)*cols]
			r3 := src[(j+3)*cols : (j+4)*cols]
			r1, r2, r3 = r1[:len(r0)], r2[:len(r0)], r3[:len(r0)]
			y := y[:len(r0)]
			for q, x := range r0 {
				y[q] += c0*x + c1*r1[q] + c2*r2[q] + c3*r3[q]
			}
		}
		for ; j < h; j++ {
			c := p.u[j*k+m]
			row := src[j*cols : (j+1)*cols]
			y := y[:len(row)]
			for q, x := range row {
				y[q] += c * x
			}
		}
	}
}

// latticeStep applies exp(-i g V dt) to f.
func (p *propagator) latticeStep(f *field, g, dt float64) {
	w := f.width()
	cols := 2 * w
	p.sine(f.x, cols)
	for m := range p.b.Block {
		sn, cs := math.Sincos(-g * p.v0 * p.lam[m] * dt)
		row := p.y[m*cols : (m+1)*cols]
		re, im := row[:w], row[w:cols]
		for q := range re {
			a, b := re[q], im[q]
			re[q] = cs*a - sn*b
			im[q] = sn*a + cs*b
		}
	}
	p.sine(p.y, cols)
	copy(f.x, p.y)
}

// kineticStep applies exp(-i rot l^2 h + i l da) to f.
func (p *propagator) kineticStep(f *field, h, da float64) {
	p.diagonalPhase(f, p.kineticTable(h), da)
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

// kineticTable returns exp(-i rot l^2 h) for every l, cached for the few
// durations a scheme uses.
func (p *propagator) kineticTable(h float64) []complex128 {
	for i, x := range p.kinHs {
		if x == h {
			return p.kinTabs[i]
		}
	}
	tab := make([]complex128, p.b.Size())
	for i := range tab {
		l := float64(p.b.LMin() + i)
		tab[i] = cis(-p.rot * l * l * h)
	}
	if len(p.kinHs) >= 8 {
		p.kinHs, p.kinTabs = p.kinHs[1:], p.kinTabs[1:]
	}
	p.kinHs = append(p.kinHs, h)
	p.kinTabs = append(p.kinTabs, tab)
	return tab
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

// splitSteps advances f from t0 to t1 in n steps of the propagator's scheme.
// The last kinetic factor of a step and the first of the next are merged.
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
	for range n {
		for i, bw := range sch.b {
			h := pending + sch.a[i]*dt
			tn := t + sch.a[i]*dt
			an := m.angle(tn)
			p.kineticStep(f, h, an-a)
			t, a, pending = tn, an, 0
			p.latticeStep(f, m.depth(t), bw*dt)
		}
		pending = sch.a[len(sch.b)] * dt
		t += pending
	}
	p.kineticStep(f, pending, m.angle(t1)-a)
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
