package mc

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestJobWithin checks the layout of several runs in one directory: a
// subdirectory is resumed only when resuming and it holds a run's manifest;
// otherwise a new run starts there.
func TestJobWithin(t *testing.T) {
	top := t.TempDir()
	done := filepath.Join(top, "a")
	if err := os.MkdirAll(done, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(done, ManifestFile), []byte("{}"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tt := range []struct {
		resume bool
		sub    string
		want   bool
	}{
		{false, "a", false}, // --out: a new run, even over an old one (Create refuses it)
		{true, "a", true},   // --resume: the run there continues
		{true, "b", false},  // --resume: a run never started starts
	} {
		j := Job{Dir: top, Resume: tt.resume}.Within(tt.sub)
		if j.Dir != filepath.Join(top, tt.sub) || j.Resume != tt.want {
			t.Errorf("resume %v, sub %s: dir %s resume %v; want %s, %v", tt.resume, tt.sub, j.Dir, j.Resume, filepath.Join(top, tt.sub), tt.want)
		}
	}
	if HasRun(filepath.Join(top, "b")) || !HasRun(done) {
		t.Errorf("HasRun: b %v, a %v; want false, true", HasRun(filepath.Join(top, "b")), HasRun(done))
	}
}

// TestJobInProcessBound checks that a run refuses, before anything is
// written, more realisations in one process than MaxInProcess (its records
// stay in memory), and names the remedy: shards merged by the streaming
// merge. A shard of the same ensemble that fits is accepted up to there.
func TestJobInProcessBound(t *testing.T) {
	e := sfEnsemble(t, Budget{}, 4*MaxInProcess)
	e.ScaleFactor = false
	r, err := NewRealiser(e)
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	_, err = Job{Realiser: r, Dir: dir}.Execute(context.Background())
	if err == nil || !strings.Contains(err.Error(), "--shard k/n") {
		t.Fatalf("%d realisations in one process: err %v, want the shard remedy", 4*MaxInProcess, err)
	}
	if HasRun(dir) {
		t.Errorf("a refused job left a manifest in %s", dir)
	}
	// A quarter fits: cancelled at once, so it stops before simulating.
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	_, err = Job{Realiser: r, Shard: &Shard{Index: 1, Count: 4}}.Execute(ctx)
	if err != nil && strings.Contains(err.Error(), "in one process") {
		t.Errorf("a shard of %d realisations was refused: %v", MaxInProcess, err)
	}
}

// TestLossPossible: a budget whose photon scattering is drawn shot by shot
// can lose shots, one whose scattering is a cloud's mean factor cannot;
// the manifest records it so that summaries and verdicts bound the mean
// contrast for losses a sample happens not to show (stats.ZeroMixture;
// its coverage with Possible set is TestZeroMixtureCoverage).
func TestLossPossible(t *testing.T) {
	var b Budget
	if b.LossPossible() {
		t.Error("a budget without scattering can lose shots")
	}
	b.Apparatus.Scattering.RateS = [2]float64{0.5, 0.5}
	if !b.LossPossible() {
		t.Error("a budget with scattering drawn shot by shot cannot lose shots")
	}
	e := sfEnsemble(t, b, 10)
	e.ScaleFactor = false
	r, err := NewRealiser(e)
	if err != nil {
		t.Fatal(err)
	}
	if !(Job{Realiser: r}).Manifest().LossPossible {
		t.Error("the manifest of a run with scattering does not record that shots may be lost")
	}
	b.Apparatus.Scattering.Cloud = true
	if b.LossPossible() {
		t.Error("a cloud's mean factor loses no shot, but the budget says it can")
	}
}
