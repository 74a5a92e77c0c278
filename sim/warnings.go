package sim

import (
	"fmt"
	"math"
)

// Limits of the model's validity that Warnings checks (docs/model.md,
// Limits).
const (
	// MinSiteSpacingM is the smallest site spacing 2 pi R / N an optical
	// lattice is taken to reach: a pattern made by interfering light of
	// wavelength lambda has a period of at least lambda / 2 (counter-
	// propagating beams), 0.39 um for the 780 nm light of rubidium's D2
	// line and 0.53 um at 1064 nm (common practice). Sub-wavelength
	// lattices need special techniques the model does not describe.
	MinSiteSpacingM = 0.4e-6
	// MaxDepthHz is the deepest lattice, V0/h, taken to be within reach of
	// optical dipole potentials: k_B x 1 mK / h = 20.8 MHz, the depth of the
	// deepest far-detuned traps (optical tweezers) in common use (common
	// practice, from memory); optical lattices usually stay far below it.
	MaxDepthHz = Boltzmann * 1e-3 / Planck
)

// Warnings returns the inputs of c that lie outside the model's validity,
// each as one sentence naming the value, the limit and its basis; nil if
// there are none. They do not stop a simulation: the results are those of
// the model, which may not describe an apparatus at such values.
func (c Config) Warnings() []string {
	var w []string
	if n := c.Ring.Sites; n > 0 && c.Ring.RadiusM > 0 {
		if d := 2 * math.Pi * c.Ring.RadiusM / float64(n); d < MinSiteSpacingM {
			w = append(w, fmt.Sprintf("the site spacing 2 pi R / N = %.3g um is below %.2g um, about half an optical wavelength, the finest period interfering light makes: such a ring lattice is outside the model's optical basis", d*1e6, MinSiteSpacingM*1e6))
		}
	}
	if c.Sequence.Up != nil {
		if cruise := c.Sequence.CruiseSpeed(); math.Abs(c.RotationRadS) > cruise {
			w = append(w, fmt.Sprintf("the rotation %.3g rad/s is faster than the cruise %.3g rad/s: both lattices turn the same way in the inertial frame and the phase is far outside the small-rotation regime of a Sagnac sensor", c.RotationRadS, cruise))
		}
	}
	if c.DepthHz > MaxDepthHz {
		w = append(w, fmt.Sprintf("the lattice depth %.3g MHz is above %.3g MHz (k_B x 1 mK / h), deeper than optical dipole potentials reach in practice", c.DepthHz/1e6, MaxDepthHz/1e6))
	}
	return w
}
