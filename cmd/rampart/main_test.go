package main

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/golden")

// repoRoot is the repository root, absolute because tests change directory.
var repoRoot = func() string {
	dir, err := filepath.Abs("../..")
	if err != nil {
		panic(err)
	}
	return dir
}()

// fakeClock is a clock that advances by one millisecond at each reading, so
// that every simulated shot takes 1 ms.
func fakeClock() func() time.Time {
	t := time.Date(2025, 1, 1, 0, 0, 0, 0, time.UTC)
	return func() time.Time {
		t = t.Add(time.Millisecond)
		return t
	}
}

// execute runs the command line from the repository root, as the README
// does, and returns what it printed and its exit code.
func execute(t *testing.T, args ...string) (stdout, stderr string, code int) {
	t.Helper()
	t.Chdir(repoRoot)
	var out, errs bytes.Buffer
	code = run(args, &out, &errs, env{now: fakeClock()})
	return out.String(), errs.String(), code
}

// golden compares got with the golden file testdata/golden/name, or
// rewrites the file with -update.
func golden(t *testing.T, name, got string) {
	t.Helper()
	path := filepath.Join(repoRoot, "testdata", "golden", name)
	if *update {
		if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./cmd/rampart -update to create it)", err)
	}
	if got == string(want) {
		return
	}
	g, w := strings.Split(got, "\n"), strings.Split(string(want), "\n")
	for i := 0; i < len(g) || i < len(w); i++ {
		var gl, wl string
		if i < len(g) {
			gl = g[i]
		}
		if i < len(w) {
			wl = w[i]
		}
		if gl != wl {
			t.Errorf("output differs from %s at line %d (rerun with -update if the change is intended):\ngot:  %q\nwant: %q", path, i+1, gl, wl)
			return
		}
	}
}

func TestGolden(t *testing.T) {
	for _, row := range []struct {
		golden string
		args   []string
	}{
		{"shot-benchmark.txt", []string{"shot", "--scenario", "testdata/scenarios/benchmark.toml"}},
		{"shot-thermal-check.txt", []string{"shot", "--scenario", "testdata/scenarios/thermal.toml", "--check"}},
		{"shot-file.txt", []string{"shot", "--scenario", "testdata/scenarios/file.toml"}},
		{"shot-noise.json", []string{"shot", "--scenario", "testdata/scenarios/noise.toml", "--json"}},
		{"shot-noise.txt", []string{"shot", "--scenario", "testdata/scenarios/noise.toml"}},
		{"shot-set.txt", []string{"shot", "--scenario", "testdata/scenarios/benchmark.toml", "--set", "ramp.shape=inverse", "--set", "motion.laps=2.5"}},
		{"ramp-inverse.txt", []string{"ramp", "--scenario", "testdata/scenarios/inverse.toml"}},
		{"ramp-file-drive.txt", []string{"ramp", "--scenario", "testdata/scenarios/file-drive.toml"}},
		{"ramp-throw.txt", []string{"ramp", "--scenario", "testdata/scenarios/benchmark.toml", "--set", "ramp.shape=inverse", "--set", "ramp.duration_us=60"}},
	} {
		t.Run(row.golden, func(t *testing.T) {
			stdout, stderr, code := execute(t, row.args...)
			if code != 0 || stderr != "" {
				t.Fatalf("%q: exit %d, stderr %q", row.args, code, stderr)
			}
			golden(t, row.golden, stdout)
		})
	}
}
