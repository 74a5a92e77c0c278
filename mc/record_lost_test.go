package mc

import (
	"context"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"rampart/sim"
)

// TestLostShotRows runs an ensemble whose atoms scatter often (photon
// scattering at 300 /s, a third of the shots lost on this sequence) into a
// run directory, whole and in two shards, and checks the rows of the lost
// shots: phase_rad and bias_rad empty (a lost shot has no phase), read
// back to the records the run held (index for index), and the merged
// shards byte-identical to the whole run.
func TestLostShotRows(t *testing.T) {
	var b Budget
	b.Apparatus.Scattering = sim.Scattering{RateS: [2]float64{300, 300}, Cloud: true}
	r, _ := apparatusEnsemble(t, b, 24)
	root := t.TempDir()
	run := func(dir string, shard *Shard) []Record {
		t.Helper()
		res, err := Job{Realiser: r, Fingerprint: "f", Dir: dir, Shard: shard}.Execute(context.Background())
		if err != nil {
			t.Fatal(err)
		}
		res.Release()
		return res.Records
	}
	whole := filepath.Join(root, "whole")
	recs := run(whole, nil)
	lost := 0
	for _, rec := range recs {
		if rec.Lost() {
			lost++
		}
	}
	t.Logf("%d of %d shots lost", lost, len(recs))
	if lost == 0 || lost == len(recs) {
		t.Fatalf("%d of %d shots lost: the test needs some of each", lost, len(recs))
	}
	text, err := os.ReadFile(filepath.Join(whole, RealisationsFile))
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(text)), "\n")
	cols := strings.Split(lines[0], ",")
	phase, bias := slices.Index(cols, "phase_rad"), slices.Index(cols, "bias_rad")
	for i, rec := range recs {
		f := strings.Split(lines[i+1], ",")
		if empty := f[phase] == "" && f[bias] == ""; empty != rec.Lost() {
			t.Errorf("realisation %d (lost %v): phase_rad %q, bias_rad %q; want both empty exactly for a lost shot", rec.Index, rec.Lost(), f[phase], f[bias])
		}
	}
	_, got, err := Read(whole)
	if err != nil {
		t.Fatal(err)
	}
	for i := range recs {
		if got[i].Lost() != recs[i].Lost() || got[i].BiasRad != recs[i].BiasRad || got[i].PhaseRad != recs[i].PhaseRad || got[i].Contrast != recs[i].Contrast {
			t.Errorf("realisation %d read back as %+v, written %+v", i, got[i], recs[i])
		}
	}
	shards := []string{filepath.Join(root, "s1"), filepath.Join(root, "s2")}
	run(shards[0], &Shard{1, 2})
	run(shards[1], &Shard{2, 2})
	m, merged, err := Merge(shards)
	if err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(root, "merged")
	if err := WriteRun(out, m, merged); err != nil {
		t.Fatal(err)
	}
	again, err := os.ReadFile(filepath.Join(out, RealisationsFile))
	if err != nil {
		t.Fatal(err)
	}
	if string(again) != string(text) {
		t.Errorf("the merged shards' realisations differ from the whole run's")
	}
}

// TestLostShotRowRefused: an empty phase or bias field is read only in the
// row of a lost shot, and only both together.
func TestLostShotRowRefused(t *testing.T) {
	lost := Record{Index: 3, Inputs: []float64{1e-3}, Ground: [2]float64{0.9, 0.9}}
	row := lost.format(false, false)
	if !strings.Contains(row, "0,,,0,0,") {
		t.Fatalf("lost row %q: want empty phase_rad and bias_rad", row)
	}
	if got, err := parseRecord(row, 1, false, false); err != nil || !got.Lost() || got.BiasRad != 0 {
		t.Errorf("lost row: %+v, %v", got, err)
	}
	for _, body := range []string{
		"3,0.001,0.9,,,0.9,0,0.9,0.9", // a fringe with no phase
		"3,0.001,0,,0,0,0,0.9,0.9",    // one of the two empty
	} {
		if _, err := parseRecord(body+","+rowChecksum(body), 1, false, false); err == nil || !strings.Contains(err.Error(), "only a lost shot") {
			t.Errorf("row %q: got %v, want a refusal", body, err)
		}
	}
}
