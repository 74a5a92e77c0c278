package present

import (
	"bytes"
	"strings"
	"testing"

	"rampart/mc"
	"rampart/sim"
)

// TestFixedNoNegativeZero checks that a value rounding to zero prints
// without a sign (a table must not show "-0.000"), while real negatives
// keep theirs.
func TestFixedNoNegativeZero(t *testing.T) {
	for _, c := range []struct {
		x    float64
		n    int
		want string
	}{
		{-0.0001, 3, "0.000"}, // rounds to zero
		{-0.0, 2, "0.00"},     // negative zero
		{-0.4, 0, "0"},        // rounds to zero, no decimals
		{-0.0006, 3, "-0.001"},
		{0.25, 2, "0.25"},
		{-12.5, 1, "-12.5"},
	} {
		if got := Fixed(c.x, c.n); got != c.want {
			t.Errorf("Fixed(%v, %d) = %q, want %q", c.x, c.n, got, c.want)
		}
	}
}

// TestSobolGridClips checks that Sobol' indices, shares of a variance in
// [0, 1] (Saltelli et al., Comput. Phys. Commun. 181, 259 (2010)), print
// clipped to it: an estimate outside is marked "*", an interval wholly
// outside "!", and no cell shows a negative number.
func TestSobolGridClips(t *testing.T) {
	rep := SensitivityReport{Shots: 40, BaseRows: 10, Indices: mc.SobolResult{Confidence: 0.95, Inputs: []mc.SobolInput{{
		Name:          "timing.skew_ns",
		ContrastFirst: mc.Interval{Value: -0.0002, Lo: -0.05, Hi: 0.04},
		ContrastTotal: mc.Interval{Value: 1.08, Lo: 0.9, Hi: 1.2},
		BiasFirst:     mc.Interval{Value: -0.2, Lo: -0.3, Hi: -0.1},
		BiasTotal:     mc.Interval{Value: 0.5, Lo: 0.4, Hi: 0.6},
	}}}}
	var buf bytes.Buffer
	if err := sobolGrid(rep).Render(&buf); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	for _, want := range []string{"0.000*", "[0.000, 0.040]", "1.000*", "[0.900, 1.000]", "[0.000, 0.000]!", "0.500 ", "[0.400, 0.600] "} {
		if !strings.Contains(out, want) {
			t.Errorf("table lacks %q:\n%s", want, out)
		}
	}
	if strings.Contains(out, "-0") || strings.Contains(out, "1.080") {
		t.Errorf("table shows a value outside [0, 1]:\n%s", out)
	}
}

// TestAmount checks the budget's amounts: a relative error in %, ppm or
// ppb by its size (never "2e-06 %"), any other source in its lab unit.
func TestAmount(t *testing.T) {
	depth, _ := mc.LookupSource(mc.ParamDepthCommon)
	skew, _ := mc.LookupSource(mc.ParamSkew)
	temp, _ := mc.LookupSource(mc.SourceTemperature)
	for _, c := range []struct {
		s    mc.Source
		si   float64
		want string
	}{
		{depth, 0.01, "1 %"},
		{depth, 1e-3, "0.1 %"},
		{depth, 2e-6, "2 ppm"},
		{depth, 2e-8, "20 ppb"},
		{skew, 20e-9, "20 ns"},
		{temp, 5e-9, "5 nK"},
	} {
		if got := Amount(c.s, c.si); got != c.want {
			t.Errorf("Amount(%s, %g) = %q, want %q", c.s.Key, c.si, got, c.want)
		}
	}
}

// TestClampNote checks the note on temperature draws clamped at 0 K: the
// probability of a draw below 0 K is Phi(-T/sigma) (Phi(-4) = 3.167e-05,
// Abramowitz & Stegun, Handbook of Mathematical Functions, table 26.1),
// and there is no note when 0 K lies beyond 5 sigma.
func TestClampNote(t *testing.T) {
	for _, c := range []struct {
		tK, sK float64
		want   string
	}{
		{20e-9, 5e-9, "Temperature draws below 0 K (start 20 nK, spread 5 nK: probability 3.2e-05 per shot) are clamped at 0 K."},
		{20e-9, 3.9e-9, ""}, // 0 K is 5.1 sigma away
		{20e-9, 0, ""},
	} {
		if got := ClampNote(sim.Config{TemperatureK: c.tK}, mc.Budget{TemperatureSpreadK: c.sK}); got != c.want {
			t.Errorf("ClampNote(T %g, sigma %g) = %q, want %q", c.tK, c.sK, got, c.want)
		}
	}
}

// TestDerivativeRounding: a derivative whose difference over the step is
// below the rounding floor reads "rounding" (a new user read 8.88e-16 as a
// contrast change), an exact zero stays zero, a real change keeps its
// digits, and the note appears only when a cell says rounding.
func TestDerivativeRounding(t *testing.T) {
	rep := SensitivityReport{ScaleFactorS: 1, Derivatives: []mc.Derivative{
		{Input: "a", Step: 1e-6, Unit: "relative", Contrast: 3.8e-7, ContrastSecond: 1.57e3, BiasRad: 799},
		{Input: "b", Step: 1, Unit: "ppm", Contrast: 0, ContrastSecond: 8.9e-16, BiasRad: 0},
	}}
	cells := derivativeGrid(rep).Table().Rows
	if got := cells[0][3]; got != "3.80e-07" {
		t.Errorf("a: dC/dx %q, want 3.80e-07 (change 3.8e-13, above the floor)", got)
	}
	if got := cells[1][4]; got != belowRounding {
		t.Errorf("b: d2C/dx2 %q, want %q", got, belowRounding)
	}
	if got := cells[1][3]; got != "0.00e+00" {
		t.Errorf("b: exact zero dC/dx %q, want 0.00e+00", got)
	}
	var w bytes.Buffer
	if err := PrintSensitivity(&w, rep); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(w.String(), roundingNote) {
		t.Errorf("no rounding note:\n%s", w.String())
	}
	rep.Derivatives = rep.Derivatives[:1]
	w.Reset()
	if err := PrintSensitivity(&w, rep); err != nil {
		t.Fatal(err)
	}
	if strings.Contains(w.String(), roundingNote) {
		t.Errorf("rounding note without a rounding cell:\n%s", w.String())
	}
}
