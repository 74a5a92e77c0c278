package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// TestShotScatteringRows: shot reports each arm's scattering rate and the
// cloud's factor exp(-(L_+ + L_-)/2) that its contrast includes. The
// factor is checked against the simulation itself: the contrast with the
// lattice's wavelength set (scattering on) over the contrast without it
// (docs/model.md, Perturbations: photon scattering; the shot applies the
// factor in sim, the report computes it from the rates and the duration).
func TestShotScatteringRows(t *testing.T) {
	type shot struct {
		Contrast         float64     `json:"contrast"`
		ScatteringPerS   *[2]float64 `json:"scattering_per_s"`
		ScatteringFactor float64     `json:"scattering_factor"`
	}
	get := func(sets ...string) shot {
		args := []string{"shot", "--scenario", "testdata/demo/demo.toml", "--json"}
		for _, s := range sets {
			args = append(args, "--set", s)
		}
		stdout, stderr, code := execute(t, args...)
		if code != 0 {
			t.Fatalf("exit %d: %s", code, stderr)
		}
		var r shot
		if err := json.Unmarshal([]byte(stdout), &r); err != nil {
			t.Fatal(err)
		}
		return r
	}
	on := get("lattice.polarisation_plus=-1")
	off := get("lattice.wavelength_nm=0")
	if on.ScatteringPerS == nil || !(on.ScatteringPerS[0] > on.ScatteringPerS[1]) {
		t.Fatalf("rates %v: want both arms, the sigma- arm's the larger here", on.ScatteringPerS)
	}
	if off.ScatteringPerS != nil || off.ScatteringFactor != 0 {
		t.Errorf("no scattering: rates %v, factor %g; want none", off.ScatteringPerS, off.ScatteringFactor)
	}
	if got := on.Contrast / off.Contrast; math.Abs(got-on.ScatteringFactor) > 1e-9 {
		t.Errorf("contrast ratio %.12f, reported factor %.12f", got, on.ScatteringFactor)
	}
}

// TestShardCheckedFirst: a malformed --shard is refused before any
// simulation (no physics warning of the nominal shot precedes it), with
// or without --out.
func TestShardCheckedFirst(t *testing.T) {
	for _, extra := range [][]string{nil, {"--out", t.TempDir() + "/sh"}} {
		args := append([]string{"run", "--scenario", "testdata/demo/demo.toml", "--shard", "3/2"}, extra...)
		_, stderr, code := execute(t, args...)
		if code != 2 || !strings.Contains(stderr, `--shard: shard "3/2" is not k/n`) || strings.Contains(stderr, "warning") {
			t.Errorf("%v: exit %d, stderr %q; want 2 and the shard's message alone", args, code, stderr)
		}
	}
}

// TestShotNotCarried: a lattice moved far faster than it can drag the atom
// (3000 rad/s on the benchmark ring, 15 mm/s against a recoil velocity of
// about 6 mm/s for Rb-87 at 780 nm, from memory) leaves it out of the
// moving ground band; shot says so and what to change. The benchmark ramp
// as it is keeps 0.99 and gets no such note.
func TestShotNotCarried(t *testing.T) {
	stdout, _, _ := execute(t, "shot", "--scenario", "testdata/scenarios/benchmark.toml", "--set", "motion.cruise_rad_s=3000")
	if !strings.Contains(stdout, "the lattice does not carry it") {
		t.Errorf("no note on the atom left behind:\n%s", stdout)
	}
	stdout, _, code := execute(t, "shot", "--scenario", "testdata/scenarios/benchmark.toml")
	if code != 0 || strings.Contains(stdout, "does not carry") {
		t.Errorf("benchmark shot: exit %d, or a note it does not need:\n%s", code, stdout)
	}
}
