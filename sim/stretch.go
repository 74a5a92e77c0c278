package sim

import "math"

// blockExp holds exp(-i H' tau) for every class block of a constant H' as
// dense complex matrices (real and imaginary parts, K x K row-major).
type blockExp struct {
	re, im [][]float64
}

func newBlockExp(es *eigensystem, tau float64) blockExp {
	n := len(es.vals)
	k := len(es.vals[0])
	be := blockExp{re: make([][]float64, n), im: make([][]float64, n)}
	cs := make([]float64, k)
	sn := make([]float64, k)
	for c := range n {
		for m := range k {
			sn[m], cs[m] = math.Sincos(-es.vals[c][m] * tau)
		}
		re, im := make([]float64, k*k), make([]float64, k*k)
		v := es.vecs[c]
		for i := range k {
			for j := range k {
				var a, b float64
				for m := range k {
					x := v[i*k+m] * v[j*k+m]
					a += x * cs[m]
					b += x * sn[m]
				}
				re[i*k+j], im[i*k+j] = a, b
			}
		}
		be.re[c], be.im[c] = re, im
	}
	return be
}

// apply multiplies every level of f by the block exponentials.
func (be blockExp) apply(f *field, scratch []float64) {
	k, n, wd := f.b.Block, f.b.Sites, f.width()
	cols := 2 * wd
	xr, xi := scratch[:k], scratch[k:2*k]
	for c := range n {
		ar, ai := be.re[c], be.im[c]
		for lev := range f.levels {
			q := lev*n + c
			for j := range k {
				xr[j], xi[j] = f.x[j*cols+q], f.x[j*cols+wd+q]
			}
			for i := range k {
				rr, ri := ar[i*k:(i+1)*k], ai[i*k:(i+1)*k]
				var yr, yi float64
				for j := range k {
					yr += rr[j]*xr[j] - ri[j]*xi[j]
					yi += rr[j]*xi[j] + ri[j]*xr[j]
				}
				f.x[i*cols+q], f.x[i*cols+wd+q] = yr, yi
			}
		}
	}
}

// kick applies exp(i l da) to f: a jump da of the lattice angle, seen in
// the co-moving frame.
func (p *propagator) kick(f *field, da float64) {
	if da != 0 {
		p.diagonalPhase(f, nil, da)
	}
}

// stretch advances f over [t0, t1], during which the commanded speed w is
// constant. Without noise this is one exact step. With lattice jitter or
// depth noise the stretch is cut into intervals of at most noiseStep (the
// noise record's resolution), each treated as
//
//	A(tau/2) exp(i l dd/2) exp(-i dg V tau) exp(i l dd/2) A(tau/2),
//
// A(tau) = exp(-i H'_0 tau) the exact propagator of the commanded motion,
// dd the change of the jitter angle and dg the depth deviation over the
// interval (a Strang splitting in the small perturbation only). Its cost
// grows with the number of noise samples, not with the trap period.
// It returns the eigensystem of H'_0.
//
// Unless p.gridCruise is set, the noisy stretch is first propagated in the
// cut band basis (stretchReduced, sim/reduced.go), and on the full grid
// only where its error estimate fails.
func (p *propagator) stretch(f *field, d Drive, w, t0, t1, noiseStep float64, es *eigensystem) *eigensystem {
	g0 := 1 + d.DepthRel
	if t1 <= t0 {
		return es
	}
	if p.ring == nil {
		return p.stretchFree(f, d, w, t0, t1, noiseStep, es)
	}
	if es == nil {
		e := diagonalise(p.b, p.rot, w, g0*p.v0)
		es = &e
	}
	if n := p.ring.pieces(w-d.RotationRadS, t1-t0); n > 1 && !d.noisy() {
		h := (t1 - t0) / float64(n)
		for i := range n {
			es = p.stretchRing(f, d, w, t0+float64(i)*h, t0+float64(i+1)*h, noiseStep, es)
		}
		return es
	}
	return p.stretchRing(f, d, w, t0, t1, noiseStep, es)
}

// stretchRing is stretch with the ring potential over [t0, t1]: the first
// Magnus term before the exact step, or a noisy stretch on the grid with
// the potential in every interval (sim/ringexact.go).
func (p *propagator) stretchRing(f *field, d Drive, w, t0, t1, noiseStep float64, es *eigensystem) *eigensystem {
	if d.noisy() && noiseStep > 0 {
		// A noisy stretch: the potential joins the noise factor of every
		// interval of the grid's interval method (stretchFree).
		return p.stretchFree(f, d, w, t0, t1, noiseStep, es)
	}
	g0 := 1 + d.DepthRel
	tau := t1 - t0
	p.ring.build(p.b, es, d.Angle(t0)-d.RotationRadS*t0, w-d.RotationRadS, g0, tau)
	p.ring.applyMagnus(f, es, 1)
	return p.exactStep(f, es, w, g0, tau)
}

// stretchFree is stretch without the ring potential.
func (p *propagator) stretchFree(f *field, d Drive, w, t0, t1, noiseStep float64, es *eigensystem) *eigensystem {
	g0 := 1 + d.DepthRel
	if !d.noisy() || !(noiseStep > 0) {
		return p.exactStep(f, es, w, g0, t1-t0)
	}
	if es == nil {
		e := diagonalise(p.b, p.rot, w, g0*p.v0)
		es = &e
	}
	n := int(math.Ceil((t1 - t0) / noiseStep))
	if !p.gridCruise && p.ring == nil {
		ok, est := p.stretchReduced(f, d, es, t0, t1, n)
		p.tailEst = math.Max(p.tailEst, est)
		if reducedTrace != nil {
			reducedTrace(p.cutBands, est, ok)
		}
		if ok {
			return es
		}
		p.fellBack = true
	}
	tau := (t1 - t0) / float64(n)
	half := newBlockExp(es, tau/2)
	full := newBlockExp(es, tau)
	scratch := make([]float64, 2*p.b.Block)
	half.apply(f, scratch)
	for i := range n {
		ta, tb := t0+float64(i)*tau, t0+float64(i+1)*tau
		dd := d.Jitter.At(tb) - d.Jitter.At(ta)
		p.kick(f, dd/2)
		if d.DepthNoise != nil {
			p.latticeStep(f, d.DepthNoise.At((ta+tb)/2), tau)
		}
		if p.ring != nil {
			// The ring potential at the interval's midpoint, beside the
			// depth noise (both diagonal in angle).
			tm := (ta + tb) / 2
			p.ring.split(f, d.Angle(tm)-d.RotationRadS*tm, d.Depth(tm), tau)
		}
		p.kick(f, dd/2)
		if i < n-1 {
			full.apply(f, scratch)
		}
	}
	half.apply(f, scratch)
	return es
}

// reducedTrace, when set (by tests), sees every noisy stretch tried in the
// band basis: the bands kept, the error estimate and whether it held.
var reducedTrace func(bands int, est float64, ok bool)
