package present

import (
	"fmt"
	"io"
	"path/filepath"
	"strings"
	"time"

	"rampart/internal/plural"
	"rampart/mc"
)

// EnsembleLine says what an ensemble run was and how it went: its size,
// seed and sampler, its shard, and the realisations simulated (in elapsed)
// and resumed of its records.
func EnsembleLine(m mc.Manifest, records, fresh int, elapsed time.Duration) string {
	s := fmt.Sprintf("Ensemble: %s, seed %d, %s sampler", plural.Count(records, "realisation"), m.Seed, m.Sampler)
	if m.Shard != nil {
		from, to := m.Range()
		s += fmt.Sprintf(", shard %d/%d (realisations %d to %d of %d; merge the shards for the whole ensemble)", m.Shard.Index, m.Shard.Count, from, to-1, m.Samples)
	}
	if fresh > 0 {
		el, unit := Duration(elapsed)
		s += fmt.Sprintf("; %d simulated in %s %s", fresh, el, unit)
		if records > fresh {
			s += fmt.Sprintf(", %d resumed", records-fresh)
		}
	}
	return s
}

// Work adds up the realisations a command simulated and resumed over its
// ensembles, and the time it took.
type Work struct {
	Fresh, Resumed int
	Elapsed        time.Duration
}

// Add counts a run of records records, fresh of them simulated in elapsed.
func (w *Work) Add(fresh, records int, elapsed time.Duration) {
	w.Fresh += fresh
	w.Resumed += records - fresh
	w.Elapsed += elapsed
}

// Line says what was run (what) and how: seed, sampler, shard and work.
func (w Work) Line(what string, seed uint64, sampler, shard string) string {
	s := fmt.Sprintf("Ensembles: %s, seed %d, %s sampler", what, seed, sampler)
	if shard != "" {
		s += ", shard " + shard
	}
	if w.Fresh > 0 {
		el, unit := Duration(w.Elapsed)
		s += fmt.Sprintf("; %d simulated in %s %s", w.Fresh, el, unit)
	}
	if w.Resumed > 0 {
		s += fmt.Sprintf("; %d resumed", w.Resumed)
	}
	return s
}

// PrintShardNote tells how to combine the shards (shard "k/n") of the runs
// a command keeps in the subdirectories subs of dir ("" for dir itself),
// and what to run on the merged set.
func PrintShardNote(w io.Writer, shard, dir string, subs []string, then string) error {
	sh, err := mc.ParseShard(shard)
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "Ran shard %d/%d into %s. When every shard has run, each with its own --out (D1 to D%d below), merge them:\n", sh.Index, sh.Count, dir, sh.Count)
	for _, s := range subs {
		var dirs []string
		for k := 1; k <= sh.Count; k++ {
			if sh.Count > 4 && k == 3 {
				dirs = append(dirs, "...")
				k = sh.Count
			}
			dirs = append(dirs, filepath.Join(fmt.Sprintf("D%d", k), s))
		}
		fmt.Fprintf(w, "  rampart merge --out %s %s\n", filepath.Join("ALL", s), strings.Join(dirs, " "))
	}
	fmt.Fprintf(w, "then %s: run this command again without --shard, with --resume ALL in place of --out.\n", then)
	return nil
}
