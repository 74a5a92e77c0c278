package main

import (
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
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
		if c := run.Result.Contrast; c < want.min || c > want.max {
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
	for _, id := range []string{"drive", "dynamics-offset-up", "ranking", "rank-sin2-contrast", "rank-optimal-bias", "tolerance-timing-skew_ns", "tolerance-depth-common_rel", "response-phase-common", "response-mask-phase"} {
		if !strings.Contains(string(page), `id="`+id+`"`) {
			t.Errorf("demo report lacks figure %q", id)
		}
	}
	for _, want := range []string{"1. One noise-free shot", "2. The three ramps", "3. The winner", "4. Hardware tolerances", "5. Which noise frequencies matter", "6. The report: DIR/report.html"} {
		if !strings.Contains(strings.ReplaceAll(stdout, dir, "DIR"), want) {
			t.Errorf("demo output lacks %q", want)
		}
	}
}

// TestDemoDefaultsDecide checks that the demo's default options pass its own
// check: the README's first command runs with no flags.
func TestDemoDefaultsDecide(t *testing.T) {
	d, err := newDemo(env{}, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	cmd := newDemoCmd(env{})
	if err := cmd.ParseFlags(nil); err != nil {
		t.Fatal(err)
	}
	if v, err := cmd.Flags().GetInt("tolerance-samples"); err != nil || v != d.opts.toleranceSamples {
		t.Fatalf("--tolerance-samples default %d (%v), newDemo's %d", v, err, d.opts.toleranceSamples)
	}
	if err := d.check(); err != nil {
		t.Errorf("the demo's defaults are refused: %v", err)
	}
}
