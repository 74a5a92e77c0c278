package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestResumeNotARun checks that --resume of a directory that holds no run
// (rank, tolerance: nor its subdirectories) is refused naming --resume, and leaves the user's directory as it was
// (no lock file); that merge of a missing directory says it is missing.
func TestResumeNotARun(t *testing.T) {
	dir := t.TempDir()
	user := filepath.Join(dir, "userdir")
	os.MkdirAll(user, 0o755)
	if err := os.WriteFile(filepath.Join(user, "notes.txt"), []byte("mine\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, row := range []struct {
		name string
		args []string
		msg  string
	}{
		{"run", []string{"run", "--scenario", ensembleScenario, "--samples", "2", "--resume", user}, "--resume " + user + ": it holds no run (no manifest.json)"},
		{"qualify", []string{"qualify", "--scenario", ensembleScenario, "--spec", writeSpec(t, dir, "spec.toml", "[contrast]\np05_min = 0.5\n"), "--samples", "100", "--resume", user},
			"--resume " + user + ": it holds no run"},
		{"sensitivity", []string{"sensitivity", "--scenario", ensembleScenario, "--base", "4", "--resume", user}, "--resume " + user + ": it holds no run"},
		{"rank", []string{"rank", "--scenario", ensembleScenario, "--ramp", "a=sin2", "--ramp", "b=inverse", "--samples", "2", "--resume", user},
			"--resume " + user + ": neither it nor its subdirectories hold a run"},
		{"tolerance", []string{"tolerance", "--scenario", ensembleScenario, "--spec", writeSpec(t, dir, "spec2.toml", "[contrast]\np05_min = 0.5\n"), "--samples", "20", "--resume", user},
			"--resume " + user + ": neither it nor its subdirectories hold a run"},
		{"merge a missing directory", []string{"merge", filepath.Join(dir, "nosuch1")}, filepath.Join(dir, "nosuch1") + " does not exist"},
	} {
		stdout, stderr, code := execute(t, row.args...)
		if code != 2 || stdout != "" || strings.Count(stderr, "\n") != 1 || !strings.Contains(stderr, row.msg) {
			t.Errorf("%s: exit %d, stdout %q, stderr %q; want exit 2 and one line containing %q", row.name, code, stdout, stderr, row.msg)
		}
		if entries, _ := os.ReadDir(user); len(entries) != 1 {
			t.Errorf("%s: the user's directory now holds %d entries, want its 1 (notes.txt)", row.name, len(entries))
		}
	}
	// An empty directory is a job stopped before its first run (a cluster
	// task pre-empted after making it): rank and run start there.
	empty := filepath.Join(dir, "empty")
	os.MkdirAll(empty, 0o755)
	if _, stderr, code := execute(t, "rank", "--scenario", ensembleScenario, "--ramp", "a=sin2", "--ramp", "b=inverse", "--samples", "2", "--resume", empty); code != 0 {
		t.Errorf("rank --resume of an empty directory: exit %d, %s; want it to start there", code, stderr)
	}
	if !hasRunBelow(empty, resumeDepth) {
		t.Errorf("rank --resume of an empty directory left no run in it")
	}
	empty2 := filepath.Join(dir, "empty2")
	os.MkdirAll(empty2, 0o755)
	if _, stderr, code := execute(t, "run", "--scenario", ensembleScenario, "--samples", "2", "--resume", empty2); code != 0 || !hasRunBelow(empty2, 0) {
		t.Errorf("run --resume of an empty directory: exit %d, %s; want a run started there", code, stderr)
	}
}
