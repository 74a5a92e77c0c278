package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"rampart/mc"
	"rampart/stats"
)

// lookJSON is the part of qualify --json that the look bookkeeping sets.
type lookJSON struct {
	Samples        int     `json:"samples"`
	Look           int     `json:"look"`
	LookConfidence float64 `json:"look_confidence"`
}

// TestQualifyLooksRecorded: an ensemble qualified in a run directory,
// topped up with --resume and more --samples, and qualified again takes
// look 2 without being told, says so, and the manifest counts the looks; a
// --look below the recorded count is refused before anything runs, and an
// explicit --look at or above it wins. The look confidences are those of
// stats.LookAlpha (alpha_k = alpha 6 / (pi^2 k^2), Lan and DeMets 1983).
func TestQualifyLooksRecorded(t *testing.T) {
	dir := t.TempDir()
	spec := writeSpec(t, dir, "spec.toml", "[contrast]\np05_min = 0.5\n")
	run := filepath.Join(dir, "run")
	looks := func() int {
		t.Helper()
		m, err := mc.ReadManifest(run)
		if err != nil {
			t.Fatal(err)
		}
		return m.Looks
	}
	qualify := func(samples string, extra ...string) (lookJSON, string, int) {
		t.Helper()
		args := []string{"qualify", "--scenario", ensembleScenario, "--set", "ramp.shape=inverse", "--samples", samples, "--seed", "3", "--spec", spec, "--json"}
		stdout, stderr, code := execute(t, append(args, extra...)...)
		var q lookJSON
		if code != 2 { // 0, 1 or 3: a verdict, printed
			if err := json.Unmarshal([]byte(stdout), &q); err != nil {
				t.Fatalf("%v: %v", err, stdout)
			}
		}
		return q, stderr, code
	}
	conf := func(k int) float64 { return 1 - stats.LookAlpha(0.05, k) }

	q, stderr, code := qualify("60", "--out", run)
	if code == 2 || q.Look != 1 || q.LookConfidence != conf(1) || looks() != 1 {
		t.Fatalf("first qualification: exit %d (%s), look %d at %v, manifest looks %d; want look 1 at %v recorded", code, stderr, q.Look, q.LookConfidence, looks(), conf(1))
	}
	if !strings.Contains(stderr, "look 1 recorded") {
		t.Errorf("first qualification does not say its look was recorded: %q", stderr)
	}
	q, stderr, code = qualify("90", "--resume", run)
	if code == 2 || q.Samples != 90 || q.Look != 2 || q.LookConfidence != conf(2) || looks() != 2 {
		t.Fatalf("topped up to 90: exit %d (%s), %d samples, look %d at %v, manifest looks %d; want 90 at look 2 (%v) recorded", code, stderr, q.Samples, q.Look, q.LookConfidence, looks(), conf(2))
	}
	// The text output names the look.
	stdout, _, _ := execute(t, "qualify", "--scenario", ensembleScenario, "--set", "ramp.shape=inverse", "--samples", "90", "--seed", "3", "--spec", spec, "--resume", run)
	if !strings.Contains(stdout, "Look 3:") || looks() != 3 {
		t.Errorf("third qualification: manifest looks %d, output without \"Look 3:\":\n%s", looks(), stdout)
	}
	// A look number already spent is refused, exit 2, nothing recorded.
	if _, stderr, code := qualify("90", "--resume", run, "--look", "2"); code != 2 || !strings.Contains(stderr, "already qualified 3 times") || looks() != 3 {
		t.Errorf("--look 2 after 3 looks: exit %d, %q, manifest looks %d; want exit 2 and a refusal", code, stderr, looks())
	}
	// An explicit --look at or above the count wins.
	if q, stderr, code := qualify("90", "--resume", run, "--look", "5"); code == 2 || q.Look != 5 || looks() != 5 {
		t.Errorf("--look 5: exit %d (%s), look %d, manifest looks %d; want 5", code, stderr, q.Look, looks())
	}
	// A topped-up ensemble is the ensemble run at its full size at once:
	// the same summary (realisation i depends only on the seed and i).
	fresh := filepath.Join(dir, "fresh")
	if _, stderr, code := qualify("90", "--out", fresh); code == 2 {
		t.Fatalf("fresh 90: exit %d: %s", code, stderr)
	}
	if a, b := readFileT(t, filepath.Join(run, mc.RealisationsFile)), readFileT(t, filepath.Join(fresh, mc.RealisationsFile)); a != b {
		t.Errorf("topped-up realisations differ from a run of 90 at once")
	}
}

// readFileT returns the content of path.
func readFileT(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}
