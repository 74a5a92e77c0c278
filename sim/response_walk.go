package sim

import "math"

// blockMat is a block-diagonal operator on the momentum basis: one K x K
// complex matrix per class, m[c][i*K+j].
type blockMat [][]complex128

// identityField returns a field of Block levels whose level j holds the
// basis state j of every class: propagated, it holds the block unitary
// U(t) column by column (level j is column j of every class block).
func identityField(b Basis) *field {
	f := newField(b, b.Block)
	n, w := b.Sites, f.width()
	for j := range b.Block {
		for c := range n {
			f.x[2*w*j+j*n+c] = 1
		}
	}
	return f
}

// unitaryOf reads the block unitary out of an identity field.
func unitaryOf(f *field) blockMat {
	b := f.b
	k, n, w := b.Block, b.Sites, f.width()
	u := make(blockMat, n)
	for c := range n {
		m := make([]complex128, k*k)
		for i := range k {
			row := f.x[2*w*i:]
			for lev := range k {
				m[i*k+lev] = complex(row[lev*n+c], row[w+lev*n+c])
			}
		}
		u[c] = m
	}
	return u
}

// mul sets out = m v for states in the momentum layout (index N j + c).
func (m blockMat) mul(b Basis, v, out []complex128) {
	k, n := b.Block, b.Sites
	for c := range n {
		mc := m[c]
		for i := range k {
			var s complex128
			row := mc[i*k : (i+1)*k]
			for j, x := range row {
				s += x * v[n*j+c]
			}
			out[n*i+c] = s
		}
	}
}

// mulH sets out = m^dagger v.
func (m blockMat) mulH(b Basis, v, out []complex128) {
	k, n := b.Block, b.Sites
	for c := range n {
		mc := m[c]
		for i := range k {
			var s complex128
			for j := range k {
				x := mc[j*k+i]
				s += complex(real(x), -imag(x)) * v[n*j+c]
			}
			out[n*i+c] = s
		}
	}
}

// responseOp is a perturbation operator of one arm in the frame co-moving
// with its nominal lattice (lattice at angle 0), acting within each class
// block: apply sets out = W v, in rad/s (energy/hbar) per unit of the noise
// signal.
type responseOp int

const (
	opLattice   responseOp = iota // V: depth modulation, H += eps(t) V
	opSlope                       // -dV/dtheta: lattice displacement, H += delta(t) (-V')
	opCurvature                   // V''/2: the displacement's second order, H += delta^2 V''/2
	opMomentum                    // l: the displacement at the start (a kick exp(-i l delta(0)))
)

// apply sets out = W v; v0 = V0/hbar in rad/s.
func (op responseOp) apply(b Basis, v0 float64, v, out []complex128) {
	k, n := b.Block, b.Sites
	nn := float64(n)
	at := func(c, j int) complex128 {
		if j < 0 || j >= k {
			return 0
		}
		return v[n*j+c]
	}
	for c := range n {
		for j := range k {
			lo, hi := at(c, j-1), at(c, j+1)
			var y complex128
			switch op {
			case opLattice:
				y = complex(-v0/2, 0)*v[n*j+c] + complex(-v0/4, 0)*(lo+hi)
			case opSlope:
				y = complex(0, v0*nn/4) * (lo - hi)
			case opCurvature:
				y = complex(v0*nn*nn/8, 0) * (lo + hi)
			case opMomentum:
				y = complex(float64(b.L(c, j)), 0) * v[n*j+c]
			}
			out[n*j+c] = y
		}
	}
}

// cruiseFrame holds what the samples inside the cruise need: the block
// unitary F1 = U(t1) at its start, the eigensystem of the constant H'
// there, and B = F1^dagger E (E the eigenvectors), so that for a state v
// given in the time-0 picture
//
//	U(t1+s)^dagger W U(t1+s) v = B e^{i Lambda s} (E^T W E) e^{-i Lambda s} E^T F1 v.
type cruiseFrame struct {
	es *eigensystem
	f1 blockMat
	b  blockMat
}

func newCruiseFrame(bs Basis, es *eigensystem, f1 blockMat) *cruiseFrame {
	k, n := bs.Block, bs.Sites
	cf := &cruiseFrame{es: es, f1: f1, b: make(blockMat, n)}
	for c := range n {
		m := make([]complex128, k*k)
		e := es.vecs[c]
		for i := range k {
			for kk := range k {
				var s complex128
				for j := range k {
					x := f1[c][j*k+i]
					s += complex(real(x), -imag(x)) * complex(e[j*k+kk], 0)
				}
				m[i*k+kk] = s
			}
		}
		cf.b[c] = m
	}
	return cf
}

// eigenCoefficients returns E^T F1 v in the momentum layout (index N k + c
// for eigenvector k of class c).
func (cf *cruiseFrame) eigenCoefficients(bs Basis, v []complex128) []complex128 {
	k, n := bs.Block, bs.Sites
	fv := make([]complex128, len(v))
	cf.f1.mul(bs, v, fv)
	out := make([]complex128, len(v))
	for c := range n {
		e := cf.es.vecs[c]
		for kk := range k {
			var s complex128
			for j := range k {
				s += complex(e[j*k+kk], 0) * fv[n*j+c]
			}
			out[n*kk+c] = s
		}
	}
	return out
}

// operatorInEigenbasis returns E^T W E for every class.
func (cf *cruiseFrame) operatorInEigenbasis(bs Basis, op responseOp, v0 float64) blockMat {
	k, n := bs.Block, bs.Sites
	out := make(blockMat, n)
	col := make([]complex128, bs.Size())
	wc := make([]complex128, bs.Size())
	for c := range n {
		out[c] = make([]complex128, k*k)
	}
	for kk := range k {
		for c := range n {
			for j := range k {
				col[n*j+c] = complex(cf.es.vecs[c][j*k+kk], 0)
			}
		}
		op.apply(bs, v0, col, wc)
		for c := range n {
			e := cf.es.vecs[c]
			for i := range k {
				var s complex128
				for j := range k {
					s += complex(e[j*k+i], 0) * wc[n*j+c]
				}
				out[c][i*k+kk] = s
			}
		}
	}
	return out
}

// phases multiplies eigen coefficients p (momentum layout) by e^{-i sign lambda s}.
func (cf *cruiseFrame) phases(bs Basis, p []complex128, sign, s float64, out []complex128) {
	k, n := bs.Block, bs.Sites
	for c := range n {
		for kk := range k {
			out[n*kk+c] = p[n*kk+c] * cis(-sign*cf.es.vals[c][kk]*s)
		}
	}
}

// responseWalk propagates the block unitary U(t) of one arm's nominal
// motion from 0 to the end of its drive and reports it at the sample times
// t_j = j h (j = 0 .. nt, t_nt = T): on the ramps as the matrix itself, in
// the cruise through its cruiseFrame and the time s since the cruise began
// (the cruise is not stepped: the samples there are exact). Ramps are
// integrated with the simulator's splitting, at least one step per sample
// interval and none longer than the simulator's step. It returns U(T).
func (s *Simulator) responseWalk(p *propagator, d Drive, h float64, nt int,
	onRamp func(j int, u blockMat), inCruise func(j int, s float64, cf *cruiseFrame)) blockMat {
	b := s.basis
	tm := d.times()
	f := identityField(b)
	split := func(ta, tb float64) {
		if tb > ta {
			p.splitSteps(f, d, ta, tb, max(1, s.steps(tb-ta)))
		}
	}
	tc := 0.0
	var cf *cruiseFrame
	cruised := false
	enterCruise := func() {
		if cf != nil {
			return
		}
		split(tc, tm[1])
		tc = tm[1]
		es := diagonaliseFor(p, d.cruiseSpeed(), 1+d.DepthRel)
		cf = newCruiseFrame(b, es, unitaryOf(f))
	}
	for j := 0; j <= nt; j++ {
		t := float64(j) * h
		if j == nt {
			t = tm[3]
		}
		switch {
		case t <= tm[1] && !cruised:
			split(tc, t)
			tc = t
			if onRamp != nil {
				onRamp(j, unitaryOf(f))
			}
		case t <= tm[2] && !cruised:
			enterCruise()
			if inCruise != nil {
				inCruise(j, t-tm[1], cf)
			}
		default:
			if !cruised {
				enterCruise()
				p.exactStep(f, cf.es, d.cruiseSpeed(), 1+d.DepthRel, tm[2]-tm[1])
				tc, cruised = tm[2], true
			}
			split(tc, t)
			tc = t
			if onRamp != nil {
				onRamp(j, unitaryOf(f))
			}
		}
	}
	return unitaryOf(f)
}

// responseStep returns the sample step h and the count nt for a sequence
// of duration T: at most a quarter of the simulator's step (the resolution
// of the noise records the Monte Carlo draws) and fine enough that the
// fastest Bohr frequency of the cruise Hamiltonian, spread, is below the
// Nyquist frequency pi/h with 10 % to spare (no aliased resonance).
func (s *Simulator) responseStep(T, spread float64) (float64, int) {
	h := s.step / 4
	if spread > 0 {
		h = math.Min(h, responseNyquistShare*math.Pi/spread)
	}
	nt := max(2, int(math.Ceil(T/h-1e-9)))
	return T / float64(nt), nt
}

var responseNyquistShare = 0.9
