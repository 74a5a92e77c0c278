package mc

import (
	"bufio"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"
)

// ManifestFormat names the layout of an ensemble directory.
const ManifestFormat = "rampart-ensemble/1"

// Names of the files of an ensemble directory.
const (
	ManifestFile     = "manifest.json"
	RealisationsFile = "realisations.csv"
)

// Shard is slice Index (1-based) of Count of an ensemble: the contiguous
// realisations [from, to) given by Range.
type Shard struct {
	Index int `json:"index"`
	Count int `json:"count"`
}

// Range returns the realisations of the shard in an ensemble of samples.
func (s Shard) Range(samples int) (from, to int) {
	return (s.Index - 1) * samples / s.Count, s.Index * samples / s.Count
}

// ParseShard reads "k/n" with 1 <= k <= n.
func ParseShard(s string) (Shard, error) {
	var sh Shard
	var rest string
	if n, _ := fmt.Sscanf(s, "%d/%d%s", &sh.Index, &sh.Count, &rest); n != 2 || sh.Count < 1 || sh.Index < 1 || sh.Index > sh.Count {
		return Shard{}, fmt.Errorf("shard %q is not k/n with 1 <= k <= n (e.g. 2/8)", s)
	}
	return sh, nil
}

// Manifest identifies an ensemble run: what was simulated and how it was
// drawn. Two directories belong to the same ensemble when their manifests
// agree but for the shard.
type Manifest struct {
	Format string `json:"format"`
	// Fingerprint identifies the scenario and noise budget (the caller's
	// hash of them); Scenario is their text, for the record.
	Fingerprint string `json:"fingerprint"`
	Scenario    string `json:"scenario,omitempty"`
	// SagnacRad and ScaleFactorS are those of the nominal sequence, for
	// summaries of the records.
	SagnacRad    float64  `json:"sagnac_rad"`
	ScaleFactorS float64  `json:"scale_factor_s"`
	Seed         uint64   `json:"seed"`
	Samples      int      `json:"samples"`
	Sampler      string   `json:"sampler"`
	Shard        *Shard   `json:"shard,omitempty"`
	Columns      []string `json:"columns"`
}

// Range returns the realisations the manifest's run covers.
func (m Manifest) Range() (from, to int) {
	if m.Shard == nil {
		return 0, m.Samples
	}
	return m.Shard.Range(m.Samples)
}

func (m Manifest) layout() (nInputs int, rin, phase bool) {
	for _, c := range m.Columns[1:] {
		switch c {
		case "rin_rms_rel":
			rin = true
		case "phase_rms_plus_rad":
			phase = true
		case "phase_rms_minus_rad", "contrast", "phase_rad", "bias_rad", "z_re", "z_im", "ground_plus", "ground_minus":
		default:
			nInputs++
		}
	}
	return nInputs, rin, phase
}

// sameEnsemble returns an error naming the first field in which m and o
// differ, the shard aside.
func (m Manifest) sameEnsemble(o Manifest) error {
	switch {
	case m.Format != o.Format:
		return fmt.Errorf("format %q, want %q", o.Format, m.Format)
	case m.Fingerprint != o.Fingerprint:
		return errors.New("a different scenario or noise budget")
	case m.Seed != o.Seed:
		return fmt.Errorf("seed %d, not %d", o.Seed, m.Seed)
	case m.Samples != o.Samples:
		return fmt.Errorf("%d samples, not %d", o.Samples, m.Samples)
	case m.Sampler != o.Sampler:
		return fmt.Errorf("sampler %q, not %q", o.Sampler, m.Sampler)
	case !slices.Equal(m.Columns, o.Columns):
		return errors.New("different columns")
	}
	return nil
}

// Store streams the records of a run to its directory.
type Store struct {
	dir  string
	m    Manifest
	f    *os.File
	rin  bool
	phas bool
}

// Create starts a new run in dir (created if missing). It refuses a
// directory that already holds a run.
func Create(dir string, m Manifest) (*Store, error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, err
	}
	path := filepath.Join(dir, RealisationsFile)
	if _, err := os.Stat(path); err == nil {
		return nil, fmt.Errorf("%s already holds a run (use --resume %s to continue it, or another directory)", dir, dir)
	}
	if err := writeJSON(filepath.Join(dir, ManifestFile), m); err != nil {
		return nil, err
	}
	f, err := os.OpenFile(path, os.O_CREATE|os.O_EXCL|os.O_WRONLY, 0o644)
	if err != nil {
		return nil, err
	}
	if _, err := f.WriteString(strings.Join(m.Columns, ",") + "\n"); err != nil {
		f.Close()
		return nil, err
	}
	_, rin, phase := m.layout()
	return &Store{dir: dir, m: m, f: f, rin: rin, phas: phase}, nil
}

// Resume reopens the run in dir, which must be of the ensemble m describes,
// and returns the records already done. A torn last row (from a kill
// during a write) is dropped and will be run again.
func Resume(dir string, m Manifest) (*Store, []Record, error) {
	old, recs, valid, err := read(dir)
	if err != nil {
		return nil, nil, err
	}
	if err := m.sameEnsemble(old); err != nil {
		return nil, nil, fmt.Errorf("cannot resume %s: it holds %v", dir, err)
	}
	if (old.Shard == nil) != (m.Shard == nil) || (old.Shard != nil && *old.Shard != *m.Shard) {
		return nil, nil, fmt.Errorf("cannot resume %s: it holds a different shard", dir)
	}
	path := filepath.Join(dir, RealisationsFile)
	if err := os.Truncate(path, valid); err != nil {
		return nil, nil, err
	}
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_APPEND, 0o644)
	if err != nil {
		return nil, nil, err
	}
	_, rin, phase := m.layout()
	return &Store{dir: dir, m: m, f: f, rin: rin, phas: phase}, recs, nil
}

// Append writes one record.
func (s *Store) Append(r Record) error {
	_, err := s.f.WriteString(r.format(s.rin, s.phas))
	return err
}

// Close closes the realisations file.
func (s *Store) Close() error { return s.f.Close() }

// Read returns the manifest and records of an ensemble directory.
func Read(dir string) (Manifest, []Record, error) {
	m, recs, _, err := read(dir)
	return m, recs, err
}

// read returns the manifest, the records in order and the byte length of
// the valid prefix of the realisations file.
func read(dir string) (Manifest, []Record, int64, error) {
	var m Manifest
	b, err := os.ReadFile(filepath.Join(dir, ManifestFile))
	if err != nil {
		return m, nil, 0, fmt.Errorf("%s is not an ensemble directory: %w", dir, err)
	}
	if err := json.Unmarshal(b, &m); err != nil {
		return m, nil, 0, fmt.Errorf("%s: %w", filepath.Join(dir, ManifestFile), err)
	}
	if m.Format != ManifestFormat || len(m.Columns) < 8 {
		return m, nil, 0, fmt.Errorf("%s: not a %s manifest", filepath.Join(dir, ManifestFile), ManifestFormat)
	}
	path := filepath.Join(dir, RealisationsFile)
	f, err := os.Open(path)
	if err != nil {
		return m, nil, 0, err
	}
	defer f.Close()
	br := bufio.NewReader(f)
	header, err := br.ReadString('\n')
	if err != nil || strings.TrimRight(header, "\n") != strings.Join(m.Columns, ",") {
		return m, nil, 0, fmt.Errorf("%s: header does not match the manifest's columns", path)
	}
	valid := int64(len(header))
	nIn, rin, phase := m.layout()
	from, to := m.Range()
	var recs []Record
	for line := 2; ; line++ {
		s, err := br.ReadString('\n')
		if err == io.EOF {
			break // a torn row without its newline is dropped
		}
		if err != nil {
			return m, nil, 0, err
		}
		r, perr := parseRecord(s, nIn, rin, phase)
		if perr != nil {
			return m, nil, 0, fmt.Errorf("%s line %d: %v", path, line, perr)
		}
		if want := from + len(recs); r.Index != want || r.Index >= to {
			return m, nil, 0, fmt.Errorf("%s line %d: realisation %d out of order (want %d, range [%d, %d))", path, line, r.Index, want, from, to)
		}
		recs = append(recs, r)
		valid += int64(len(s))
	}
	return m, recs, valid, nil
}

// Merge combines the directories of the shards of one ensemble (in any
// order) and returns the manifest and records of the whole ensemble, as one
// unsharded run would have them. Every realisation must be present once.
func Merge(dirs []string) (Manifest, []Record, error) {
	if len(dirs) == 0 {
		return Manifest{}, nil, errors.New("no directories to merge")
	}
	var first Manifest
	var all []Record
	for i, d := range dirs {
		m, recs, err := Read(d)
		if err != nil {
			return Manifest{}, nil, err
		}
		if i == 0 {
			first = m
		} else if err := first.sameEnsemble(m); err != nil {
			return Manifest{}, nil, fmt.Errorf("%s is not a shard of the ensemble in %s: it has %v", d, dirs[0], err)
		}
		if from, to := m.Range(); len(recs) != to-from {
			return Manifest{}, nil, fmt.Errorf("%s is incomplete: %d of %d realisations (resume it first)", d, len(recs), to-from)
		}
		all = append(all, recs...)
	}
	slices.SortFunc(all, func(a, b Record) int { return a.Index - b.Index })
	for i, r := range all {
		if r.Index != i {
			if i > 0 && all[i-1].Index == r.Index {
				return Manifest{}, nil, fmt.Errorf("realisation %d appears in more than one shard", r.Index)
			}
			return Manifest{}, nil, fmt.Errorf("realisation %d is in none of the shards", i)
		}
	}
	if len(all) != first.Samples {
		return Manifest{}, nil, fmt.Errorf("the shards hold %d of %d realisations", len(all), first.Samples)
	}
	first.Shard = nil
	return first, all, nil
}

// WriteRun writes a whole run (manifest and records) to dir, each file
// through a temporary file renamed into place.
func WriteRun(dir string, m Manifest, recs []Record) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	if _, err := os.Stat(filepath.Join(dir, RealisationsFile)); err == nil {
		return fmt.Errorf("%s already holds a run; choose another directory", dir)
	}
	_, rin, phase := m.layout()
	var b strings.Builder
	b.WriteString(strings.Join(m.Columns, ",") + "\n")
	for _, r := range recs {
		b.WriteString(r.format(rin, phase))
	}
	if err := WriteFileAtomic(filepath.Join(dir, RealisationsFile), []byte(b.String())); err != nil {
		return err
	}
	return writeJSON(filepath.Join(dir, ManifestFile), m)
}

func writeJSON(path string, v any) error {
	b, err := json.MarshalIndent(v, "", "  ")
	if err != nil {
		return err
	}
	return WriteFileAtomic(path, append(b, '\n'))
}

// WriteFileAtomic writes data to a temporary file beside path and renames
// it into place, so that path never holds a partial file.
func WriteFileAtomic(path string, data []byte) error {
	f, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".tmp*")
	if err != nil {
		return err
	}
	_, err = f.Write(data)
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err == nil {
		err = os.Chmod(f.Name(), 0o644)
	}
	if err == nil {
		err = os.Rename(f.Name(), path)
	}
	if err != nil {
		os.Remove(f.Name())
	}
	return err
}
