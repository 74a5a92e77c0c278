package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestDesignReports: scan, edge and robust write --report pages with
// their tables and figures, and the command line that reproduces them.
func TestDesignReports(t *testing.T) {
	dir := t.TempDir()
	spec := writeSpec(t, dir, "spec.toml", "[contrast]\np05_min = 0.95\n")
	for _, tt := range []struct {
		name    string
		args    []string
		code    int // edge's range here holds no passing value: exit 1, report written
		ids     []string
		figures int
		texts   []string
	}{
		{"scan", []string{"scan", "--scenario", ensembleScenario, "--vary", "ramp.duration_us=100:200:3", "--vary", "lattice.depth_khz=18,22", "--spec", spec},
			0, []string{"scan-contrast", "scan-bias"}, 2, []string{"Scan of ramp.duration_us and lattice.depth_khz"}},
		{"edge", []string{"edge", "--scenario", ensembleScenario, "--spec", spec, "--key", "ramp.duration_us", "--range", "50:80", "--steps", "1", "--samples", "100"},
			1, nil, 0, []string{"Edge of ramp.duration_us against spec", "The points the search qualified"}},
		{"robust", []string{"robust", "--scenario", ensembleScenario, "--set", "ramp.duration_us=100", "--samples", "20", "--terms", "2",
			"--evals", "4", "--step", "0.2", "--fresh-samples", "40", "--write", filepath.Join(dir, "r.csv")},
			0, []string{"drive", "robust-history", "ranking"}, 3, []string{"Robust optimisation (p05)", "Ranking on the fresh ensemble"}},
	} {
		t.Run(tt.name, func(t *testing.T) {
			rep := filepath.Join(dir, "report-"+tt.name)
			args := append(tt.args, "--report", rep)
			_, stderr, code := execute(t, args...)
			if code != tt.code {
				t.Fatalf("exit %d, want %d: %s", code, tt.code, stderr)
			}
			readReport(t, rep, "rampart "+strings.Join(args, " "), tt.ids, tt.figures, tt.texts...)
		})
	}
}

// TestDesignReportBadDir: a --report directory that cannot hold the page
// is refused before anything runs (exit 2, nothing written).
func TestDesignReportBadDir(t *testing.T) {
	dir := t.TempDir()
	file := filepath.Join(dir, "file")
	if err := os.WriteFile(file, nil, 0o644); err != nil {
		t.Fatal(err)
	}
	spec := writeSpec(t, dir, "spec.toml", "[contrast]\np05_min = 0.95\n")
	for _, args := range [][]string{
		{"scan", "--scenario", ensembleScenario, "--vary", "ramp.duration_us=100:200:3"},
		{"edge", "--scenario", ensembleScenario, "--spec", spec, "--key", "ramp.duration_us", "--range", "50:80"},
		{"robust", "--scenario", ensembleScenario, "--write", filepath.Join(dir, "r.csv")},
	} {
		_, stderr, code := execute(t, append(args, "--report", file)...)
		if code != 2 || !strings.Contains(stderr, "--report "+file) {
			t.Errorf("%s: exit %d, %q: want 2 and a message naming --report", args[0], code, stderr)
		}
		if _, err := os.Stat(filepath.Join(dir, "r.csv")); err == nil {
			t.Errorf("%s: wrote the ramp file before refusing", args[0])
		}
	}
}
