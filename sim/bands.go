package sim

import (
	"math"
	"sync/atomic"
)

// eigensystem holds the eigenvalues (ascending, rad/s) and eigenvectors of
// every class block of one Hamiltonian: vecs[c][j*K+k] is component j of
// eigenvector k of class c.
type eigensystem struct {
	vals [][]float64
	vecs [][]float64
	// gen identifies the contents: every (re)computation into the storage
	// takes a new number (nextEigenGen), so that what is derived from the
	// eigensystem (the ring potential's overlaps, sim/ringexact.go) can be
	// reused while gen is unchanged. Zero: not numbered, never reused.
	gen uint64
}

// eigenGen numbers the eigensystems' computations (eigensystem.gen).
var eigenGen atomic.Uint64

// nextEigenGen returns a number no eigensystem computation had before.
func nextEigenGen() uint64 { return eigenGen.Add(1) }

// blockHamiltonian fills the diagonal d and off-diagonal e of the class-c
// block of H' = E_rot l^2 - hbar w l + V with the lattice at angle 0, all
// over hbar (rad/s): rot = E_rot/hbar, v0 = V0/hbar.
//
//	H'_jj = rot l_j^2 - w l_j - v0/2,  H'_j,j+1 = -v0/4.
func blockHamiltonian(b Basis, c int, rot, w, v0 float64, d, e []float64) {
	for j := range b.Block {
		l := float64(b.L(c, j))
		d[j] = rot*l*l - w*l - v0/2
	}
	for j := range b.Block - 1 {
		e[j] = -v0 / 4
	}
}

// diagonalise returns the eigensystem of every block of H'(w) at depth v0.
func diagonalise(b Basis, rot, w, v0 float64) eigensystem {
	var es eigensystem
	diagonaliseOver(b, rot, w, v0, &es)
	return es
}

// diagonaliseOver is diagonalise into es, reusing its storage when it has
// the basis's shape (a shot's cruise eigensystems, sim/shotwork.go).
func diagonaliseOver(b Basis, rot, w, v0 float64, es *eigensystem) {
	k := b.Block
	if len(es.vals) != b.Sites || len(es.vals[0]) != k {
		*es = eigensystem{vals: make([][]float64, b.Sites), vecs: make([][]float64, b.Sites)}
	}
	e := make([]float64, k)
	zt := make([]float64, k*k)
	work := make([]float64, 2*k)
	for c := range b.Sites {
		es.vals[c], es.vecs[c] = diagonaliseInto(b, c, rot, w, v0, e, zt, work, es.vals[c], es.vecs[c])
	}
	es.gen = nextEigenGen()
}

// block is the eigensystem of one class block.
type block struct {
	vals, vecs []float64
}

// diagonaliseBlock returns the eigensystem of the class-c block of H'(w)
// by the implicit QL method (LAPACK dsteqr).
func diagonaliseBlock(b Basis, c int, rot, w, v0 float64) block {
	k := b.Block
	vals, vecs := diagonaliseInto(b, c, rot, w, v0, make([]float64, k), make([]float64, k*k), make([]float64, 2*k), nil, nil)
	return block{vals: vals, vecs: vecs}
}

// diagonaliseInto returns the eigenvalues and eigenvectors (vecs[j*K+m],
// component j of vector m) of the class-c block by steqr, with scratch e
// (K), zt (K*K) and work (2K), in vals (K) and vecs (K*K) when they are
// not nil.
func diagonaliseInto(b Basis, c int, rot, w, v0 float64, e, zt, work, vals, vecs []float64) ([]float64, []float64) {
	k := b.Block
	if vals == nil {
		vals = make([]float64, k)
	}
	blockHamiltonian(b, c, rot, w, v0, vals, e)
	if !steqr(k, vals, e, zt, work) {
		panic("sim: tridiagonal eigensolver did not converge")
	}
	if vecs == nil {
		vecs = make([]float64, k*k)
	}
	for m := range k {
		for j, v := range zt[m*k : (m+1)*k] {
			vecs[j*k+m] = v
		}
	}
	return vals, vecs
}

// BandsHz returns the band energies E/h in Hz, ascending, of class c (the
// quasi-momentum class l mod N) for a lattice of depth V0/h = depthHz at
// rest, in basis b. Energies include the constant -V0/2 of the lattice, so
// that with E_s = N^2 E_rot / 4 and q = V0 / (4 E_s) the lowest value at
// c = 0 is -V0/2 + E_s a_0(q) (Mathieu characteristic values).
func (r Ring) BandsHz(b Basis, depthHz float64, c int) []float64 {
	rot := r.rotationalRate()
	es := diagonalise(b, rot, 0, 2*math.Pi*depthHz)
	out := make([]float64, b.Block)
	for i, v := range es.vals[c%b.Sites] {
		out[i] = v / (2 * math.Pi)
	}
	return out
}

// wannier returns the localised (Wannier) state of band n at site 0 for the
// blocks of es, built from the band's Bloch states of all classes. The gauge
// of each Bloch state is fixed by its overlap with the n-th harmonic
// oscillator state of the site (trap frequency trapRadS), which makes the
// sum localised; the state is normalised.
func wannier(b Basis, r Ring, es eigensystem, n int, trapRadS float64) State {
	k := b.Block
	amp := make([]complex128, b.Size())
	width := math.Sqrt(Hbar / (r.Inertia() * trapRadS)) // oscillator length in rad
	phase := complex(1, 0)
	for range n {
		phase *= -1i // the oscillator state's momentum amplitudes carry (-i)^n
	}
	norm := 1 / math.Sqrt(float64(b.Sites))
	for c := range b.Sites {
		var ov float64
		for j := range k {
			ov += es.vecs[c][j*k+n] * hermiteFunction(n, float64(b.L(c, j))*width)
		}
		sign := 1.0
		if ov < 0 {
			sign = -1
		}
		a := phase * complex(sign*norm, 0)
		for j := range k {
			amp[b.Sites*j+c] = a * complex(es.vecs[c][j*k+n], 0)
		}
	}
	return State{Basis: b, Amp: amp}
}

// hermiteFunction returns H_n(x) exp(-x^2/2) up to a positive constant,
// by the three-term recurrence of the normalised functions (stable for
// large n).
func hermiteFunction(n int, x float64) float64 {
	g := math.Exp(-x * x / 2)
	p0, p1 := g, math.Sqrt2*x*g
	if n == 0 {
		return p0
	}
	for m := 1; m < n; m++ {
		p0, p1 = p1, math.Sqrt(2/float64(m+1))*x*p1-math.Sqrt(float64(m)/float64(m+1))*p0
	}
	return p1
}

// bandMeans returns the mean over classes of each band's energy in rad/s:
// the energy of the band's Wannier state.
func bandMeans(es eigensystem) []float64 {
	k := len(es.vals[0])
	m := make([]float64, k)
	for _, v := range es.vals {
		for i := range k {
			m[i] += v[i]
		}
	}
	for i := range m {
		m[i] /= float64(len(es.vals))
	}
	return m
}

// thermalWeights returns Boltzmann weights p_n proportional to
// exp(-E_n / k_B T) over the levels whose energies (rad/s) are given,
// normalised to one. At T = 0 all weight is on level 0.
func thermalWeights(energies []float64, temperatureK float64) []float64 {
	p := make([]float64, len(energies))
	if temperatureK <= 0 || len(p) == 1 {
		p[0] = 1
		return p
	}
	beta := Hbar / (Boltzmann * temperatureK)
	var sum float64
	for i, e := range energies {
		p[i] = math.Exp(-beta * (e - energies[0]))
		sum += p[i]
	}
	for i := range p {
		p[i] /= sum
	}
	return p
}

// LevelCutoff is the smallest Boltzmann weight, relative to the ground
// level, of a level that a thermal start propagates.
const LevelCutoff = 1e-6

// thermalLevels returns how many of the site's bound levels (band means
// below the top of the lattice, 0) carry a weight above LevelCutoff at
// temperatureK; at least one.
func thermalLevels(means []float64, temperatureK float64) int {
	if temperatureK <= 0 {
		return 1
	}
	beta := Hbar / (Boltzmann * temperatureK)
	n := 1
	for n < len(means) && means[n] < 0 && math.Exp(-beta*(means[n]-means[0])) > LevelCutoff {
		n++
	}
	return n
}
