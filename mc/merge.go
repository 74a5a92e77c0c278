package mc

import (
	"bufio"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"hash"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"rampart/internal/atomicfile"
	"rampart/internal/plural"
)

// Merged is the set of shard directories of one ensemble, their manifests
// checked, to be read in index order as one unsharded run. It holds no
// record: Scan streams the rows shard by shard, verifying each, so that an
// ensemble of any size is merged in bounded memory.
type Merged struct {
	// Manifest is that of the whole ensemble, as one unsharded run would
	// have it (no shard, no digest). The caller may set its YieldSpec and
	// Confidence before WriteRun.
	Manifest Manifest
	shards   []shardRun // in index order, tiling [0, Samples)
}

type shardRun struct {
	dir string
	m   Manifest
}

// OpenShards checks the directories of the shards of one ensemble (in any
// order) from their manifests: every shard complete and sealed (with the
// digest of its records), not being written, and of the same build,
// numerics and yield spec; their ranges tiling the ensemble, each
// realisation in exactly one. The rows are verified as Scan reads them.
func OpenShards(dirs []string) (*Merged, error) { return openShards(dirs, true) }

// OpenShardsResummarised is OpenShards for a caller that summarises the
// merged run with a yield spec and confidence of its own: the shards may
// have been summarised with different ones (neither changes a record).
func OpenShardsResummarised(dirs []string) (*Merged, error) { return openShards(dirs, false) }

func openShards(dirs []string, sameSummaries bool) (*Merged, error) {
	if len(dirs) == 0 {
		return nil, errors.New("no directories to merge")
	}
	shards := make([]shardRun, 0, len(dirs))
	for i, d := range dirs {
		if err := checkNotWriting(d); err != nil {
			return nil, err
		}
		m, err := ReadManifest(d)
		if err != nil {
			return nil, err
		}
		if i > 0 {
			first := shards[0].m
			if err := first.sameEnsemble(m); err != nil {
				return nil, fmt.Errorf("%s is not a shard of the ensemble in %s: it has %v", d, dirs[0], err)
			}
			if sameSummaries && !sameSummary(first, m) {
				return nil, fmt.Errorf("%s was summarised with another yield spec or confidence than %s: give the merged run's yield spec (--min-contrast, --max-bias-rad) and --confidence to merge them", d, dirs[0])
			}
		}
		if m.RecordsSHA256 == "" {
			return nil, unsealed(d, m)
		}
		shards = append(shards, shardRun{dir: d, m: m})
	}
	slices.SortStableFunc(shards, func(a, b shardRun) int {
		fa, _ := a.m.Range()
		fb, _ := b.m.Range()
		return fa - fb
	})
	next, prev := 0, ""
	for _, s := range shards {
		from, to := s.m.Range()
		switch {
		case from > next:
			return nil, fmt.Errorf("realisation %d is in none of the shards (the next, %s, starts at %d)", next, s.dir, from)
		case from < next:
			return nil, fmt.Errorf("realisation %d appears in more than one shard: %s and %s both hold it", from, prev, s.dir)
		}
		next, prev = to, s.dir
	}
	first := shards[0].m
	if next != first.Samples {
		return nil, fmt.Errorf("realisation %d is in none of the shards (they hold %d of %s)", next, next, plural.Count(first.Samples, "realisation"))
	}
	first.Shard = nil
	first.RecordsSHA256 = ""
	return &Merged{Manifest: first, shards: shards}, nil
}

// unsealed says why the shard in dir, whose manifest m has no digest, is
// refused: it is incomplete, or complete but was never closed.
func unsealed(dir string, m Manifest) error {
	from, to := m.Range()
	n := 0
	if f, path, err := openRecords(dir); err == nil {
		var serr error
		n, _, serr = ScanRecords(f, path, m, func(Record, string) error { return nil })
		f.Close()
		if serr != nil {
			return fmt.Errorf("%s is incomplete and its records do not verify: %w", dir, serr)
		}
	}
	if n != to-from {
		return fmt.Errorf("%s is incomplete: %d of %s (resume it first)", dir, n, plural.Count(to-from, "realisation"))
	}
	return fmt.Errorf("%s holds every realisation but was not sealed with the digest of its records (the run stopped before it closed): resume it once to seal it", dir)
}

// Scan reads the records of every shard in index order and calls fn with
// each record and its row (the text with its newline), verifying each row
// (ScanRecords) and each shard against the digest in its manifest. The
// digest of a shard is checked after its last row, so on an error fn has
// seen rows that do not verify: whatever fn made of them must be
// discarded. An error of fn stops the scan and is returned as it is.
func (g *Merged) Scan(fn func(rec Record, row string) error) error {
	for _, s := range g.shards {
		if err := checkNotWriting(s.dir); err != nil {
			return err
		}
		f, path, err := openRecords(s.dir)
		if err != nil {
			return err
		}
		_, _, err = ScanRecords(f, path, s.m, fn)
		f.Close()
		if err != nil {
			return err
		}
	}
	return nil
}

// WriteRun writes the merged ensemble to dir as one unsharded run, under
// the directory's lock: the rows of the shards copied in index order as
// Scan verifies them (each passed to each, if not nil), then the manifest
// with the digest of the records. The records file is written whole or
// not at all: a row or shard that does not verify leaves dir without it.
func (g *Merged) WriteRun(dir string, each func(Record)) error {
	return writeRun(dir, g.Manifest, func(emit func(string) error) error {
		return g.Scan(func(rec Record, row string) error {
			if each != nil {
				each(rec)
			}
			return emit(row)
		})
	})
}

// Merge combines the directories of the shards of one ensemble (in any
// order) and returns the manifest and records of the whole ensemble, as one
// unsharded run would have them (see OpenShards). It holds every record;
// Merged.Scan and Merged.WriteRun merge in bounded memory.
func Merge(dirs []string) (Manifest, []Record, error) {
	g, err := OpenShards(dirs)
	if err != nil {
		return Manifest{}, nil, err
	}
	recs := make([]Record, 0, g.Manifest.Samples)
	if err := g.Scan(func(rec Record, _ string) error { recs = append(recs, rec); return nil }); err != nil {
		return Manifest{}, nil, err
	}
	return g.Manifest, recs, nil
}

func sameSummary(a, b Manifest) bool {
	return a.Confidence == b.Confidence && (a.YieldSpec == nil) == (b.YieldSpec == nil) &&
		(a.YieldSpec == nil || *a.YieldSpec == *b.YieldSpec)
}

// WriteRun writes a whole run (manifest and records) to dir under its lock,
// each file whole or not at all (the records first, then the manifest
// with their digest). The manifest keeps the build that wrote the records.
func WriteRun(dir string, m Manifest, recs []Record) error {
	_, rin, phase := m.layout()
	return writeRun(dir, m, func(emit func(string) error) error {
		for _, r := range recs {
			if err := emit(r.format(rin, phase)); err != nil {
				return err
			}
		}
		return nil
	})
}

// writeRun writes the run m describes to dir under its lock, the records
// file streamed from rows (which calls emit with each row in index order)
// and hashed as it is written, then the manifest, with the digest when the
// rows cover the run's range. An error of rows is returned as it is.
func writeRun(dir string, m Manifest, rows func(emit func(row string) error) error) error {
	unlock, err := LockDir(dir)
	if err != nil {
		return err
	}
	defer unlock()
	if _, err := os.Lstat(filepath.Join(dir, RealisationsFile)); err == nil {
		return fmt.Errorf("%s already holds a run; choose another directory", dir)
	}
	var h hash.Hash
	n := 0
	var rowsErr error
	err = atomicfile.Write(filepath.Join(dir, RealisationsFile), func(w io.Writer) error {
		h = sha256.New()
		bw := bufio.NewWriterSize(io.MultiWriter(w, h), 1<<16)
		if _, err := bw.WriteString(strings.Join(m.Columns, ",") + "\n"); err != nil {
			return err
		}
		rowsErr = rows(func(row string) error {
			n++
			_, err := bw.WriteString(row)
			return err
		})
		if rowsErr != nil {
			return rowsErr
		}
		return bw.Flush()
	})
	if rowsErr != nil {
		return rowsErr
	}
	if err != nil {
		return err
	}
	if from, to := m.Range(); n == to-from {
		m.RecordsSHA256 = hex.EncodeToString(h.Sum(nil))
	}
	return writeJSON(filepath.Join(dir, ManifestFile), m)
}
