package main

import (
	"io"
	"reflect"
	"testing"
)

// TestDesignFlagsParse checks the flags of scan, edge and robust apart from
// running them, as TestFlagsParse does for the other commands.
func TestDesignFlagsParse(t *testing.T) {
	e := env{}
	t.Run("scan", func(t *testing.T) {
		var got scanOptions
		cmd := newScanCmd(e, func(_ env, _, _ io.Writer, o scanOptions) error { got = o; return nil })
		if err := parse(t, cmd, "--scenario", "s.toml", "--set", "motion.laps=2", "--vary", "ramp.duration_us=50:300:6",
			"--vary", "lattice.depth_khz=10,20", "--ensemble", "--spec", "p.toml", "--samples", "80", "--seed", "4", "--out", "D", "--json"); err != nil {
			t.Fatal(err)
		}
		ens := defaultEnsemble(200)
		ens.samples, ens.seed, ens.out = 80, 4, "D"
		want := scanOptions{scenario: "s.toml", sets: []string{"motion.laps=2"}, vary: []string{"ramp.duration_us=50:300:6", "lattice.depth_khz=10,20"},
			ensemble: true, spec: "p.toml", ens: ens, json: true}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("got %+v\nwant %+v", got, want)
		}
	})
	t.Run("edge", func(t *testing.T) {
		var got edgeOptions
		var given bool
		cmd := newEdgeCmd(e, func(_ env, _, _ io.Writer, o edgeOptions, c bool) error { got, given = o, c; return nil })
		if err := parse(t, cmd, "--scenario", "s.toml", "--spec", "p.toml", "--key", "ramp.duration_us", "--range", "100:400",
			"--steps", "4", "--largest", "--samples", "300", "--confidence", "0.9", "--resume", "D"); err != nil {
			t.Fatal(err)
		}
		ens := defaultEnsemble(400)
		ens.samples, ens.confidence, ens.resume = 300, 0.9, "D"
		want := edgeOptions{scenario: "s.toml", key: "ramp.duration_us", span: "100:400", steps: 4, largest: true, spec: "p.toml", ens: ens}
		if !reflect.DeepEqual(got, want) || !given {
			t.Errorf("got %+v (confidence given %v)\nwant %+v", got, given, want)
		}
	})
	t.Run("robust", func(t *testing.T) {
		var got robustOptions
		cmd := newRobustCmd(e, func(_ env, _, _ io.Writer, o robustOptions) error { got = o; return nil })
		if err := parse(t, cmd, "--scenario", "s.toml", "--write", "r.csv", "--terms", "10", "--evals", "150", "--objective", "mean-kstd",
			"--k", "3", "--fresh-samples", "500", "--fresh-seed", "9", "--ramp", "a=inverse", "--history", "h.csv"); err != nil {
			t.Fatal(err)
		}
		want := robustOptions{scenario: "s.toml", samples: 200, seed: 1, sampler: "random", confidence: 0.95, terms: 10, evals: 150, step: 0.05,
			objective: "mean-kstd", k: 3, weight: 100, freshSamples: 500, freshSeed: 9, ramps: []string{"a=inverse"}, write: "r.csv", history: "h.csv"}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("got %+v\nwant %+v", got, want)
		}
	})
}
