package main

import (
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"rampart/sim"
)

// TestDemoClaims checks what the project's issues ask of the demo, and the
// README says it shows: the smooth ramp is visibly non-adiabatic (contrast
// below 0.97) while the inverse-engineered ramp and the optimiser's table
// recover (above 0.995).
func TestDemoClaims(t *testing.T) {
	d, err := newDemo(env{now: fakeClock()}, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	for i, want := range []struct{ min, max float64 }{{0, 0.97}, {0.995, 1}, {0.995, 1}} {
		sc, cfg, err := d.variant(i)
		if err != nil {
			t.Fatal(err)
		}
		run, err := simulate(d.env, sc, cfg, nil)
		if err != nil {
			t.Fatal(err)
		}
		// The ramp's own contrast: the photon scattering of the demo's
		// lattice costs every ramp alike, the factor exp(-(L_+ + L_-)/2)
		// on z (docs/model.md, Perturbations), which is divided out.
		s, err := sim.NewSimulator(run.Config)
		if err != nil {
			t.Fatal(err)
		}
		base, err := sc.Apparatus()
		if err != nil {
			t.Fatal(err)
		}
		l := s.ScatteringMeans(base)
		if c := run.Result.Contrast / math.Exp(-(l[0]+l[1])/2); c < want.min || c > want.max {
			t.Errorf("%s: contrast %.5f, want between %g and %g", demoRamps[i].name, c, want.min, want.max)
		}
	}
}

// TestDemoGolden runs the whole demo on small ensembles (the default sizes
// take about 20 s) and pins its output; the report it writes must hold the
// ranking, the tolerance curves and the dynamics.
func TestDemoGolden(t *testing.T) {
	dir := t.TempDir()
	stdout, stderr, code := execute(t, "demo", "--samples", "100", "--tolerance-samples", "80", "--report", dir)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	golden(t, "demo.txt", strings.ReplaceAll(stdout, dir, "DIR"))
	page, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(page), "Edge of ramp.duration_us against spec") {
		t.Error("demo report lacks the design stage's section")
	}
	for _, id := range []string{"drive", "dynamics-offset-up", "ranking", "rank-sin2-contrast", "rank-optimal-bias", "tolerance-timing-skew_ns", "tolerance-depth-common_rel", "response-phase-common", "response-mask-phase"} {
		if !strings.Contains(string(page), `id="`+id+`"`) {
			t.Errorf("demo report lacks figure %q", id)
		}
	}
	for _, want := range []string{"1. One noise-free shot", "2. The three ramps", "3. The winner", "4. Hardware tolerances", "5. Which noise frequencies matter", "6. Designing the ramp", "The smallest ramp.duration_us that meets spec", "7. The report: DIR/report.html"} {
		if !strings.Contains(strings.ReplaceAll(stdout, dir, "DIR"), want) {
			t.Errorf("demo output lacks %q", want)
		}
	}
}

// TestDemoStoryFigures keeps the apparatus figures the demo's story
// quotes (testdata/demo/demo.toml) in step with the library: the pair's
// 0.93 Hz/G and 431 Hz/G^2 at 3.23 G (Breit-Rabi), 0.47 scattered photons
// per second at 785 nm and 20 kHz (Grimm et al. 2000), and about 0.6 % of
// the atoms scattering during a shot, 1 - exp(-L), each to the digits
// quoted.
func TestDemoStoryFigures(t *testing.T) {
	d, err := newDemo(env{now: fakeClock()}, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	sc, cfg, err := d.variant(2)
	if err != nil {
		t.Fatal(err)
	}
	z, err := sc.Zeeman()
	if err != nil {
		t.Fatal(err)
	}
	rate := sc.ScatteringRates()
	s, err := sim.NewSimulator(cfg)
	if err != nil {
		t.Fatal(err)
	}
	base, err := sc.Apparatus()
	if err != nil {
		t.Fatal(err)
	}
	l := s.ScatteringMeans(base)
	lost := 1 - math.Exp(-l[0])
	for _, c := range []struct {
		name      string
		got, want float64
		digits    float64 // half a unit of the last digit quoted
	}{
		{"linear Zeeman, Hz/G", z.LinearHzPerG, 0.93, 0.005},
		{"quadratic Zeeman, Hz/G^2", z.QuadraticHzPerG2, 431, 0.5},
		{"scattering, 1/s", rate[0], 0.47, 0.005},
		{"atoms scattering in a shot, %", 100 * lost, 0.6, 0.05},
	} {
		if math.Abs(c.got-c.want) > c.digits {
			t.Errorf("%s: %g, the story says %g", c.name, c.got, c.want)
		}
	}
}
