package mc

import (
	"bytes"
	"context"
	"errors"
	"os"
	"path/filepath"
	"testing"

	"rampart/noise"
	"rampart/sim"
)

// testEnsemble is a short, fast ensemble: the project's benchmark ring
// (20 sites, 5 um, Rb-87, 20 kHz) with a half-lap sequence, every static
// source on and, if dynamic, intensity and drive phase noise.
func testEnsemble(t testing.TB, samples int, dynamic bool) Ensemble {
	t.Helper()
	c := sim.Config{
		Ring:         sim.Ring{Sites: 20, RadiusM: 5e-6, MassKg: sim.Rb87MassU * sim.AtomicMassUnit},
		DepthHz:      20e3,
		RotationRadS: 1e-3,
		TemperatureK: 20e-9,
	}
	up, err := sim.NewShape("inverse", 150e-6, 2000, c.TrapRadS())
	if err != nil {
		t.Fatal(err)
	}
	if c.Sequence, err = sim.NewSequence(up, 0.5); err != nil {
		t.Fatal(err)
	}
	b := Budget{
		DepthCommonRel: 0.01, DepthDifferentialRel: 1e-3, ClockRel: 1e-5, SpeedRel: 1e-6,
		SkewS: 50e-9, TemperatureSpreadK: 5e-9, PulseAreaRel: 0.01,
	}
	if dynamic {
		b.RIN = noise.White{Level: noise.IntensityFromRIN(-100)}
		b.Phase = noise.White{Level: noise.PhaseFromDBc(-90)}
		b.PhaseCorrelation = 0.5
	}
	return Ensemble{Config: c, Budget: b, Samples: samples, Seed: 7, Sampler: "lhs"}
}

func runToDir(t *testing.T, e Ensemble, dir string, shard *Shard, workers int, stopAfter int) error {
	t.Helper()
	r, err := NewRealiser(e)
	if err != nil {
		t.Fatal(err)
	}
	m := Manifest{Format: ManifestFormat, Fingerprint: "test", Seed: e.Seed, Samples: e.Samples, Sampler: e.Sampler, Shard: shard,
		Columns: Columns(r.Params(), e.Budget.RIN != nil, e.Budget.Phase != nil)}
	var st *Store
	var done []Record
	if _, err := os.Stat(filepath.Join(dir, RealisationsFile)); err == nil {
		st, done, err = Resume(dir, m)
		if err != nil {
			t.Fatal(err)
		}
	} else if st, err = Create(dir, m); err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	from, to := m.Range()
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	count := 0
	_, err = r.Run(ctx, from+len(done), to, workers, func(rec Record) error {
		if err := st.Append(rec); err != nil {
			return err
		}
		count++
		if stopAfter > 0 && count == stopAfter {
			cancel() // an interruption (Ctrl-C) part-way through
		}
		return nil
	})
	return err
}

func readFile(t *testing.T, path string) []byte {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// TestReproducible checks the seeding promise (docs/model.md, Statistics):
// realisation i is the same whatever the number of workers, an
// interruption and resume, or a split into shards merged afterwards. The
// comparison is of the result files, byte for byte.
func TestReproducible(t *testing.T) {
	e := testEnsemble(t, 12, true)
	base := t.TempDir()
	one := filepath.Join(base, "one")
	if err := runToDir(t, e, one, nil, 1, 0); err != nil {
		t.Fatal(err)
	}
	want := readFile(t, filepath.Join(one, RealisationsFile))

	two := filepath.Join(base, "two")
	if err := runToDir(t, e, two, nil, 2, 0); err != nil {
		t.Fatal(err)
	}
	if got := readFile(t, filepath.Join(two, RealisationsFile)); !bytes.Equal(got, want) {
		t.Errorf("2 workers: realisations differ from 1 worker")
	}

	resumed := filepath.Join(base, "resumed")
	if err := runToDir(t, e, resumed, nil, 2, 5); !errors.Is(err, context.Canceled) {
		t.Fatalf("interrupted run: got error %v, want context.Canceled", err)
	}
	// A kill can tear the last row; resume must drop it and redo it.
	path := filepath.Join(resumed, RealisationsFile)
	part := readFile(t, path)
	if err := os.WriteFile(path, append(part, []byte("5,0.01,0.0")...), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := runToDir(t, e, resumed, nil, 2, 0); err != nil {
		t.Fatal(err)
	}
	if got := readFile(t, path); !bytes.Equal(got, want) {
		t.Errorf("interrupted and resumed: realisations differ from an uninterrupted run")
	}

	var dirs []string
	for k := 3; k >= 1; k-- { // any order
		d := filepath.Join(base, "shard", string(rune('0'+k)))
		if err := runToDir(t, e, d, &Shard{Index: k, Count: 3}, 1, 0); err != nil {
			t.Fatal(err)
		}
		dirs = append(dirs, d)
	}
	m, recs, err := Merge(dirs)
	if err != nil {
		t.Fatal(err)
	}
	merged := filepath.Join(base, "merged")
	if err := WriteRun(merged, m, recs); err != nil {
		t.Fatal(err)
	}
	if got := readFile(t, filepath.Join(merged, RealisationsFile)); !bytes.Equal(got, want) {
		t.Errorf("3 shards merged: realisations differ from one run")
	}
	if got, want := readFile(t, filepath.Join(merged, ManifestFile)), readFile(t, filepath.Join(one, ManifestFile)); !bytes.Equal(got, want) {
		t.Errorf("3 shards merged: manifest differs from one run:\n%s\nwant\n%s", got, want)
	}
}

// TestMergeRefuses checks that merging incomplete or foreign shards fails
// with a message naming the problem.
func TestMergeRefuses(t *testing.T) {
	e := testEnsemble(t, 6, false)
	base := t.TempDir()
	a := filepath.Join(base, "a")
	if err := runToDir(t, e, a, &Shard{Index: 1, Count: 2}, 1, 0); err != nil {
		t.Fatal(err)
	}
	if _, _, err := Merge([]string{a}); err == nil {
		t.Error("merge of one of two shards: got no error")
	}
	e2 := e
	e2.Seed = 8
	b := filepath.Join(base, "b")
	if err := runToDir(t, e2, b, &Shard{Index: 2, Count: 2}, 1, 0); err != nil {
		t.Fatal(err)
	}
	if _, _, err := Merge([]string{a, b}); err == nil {
		t.Error("merge of shards with different seeds: got no error")
	}
}
