package sim

import (
	"fmt"
	"math"
	"sort"

	"rampart/internal/plural"
)

// Tabulated is a ramp given by samples (t_i, Omega_i), for example from a
// numerical optimiser. Between rows the speed is the monotone piecewise-cubic
// Hermite interpolant (PCHIP): it passes through every row, has a continuous
// first derivative, and adds no overshoot between rows. The angle is its
// exact integral.
//
// References:
//
//	F. N. Fritsch and R. E. Carlson, "Monotone piecewise cubic
//	interpolation", SIAM J. Numer. Anal. 17, 238 (1980).
type Tabulated struct {
	label string
	t, w  []float64 // rows
	m     []float64 // slopes at the rows
	cum   []float64 // angle at the rows
}

// CruiseTolerance is the relative mismatch allowed between the last row of a
// ramp table and the cruise speed.
const CruiseTolerance = 1e-6

// NewTabulated returns the ramp through the rows (t[i], omega[i]). The times
// must start at 0 and increase strictly; the speed must start at 0 and end at
// cruise within CruiseTolerance (relative), and cruise must be non-zero.
func NewTabulated(label string, t, omega []float64, cruise float64) (*Tabulated, error) {
	n := len(t)
	if n != len(omega) {
		panic("sim: NewTabulated: len(t) != len(omega)")
	}
	if n < 2 {
		return nil, fmt.Errorf("ramp table has %s, need at least 2", plural.Count(n, "row"))
	}
	if t[0] != 0 {
		return nil, fmt.Errorf("ramp table starts at t = %g s, want 0", t[0])
	}
	for i := range t {
		if math.IsNaN(t[i]) || math.IsInf(t[i], 0) || math.IsNaN(omega[i]) || math.IsInf(omega[i], 0) {
			return nil, fmt.Errorf("ramp table row %d is not finite (t = %g s, speed = %g rad/s)", i+1, t[i], omega[i])
		}
		if i > 0 && !(t[i] > t[i-1]) {
			return nil, fmt.Errorf("ramp table row %d: time %g s is not after the previous row (%g s)", i+1, t[i], t[i-1])
		}
	}
	if omega[0] != 0 {
		return nil, fmt.Errorf("ramp table starts at speed %g rad/s, want 0", omega[0])
	}
	if cruise == 0 || math.IsNaN(cruise) || math.IsInf(cruise, 0) {
		return nil, fmt.Errorf("cruise speed %g rad/s is not a non-zero finite speed", cruise)
	}
	if d := math.Abs(omega[n-1]-cruise) / math.Abs(cruise); d > CruiseTolerance {
		return nil, fmt.Errorf("ramp table ends at speed %.9g rad/s but the cruise speed is %.9g rad/s (relative difference %.2g, tolerance %g)",
			omega[n-1], cruise, d, CruiseTolerance)
	}
	r := &Tabulated{
		label: label,
		t:     append([]float64(nil), t...),
		w:     append([]float64(nil), omega...),
	}
	r.w[n-1] = cruise // the last row is the cruise speed to the bit
	r.m = pchipSlopes(r.t, r.w)
	r.cum = make([]float64, n)
	for i := 1; i < n; i++ {
		h := r.t[i] - r.t[i-1]
		r.cum[i] = r.cum[i-1] + h*(r.w[i-1]+r.w[i])/2 + h*h*(r.m[i-1]-r.m[i])/12
	}
	return r, nil
}

// pchipSlopes returns the Fritsch-Carlson slopes with the three-point end
// formula used by common PCHIP implementations (e.g. SciPy's
// PchipInterpolator): harmonic means of secants inside, zero at extrema.
func pchipSlopes(x, y []float64) []float64 {
	n := len(x)
	m := make([]float64, n)
	if n == 2 {
		s := (y[1] - y[0]) / (x[1] - x[0])
		m[0], m[1] = s, s
		return m
	}
	h := make([]float64, n-1)
	d := make([]float64, n-1)
	for i := range h {
		h[i] = x[i+1] - x[i]
		d[i] = (y[i+1] - y[i]) / h[i]
	}
	for i := 1; i < n-1; i++ {
		if d[i-1]*d[i] <= 0 {
			continue
		}
		w1, w2 := 2*h[i]+h[i-1], h[i]+2*h[i-1]
		m[i] = (w1 + w2) / (w1/d[i-1] + w2/d[i])
	}
	m[0] = pchipEnd(h[0], h[1], d[0], d[1])
	m[n-1] = pchipEnd(h[n-2], h[n-3], d[n-2], d[n-3])
	return m
}

func pchipEnd(h0, h1, d0, d1 float64) float64 {
	m := ((2*h0+h1)*d0 - h0*d1) / (h0 + h1)
	switch {
	case m*d0 <= 0:
		return 0
	case d0*d1 <= 0 && math.Abs(m) > 3*math.Abs(d0):
		return 3 * d0
	}
	return m
}

func (r *Tabulated) Duration() float64 { return r.t[len(r.t)-1] }
func (r *Tabulated) Name() string      { return r.label }

// Rows returns the number of rows of the table.
func (r *Tabulated) Rows() int { return len(r.t) }

func (r *Tabulated) locate(t float64) (i int, u, h float64) {
	n := len(r.t)
	switch {
	case t <= 0:
		return 0, 0, r.t[1] - r.t[0]
	case t >= r.t[n-1]:
		return n - 2, 1, r.t[n-1] - r.t[n-2]
	}
	i = sort.SearchFloat64s(r.t, t) - 1
	if i < 0 {
		i = 0
	}
	h = r.t[i+1] - r.t[i]
	return i, (t - r.t[i]) / h, h
}

func (r *Tabulated) Speed(t float64) float64 {
	i, u, h := r.locate(t)
	u2, u3 := u*u, u*u*u
	return (2*u3-3*u2+1)*r.w[i] + (u3-2*u2+u)*h*r.m[i] + (-2*u3+3*u2)*r.w[i+1] + (u3-u2)*h*r.m[i+1]
}

func (r *Tabulated) Angle(t float64) float64 {
	i, u, h := r.locate(t)
	u2, u3, u4 := u*u, u*u*u, u*u*u*u
	return r.cum[i] + h*((u4/2-u3+u)*r.w[i]+(u4/4-2*u3/3+u2/2)*h*r.m[i]+(-u4/2+u3)*r.w[i+1]+(u4/4-u3/3)*h*r.m[i+1])
}

// MaxAccel returns the largest |dOmega/dt| of the interpolant, in rad/s^2.
// On each row interval the PCHIP speed is a cubic, so its derivative is a
// quadratic in u = (t - t_i) / h whose extreme is at an end or at its
// vertex; the maximum is exact.
func (r *Tabulated) MaxAccel() float64 {
	var a float64
	for i := 0; i+1 < len(r.t); i++ {
		h := r.t[i+1] - r.t[i]
		// Speed(u) = h00 w0 + h10 h m0 + h01 w1 + h11 h m1; its derivative
		// in u is c2 u^2 + c1 u + c0 with
		d := r.w[i+1] - r.w[i]
		c0 := h * r.m[i]
		c1 := 6*d - h*(4*r.m[i]+2*r.m[i+1])
		c2 := -6*d + 3*h*(r.m[i]+r.m[i+1])
		deriv := func(u float64) float64 { return math.Abs(c2*u*u+c1*u+c0) / h }
		a = math.Max(a, math.Max(deriv(0), deriv(1)))
		if c2 != 0 {
			if u := -c1 / (2 * c2); u > 0 && u < 1 {
				a = math.Max(a, deriv(u))
			}
		}
	}
	return a
}

// TimeScaleS returns |Omega_0| / max |dOmega/dt|, the time the ramp's
// steepest stretch would take to reach the cruise speed Omega_0. For a
// sin^2 ramp of duration tau it is 2 tau / pi; a table with one steep row
// has a time scale far below its duration, and AutoNumerics resolves it
// (docs/model.md, Numerics).
func (r *Tabulated) TimeScaleS() float64 {
	a := r.MaxAccel()
	if a == 0 {
		return r.Duration()
	}
	return math.Abs(r.w[len(r.w)-1]) / a
}
