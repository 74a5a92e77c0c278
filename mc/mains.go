package mc

import (
	"fmt"
	"math"

	"rampart/sim"
)

// Mains is the shape of the mains field line whose fundamental's amplitude
// is Budget.MainsG (the row ParamMains of Sources): a field
//
//	b(t) = A [sin(2 pi f t + p) + sum_h r_h sin(2 pi h f t + h p)]
//
// from the shot's start t = 0 (docs/model.md, Perturbations, magnetic
// field), harmonic h = 2, 3, ... of relative amplitude r_h = HarmonicsRel[h-2].
// The harmonics are locked to the fundamental, so that p is where in the
// mains cycle the shot starts: uniform on [0, 2 pi) from shot to shot
// (the shot is not triggered on the mains), or PhaseRad in every shot
// (FixedPhase: the shot is triggered on it). It acts through the spin
// pair's Zeeman coefficients (sim.FieldShift), added to the field noise.
type Mains struct {
	Hz           float64   // line frequency f, Hz; 0: 50 Hz
	HarmonicsRel []float64 // amplitude of harmonic h = 2, 3, ... relative to the fundamental's
	FixedPhase   bool      // every shot at phase PhaseRad; false: uniform
	PhaseRad     float64
}

// DefaultMainsHz is the line frequency of a Mains without one (Europe,
// most of Asia; North America's is 60 Hz).
const DefaultMainsHz = 50

// Frequency returns f, DefaultMainsHz when Hz is zero.
func (m Mains) Frequency() float64 {
	if m.Hz == 0 {
		return DefaultMainsHz
	}
	return m.Hz
}

// Validate checks the line's frequency, harmonics and phase.
func (m Mains) Validate() error {
	if !(m.Hz >= 0) || math.IsInf(m.Hz, 0) {
		return fmt.Errorf("mains frequency %g Hz: want a positive frequency (0: %d Hz)", m.Hz, DefaultMainsHz)
	}
	for i, r := range m.HarmonicsRel {
		if !(r >= 0) || math.IsInf(r, 0) {
			return fmt.Errorf("mains harmonic %d: relative amplitude %g, want a finite non-negative number", i+2, r)
		}
	}
	if math.IsNaN(m.PhaseRad) || math.IsInf(m.PhaseRad, 0) {
		return fmt.Errorf("mains phase %g rad: want a finite phase", m.PhaseRad)
	}
	return nil
}

// Phase returns the phase p of a shot whose drawn standard normal variate
// is z: 2 pi Phi(z), uniform on [0, 2 pi) (Phi the normal distribution
// function), or PhaseRad with FixedPhase.
func (m Mains) Phase(z float64) float64 {
	if m.FixedPhase {
		return m.PhaseRad
	}
	return math.Pi * math.Erfc(-z/math.Sqrt2)
}

// Field returns b(t) of a line of fundamental amplitude a (G) at phase p.
func (m Mains) Field(a, p, t float64) float64 {
	w := 2 * math.Pi * m.Frequency()
	b := math.Sin(w*t + p)
	for i, r := range m.HarmonicsRel {
		h := float64(i + 2)
		b += r * math.Sin(h*(w*t+p))
	}
	return a * b
}

// PhaseVarianceRad2 returns the variance over a uniform phase p of the
// phase -2 pi k integral_0^T b(t) dt that a line of fundamental amplitude a
// (G) gives a shot of duration T through a linear Zeeman coefficient k
// (Hz/G): the harmonics' cross terms average to zero over p, and each
// harmonic h of angular frequency w_h = 2 pi h f and amplitude a_h adds
//
//	(2 pi k a_h / w_h)^2 (1 - cos w_h T).
func (m Mains) PhaseVarianceRad2(a, k, T float64) float64 {
	w := 2 * math.Pi * m.Frequency()
	v := 0.0
	for h, r := range append([]float64{1}, m.HarmonicsRel...) {
		wh := w * float64(h+1)
		c := 2 * math.Pi * k * a * r / wh
		v += c * c * (1 - math.Cos(wh*T))
	}
	return v
}

// addMains adds the line of fundamental amplitude a at phase p to the
// shot's field record (a new record on the grid of n samples of stepS from
// the shot's start when it has none).
func (m Mains) addMains(sh *sim.Shot, a, p, stepS float64, n int) {
	x := make([]float64, n)
	if old := sh.Field.Noise; old != nil {
		if len(old.Values) != n || old.StepS != stepS {
			panic("mc: the mains line and the field noise on different grids")
		}
		copy(x, old.Values)
	}
	for j := range x {
		x[j] += m.Field(a, p, float64(j)*stepS)
	}
	sh.Field.Noise = &sim.Series{StepS: stepS, Values: x}
}
