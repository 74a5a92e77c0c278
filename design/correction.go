package design

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"

	"gonum.org/v1/gonum/integrate/quad"

	"rampart/internal/plural"
	"rampart/sim"
)

// MaxTerms bounds the correction basis: 12 terms reach 6 periods over the
// ramp, finer than any ramp a lattice can follow, and keep the angle's
// quadrature exact to round-off (see Corrected.Angle).
const MaxTerms = 12

// Corrected is a reference ramp-up plus a smooth correction,
//
//	Omega(t) = Omega_ref(t) + Omega_0 sum_k c_k phi_k(s),   s = t / t_r,
//
// with the basis
//
//	phi_{2j-1}(s) = B(s) sin(2 pi j s),
//	phi_{2j}(s)   = B(s) (cos(2 pi j s) - m_j),   B(s) = 64 s^3 (1 - s)^3,
//
// m_j = int B cos(2 pi j s) ds / int B ds. B and its first two derivatives
// vanish at both ends, so the correction keeps the reference's boundary
// values: speed 0 at t = 0, the cruise speed Omega_0 at t_r, and the
// speed's first and second derivatives there (a reference continuous in
// acceleration and jerk stays so). Every phi_k integrates to zero over the
// ramp (sin by the symmetry of B about s = 1/2, cos by m_j), so the ramp
// angle, and with it the cruise time and the closure of the sequence
// (sim.CheckClosure), are those of the reference. B peaks at 1, so c_k is
// the largest speed change of a term in units of the cruise speed.
type Corrected struct {
	Ref   sim.Ramp
	Coef  []float64
	Label string // Name; "corrected" if empty
	means []float64
}

// NewCorrected returns the reference ramp with the correction coef (at most
// MaxTerms coefficients).
func NewCorrected(ref sim.Ramp, coef []float64, label string) (*Corrected, error) {
	if len(coef) > MaxTerms {
		return nil, fmt.Errorf("%s: at most %d", plural.Count(len(coef), "correction term"), MaxTerms)
	}
	for i, c := range coef {
		if math.IsNaN(c) || math.IsInf(c, 0) {
			return nil, fmt.Errorf("correction coefficient %d is %g: want a finite number", i+1, c)
		}
	}
	r := &Corrected{Ref: ref, Coef: append([]float64(nil), coef...), Label: label}
	r.means = make([]float64, (len(coef)+1)/2)
	const intB = 64.0 / 140 // int_0^1 s^3 (1-s)^3 ds = 3! 3! / 7! = 1/140
	for j := range r.means {
		f := func(s float64) float64 { return bump(s) * math.Cos(2*math.Pi*float64(j+1)*s) }
		r.means[j] = quad.Fixed(f, 0, 1, quadNodes, quad.Legendre{}, 0) / intB
	}
	return r, nil
}

// quadNodes is the Gauss-Legendre order of the angle: exact for degree
// 2n - 1 = 95, and for the highest term (B times a trigonometric function of
// frequency 12 pi) the remainder (n!)^4 / ((2n+1) ((2n)!)^3) (12 pi)^(2n) is
// far below round-off.
const quadNodes = 48

func bump(s float64) float64 {
	u := s * (1 - s)
	return 64 * u * u * u
}

// term returns phi_k(s), k = 0, 1, ... (phi_{k+1} of the formula).
func (r *Corrected) term(k int, s float64) float64 {
	j := k/2 + 1
	if k%2 == 0 {
		return bump(s) * math.Sin(2*math.Pi*float64(j)*s)
	}
	return bump(s) * (math.Cos(2*math.Pi*float64(j)*s) - r.means[j-1])
}

func (r *Corrected) correction(s float64) float64 {
	var sum float64
	for k, c := range r.Coef {
		if c != 0 {
			sum += c * r.term(k, s)
		}
	}
	return sum
}

func (r *Corrected) Duration() float64 { return r.Ref.Duration() }

func (r *Corrected) Name() string {
	if r.Label == "" {
		return "corrected"
	}
	return r.Label
}

func (r *Corrected) cruise() float64 { return sim.Cruise(r.Ref) }

func (r *Corrected) Speed(t float64) float64 {
	d := r.Duration()
	s := min(max(t/d, 0), 1)
	return r.Ref.Speed(t) + r.cruise()*r.correction(s)
}

// Angle is the reference's angle plus the correction's integral, by
// Gauss-Legendre quadrature of quadNodes nodes (exact to round-off, see
// quadNodes); at t_r it is the reference's.
func (r *Corrected) Angle(t float64) float64 {
	d := r.Duration()
	s := min(max(t/d, 0), 1)
	a := r.Ref.Angle(t)
	if s == 0 || s == 1 {
		return a
	}
	return a + r.cruise()*d*quad.Fixed(r.correction, 0, s, quadNodes, quad.Legendre{}, 0)
}

// RampRows is the number of rows WriteRamp writes by default: the PCHIP
// interpolant through 2001 rows follows a smooth ramp to about 1e-9 of its
// speed scale (fourth order in the row spacing).
const RampRows = 2001

// WriteRamp writes the ramp-up r as a ramp file (docs/model.md, Ramp shapes:
// file): a header t_s,omega_rad_s and rows evenly spaced in time from t = 0
// to t_r, the first speed 0 and the last the cruise speed, exactly as the
// scenario's ramp reader wants them.
func WriteRamp(w io.Writer, r sim.Ramp, rows int) error {
	if rows < 2 {
		panic("design: WriteRamp of fewer than 2 rows")
	}
	bw := bufio.NewWriter(w)
	fmt.Fprintln(bw, "t_s,omega_rad_s")
	d := r.Duration()
	for i := range rows {
		t := d * float64(i) / float64(rows-1)
		v := r.Speed(t)
		switch i {
		case 0:
			t, v = 0, 0
		case rows - 1:
			t, v = d, sim.Cruise(r)
		}
		fmt.Fprintf(bw, "%s,%s\n", strconv.FormatFloat(t, 'g', 17, 64), strconv.FormatFloat(v, 'g', 17, 64))
	}
	return bw.Flush()
}
