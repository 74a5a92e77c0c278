package sim

import (
	"math"

	"gonum.org/v1/gonum/dsp/fourier"
)

// PlainSplitStep integrates a whole shot in the inertial frame with
// fixed-step Strang splitting on a grid of angles,
//
//	exp(-i E_rot l^2 dt/2) exp(-i V(theta - a(t+dt/2)) dt) exp(-i E_rot l^2 dt/2),
//
// moving between angle and momentum with FFTs, ramps and cruise alike. It
// shares no propagation code with Simulator.Run and is kept as the test
// oracle and as the baseline the fast propagator is measured against. It
// returns z = <psi_-(T)|psi_+(T)> for the lowest level, before pulse factors.
func (s *Simulator) PlainSplitStep(sh Shot, stepS float64) complex128 {
	return s.plainSplitStep(sh, stepS, nil)
}

// plainSplitStep is PlainSplitStep with, if u is not nil, a potential
// u(a, g, theta, s) in rad/s for the arm of sign s added to the lattice factor as a diagonal in
// angle space (a the lattice's angle, g its relative depth): the exact
// reference the ring potential's first-order treatment is tested against.
func (s *Simulator) plainSplitStep(sh Shot, stepS float64, u func(a, g, theta, s float64) float64) complex128 {
	cfg, b := s.cfg, s.basis
	m := b.Size()
	v0 := 2 * math.Pi * cfg.DepthHz
	rot := cfg.Ring.rotationalRate()
	gStart := 1 + (sh.DepthRel[0]+sh.DepthRel[1])/2
	es0 := diagonalise(b, rot, cfg.RotationRadS, gStart*v0)
	trap := 2 * math.Pi * cfg.Ring.TrapHz(cfg.DepthHz*gStart)
	start := wannier(b, cfg.Ring, es0, 0, trap)

	drives := s.drives(sh)
	end := math.Max(drives[0].times()[3], drives[1].times()[3])
	n := int(math.Ceil(end/stepS - 1e-9))
	dt := end / float64(n)

	fft := fourier.NewCmplxFFT(m)
	kin := make([]complex128, m) // exp(-i rot l^2 dt/2) at FFT index
	for i := range m {
		l := float64(i)
		if i >= m/2 {
			l -= float64(m)
		}
		kin[i] = cis(-rot * l * l * dt / 2)
	}
	var out [2][]complex128
	for a, d := range drives {
		psi := make([]complex128, m) // momentum amplitudes at FFT index l mod m
		for i, amp := range start.Amp {
			psi[(b.LMin()+i+m)%m] = amp
		}
		x := make([]complex128, m)
		for step := range n {
			t := (float64(step) + 0.5) * dt
			for i := range psi {
				psi[i] *= kin[i]
			}
			fft.Sequence(x, psi)
			aa, g := d.Angle(t), d.Depth(t)
			for j := range x {
				th := 2 * math.Pi * float64(j) / float64(m)
				c := math.Cos(float64(b.Sites) * (th - aa) / 2)
				w := g * v0 * c * c
				if u != nil {
					w -= u(aa, g, th, d.Sign)
				}
				x[j] *= cis(w * dt)
			}
			fft.Coefficients(psi, x)
			for i := range psi {
				psi[i] *= kin[i] / complex(float64(m), 0)
			}
		}
		out[a] = psi
	}
	var z complex128
	for i := range out[0] {
		z += complexConj(out[1][i]) * out[0][i]
	}
	return z
}
