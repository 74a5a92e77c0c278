package design

import (
	"context"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"rampart/mc"
	"rampart/scenario"
	"rampart/stats"
)

const demo = "../testdata/demo/demo.toml"

// configs loads the demo at each point of the axes: its configuration
// and its apparatus's noise-free shot, as rampart scan does.
func configs(t testing.TB, axes []Axis, sets ...string) ([]Point, []NominalShot) {
	t.Helper()
	pts, err := Grid(axes)
	if err != nil {
		t.Fatal(err)
	}
	shots := make([]NominalShot, len(pts))
	for i, p := range pts {
		sc, cfg, err := scenario.LoadConfig(demo, append(slices.Clone(sets), p.Sets...))
		if err != nil {
			t.Fatal(err)
		}
		app, err := sc.Apparatus()
		if err != nil {
			t.Fatal(err)
		}
		shots[i] = NominalShot{Config: cfg, Apparatus: app}
	}
	return pts, shots
}

// TestScanNominalSagnac scans the background rotation: the phase of the
// nominal shot must grow as K Omega with the Sagnac scale factor
//
//	K = 2 I phi(T) / hbar = 4 pi m R^2 / hbar   (one lap, phi(T) = 2 pi),
//
// computed here from CODATA 2018 constants (hbar = 1.054571817e-34 J s, u =
// 1.66053906660e-27 kg) and the demo's mass (86.909180520 u, AME2016) and
// radius (5 um): K = 0.429921 s. The phase at zero rotation is the demo
// apparatus's bias (its tilted ring leaves the 150 us sin2 ramp's excited
// packets 7.9e-6 rad; docs/model.md, Perturbations), the same at every
// Omega: phase(Omega) - phase(0) = K Omega to the numerics' level
// (docs/model.md, Numerics: phase 1e-6 rad). The scan's results do not
// depend on the number of workers.
func TestScanNominalSagnac(t *testing.T) {
	axis := Axis{"motion.rotation_rad_s", []float64{0, 1e-3, 2e-3, 4e-3}}
	_, cfgs := configs(t, []Axis{axis})
	one, err := ScanNominal(context.Background(), cfgs, 1, nil)
	if err != nil {
		t.Fatal(err)
	}
	calls := 0
	two, err := ScanNominal(context.Background(), cfgs, 2, func() { calls++ })
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(one, two) || calls != len(cfgs) {
		t.Fatalf("1 worker %v, 2 workers %v (%d progress calls): want the same, %d calls", one, two, calls, len(cfgs))
	}
	const hbar, u = 1.054571817e-34, 1.66053906660e-27
	m, r := 86.909180520*u, 5e-6
	k := 4 * math.Pi * m * r * r / hbar
	bias := one[0].PhaseRad
	if math.Abs(bias) > 2e-5 {
		t.Errorf("phase at zero rotation %.9g rad: the demo's bias is of order 1e-5 rad", bias)
	}
	for i, n := range one {
		want := k * axis.Values[i]
		if math.Abs(n.PhaseRad-bias-want) > 1e-6 {
			t.Errorf("Omega %g: phase - phase(0) = %.9g rad, want K Omega = %.9g (tol 1e-6 abs)", axis.Values[i], n.PhaseRad-bias, want)
		}
		// sin2 never overshoots: the peak is the cruise speed (500 rad/s).
		if math.Abs(n.PeakSpeedRadS-500) > 1e-9 || n.Reverses {
			t.Errorf("peak speed %g (reverses %v), want 500 rad/s", n.PeakSpeedRadS, n.Reverses)
		}
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := ScanNominal(ctx, cfgs, 2, nil); err == nil {
		t.Error("cancelled scan: no error")
	}
}

// TestMetricsOf checks the scan figures against their definitions: the p05
// contrast interval is the exact order-statistic interval
// (stats.QuantileInterval), absent below the size that has one (Wilks 1941:
// a two-sided 95 % interval on the 5th percentile needs both one-sided
// 97.5 % bounds, 72 realisations for the lower one).
func TestMetricsOf(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for _, n := range []int{30, 400} {
		recs := make([]mc.Record, n)
		c := make([]float64, n)
		for i := range recs {
			c[i] = 1 - 0.05*rng.Float64()
			recs[i] = mc.Record{Index: i, Contrast: c[i], BiasRad: 1e-5 * rng.NormFloat64()}
		}
		spec := mc.Spec{MinContrast: 0.96}
		s := mc.Summarise(recs, 1, 0, 1, 0.95, spec)
		got := MetricsOf(s)
		slices.Sort(c)
		lo, hi := stats.QuantileInterval(c, 0.05, 0.95)
		switch {
		case lo.OK && hi.OK:
			if got.ContrastP05.CI == nil || got.ContrastP05.CI[0] != lo.Value || got.ContrastP05.CI[1] != hi.Value {
				t.Errorf("n=%d: p05 interval %v, want [%g, %g]", n, got.ContrastP05.CI, lo.Value, hi.Value)
			}
		default:
			if got.ContrastP05.CI != nil || got.ContrastP05.NoBoundBelow == 0 {
				t.Errorf("n=%d: p05 interval %v (no bound below %d), want none", n, got.ContrastP05.CI, got.ContrastP05.NoBoundBelow)
			}
		}
		if got.Yield == nil || got.Yield.Inside != countAtLeast(c, 0.96) {
			t.Errorf("n=%d: yield %v, want %d inside", n, got.Yield, countAtLeast(c, 0.96))
		}
	}
}

func countAtLeast(x []float64, v float64) int {
	k := 0
	for _, e := range x {
		if e >= v {
			k++
		}
	}
	return k
}

// TestCheckPoints checks the points a scan checks by default: the ends and
// the middle of one axis, the corners and centre of an odd grid, the
// corners alone of an even one.
func TestCheckPoints(t *testing.T) {
	grid := func(xs, ys []float64) [][]float64 {
		var out [][]float64
		for _, x := range xs {
			if ys == nil {
				out = append(out, []float64{x})
				continue
			}
			for _, y := range ys {
				out = append(out, []float64{x, y})
			}
		}
		return out
	}
	count := func(b []bool) (n int) {
		for _, v := range b {
			if v {
				n++
			}
		}
		return n
	}
	one := CheckPoints(grid([]float64{1, 2, 3, 4, 5}, nil))
	if want := []bool{true, false, true, false, true}; !slices.Equal(one, want) {
		t.Errorf("5 points: %v, want %v", one, want)
	}
	odd := CheckPoints(grid([]float64{1, 2, 3}, []float64{10, 20, 30}))
	if count(odd) != 5 || !odd[4] || !odd[0] || !odd[8] || odd[1] {
		t.Errorf("3 x 3: %v, want the 4 corners and the centre", odd)
	}
	even := CheckPoints(grid([]float64{1, 2, 3, 4}, []float64{10, 20, 30, 40}))
	if count(even) != 4 || !even[0] || !even[3] || !even[12] || !even[15] {
		t.Errorf("4 x 4: %v, want the 4 corners", even)
	}
}
