package mc

import (
	"os"
	"path/filepath"
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
