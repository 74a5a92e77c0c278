package sim

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
)

// TestSequenceGeometry checks a sequence built from laps (docs/model.md,
// Interferometer and signs): total angle 2 pi laps, the cruise lasting what the laps need,
// (2 pi laps - Omega_0 t_r) / Omega_0 since the two ramps turn Omega_0 t_r
// together, the ramp-down the time mirror of the ramp-up, and Angle the
// integral of Speed over the whole sequence.
func TestSequenceGeometry(t *testing.T) {
	const tr, w0 = 150e-6, 500.0
	ramps := append(testRamps(tr), mustTabulatedSin2(t, tr, w0))
	for _, up := range ramps {
		for _, laps := range []float64{0.5, 1, 7.5} {
			t.Run(fmt.Sprintf("%s_laps%g", up.Name(), laps), func(t *testing.T) {
				seq, err := NewSequence(up, laps)
				if err != nil {
					t.Fatal(err)
				}
				total := 2 * math.Pi * laps
				const tol = 1e-13 // relative: round-off
				if got := seq.TotalAngle(); math.Abs(got/total-1) > tol {
					t.Errorf("TotalAngle: got %v, want %v (tol %g)", got, total, tol*total)
				}
				wantCruise := (total - w0*tr) / w0
				if got := seq.CruiseS; math.Abs(got-wantCruise) > tol*total/w0 {
					t.Errorf("CruiseS: got %v, want %v (tol %g)", got, wantCruise, tol*total/w0)
				}
				T := seq.Duration()
				if got := 2*tr + wantCruise; math.Abs(T-got) > tol*T {
					t.Errorf("Duration: got %v, want %v (tol %g)", T, got, tol*T)
				}
				if got := seq.Angle(T); math.Abs(got/total-1) > tol {
					t.Errorf("Angle(T): got %v, want %v (tol %g)", got, total, tol*total)
				}
				if seq.Speed(-1e-9) != 0 || seq.Speed(T+1e-9) != 0 || seq.Angle(-1) != 0 || seq.Angle(2*T) != seq.TotalAngle() {
					t.Errorf("outside [0, T]: speeds %v, %v and angles %v, %v, want 0, 0, 0 and the total",
						seq.Speed(-1e-9), seq.Speed(T+1e-9), seq.Angle(-1), seq.Angle(2*T))
				}
				// Mirror symmetry, and continuity at the joins.
				for i := range 200 {
					x := T * (float64(i) + 0.3) / 200
					if a, b := seq.Speed(x), seq.Speed(T-x); math.Abs(a-b) > tol*w0 {
						t.Errorf("mirror: Speed(%g) = %v, Speed(T - t) = %v (tol %g)", x, a, b, tol*w0)
					}
					if a, b := seq.Angle(x), total-seq.Angle(T-x); math.Abs(a-b) > tol*total {
						t.Errorf("mirror: Angle(%g) = %v, total - Angle(T - t) = %v (tol %g)", x, a, b, tol*total)
					}
				}
				for _, join := range []float64{tr, T - tr} {
					const eps = 1e-15 // s: both sides of the join
					if a, b := seq.Speed(join-eps), seq.Speed(join+eps); math.Abs(a-b) > 1e-6*w0 {
						t.Errorf("Speed jumps at %g: %v to %v", join, a, b)
					}
				}
				// Angle is the integral of Speed: 4-point Gauss-Legendre on
				// 40 panels per ramp (the table's rows, where its cubic
				// pieces join; ~(pi/80)^8 relative error for sin2) and one
				// panel for the constant cruise.
				var panels []float64
				for i := range 41 {
					panels = append(panels, tr*float64(i)/40)
				}
				for i := range 41 {
					panels = append(panels, T-tr+tr*float64(i)/40)
				}
				var acc float64
				for i := 1; i < len(panels); i++ {
					acc += quad.Fixed(seq.Speed, panels[i-1], panels[i], 4, quad.Legendre{}, 0)
					tolQ := 1e-12 * total // absolute: round-off
					if got := seq.Angle(panels[i]); math.Abs(got-acc) > tolQ {
						t.Errorf("Angle(%g): got %v, want the integral %v (tol %g)", panels[i], got, acc, tolQ)
					}
				}
			})
		}
	}
}

func mustTabulatedSin2(t *testing.T, tr, w0 float64) Ramp {
	t.Helper()
	const rows = 41
	sin2 := Sin2{DurationS: tr, CruiseRadS: w0}
	ts, ws := make([]float64, rows), make([]float64, rows)
	for i := range rows {
		ts[i] = tr * float64(i) / (rows - 1)
		ws[i] = sin2.Speed(ts[i])
	}
	r, err := NewTabulated("table", ts, ws, w0)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// TestNewSequenceErrors checks the refusals of NewSequence.
func TestNewSequenceErrors(t *testing.T) {
	tests := []struct {
		name string
		up   Ramp
		laps float64
		want string
	}{
		{"ramps exceed laps", Sin2{DurationS: 0.1, CruiseRadS: 500}, 1, "the two ramps alone turn each arm by 7.95775 turns, more than laps = 1: raise laps, lower the cruise speed or shorten the ramp"}, // 2 x 500 rad/s * 0.1 s / 2 / (2 pi)
		{"zero laps", Sin2{DurationS: 1e-4, CruiseRadS: 500}, 0, "laps = 0"},
		{"negative cruise", Sin2{DurationS: 1e-4, CruiseRadS: -500}, 1, "must be positive"},
		{"infinite laps", Sin2{DurationS: 1e-4, CruiseRadS: 500}, math.Inf(1), "positive finite"},
	}
	for _, tt := range tests {
		_, err := NewSequence(tt.up, tt.laps)
		if err == nil || !strings.Contains(err.Error(), tt.want) {
			t.Errorf("%s: got error %v, want one containing %q", tt.name, err, tt.want)
		}
	}
	// The ramps may use up all the laps exactly: no cruise.
	up := Sin2{DurationS: 2 * math.Pi / 500, CruiseRadS: 500}
	seq, err := NewSequence(up, 1)
	if err != nil {
		t.Fatalf("ramps turning exactly the laps: %v", err)
	}
	if seq.CruiseS != 0 {
		t.Errorf("CruiseS: got %v, want %v (tol 0)", seq.CruiseS, 0.0)
	}
}

// TestCheckClosure checks the closure rule of docs/model.md, Interferometer and signs: the
// arms at +phi and -phi meet only if 2 phi(T) is a multiple of 2 pi, and
// otherwise the error says how many sites apart they end (2 laps N mod N,
// the shorter way round) and which laps would close.
func TestCheckClosure(t *testing.T) {
	tests := []struct {
		laps         float64
		sites        int
		apart        float64 // site spacings
		lower, upper float64
	}{
		{0.5, 20, 0, 0, 0},
		{1, 20, 0, 0, 0},
		{37.5, 7, 0, 0, 0},
		{1 + 1e-12, 20, 0, 0, 0}, // round-off in a computed laps is accepted
		{0.3, 20, 8, 0.5, 1},     // 2 laps = 0.6 turns = 12 sites, 8 the other way; no positive closing value below
		{1.25, 20, 10, 1, 1.5},   // half a ring apart
		{2.1, 20, 4, 2, 2.5},     // 4.2 turns: 0.2 turn = 4 sites
		{0.26, 7, 3.36, 0.5, 1},  // 0.52 turns of 7 sites = 3.64 sites, 3.36 the other way
		{3.05, 10, 1, 3, 3.5},    // 6.1 turns: 1 site
	}
	for _, tt := range tests {
		err := CheckClosure(tt.laps, tt.sites)
		if tt.apart == 0 {
			if err != nil {
				t.Errorf("laps %g, %d sites: got %v, want no error", tt.laps, tt.sites, err)
			}
			continue
		}
		var ce *ClosureError
		if !errors.As(err, &ce) {
			t.Errorf("laps %g, %d sites: got %v, want a *ClosureError", tt.laps, tt.sites, err)
			continue
		}
		const tol = 1e-9 // absolute, site spacings: round-off of 2 laps N
		if math.Abs(ce.SitesApart-tt.apart) > tol {
			t.Errorf("laps %g, %d sites: SitesApart got %v, want %v (tol %g)", tt.laps, tt.sites, ce.SitesApart, tt.apart, tol)
		}
		if ce.Lower != tt.lower || ce.Upper != tt.upper || ce.Laps != tt.laps || ce.Sites != tt.sites {
			t.Errorf("laps %g, %d sites: got %+v, want Lower %v Upper %v", tt.laps, tt.sites, *ce, tt.lower, tt.upper)
		}
		for _, part := range []string{fmt.Sprint(tt.lower), fmt.Sprint(tt.upper), "sites apart"} {
			if !strings.Contains(ce.Error(), part) {
				t.Errorf("laps %g: message %q does not mention %q", tt.laps, ce.Error(), part)
			}
		}
	}
}

// TestNewSimulatorRefusesOpenSequence checks that a sequence whose arms end
// in different sites is refused before any propagation, with the typed
// error.
func TestNewSimulatorRefusesOpenSequence(t *testing.T) {
	up := Sin2{DurationS: 150e-6, CruiseRadS: 500}
	seq, err := NewSequence(up, 1.3)
	if err != nil {
		t.Fatal(err)
	}
	_, err = NewSimulator(Config{Ring: rb87Ring(20, 5e-6), DepthHz: 20e3, Sequence: seq})
	var ce *ClosureError
	if !errors.As(err, &ce) {
		t.Fatalf("got %v, want a *ClosureError", err)
	}
	const want, tol = 8, 1e-9 // 2 laps = 2.6 turns: 0.6 turn = 12 sites one way, 8 the other; tol absolute, round-off
	if math.Abs(ce.SitesApart-want) > tol {
		t.Errorf("SitesApart: got %v, want %v (tol %g)", ce.SitesApart, want, tol)
	}
}
