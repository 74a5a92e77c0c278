package main

import (
	"bytes"
	"io"
	"reflect"
	"strings"
	"testing"

	"github.com/spf13/cobra"
)

// parse runs cmd on args with its run function replaced by one that only
// records that it ran, and returns the error.
func parse(t *testing.T, cmd *cobra.Command, args ...string) error {
	t.Helper()
	cmd.SetArgs(args)
	cmd.SetOut(io.Discard)
	cmd.SetErr(io.Discard)
	return cmd.Execute()
}

// defaultEnsemble is the ensemble flags' defaults with samples n.
func defaultEnsemble(n int) ensembleOptions {
	return ensembleOptions{samples: n, seed: 1, sampler: "random", confidence: 0.95}
}

// TestFlagsParse checks, command by command, that the flags land in the
// options struct the run function receives, without running anything.
func TestFlagsParse(t *testing.T) {
	e := env{}
	t.Run("run", func(t *testing.T) {
		var got runOptions
		cmd := newRunCmd(e, func(_ env, _, _ io.Writer, o runOptions) error { got = o; return nil })
		if err := parse(t, cmd, "--scenario", "s.toml", "--set", "ring.sites=10", "--set", "motion.laps=2",
			"--samples", "12", "--seed", "5", "--sampler", "lhs", "--workers", "3", "--out", "D", "--shard", "2/4",
			"--confidence", "0.9", "--min-contrast", "0.8", "--max-bias-rad", "0.01", "--json", "--report", "R",
			"--atoms", "1e5", "--cycle-s", "0.5"); err != nil {
			t.Fatal(err)
		}
		want := runOptions{scenario: "s.toml", sets: []string{"ring.sites=10", "motion.laps=2"},
			ens:         ensembleOptions{samples: 12, seed: 5, workers: 3, sampler: "lhs", out: "D", shard: "2/4", confidence: 0.9},
			minContrast: 0.8, maxBiasRad: 0.01, json: true, report: "R", readout: readoutOptions{atoms: 1e5, cycleS: 0.5}}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("got %+v\nwant %+v", got, want)
		}
	})
	t.Run("run defaults", func(t *testing.T) {
		var got runOptions
		cmd := newRunCmd(e, func(_ env, _, _ io.Writer, o runOptions) error { got = o; return nil })
		if err := parse(t, cmd, "--scenario", "s.toml"); err != nil {
			t.Fatal(err)
		}
		if want := (runOptions{scenario: "s.toml", ens: defaultEnsemble(1000)}); !reflect.DeepEqual(got, want) {
			t.Errorf("got %+v\nwant %+v", got, want)
		}
	})
	t.Run("rank", func(t *testing.T) {
		var got rankOptions
		var gotFiles []string
		cmd := newRankCmd(e, func(_ env, _, _ io.Writer, o rankOptions, files []string) error { got, gotFiles = o, files; return nil })
		if err := parse(t, cmd, "--scenario", "s.toml", "--ramp", "a=sin2", "--ramp", "b=inverse:18", "--metric", "contrast_mean", "x.toml", "y.toml"); err != nil {
			t.Fatal(err)
		}
		if want := []string{"a=sin2", "b=inverse:18"}; !reflect.DeepEqual(got.ramps, want) || got.metric != "contrast_mean" || got.scenario != "s.toml" {
			t.Errorf("got ramps %q, metric %q, scenario %q", got.ramps, got.metric, got.scenario)
		}
		if want := []string{"x.toml", "y.toml"}; !reflect.DeepEqual(gotFiles, want) {
			t.Errorf("files %q, want %q", gotFiles, want)
		}
	})
	t.Run("qualify confidence given or not", func(t *testing.T) {
		for _, tt := range []struct {
			args  []string
			given bool
			conf  float64
		}{
			{[]string{"--scenario", "s.toml", "--spec", "q.toml"}, false, 0.95},
			{[]string{"--scenario", "s.toml", "--spec", "q.toml", "--confidence", "0.99"}, true, 0.99},
		} {
			var got qualifyOptions
			var given bool
			cmd := newQualifyCmd(e, func(_ env, _, _ io.Writer, o qualifyOptions, g bool) error { got, given = o, g; return nil })
			if err := parse(t, cmd, tt.args...); err != nil {
				t.Fatal(err)
			}
			if given != tt.given || got.ens.confidence != tt.conf || got.spec != "q.toml" {
				t.Errorf("%q: confidence %g given %v, spec %q; want %g given %v", tt.args, got.ens.confidence, given, got.spec, tt.conf, tt.given)
			}
		}
	})
	t.Run("tolerance", func(t *testing.T) {
		var got toleranceOptions
		cmd := newToleranceCmd(e, func(_ env, _, _ io.Writer, o toleranceOptions, _ bool) error { got = o; return nil })
		if err := parse(t, cmd, "--scenario", "s.toml", "--spec", "q.toml", "--sources", "timing.skew_ns,depth.rin_db_hz", "--joint", "--precision", "0.1"); err != nil {
			t.Fatal(err)
		}
		want := toleranceOptions{decisionOptions: decisionOptions{scenario: "s.toml", ens: defaultEnsemble(200)},
			spec: "q.toml", sources: "timing.skew_ns,depth.rin_db_hz", joint: true, precision: 0.1, kernels: true}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("got %+v\nwant %+v", got, want)
		}
	})
	t.Run("sensitivity samples sobol", func(t *testing.T) {
		var got sensitivityOptions
		cmd := newSensitivityCmd(e, func(_ env, _, _ io.Writer, o sensitivityOptions) error { got = o; return nil })
		if err := parse(t, cmd, "--scenario", "s.toml", "--base", "64"); err != nil {
			t.Fatal(err)
		}
		if got.base != 64 || got.ens.sampler != "sobol" {
			t.Errorf("base %d, sampler %q; want 64, sobol", got.base, got.ens.sampler)
		}
	})
	t.Run("merge", func(t *testing.T) {
		var gotDirs []string
		var got mergeOptions
		cmd := newMergeCmd(e, func(_ env, _, _ io.Writer, dirs []string, o mergeOptions) error { gotDirs, got = dirs, o; return nil })
		if err := parse(t, cmd, "--out", "ALL", "--min-contrast", "0.5", "D1", "D2"); err != nil {
			t.Fatal(err)
		}
		if want := []string{"D1", "D2"}; !reflect.DeepEqual(gotDirs, want) || got.out != "ALL" || got.minContrast != 0.5 || got.confidence != 0 || got.confidenceGiven {
			t.Errorf("dirs %q, options %+v", gotDirs, got)
		}
	})
	t.Run("shot and ramp", func(t *testing.T) {
		var shot shotOptions
		cmd := newShotCmd(e, func(_ env, _, _ io.Writer, o shotOptions) error { shot = o; return nil })
		if err := parse(t, cmd, "--scenario", "s.toml", "--check", "--trace", "t.csv", "--json"); err != nil {
			t.Fatal(err)
		}
		if want := (shotOptions{scenario: "s.toml", check: true, trace: "t.csv", json: true}); !reflect.DeepEqual(shot, want) {
			t.Errorf("shot: got %+v, want %+v", shot, want)
		}
		var ramp rampOptions
		cmd = newRampCmd(e, func(_, _ io.Writer, o rampOptions) error { ramp = o; return nil })
		if err := parse(t, cmd, "--scenario", "s.toml", "--out", "p.csv"); err != nil {
			t.Fatal(err)
		}
		if want := (rampOptions{scenario: "s.toml", out: "p.csv"}); !reflect.DeepEqual(ramp, want) {
			t.Errorf("ramp: got %+v, want %+v", ramp, want)
		}
	})
}

// TestFlagsRefusedBeforeRunning checks that what the parser refuses never
// reaches the run function.
func TestFlagsRefusedBeforeRunning(t *testing.T) {
	tests := []struct {
		name string
		args []string
		want string
	}{
		{"missing scenario", nil, `required flag(s) "scenario" not set`},
		{"not a number", []string{"--scenario", "s.toml", "--samples", "ten"}, `invalid argument "ten" for "--samples"`},
		{"unknown flag", []string{"--scenario", "s.toml", "--sample", "10"}, "unknown flag: --sample"},
		{"positional", []string{"--scenario", "s.toml", "extra"}, `unknown command "extra"`},
	}
	for _, tt := range tests {
		ran := false
		cmd := newRunCmd(env{}, func(env, io.Writer, io.Writer, runOptions) error { ran = true; return nil })
		var buf bytes.Buffer
		cmd.SetArgs(tt.args)
		cmd.SetOut(&buf)
		cmd.SetErr(&buf)
		err := cmd.Execute()
		if err == nil || !strings.Contains(err.Error(), tt.want) || ran {
			t.Errorf("%s: error %v, ran %v; want an error with %q and no run", tt.name, err, ran, tt.want)
		}
	}
}
