package mc

import (
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"syscall"

	"rampart/internal/atomicfile"
	"rampart/internal/boundedread"
	"rampart/internal/version"
)

// Names of the files of an ensemble directory.
const (
	ManifestFile     = "manifest.json"
	RealisationsFile = "realisations.csv"
)

// maxRowBytes bounds one row of a records file: an index and up to a few
// dozen shortest-round-trip float64 fields of at most 24 bytes.
const maxRowBytes = 4096

// Store streams the records of a run to its directory. It holds the
// directory's lock (see LockDir) from Create or Resume to Close.
type Store struct {
	dir    string
	m      Manifest
	f      *os.File
	rin    bool
	phas   bool
	n      int // records in the file
	unlock func() error
}

// Create starts a new run in dir (created if missing). It takes the
// directory's lock first, refuses a directory that already holds a run, and
// only then writes the manifest (stamped with this build) and the header of
// the records file.
func Create(dir string, m Manifest) (_ *Store, err error) {
	unlock, err := LockDir(dir)
	if err != nil {
		return nil, err
	}
	defer func() {
		if err != nil {
			unlock()
		}
	}()
	path := filepath.Join(dir, RealisationsFile)
	if _, err := os.Lstat(path); err == nil {
		return nil, fmt.Errorf("%s already holds a run (use --resume %s to continue it, or another directory)", dir, dir)
	}
	m.Rampart = version.Get()
	m.RecordsSHA256 = ""
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
	return &Store{dir: dir, m: m, f: f, rin: rin, phas: phase, unlock: unlock}, nil
}

// Resume reopens the run in dir, which must be of the ensemble m describes
// and written by this build, and returns the records already done. A run
// of the random sampler, unsharded, may be topped up: m may ask for more
// samples than the run holds (its manifest is then rewritten, unsealed,
// before any row is added). The looks recorded (Manifest.Looks) are kept. It
// takes the directory's lock first. A torn last row (from a kill during a
// write) is dropped and will be run again; any other row that does not
// verify (checksum, order, physical range) is refused naming its line.
func Resume(dir string, m Manifest) (_ *Store, _ []Record, err error) {
	if fi, err := os.Stat(dir); err != nil || !fi.IsDir() {
		return nil, nil, fmt.Errorf("cannot resume %s: it is not an ensemble directory", dir)
	}
	if _, err := os.Lstat(filepath.Join(dir, LockFile)); err != nil && !HasRun(dir) {
		// Neither a run nor one being started (whose writer holds the
		// lock, and is named below): refused before the lock, which would
		// leave a lock file in a directory that is not a run.
		return nil, nil, fmt.Errorf("cannot resume %s: it is not an ensemble directory (no %s)", dir, ManifestFile)
	}
	unlock, err := LockDir(dir)
	if err != nil {
		return nil, nil, err
	}
	defer func() {
		if err != nil {
			unlock()
		}
	}()
	m.Rampart = version.Get()
	m.RecordsSHA256 = ""
	old, recs, valid, err := read(dir)
	if err != nil {
		return nil, nil, err
	}
	grown := m.Samples != old.Samples
	if grown {
		if err := canTopUp(old, m); err != nil {
			return nil, nil, fmt.Errorf("cannot resume %s: it holds %v", dir, err)
		}
		old.Samples = m.Samples
	}
	if err := m.sameEnsemble(old); err != nil {
		return nil, nil, fmt.Errorf("cannot resume %s: it holds %v", dir, err)
	}
	m.Looks = old.Looks
	if (old.Shard == nil) != (m.Shard == nil) || (old.Shard != nil && *old.Shard != *m.Shard) {
		return nil, nil, fmt.Errorf("cannot resume %s: it holds a different shard", dir)
	}
	path := filepath.Join(dir, RealisationsFile)
	if err := os.Truncate(path, valid); err != nil {
		return nil, nil, err
	}
	if grown { // unsealed before a row is added, so that an interrupted top-up resumes
		if err := writeJSON(filepath.Join(dir, ManifestFile), m); err != nil {
			return nil, nil, err
		}
	}
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_APPEND, 0o644)
	if err != nil {
		return nil, nil, err
	}
	_, rin, phase := m.layout()
	return &Store{dir: dir, m: m, f: f, rin: rin, phas: phase, n: len(recs), unlock: unlock}, recs, nil
}

// Append writes one record.
func (s *Store) Append(r Record) error {
	if _, err := s.f.WriteString(r.format(s.rin, s.phas)); err != nil {
		return err
	}
	s.n++
	return nil
}

// Close closes the records file; when the run is complete it seals it,
// writing the digest of the records into the manifest. It then releases
// the directory's lock.
func (s *Store) Close() error {
	defer s.unlock()
	err := s.f.Sync()
	if cerr := s.f.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		return err
	}
	if from, to := s.m.Range(); s.n != to-from {
		return nil
	}
	sum, err := fileSHA256(filepath.Join(s.dir, RealisationsFile))
	if err != nil {
		return err
	}
	m := s.m
	m.RecordsSHA256 = sum
	return writeJSON(filepath.Join(s.dir, ManifestFile), m)
}

func fileSHA256(path string) (string, error) {
	f, err := os.Open(path)
	if err != nil {
		return "", err
	}
	defer f.Close()
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return "", err
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// Read returns the manifest and records of an ensemble directory, each row
// verified (see ReadRecords).
func Read(dir string) (Manifest, []Record, error) {
	m, recs, _, err := read(dir)
	return m, recs, err
}

// RecordLook records in the manifest of the run in dir that it was
// qualified at look (Manifest.Looks becomes look if that is more), under
// the directory's lock.
func RecordLook(dir string, look int) error {
	unlock, err := LockDir(dir)
	if err != nil {
		return err
	}
	defer unlock()
	m, err := ReadManifest(dir)
	if err != nil {
		return err
	}
	if look <= m.Looks {
		return nil
	}
	m.Looks = look
	return writeJSON(filepath.Join(dir, ManifestFile), m)
}

// ReadManifest reads and checks the manifest of an ensemble directory.
func ReadManifest(dir string) (Manifest, error) {
	var m Manifest
	path := filepath.Join(dir, ManifestFile)
	b, err := boundedread.ReadFile(path, boundedread.TextCap)
	if err != nil {
		return m, fmt.Errorf("%s is not an ensemble directory: %s: %w", dir, ManifestFile, unwrapPathError(err))
	}
	if err := json.Unmarshal(b, &m); err != nil {
		return m, fmt.Errorf("%s: not a manifest: %v", path, err)
	}
	if err := m.validate(); err != nil {
		return m, fmt.Errorf("%s: %w", path, err)
	}
	return m, nil
}

// read returns the manifest, the records in order and the byte length of
// the valid prefix of the realisations file.
func read(dir string) (Manifest, []Record, int64, error) {
	m, err := ReadManifest(dir)
	if err != nil {
		return m, nil, 0, err
	}
	f, path, err := openRecords(dir)
	if err != nil {
		return m, nil, 0, err
	}
	defer f.Close()
	recs, valid, err := ReadRecords(f, path, m)
	return m, recs, valid, err
}

// openRecords opens the records file of the run in dir for reading,
// refusing anything but a regular file (a FIFO would block the reader). It
// returns the file and its path.
func openRecords(dir string) (*os.File, string, error) {
	path := filepath.Join(dir, RealisationsFile)
	f, err := os.OpenFile(path, os.O_RDONLY|syscall.O_NONBLOCK, 0)
	if err != nil {
		return nil, path, fmt.Errorf("%s: %w", dir, err)
	}
	if fi, err := f.Stat(); err != nil || !fi.Mode().IsRegular() {
		f.Close()
		return nil, path, fmt.Errorf("%s is not a regular file", path)
	}
	return f, path, nil
}

// ReadRecords reads a records file of the run m describes from r; name
// labels errors. It verifies every row as ScanRecords does and returns the
// records and the byte length of the verified prefix. It holds every
// record (about 200 bytes each with its inputs): readers of large runs use
// ScanRecords.
func ReadRecords(r io.Reader, name string, m Manifest) ([]Record, int64, error) {
	var recs []Record
	_, valid, err := ScanRecords(r, name, m, func(rec Record, _ string) error {
		recs = append(recs, rec)
		return nil
	})
	if err != nil {
		return nil, 0, err
	}
	return recs, valid, nil
}

// ScanRecords reads a records file of the run m describes from r, row by
// row, and calls fn with each verified record and its row (the text with
// its newline); name labels errors. It holds one row at a time, so a file
// of any length is read in bounded memory.
//
// Each row must carry a valid checksum, be in index order within the run's
// range and hold physical values (Record.check); the first row that does
// not is refused naming its line. A torn last row without its newline is
// dropped. It returns the number of rows and the byte length of the
// verified prefix. An error of fn stops the scan and is returned as it is.
//
// If m carries a digest (a sealed run) the file must hold every row and match
// the digest: a sealed file that lost its tail is refused, not resumed. The
// digest is known only at the end, so fn has seen every row of a file that
// then fails it: a caller that writes what fn is given must discard it on
// an error (as Merged.WriteRun does).
func ScanRecords(r io.Reader, name string, m Manifest, fn func(rec Record, row string) error) (int, int64, error) {
	if err := m.validate(); err != nil {
		return 0, 0, fmt.Errorf("%s: %w", name, err)
	}
	h := sha256.New()
	br := bufio.NewReaderSize(io.TeeReader(r, h), maxRowBytes)
	header, err := readRow(br)
	if err != nil || strings.TrimSuffix(header, "\n") != strings.Join(m.Columns, ",") {
		return 0, 0, fmt.Errorf("%s: header does not match the manifest's columns", name)
	}
	valid := int64(len(header))
	nIn, rin, phase := m.layout()
	from, to := m.Range()
	n := 0
	torn := false
	for line := 2; ; line++ {
		s, err := readRow(br)
		if err == io.EOF {
			torn = s != "" // a torn row without its newline is dropped
			break
		}
		if err != nil {
			return 0, 0, fmt.Errorf("%s line %d: %v", name, line, err)
		}
		rec, perr := parseRecord(s, nIn, rin, phase)
		if perr != nil {
			return 0, 0, fmt.Errorf("%s line %d: %v", name, line, perr)
		}
		if want := from + n; rec.Index != want || rec.Index >= to {
			return 0, 0, fmt.Errorf("%s line %d: realisation %d out of order (want %d, range [%d, %d))", name, line, rec.Index, want, from, to)
		}
		if err := fn(rec, s); err != nil {
			return 0, 0, err
		}
		n++
		valid += int64(len(s))
	}
	if m.RecordsSHA256 != "" { // sealed: complete, and byte for byte as sealed
		if got := hex.EncodeToString(h.Sum(nil)); torn || n != to-from || got != m.RecordsSHA256 {
			return 0, 0, fmt.Errorf("%s does not match the digest in its manifest (SHA-256 %s, manifest %s): the file changed after the run finished", name, got, excerpt(m.RecordsSHA256))
		}
	}
	return n, valid, nil
}

// readRow reads one line of at most maxRowBytes, with its newline. At the
// end of the input it returns what is left (a torn row) with io.EOF.
func readRow(br *bufio.Reader) (string, error) {
	b, err := br.ReadSlice('\n')
	if errors.Is(err, bufio.ErrBufferFull) {
		return "", fmt.Errorf("row longer than %d bytes", maxRowBytes)
	}
	s := string(b)
	if err == nil && bytes.IndexByte(b, 0) >= 0 {
		return "", errors.New("row holds a NUL byte")
	}
	return s, err
}

func writeJSON(path string, v any) error {
	b, err := json.MarshalIndent(v, "", "  ")
	if err != nil {
		return err
	}
	return atomicfile.WriteFile(path, append(b, '\n'))
}
