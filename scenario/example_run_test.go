package scenario_test

import (
	"context"
	"fmt"
	"log"
	"os"
	"path/filepath"

	"rampart/mc"
	"rampart/scenario"
)

// Example_shards runs a small ensemble of a scenario in two shards, each in
// its own run directory (as two tasks of a cluster job would), and merges
// them into the ensemble one unsharded run gives, without the command line.
func Example_shards() {
	sc, cfg, err := scenario.LoadConfig("../testdata/scenarios/benchmark.toml",
		[]string{"noise.timing.skew_ns=20", "noise.depth.common_rel=1e-3"})
	if err != nil {
		log.Fatal(err)
	}
	budget, err := sc.Budget()
	if err != nil {
		log.Fatal(err)
	}
	hash, text, err := sc.Fingerprint()
	if err != nil {
		log.Fatal(err)
	}
	top, err := os.MkdirTemp("", "rampart-example")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(top)

	ens := mc.Ensemble{Config: cfg, Budget: budget, Samples: 6, Seed: 7}
	var dirs []string
	for k := 1; k <= 2; k++ {
		r, err := mc.NewRealiser(ens)
		if err != nil {
			log.Fatal(err)
		}
		dir := filepath.Join(top, fmt.Sprintf("shard%d", k))
		job := mc.Job{Realiser: r, Fingerprint: hash, Scenario: text, Dir: dir,
			Shard: &mc.Shard{Index: k, Count: 2}, Workers: 1}
		res, err := job.Execute(context.Background())
		if err != nil {
			log.Fatal(err)
		}
		from, to := res.Manifest.Range()
		fmt.Printf("shard %d/2: realisations %d to %d, %d simulated\n", k, from, to-1, res.Fresh)
		dirs = append(dirs, dir)
	}
	m, recs, err := mc.Merge(dirs)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("merged: %d realisations, inputs %v\n", len(recs), m.Columns[1:3])
	for i, rec := range recs {
		if rec.Index != i {
			log.Fatalf("record %d has index %d", i, rec.Index)
		}
	}
	// The unsharded ensemble, in memory: realisation i depends only on the
	// seed and i, so it holds the same records.
	r, err := mc.NewRealiser(ens)
	if err != nil {
		log.Fatal(err)
	}
	one, err := mc.Job{Realiser: r, Fingerprint: hash, Workers: 2}.Execute(context.Background())
	if err != nil {
		log.Fatal(err)
	}
	same := len(one.Records) == len(recs)
	for i := range one.Records {
		same = same && one.Records[i].PhaseRad == recs[i].PhaseRad && one.Records[i].Contrast == recs[i].Contrast
	}
	fmt.Println("same as one unsharded run:", same)
	// K = 2 m R^2 phi(T) / hbar = 2 x 86.909 u x (5 um)^2 x 2 pi / hbar
	// = 0.4299 s (docs/model.md, Interferometer and signs).
	fmt.Printf("scale factor K = %.4g s\n", m.ScaleFactorS)
	// Output:
	// shard 1/2: realisations 0 to 2, 3 simulated
	// shard 2/2: realisations 3 to 5, 3 simulated
	// merged: 6 realisations, inputs [depth.common_rel timing.skew_s]
	// same as one unsharded run: true
	// scale factor K = 0.4299 s
}
