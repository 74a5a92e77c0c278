package sim

import (
	"math"

	"rampart/internal/kernel"
)

// blockExp holds exp(-i H' tau) for every class block of a constant H' as
// dense complex K x K matrices.
type blockExp struct {
	// t holds the blocks' matrices with the classes side by side: element
	// (i, j) of every class c at t[(i*K + j)*2N + c] (real part) and
	// t[(i*K + j)*2N + N + c] (imaginary part), for kernel.BlockRow.
	t    []float64
	k, n int
}

func newBlockExp(es *eigensystem, tau float64) blockExp {
	n := len(es.vals)
	k := len(es.vals[0])
	be := blockExp{t: make([]float64, 2*n*k*k), k: k, n: n}
	cs := make([]float64, k)
	sn := make([]float64, k)
	for c := range n {
		for m := range k {
			sn[m], cs[m] = math.Sincos(-es.vals[c][m] * tau)
		}
		v := es.vecs[c]
		for i := range k {
			for j := range k {
				var a, b float64
				for m := range k {
					x := v[i*k+m] * v[j*k+m]
					a += x * cs[m]
					b += x * sn[m]
				}
				o := (i*k + j) * 2 * n
				be.t[o+c], be.t[o+n+c] = a, b
			}
		}
	}
	return be
}

// apply multiplies every level of f by the block exponentials, all
// classes of a row at once (kernel.BlockRow: the bits of the loop over one
// class at a time). scratch holds at least 2 K N values.
func (be blockExp) apply(f *field, scratch []float64) { be.applyKicked(f, scratch, nil, nil) }

// applyKicked is apply after two kicks by the phase table cr + i ci (the
// e^{i l da} of kickTable, indexed as l = N j + c), applied as the rows are
// read (kernel.RotateTwiceTo): the bits of two kickTable calls and apply.
// A nil table is no kick.
func (be blockExp) applyKicked(f *field, scratch, cr, ci []float64) {
	k, n, wd := be.k, be.n, f.width()
	cols := 2 * wd
	xs := scratch[:2*n*k]
	for lev := range f.levels {
		for j := range k {
			row := f.x[j*cols:]
			if cr != nil {
				kernel.RotateTwiceTo(xs[j*2*n:j*2*n+n], xs[j*2*n+n:(j+1)*2*n], row[lev*n:lev*n+n], row[wd+lev*n:wd+lev*n+n], cr[n*j:n*j+n], ci[n*j:n*j+n])
				continue
			}
			copy(xs[j*2*n:j*2*n+n], row[lev*n:lev*n+n])
			copy(xs[j*2*n+n:(j+1)*2*n], row[wd+lev*n:wd+lev*n+n])
		}
		for i := range k {
			row := f.x[i*cols:]
			kernel.BlockRow(row[lev*n:lev*n+n], row[wd+lev*n:wd+lev*n+n], be.t[i*k*2*n:(i+1)*k*2*n], xs, k)
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

// kickTable is kick(f, da) with e^{i l da} from chain k of the last
// kineticChains: the same products, so the same bits.
func (p *propagator) kickTable(f *field, da float64, k int) {
	if da == 0 {
		return
	}
	cr, ci := p.cr[k], p.ci[k]
	n := p.b.Sites
	p.rowSegments(f, func(re, im []float64, l int) {
		kernel.RotateBy(re, im, cr[l:l+n], ci[l:l+n])
	})
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
	scratch := make([]float64, 2*p.b.Sites*p.b.Block)
	half.apply(f, scratch)
	var da [chainBatch]float64
	for i := range n {
		ta, tb := t0+float64(i)*tau, t0+float64(i+1)*tau
		k := i % chainBatch
		if k == 0 {
			// The half kicks' phase tables of the next intervals, their
			// recurrences side by side (kineticChains: the products of
			// diagonalPhase, in its order).
			m := min(chainBatch, n-i)
			for q := range m {
				ta, tb := t0+float64(i+q)*tau, t0+float64(i+q+1)*tau
				da[q] = (d.Jitter.At(tb) - d.Jitter.At(ta)) / 2
			}
			p.kineticChains(da[:m])
		}
		if d.DepthNoise == nil && p.ring == nil {
			// Nothing between the two half kicks: they are applied as the
			// next block step reads the field.
			var cr, ci []float64
			if da[k] != 0 {
				cr, ci = p.cr[k], p.ci[k]
			}
			if i < n-1 {
				full.applyKicked(f, scratch, cr, ci)
			} else {
				half.applyKicked(f, scratch, cr, ci)
			}
			continue
		}
		p.kickTable(f, da[k], k)
		if d.DepthNoise != nil {
			p.latticeStep(f, d.DepthNoise.At((ta+tb)/2), tau)
		}
		if p.ring != nil {
			// The ring potential at the interval's midpoint, beside the
			// depth noise (both diagonal in angle).
			tm := (ta + tb) / 2
			p.ring.split(f, d.Angle(tm)-d.RotationRadS*tm, d.Depth(tm), tau)
		}
		p.kickTable(f, da[k], k)
		if i < n-1 {
			full.apply(f, scratch)
		}
	}
	if d.DepthNoise != nil || p.ring != nil {
		half.apply(f, scratch)
	}
	return es
}

// reducedTrace, when set (by tests), sees every noisy stretch tried in the
// band basis: the bands kept, the error estimate and whether it held.
var reducedTrace func(bands int, est float64, ok bool)
