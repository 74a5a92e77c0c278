package sim

import (
	"fmt"
	"math"
)

// StandardGravity is g_n = 9.806 65 m/s^2 (exact, CGPM 1901), the default
// of a tilted ring; the local value differs by up to 0.3 %.
const StandardGravity = 9.80665

// RingPotential is a static potential around the ring in the apparatus
// frame, the same for both arms (docs/model.md, Perturbations):
//
//	U(theta) = -m g R sin(TiltRad) cos(theta - LowRad)
//	           - g_s V0 sum_k Rel_k cos(k theta - Phase_k) cos^2(N (theta - a_s) / 2),
//
// the first line gravity on a ring tilted by TiltRad with its lowest point
// at azimuth LowRad from the start site (theta = 0), the second angular
// harmonics of the lattice depth, V0 (1 + sum_k Rel_k cos(k theta -
// Phase_k)), which move with nothing: they belong to the beams' imperfect
// ring, while the sites move. The zero value is the perfect ring.
//
// A shot (Shot.Potential) puts it in both arms' Hamiltonians
// (sim/ringexact.go): exactly on the ramps, by the first Magnus term over
// the cruise and rests, so that the bias of packets the ramps leave
// excited comes out of the propagation (Simulator.RingErrorRad estimates
// what the Magnus term leaves out: 3e-8 rad on the demo's ring with 150 us
// sin2 ramps). Echo sequences still apply it at first order: each arm's
// packet picks up the phase -integral <U>/hbar dt along its nominal path
// (see phase), a factor on each level's overlap, which misses that
// excited-packet bias (ExcitedBiasRad gives its scale).
type RingPotential struct {
	TiltRad   float64
	LowRad    float64
	GravityMS float64 // g in m/s^2; zero means StandardGravity
	Harmonics []DepthHarmonic

	// spinHz and spinRad are a spin-dependent term, set from the shot's
	// field gradient (FieldShift.GradientHz, withGradient):
	//
	//	U_s(theta) = s h spinHz/2 cos(theta - spinRad)
	//
	// for the arm s, half the differential Zeeman shift each with opposite
	// signs (docs/model.md, Perturbations, field gradient).
	spinHz, spinRad float64
}

// withGradient returns p with the spin-dependent term of field f's
// gradient on ring r.
func (p RingPotential) withGradient(f FieldShift, r Ring) RingPotential {
	p.spinHz, p.spinRad = f.GradientHz(r), f.GradientRad
	return p
}

// DepthHarmonic is one angular harmonic of the lattice depth around the
// ring: V0 (1 + Rel cos(Order theta - PhaseRad)).
type DepthHarmonic struct {
	Order    int
	Rel      float64
	PhaseRad float64
}

// Validate reports whether p lies where its treatment was checked against
// the split-step and full-grid integrations (tilts to 10 mrad, harmonics
// to 1e-3 and accepted to 1e-2; sim/ringexact_test.go).
func (p RingPotential) Validate() error {
	if math.IsNaN(p.TiltRad) || math.Abs(p.TiltRad) > 0.01 {
		return fmt.Errorf("ring tilt %g rad is outside [-0.01, 0.01] rad, where the treatment of gravity is tested", p.TiltRad)
	}
	for i, h := range p.Harmonics {
		if h.Order < 1 {
			return fmt.Errorf("depth harmonic %d: order %d, need a positive order", i+1, h.Order)
		}
		if math.IsNaN(h.Rel) || math.Abs(h.Rel) > 0.01 {
			return fmt.Errorf("depth harmonic %d: relative amplitude %g is outside [-0.01, 0.01]", i+1, h.Rel)
		}
	}
	return nil
}

func (p RingPotential) zero() bool { return p.TiltRad == 0 && len(p.Harmonics) == 0 && p.spinHz == 0 }

// GravityHz returns the amplitude m g R sin(tilt) / h of the gravity term
// in Hz (10.7 kHz per rad of tilt for rubidium-87 at R = 5 um).
func (p RingPotential) GravityHz(r Ring) float64 {
	g := p.GravityMS
	if g == 0 {
		g = StandardGravity
	}
	return r.MassKg * g * r.RadiusM * math.Sin(p.TiltRad) / Planck
}

// potentialRadS returns U_s(theta)/hbar in rad/s for the arm of sign s in
// a lattice of relative depth g at angle a (depth v0 = V0/hbar).
func (p RingPotential) potentialRadS(r Ring, v0, g, a, theta, s float64) float64 {
	u := -2*math.Pi*p.GravityHz(r)*math.Cos(theta-p.LowRad) + s*math.Pi*p.spinHz*math.Cos(theta-p.spinRad)
	if len(p.Harmonics) > 0 {
		c := math.Cos(float64(r.Sites) * (theta - a) / 2)
		for _, h := range p.Harmonics {
			u -= g * v0 * h.Rel * math.Cos(float64(h.Order)*theta-h.PhaseRad) * c * c
		}
	}
	return u
}

// formFactor returns <w| e^{i k theta} |w> = sum_l conj(w_{l+k}) w_l.
func formFactor(w State, k int) complex128 {
	var f complex128
	for i := range w.Amp {
		if j := i + k; j >= 0 && j < len(w.Amp) {
			f += complexConj(w.Amp[j]) * w.Amp[i]
		}
	}
	return f
}

// ringTerm is one term Re(A e^{i k a(t)}) of the first-order energy
// <U>(a)/hbar, rad/s, of a packet that follows its lattice at angle a.
type ringTerm struct {
	k int
	a complex128
}

// terms returns the first-order energy of the packet w in a lattice of
// relative depth g:
//
//	<w_a|U|w_a> = -m g R sin(tilt) Re(e^{i (a - LowRad)} F_1)
//	              - g V0 sum_k Rel_k Re(e^{i (k a - Phase_k)} [F_k/2 + (F_{k+N} + F_{k-N})/4]),
//
// F_k = <w|e^{i k theta}|w> the packet's form factors in its own lattice
// (w_a is w carried to angle a, cos^2 x = 1/2 + (e^{2ix} + e^{-2ix})/4).
func (p RingPotential) terms(r Ring, v0, g, sign float64, w State) []ringTerm {
	var ts []ringTerm
	if p.TiltRad != 0 {
		ts = append(ts, ringTerm{1, complex(-2*math.Pi*p.GravityHz(r), 0) * cis(-p.LowRad) * formFactor(w, 1)})
	}
	if p.spinHz != 0 {
		// s pi delta_nu_g Re(e^{i (a - spinRad)} F_1).
		ts = append(ts, ringTerm{1, complex(sign*math.Pi*p.spinHz, 0) * cis(-p.spinRad) * formFactor(w, 1)})
	}
	n := r.Sites
	for _, h := range p.Harmonics {
		k := h.Order
		f := formFactor(w, k)/2 + (formFactor(w, k+n)+formFactor(w, k-n))/4
		ts = append(ts, ringTerm{k, complex(-g*v0*h.Rel, 0) * cis(-h.PhaseRad) * f})
	}
	return ts
}

// phase returns the first-order phase -integral_0^end <U>(theta_c(t))/hbar dt
// of a packet w that follows drive d, in rad. The packet's centre is
// theta_c = a - a”/omega^2, the commanded angle (jitter left out) less
// the lag of a packet in a harmonic site of angular frequency trap
// (Ehrenfest, adiabatic limit); the integral
//
//	integral e^{i k theta_c(t)} dt
//
// is exact over the cruise (a linear in t) and by 8-point Gauss-Legendre
// quadrature elsewhere, on pieces over which k a(t) turns by at most 0.5
// rad (quadrature error below 1e-15 of the piece).
func (p RingPotential) phase(r Ring, v0, trap float64, d Drive, w State, end float64) float64 {
	ts := p.terms(r, v0, 1+d.DepthRel, d.Sign, w)
	if len(ts) == 0 {
		return 0
	}
	tm := d.times()
	// The packet lags its accelerating lattice by a''/omega^2 (Ehrenfest
	// in the harmonic site, adiabatic limit): the lag is independent of U,
	// so it enters the phase at first order.
	omega2 := trap * trap
	const dh = 1e-7 // s, central difference of the smooth commanded speed
	// The potential is fixed in the apparatus frame, which turns with the
	// background rotation: what it sees is the lattice's angle relative to
	// the apparatus, the drive's angle less Omega_bg t (docs/model.md,
	// Interferometer and signs). The acceleration is the same in both.
	commanded := func(t float64) float64 {
		return d.Sign * d.scale() * d.Seq.Angle(d.rate()*(t-d.DelayS))
	}
	angle := func(t float64) float64 {
		acc := (d.Speed(t+dh) - d.Speed(t-dh)) / (2 * dh)
		return commanded(t) - acc/omega2
	}
	var total float64
	for _, tt := range ts {
		k := float64(tt.k)
		var in complex128
		quad := func(t0, t1, speed float64) {
			if t1 <= t0 {
				return
			}
			n := int(math.Ceil(k * speed * (t1 - t0) / 0.5))
			n = max(n, 1)
			h := (t1 - t0) / float64(n)
			for i := range n {
				a := t0 + float64(i)*h
				for j, x := range gl8x {
					in += complex(h/2*gl8w[j], 0) * cis(k*angle(a+h/2*(1+x)))
				}
			}
		}
		vmax := math.Abs(d.scale() * d.rate() * d.Seq.CruiseSpeed())
		// An echo sequence repeats the pieces for each segment, so that no
		// quadrature piece straddles a ramp's end (docs/model.md, Echo
		// sequences).
		seg := d.Seq.Segment()
		period := (seg.Duration() + d.Seq.HoldS) / d.rate()
		last := 0.0
		for j := range max(d.Seq.Segments, 1) {
			tm := tm
			if d.Seq.echo() {
				t0 := d.DelayS + float64(j)*period
				tm = [4]float64{t0, t0 + seg.Up.Duration()/d.rate(), t0 + (seg.Up.Duration()+seg.CruiseS)/d.rate(), t0 + seg.Duration()/d.rate()}
			}
			quad(last, tm[0], 0)
			quad(tm[0], tm[1], vmax)
			if w := d.cruiseSpeed() - d.RotationRadS; tm[2] > tm[1] {
				span := tm[2] - tm[1]
				// No lag on the cruise (a'' = 0): the central difference
				// at tm[1] would straddle the ramp's end and shift the whole
				// cruise by jerk*dh/omega^2, breaking the arms' symmetry (it
				// left 3.9e-7 rad on a whole lap of 150 us inverse ramps).
				e := cis(k * commanded(tm[1]))
				if x := k * w * span; math.Abs(x) > 1e-6 {
					in += e * (cis(x) - 1) / complex(0, k*w)
				} else {
					in += e * complex(span, 0) * (1 + complex(0, x/2))
				}
			}
			quad(tm[2], tm[3], vmax)
			last = tm[3]
		}
		quad(last, end, 0)
		total += real(tt.a * in)
	}
	return -total
}

// ringFactors returns, for each level's start state, the factor
// e^{i (phi_+ - phi_-)} the ring potential puts on z at first order (echo
// sequences; Run puts the potential in the Hamiltonian, sim/ringexact.go).
func (s *Simulator) ringFactors(p RingPotential, drives [2]Drive, end float64, starts []State) []complex128 {
	f := make([]complex128, len(starts))
	v0 := 2 * math.Pi * s.cfg.DepthHz
	for n, w := range starts {
		f[n] = cis(p.phase(s.cfg.Ring, v0, s.trapRadS(drives[0]), drives[0], w, end) -
			p.phase(s.cfg.Ring, v0, s.trapRadS(drives[1]), drives[1], w, end))
	}
	return f
}

// trapRadS returns the site's harmonic trap frequency at drive d's depth.
func (s *Simulator) trapRadS(d Drive) float64 {
	return 2 * math.Pi * s.cfg.Ring.TrapHz(s.cfg.DepthHz*(1+d.DepthRel))
}

// Gauss-Legendre 8-point nodes and weights on [-1, 1] (Abramowitz &
// Stegun, table 25.4).
var (
	gl8x = [8]float64{-0.9602898564975363, -0.7966664774136267, -0.5255324099163290, -0.1834346424956498, 0.1834346424956498, 0.5255324099163290, 0.7966664774136267, 0.9602898564975363}
	gl8w = [8]float64{0.1012285362903763, 0.2223810344533745, 0.3137066458778873, 0.3626837833783620, 0.3626837833783620, 0.3137066458778873, 0.2223810344533745, 0.1012285362903763}
)

// ExcitedBiasRad returns the scale of the bias that the first order (used
// for echo sequences only) misses when the ramps leave the packet excited
// (docs/model.md, Perturbations). That bias is physical, linear in the tilt and odd in the
// lowest point's azimuth. The first order follows the adiabatic path, so
// on a whole lap of symmetric ramps it cancels exactly, but a packet left
// sloshing in its site with angular amplitude
//
//	eps = 2 x0 sqrt(1 - P0),  x0 = sqrt(hbar / (2 I omega)),
//
// (x0 the site's zero-point angle, P0 = ground, the ground-band population
// after the ramp-up, Result.GroundAfterRampUp) samples the odd part of the
// gravity term differently on the two arms. The scale is
//
//	2 * 2 pi GravityHz |sin(LowRad)| eps / omega,
//
// the odd force on an oscillation of amplitude eps over a time 1/omega, for
// each of the two arms. Against the full-grid integration on one lap of
// the 20-site, 5 um, 20 kHz ring at 500 rad/s (sim/ringpotential_test.go)
// the true bias was 0.39 to 0.54 of it for sin2 and inverse ramps of 150
// and 300 us (P0 from 0.923 to 0.9996), and about 0.5 to 0.65 at 600 us
// (P0 above 0.99998). It is a scale, not a proven bound. Depth harmonics
// are not included: their excited-packet bias was not measured.
func (p RingPotential) ExcitedBiasRad(r Ring, trapRadS, ground float64) float64 {
	if p.TiltRad == 0 || !(trapRadS > 0) {
		return 0
	}
	x0 := math.Sqrt(r.rotationalRate() / trapRadS)
	eps := 2 * x0 * math.Sqrt(math.Max(0, 1-ground))
	return 2 * 2 * math.Pi * math.Abs(p.GravityHz(r)*math.Sin(p.LowRad)) * eps / trapRadS
}
