package sim

import (
	"math"
	"sync"
)

// sineBasis is the eigen-decomposition of the unit-depth lattice in a class
// block of K states, V = -1/2 - (1/4) T with T the tridiagonal matrix of
// ones: the type-I discrete sine transform
//
//	u[j][m] = sqrt(2/(K+1)) sin(pi (j+1) (m+1) / (K+1)),
//	lam[m]  = -1/2 - (1/2) cos(pi (m+1) / (K+1)),
//
// symmetric and its own inverse. It depends on K alone, so it is built once
// per block size, when first needed, and shared.
//
// References:
//
//	G. Strang, "The discrete cosine transform", SIAM Rev. 41, 135 (1999).
type sineBasis struct {
	u   []float64 // K x K
	ut  []float64 // ut[m*K/2+j] = u[j][m], j < K/2: the folded rows' coefficients
	lam []float64 // rad/s per (rad/s of v0)
}

var sineBases sync.Map // block size -> *sineBasis

// sineBasisOf returns the shared sineBasis of block size k.
func sineBasisOf(k int) *sineBasis {
	if v, ok := sineBases.Load(k); ok {
		return v.(*sineBasis)
	}
	sb := &sineBasis{u: make([]float64, k*k), lam: make([]float64, k)}
	norm := math.Sqrt(2 / float64(k+1))
	for j := range k {
		for m := range k {
			sb.u[j*k+m] = norm * math.Sin(math.Pi*float64((j+1)*(m+1))/float64(k+1))
		}
	}
	h := k / 2
	sb.ut = make([]float64, k*h)
	for m := range k {
		for j := range h {
			sb.ut[m*h+j] = sb.u[j*k+m]
		}
	}
	for m := range k {
		sb.lam[m] = -0.5 - 0.5*math.Cos(math.Pi*float64(m+1)/float64(k+1))
	}
	v, _ := sineBases.LoadOrStore(k, sb)
	return v.(*sineBasis)
}

// kineticCache holds exp(-i rot l^2 h) over a basis for the last few
// durations h, as real and imaginary parts: a split-step scheme uses five
// (the stages and the merged step ends), the same in both arms, so the arms
// of a shot share one. Not safe for concurrent use.
type kineticCache struct {
	hs     []float64
	re, im [][]float64
	next   int
}

// kineticEntries is how many durations a kineticCache holds.
const kineticEntries = 8

func (c *kineticCache) table(b Basis, rot, h float64) (re, im []float64) {
	for i, x := range c.hs {
		if x == h {
			return c.re[i], c.im[i]
		}
	}
	i := c.next
	c.next = (c.next + 1) % kineticEntries
	if len(c.hs) < kineticEntries {
		c.hs = append(c.hs, h)
		c.re = append(c.re, make([]float64, b.Size()))
		c.im = append(c.im, make([]float64, b.Size()))
	} else {
		c.hs[i] = h
	}
	re, im = c.re[i], c.im[i]
	for j := range re {
		l := float64(b.LMin() + j)
		z := cis(-rot * l * l * h)
		re[j], im[j] = real(z), imag(z)
	}
	return re, im
}

// latticeCache holds cos and sin of -g v0 lam[m] dt for the last few
// (g, dt) of the lattice factor: the stages of a scheme at constant depth
// use three.
type latticeCache struct {
	keys     [][2]float64
	cos, sin [][]float64
	next     int
}

// latticeEntries is how many (g, dt) a latticeCache holds.
const latticeEntries = 8

func (c *latticeCache) phases(p *propagator, g, dt float64) (cs, sn []float64) {
	key := [2]float64{g, dt}
	for i, v := range c.keys {
		if v == key {
			return c.cos[i], c.sin[i]
		}
	}
	i := c.next
	c.next = (c.next + 1) % latticeEntries
	if len(c.keys) < latticeEntries {
		k := len(p.lam)
		c.keys = append(c.keys, key)
		c.cos = append(c.cos, make([]float64, k))
		c.sin = append(c.sin, make([]float64, k))
	} else {
		c.keys[i] = key
	}
	cs, sn = c.cos[i], c.sin[i]
	for m, l := range p.lam {
		sn[m], cs[m] = math.Sincos(-g * p.v0 * l * dt)
	}
	return cs, sn
}
