package main

import (
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"syscall"
	"testing"

	"rampart/cmd/internal/report"
)

// listTree returns every path under dir, to show that a refused command
// wrote nothing.
func listTree(t *testing.T, dir string) []string {
	t.Helper()
	var paths []string
	err := filepath.WalkDir(dir, func(p string, _ fs.DirEntry, err error) error {
		paths = append(paths, p)
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return paths
}

// TestOutputPathsBeforeWork checks that every command refuses an output it
// cannot write before it simulates anything: exit 2, one line on stderr
// naming the flag, nothing on stdout, no file written, and no numerics
// estimate made (every ensemble, and tolerance's search, starts with one:
// preflight). The scenario's ramp is a steep table on a fixed coarse step
// whose numerics preflight refuses, so that a command that reached its
// first ensemble stops there at once with another message (the test stays
// fast before the fix too). The paths are the new user's: a FIFO where a
// file goes (rep/report.html, --history, --trace, --out FILE), a regular
// file where a directory goes, and a file in a missing directory.
func TestOutputPathsBeforeWork(t *testing.T) {
	dir := t.TempDir()
	fifo := func(path string) string {
		os.MkdirAll(filepath.Dir(path), 0o755)
		if err := syscall.Mkfifo(path, 0o644); err != nil {
			t.Skipf("mkfifo: %v", err)
		}
		return path
	}
	rep := filepath.Join(dir, "rep")
	fifo(filepath.Join(rep, "report.html"))
	history := fifo(filepath.Join(dir, "fifo.csv"))
	file := filepath.Join(dir, "target.csv")
	if err := os.WriteFile(file, []byte("x\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	spec := writeSpec(t, dir, "spec.toml", "[contrast]\np05_min = 0.95\n")
	steep := steepTable(t)
	scen := []string{"--scenario", "testdata/scenarios/ensemble.toml", "--set", "ramp.shape=file", "--set", "ramp.file=" + steep, "--set", "numerics.step_us=19"}
	with := func(cmd string, args ...string) []string {
		return append(append([]string{cmd}, scen...), args...)
	}
	fifoReport := "--report " + rep + ": " + filepath.Join(rep, "report.html") + " is a FIFO (named pipe); give a directory whose report.html is a regular file or absent"
	notDir := func(flag string) string { return flag + " " + file + ": it exists and is not a directory" }
	for _, row := range []struct {
		name string
		args []string
		msg  string
	}{
		{"run report FIFO", with("run", "--samples", "3000", "--report", rep), fifoReport},
		{"qualify report FIFO", with("qualify", "--spec", spec, "--samples", "3000", "--report", rep), fifoReport},
		{"rank report FIFO", with("rank", "--ramp", "a=file:"+steep, "--ramp", "b=sin2", "--samples", "3000", "--report", rep), fifoReport},
		{"tolerance report FIFO", with("tolerance", "--spec", spec, "--samples", "100", "--report", rep, "--out", filepath.Join(dir, "tolx")), fifoReport},
		{"sensitivity report FIFO", with("sensitivity", "--base", "64", "--report", rep), fifoReport},
		{"response report FIFO", with("response", "--report", rep), fifoReport},
		{"scan report FIFO", with("scan", "--vary", "lattice.depth_khz=18,22", "--report", rep), fifoReport},
		{"edge report FIFO", with("edge", "--spec", spec, "--key", "lattice.depth_khz", "--range", "18:22", "--report", rep), fifoReport},
		{"robust report FIFO", with("robust", "--samples", "20", "--terms", "1", "--evals", "4", "--write", filepath.Join(dir, "r.csv"), "--report", rep), fifoReport},
		{"robust history FIFO", with("robust", "--samples", "20", "--terms", "1", "--evals", "4", "--write", filepath.Join(dir, "r.csv"), "--history", history),
			"--history " + history + ": it is a FIFO (named pipe)"},
		{"shot trace FIFO", with("shot", "--trace", history), "--trace " + history + ": it is a FIFO (named pipe)"},
		{"ramp out FIFO", with("ramp", "--out", history), "--out " + history + ": it is a FIFO (named pipe)"},
		{"ramp out in a missing directory", with("ramp", "--out", filepath.Join(dir, "nodir", "x.csv")),
			"--out " + filepath.Join(dir, "nodir", "x.csv") + ": its directory " + filepath.Join(dir, "nodir") + " does not exist"},
		{"response out file", with("response", "--out", file), notDir("--out")},
		{"run out file", with("run", "--samples", "3000", "--out", file), notDir("--out")},
		{"qualify report file", with("qualify", "--spec", spec, "--report", file), notDir("--report")},
		{"rank out file", with("rank", "--ramp", "a=file:"+steep, "--ramp", "b=sin2", "--out", file), notDir("--out")},
		{"tolerance out file", with("tolerance", "--spec", spec, "--samples", "100", "--out", file), notDir("--out")},
		{"robust write under a file", with("robust", "--samples", "20", "--terms", "1", "--evals", "4", "--write", filepath.Join(file, "r.csv")),
			"--write " + filepath.Join(file, "r.csv") + ": its directory " + file + ": it exists and is not a directory"},
		{"merge out file", []string{"merge", "--out", file, dir}, notDir("--out")},
		{"demo report FIFO", []string{"demo", "--report", rep}, fifoReport},
		{"scan out file", with("scan", "--vary", "lattice.depth_khz=18,22", "--ensemble", "--out", file), notDir("--out")},
		{"sbatch script in a missing directory", []string{"sbatch", "--script", filepath.Join(dir, "nodir", "x.sh"), "--rate", "100", "--", "run", "--scenario", "testdata/scenarios/ensemble.toml", "--out", filepath.Join(dir, "o")},
			"--script " + filepath.Join(dir, "nodir", "x.sh") + ": its directory " + filepath.Join(dir, "nodir") + " does not exist"},
	} {
		before := listTree(t, dir)
		checked = nil
		stdout, stderr, code := execute(t, row.args...)
		if code != 2 || stdout != "" || strings.Count(stderr, "\n") != 1 || !strings.Contains(stderr, row.msg) {
			t.Errorf("%s: exit %d, stdout %q, stderr %q; want exit 2, nothing on stdout and one line containing %q", row.name, code, stdout, stderr, row.msg)
		}
		if len(checked) != 0 {
			t.Errorf("%s: the numerics of %d configurations were estimated before the refusal", row.name, len(checked))
		}
		if after := listTree(t, dir); !slices.Equal(before, after) {
			t.Errorf("%s: wrote files: before %q, after %q", row.name, before, after)
		}
	}
}

// TestReportWriteNamesFlag checks that an output error met while writing
// the report (here rep/report.html made a FIFO after the check) names
// --report, not the package's "report:".
func TestReportWriteNamesFlag(t *testing.T) {
	rep := filepath.Join(t.TempDir(), "rep")
	os.MkdirAll(rep, 0o755)
	if err := syscall.Mkfifo(filepath.Join(rep, "report.html"), 0o644); err != nil {
		t.Skipf("mkfifo: %v", err)
	}
	r := &report.Report{Title: "t", Command: "rampart run"}
	err := writeReport(io.Discard, r, rep)
	if err == nil || !strings.HasPrefix(err.Error(), "--report "+rep+": ") || strings.Contains(err.Error(), "report: ") {
		t.Errorf("error %v: want it to start with --report %s and not say report:", err, rep)
	}
}
