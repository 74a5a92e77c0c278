package main

import (
	"io"
	"testing"
)

// TestDemoClaims checks what issue 2 asks of the demo, and the README says
// it shows: the smooth ramp is visibly non-adiabatic (contrast below 0.97)
// and the inverse-engineered ramp recovers (above 0.995).
func TestDemoClaims(t *testing.T) {
	d, err := newDemo(env{now: fakeClock()}, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	for _, row := range []struct {
		shape    string
		min, max float64
	}{
		{"sin2", 0, 0.97},
		{"inverse", 0.995, 1},
	} {
		sc, cfg, err := d.variant(row.shape)
		if err != nil {
			t.Fatal(err)
		}
		run, err := simulate(d.env, sc, cfg, nil)
		if err != nil {
			t.Fatal(err)
		}
		if c := run.result.Contrast; c < row.min || c > row.max {
			t.Errorf("%s: contrast %.5f, want between %g and %g", row.shape, c, row.min, row.max)
		}
	}
}
