package sim

import (
	"fmt"
	"math"
)

// The perturbations of the apparatus that act on a shot as a factor on z,
// after the arms are propagated: a differential frequency shift (magnetic
// field through the spin pair's Zeeman coefficients), photon scattering,
// and a radius calibration error. See docs/model.md, Perturbations.

// Zeeman holds the differential Zeeman coefficients of the spin pair about
// its bias field: the frequency shift of the arm s = +1 relative to the arm
// s = -1 for a field offset b from the bias is
//
//	delta_nu(b) = LinearHzPerG b + QuadraticHzPerG2 b^2.
//
// (atom.Pair.Coefficients gives them for rubidium-87 pairs; with the F = 2
// state in the arm s = +1 they are used as they are, otherwise negated.)
type Zeeman struct {
	LinearHzPerG     float64
	QuadraticHzPerG2 float64
}

// ShiftHz returns delta_nu(b) for a field offset of b gauss.
func (z Zeeman) ShiftHz(b float64) float64 {
	return z.LinearHzPerG*b + z.QuadraticHzPerG2*b*b
}

// FieldShift is the differential frequency shift of the arm s = +1
// relative to the arm s = -1 during one shot:
//
//	delta_nu(t) = ShiftHz + Zeeman.ShiftHz(OffsetG + Noise(t)),
//
// with Noise a field record in gauss (nil: none). It moves the shot's
// phase by
//
//	Phi_B = -2 pi integral_0^T delta_nu(t) dt
//
// over the whole shot [0, T] (from the first pulse to the second), the
// sign of issue 12 and docs/model.md: a constant shift delta_nu gives
// -2 pi delta_nu T. The integral of the piecewise-linear record and of its
// square is exact.
type FieldShift struct {
	ShiftHz float64 // a static differential shift (any cause)
	Zeeman  Zeeman
	OffsetG float64 // static field offset from the bias, G
	Noise   *Series // field noise b(t), G
	// GradientGPerM is a field gradient in the ring's plane, G/m, towards
	// the azimuth GradientRad from the start site: the field's offset
	// varies around the ring as GradientGPerM R cos(theta - GradientRad),
	// a spin-dependent ring potential (GradientHz; docs/model.md,
	// Perturbations, field gradient) applied with the ring potential.
	GradientGPerM float64
	GradientRad   float64
}

// GradientHz returns the amplitude delta_nu_g of the differential Zeeman
// shift around a ring r from the gradient, linear in it about the static
// offset:
//
//	delta_nu_g = (LinearHzPerG + 2 QuadraticHzPerG2 OffsetG) GradientGPerM R.
//
// The arm s = +1 sees +delta_nu_g/2 cos(theta - GradientRad) and the arm
// s = -1 its opposite, relative to their mean (the sign of FieldShift).
func (f FieldShift) GradientHz(r Ring) float64 {
	if f.GradientGPerM == 0 {
		return 0
	}
	return (f.Zeeman.LinearHzPerG + 2*f.Zeeman.QuadraticHzPerG2*f.OffsetG) * f.GradientGPerM * r.RadiusM
}

// PhaseRad returns Phi_B for a shot from t0 to t1 s.
func (f FieldShift) PhaseRad(t0, t1 float64) float64 {
	if t1 <= t0 {
		return 0
	}
	d := t1 - t0
	lin, sq := seriesIntegrals(f.Noise, t0, t1)
	b0 := f.OffsetG
	// integral of (b0 + n)^2 = b0^2 T + 2 b0 int n + int n^2.
	integral := f.ShiftHz*d +
		f.Zeeman.LinearHzPerG*(b0*d+lin) +
		f.Zeeman.QuadraticHzPerG2*(b0*b0*d+2*b0*lin+sq)
	return -2 * math.Pi * integral
}

// Scattering is photon scattering from the lattice light during a shot.
//
// Each arm s scatters at RateS[s] times its relative depth g_s(t)
// (scattering is proportional to intensity), an accumulated mean number of
// events L_s = RateS[s] integral_0^T g_s dt. An event is a which-way
// measurement: it ends the coherence of the atom, whose contribution to z
// is lost; its recoil is not modelled (the scattered atom is an incoherent
// background of the read-out whatever its momentum). For an atom in the
// equal superposition of the two arms the quantum-jump picture gives
// exactly (Dalibard, Castin & Moelmer 1992)
//
//	P(no event)      = (e^{-L_+} + e^{-L_-}) / 2,
//	z | no event     = z_0 2 e^{-(L_+ + L_-)/2} / (e^{-L_+} + e^{-L_-}),
//	z | an event     = 0,
//
// so that the ensemble mean is z_0 e^{-(L_+ + L_-)/2}: with equal rates,
// the contrast decays as exp(-Gamma T), the master equation's decay of the
// coherence at half the sum of the arms' rates.
//
// References:
//
//	J. Dalibard, Y. Castin and K. Moelmer, Wave-function approach to
//	dissipative processes in quantum optics, Phys. Rev. Lett. 68, 580 (1992).
type Scattering struct {
	RateS [2]float64 // arm s = +1, arm s = -1, events/s at the nominal depth
	// Uniform is a uniform variate in [0, 1) the ensemble draws for the
	// shot: the atom scattered if Uniform >= P(no event).
	Uniform float64
	// Cloud makes the shot stand for a cloud of many atoms: z is multiplied
	// by the mean factor e^{-(L_+ + L_-)/2} and Uniform is not used.
	Cloud bool
}

// ScatteringMeans returns the accumulated mean numbers of scattering
// events L_s of each arm in shot sh.
func (s *Simulator) ScatteringMeans(sh Shot) [2]float64 {
	if s.cfg.Sequence.echo() {
		return echoScatteringMeans(sh, s.echoPlan(sh))
	}
	drives := s.drives(sh)
	end := math.Max(drives[0].times()[3], drives[1].times()[3])
	return scatteringMeans(sh.Scattering, drives, end)
}

func scatteringMeans(sc Scattering, drives [2]Drive, end float64) [2]float64 {
	var l [2]float64
	for a, d := range drives {
		if sc.RateS[a] == 0 {
			continue
		}
		lin, _ := seriesIntegrals(d.DepthNoise, 0, end)
		l[a] = sc.RateS[a] * ((1+d.DepthRel)*end + lin)
	}
	return l
}

// Factor returns the factor on z for accumulated means l, and whether
// the atom scattered.
func (sc Scattering) Factor(l [2]float64) (factor float64, scattered bool) {
	if sc.Cloud {
		return math.Exp(-(l[0] + l[1]) / 2), false
	}
	e0, e1 := math.Exp(-l[0]), math.Exp(-l[1])
	none := (e0 + e1) / 2
	if sc.Uniform >= none {
		return 0, true
	}
	return math.Exp(-(l[0]+l[1])/2) / none, false
}

// apparatus returns the factor on z of the field shift, the scattering,
// the rotation-rate noise and the radius error of shot sh, whose arms run
// to time end.
func (s *Simulator) apparatus(sh Shot, drives [2]Drive, end float64) complex128 {
	f := cis(sh.Field.PhaseRad(0, end))
	if sh.Scattering.RateS != [2]float64{} {
		k, _ := sh.Scattering.Factor(scatteringMeans(sh.Scattering, drives, end))
		f *= complex(k, 0)
	}
	if sh.RotationNoise != nil {
		f *= cis(RotationNoisePhaseRad(s.cfg.Ring, sh.RadiusRel, drives, end, sh.RotationNoise))
	}
	if sh.RadiusRel != 0 {
		c := s.cfg
		c.RotationRadS += sh.RotationOffsetRadS
		f *= cis(radiusPhase(c, sh.RadiusRel))
	}
	return f
}

// radiusPhase is the Sagnac phase the nominal scale factor misses when the
// true radius is R (1 + r): the true enclosed area is (1 + r)^2 times the
// nominal one, so
//
//	Phi_S,true - Phi_S = K ((1 + r)^2 - 1) Omega_bg,
//
// a scale-factor error of 2 r + r^2. The change of E_rot with R (a common
// shift of both arms' band energies, and a relative change -r of the trap
// frequency) is not modelled: it cancels in the phase at first order and
// enters the contrast only through the adiabaticity of the ramps.
func radiusPhase(c Config, r float64) float64 {
	return c.Ring.ScaleFactor(c.Sequence.TotalAngle()) * ((1+r)*(1+r) - 1) * c.RotationRadS
}

// seriesIntegrals returns the integrals of x(t) and x(t)^2 over [t0, t1]
// for the piecewise-linear record x (zero if nil), exactly.
func seriesIntegrals(x *Series, t0, t1 float64) (lin, sq float64) {
	if x.Len() == 0 || t1 <= t0 {
		return 0, 0
	}
	piece := func(a, b float64) {
		va, vb := x.At(a), x.At(b)
		lin += (b - a) * (va + vb) / 2
		sq += (b - a) * (va*va + va*vb + vb*vb) / 3
	}
	last := float64(x.Len()-1) * x.StepS
	a := t0
	for i := max(0, int(math.Floor(t0/x.StepS))+1); ; i++ {
		ti := float64(i) * x.StepS
		if ti >= t1 || ti > last {
			break
		}
		if ti > a {
			piece(a, ti)
			a = ti
		}
	}
	piece(a, t1)
	return lin, sq
}

// Validate reports whether f is a finite shift.
func (f FieldShift) Validate() error {
	for _, x := range []struct {
		name string
		v    float64
	}{{"differential shift (Hz)", f.ShiftHz}, {"linear Zeeman coefficient (Hz/G)", f.Zeeman.LinearHzPerG},
		{"quadratic Zeeman coefficient (Hz/G^2)", f.Zeeman.QuadraticHzPerG2}, {"field offset (G)", f.OffsetG},
		{"field gradient (G/m)", f.GradientGPerM}, {"field gradient azimuth (rad)", f.GradientRad}} {
		if math.IsNaN(x.v) || math.IsInf(x.v, 0) {
			return fmt.Errorf("%s %g is not finite", x.name, x.v)
		}
	}
	return nil
}

// Validate reports whether sc has non-negative finite rates and a
// uniform variate in [0, 1).
func (sc Scattering) Validate() error {
	for a, r := range sc.RateS {
		if !(r >= 0) || math.IsInf(r, 0) {
			return fmt.Errorf("scattering rate of arm %+d: %g /s is not a finite non-negative rate", 1-2*a, r)
		}
	}
	if !(sc.Uniform >= 0 && sc.Uniform < 1) {
		return fmt.Errorf("scattering draw %g is not in [0, 1)", sc.Uniform)
	}
	return nil
}

// ValidateRadiusRel reports whether r is a relative radius error that
// leaves a ring: r > -1 and finite.
func ValidateRadiusRel(r float64) error {
	if !(r > -1) || math.IsInf(r, 0) {
		return fmt.Errorf("relative radius error %g: need a finite number above -1", r)
	}
	return nil
}
