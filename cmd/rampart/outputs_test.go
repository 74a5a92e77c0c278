package main

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestOutputsCheckedFirst checks that output paths are refused before any
// computation, in one line with exit code 2 (qualify included, whose
// verdict codes are 0, 1 and 3), and that no output is written over the
// command's own input.
func TestOutputsCheckedFirst(t *testing.T) {
	dir := t.TempDir()
	file := filepath.Join(dir, "file")
	if err := os.WriteFile(file, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	// A copy of the file-ramp scenario and its table, to be protected.
	for _, f := range []string{"scenarios/file.toml", "ramps/sin2-41.csv", "scenarios/ensemble.toml"} {
		b, err := os.ReadFile(filepath.Join(repoRoot, "testdata", f))
		if err != nil {
			t.Fatal(err)
		}
		os.MkdirAll(filepath.Join(dir, filepath.Dir(f)), 0o755)
		if err := os.WriteFile(filepath.Join(dir, f), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	scen := filepath.Join(dir, "scenarios", "ensemble.toml")
	table := filepath.Join(dir, "ramps", "sin2-41.csv")
	unrelated := filepath.Join(dir, "ramps") // non-empty, holds no run
	ens := []string{"--scenario", scen, "--samples", "2000"}
	for _, row := range []struct {
		name string
		args []string
		msg  string
	}{
		{"report onto a file", append([]string{"run"}, append(ens, "--report", file)...), "--report " + file + ": it exists and is not a directory; give a directory for report.html"},
		{"report under a file", append([]string{"qualify", "--spec", "testdata/demo/spec.toml"}, append(ens, "--report", filepath.Join(file, "r"))...), file + " is not a directory"},
		{"report of the demo under a file", []string{"demo", "--report", filepath.Join(file, "r")}, file + " is not a directory"},
		{"out into an unrelated directory", append([]string{"run"}, append(ens, "--out", unrelated)...), "the directory holds other files (sin2-41.csv) and no run"},
		{"out onto a file", append([]string{"run"}, append(ens, "--out", file)...), "--out " + file + ": it exists and is not a directory"},
		{"trace onto the scenario", []string{"shot", "--scenario", scen, "--trace", scen}, "--trace " + scen + ": that is the input file"},
		{"profile onto the ramp table", []string{"ramp", "--scenario", filepath.Join(dir, "scenarios", "file.toml"), "--out", table}, "that is the input file"},
	} {
		stdout, stderr, code := execute(t, row.args...)
		if code != 2 || stdout != "" || strings.Count(stderr, "\n") != 1 || !strings.Contains(stderr, row.msg) {
			t.Errorf("%s: exit %d, stdout %q, stderr %q; want exit 2, nothing on stdout and one line naming %q", row.name, code, stdout, stderr, row.msg)
		}
	}
	for _, f := range []string{"scenarios/ensemble.toml", "ramps/sin2-41.csv"} {
		got, _ := os.ReadFile(filepath.Join(dir, f))
		want, _ := os.ReadFile(filepath.Join(repoRoot, "testdata", f))
		if string(got) != string(want) {
			t.Errorf("%s was overwritten", f)
		}
	}
	if entries, _ := os.ReadDir(unrelated); len(entries) != 1 {
		t.Errorf("the unrelated directory now holds %d entries, want its 1", len(entries))
	}
}

// TestDemoDefaultsPass checks that the demo's default options pass its own
// check: rampart demo with no flags used to refuse its default of 64
// tolerance realisations, below the 69 the demo spec needs.
func TestDemoDefaultsPass(t *testing.T) {
	t.Chdir(repoRoot)
	d, err := newDemo(env{now: fakeClock()}, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	if err := d.check(); err != nil {
		t.Errorf("default demo options: %v", err)
	}
	if def := newDemoCmd(env{now: fakeClock()}).Flags().Lookup("tolerance-samples").DefValue; def != fmt.Sprint(d.opts.toleranceSamples) {
		t.Errorf("--tolerance-samples defaults to %s, the demo's options to %d: want one default", def, d.opts.toleranceSamples)
	}
}
