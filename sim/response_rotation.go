package sim

import (
	"math"
	"sort"

	"gonum.org/v1/gonum/integrate/quad"
)

// rotationKernel returns the kernels of the platform's rotation-rate noise
// (channel Rotation) for arms following drives, at the frequencies
// f_m = m df, m = 0..M. Its phase is exactly linear in the noise
// (RotationNoisePhaseRad; docs/model.md, Perturbations, platform rotation):
//
//	Phi = int w(t) dOmega(t) dt,   w(t) = I (a_+'(t) - a_-'(t)) / hbar,
//
// so its bias kernel is the filter |W(f)|^2 of the enclosed-area rate,
// W(f) = int w(t) e^{-i 2 pi f t} dt (rad per rad/s times s), and it
// leaves |z| alone: its contrast kernel is zero. For a one-sided PSD S of
// dOmega, Var Phi = int S |W|^2 df, as for the other channels.
//
// W is integrated piece by piece between the drives' break points (the
// start and end of each arm's ramps): where neither arm ramps w is
// constant and its piece is integrated in closed form; on a ramp, w is
// smooth and the piece is cut into cells of length at most
// rotationCellRad / omega_max, each integrated by rotationNodes-point
// Gauss-Legendre quadrature (of w times the exponential: a degree-31 rule
// on at most half a radian of phase per node pair, error far below 1e-12
// of the piece; Abramowitz & Stegun 25.4.29). The exponentials run over
// the grid by a recurrence (one complex product per node and frequency).
func rotationKernel(drives [2]Drive, inertia, df float64, M int) ChannelKernel {
	k := inertia / Hbar
	w := func(t float64) float64 { return k * (drives[0].Speed(t) - drives[1].Speed(t)) }
	tr := rotationTransform(w, drives, df, M)
	out := ChannelKernel{Channel: Rotation, Bias: make([]float64, M+1), Contrast: make([]float64, M+1)}
	for m, x := range tr {
		out.Bias[m] = real(x)*real(x) + imag(x)*imag(x)
	}
	return out
}

// Quadrature of the ramps in rotationTransform: nodes per cell, and the
// largest phase omega_max times the cell's length.
const (
	rotationNodes   = 16
	rotationCellRad = 8
)

// rotationTransform returns W(f_m) = int w(t) e^{-i 2 pi f_m t} dt for the
// rate w of arms following drives (zero outside their drives), f_m = m df.
func rotationTransform(w func(float64) float64, drives [2]Drive, df float64, M int) []complex128 {
	p, q := drives[0].times(), drives[1].times()
	cuts := append(p[:], q[:]...)
	sort.Float64s(cuts)
	out := make([]complex128, M+1)
	// ramping reports whether an arm ramps on (a, b) (a piece between
	// consecutive cuts lies within one segment of each drive).
	ramping := func(t [4]float64, mid float64) bool {
		return (mid > t[0] && mid < t[1]) || (mid > t[2] && mid < t[3])
	}
	wmax := 2 * math.Pi * df * float64(M)
	xs, ws := make([]float64, rotationNodes), make([]float64, rotationNodes)
	for i := 0; i+1 < len(cuts); i++ {
		a, b := cuts[i], cuts[i+1]
		if !(b > a) {
			continue
		}
		mid := (a + b) / 2
		if !ramping(p, mid) && !ramping(q, mid) {
			// w constant: wc int_a^b e^{-i omega t} dt = wc e^{-i omega a} I(omega, b-a).
			wc := w(mid)
			if wc == 0 {
				continue
			}
			for m := range out {
				om := 2 * math.Pi * df * float64(m)
				ii, _ := phaseIntegrals(om, b-a)
				out[m] += complex(wc, 0) * cis(-om*a) * ii
			}
			continue
		}
		cells := 1
		if wmax > 0 {
			cells = max(1, int(math.Ceil(wmax*(b-a)/rotationCellRad)))
		}
		h := (b - a) / float64(cells)
		for c := range cells {
			lo := a + float64(c)*h
			quad.Legendre{}.FixedLocations(xs, ws, lo, lo+h)
			for j, t := range xs {
				v := complex(ws[j]*w(t), 0)
				if v == 0 {
					continue
				}
				step := cis(-2 * math.Pi * df * t)
				e := complex(1, 0)
				for m := range out {
					out[m] += v * e
					e *= step
				}
			}
		}
	}
	return out
}
