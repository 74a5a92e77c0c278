package mc

import (
	"bufio"
	"bytes"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"rampart/internal/version"
)

// testManifest is a manifest of an ensemble of n records with one static
// input and no noise processes.
func testManifest(n int) Manifest {
	return Manifest{
		Format: ManifestFormat, Fingerprint: "f", Seed: 7, Samples: n, Sampler: "random",
		Numerics: &Numerics{Grid: 96, StepS: 1e-7, Levels: 1, Scheme: SplitScheme},
		Columns:  Columns([]Param{{Name: "depth_rel"}}, false, false),
	}
}

// testRecord is a physical record of index i.
func testRecord(i int) Record {
	c := 0.9 + 0.001*float64(i%50)
	return Record{Index: i, Inputs: []float64{1e-3 * float64(i)}, Contrast: c, PhaseRad: 0.1, BiasRad: -1e-4 * float64(i),
		Z: complex(c*math.Cos(0.1), c*math.Sin(0.1)), Ground: [2]float64{0.99, 0.98}}
}

// writeTestRun creates dir holding records [from, to) of m, sealed when
// complete.
func writeTestRun(t *testing.T, dir string, m Manifest) []Record {
	t.Helper()
	st, err := Create(dir, m)
	if err != nil {
		t.Fatal(err)
	}
	from, to := m.Range()
	var recs []Record
	for i := from; i < to; i++ {
		r := testRecord(i)
		if err := st.Append(r); err != nil {
			t.Fatal(err)
		}
		recs = append(recs, r)
	}
	if err := st.Close(); err != nil {
		t.Fatal(err)
	}
	return recs
}

func TestStoreRoundTripAndSeal(t *testing.T) {
	dir := t.TempDir()
	want := writeTestRun(t, dir, testManifest(20))
	m, got, err := Read(dir)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("read back %d records differing from the %d written", len(got), len(want))
	}
	if len(m.RecordsSHA256) != 64 || m.Rampart != version.Get() {
		t.Errorf("manifest not sealed or not stamped: digest %q, build %v", m.RecordsSHA256, m.Rampart)
	}
}

// TestLockHelper is not a test: TestLockTwoProcesses runs the test binary
// again with RAMPART_LOCK_HELPER set, and this holds that directory's lock
// until its standard input closes.
func TestLockHelper(t *testing.T) {
	dir := os.Getenv("RAMPART_LOCK_HELPER")
	if dir == "" {
		t.Skip("helper process for TestLockTwoProcesses")
	}
	unlock, err := LockDir(dir)
	if err != nil {
		fmt.Println("error:", err)
		os.Exit(1)
	}
	defer unlock()
	fmt.Println("locked")
	bufio.NewReader(os.Stdin).ReadString('\n') // until the parent closes stdin
}

func TestLockTwoProcesses(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "run")
	cmd := exec.Command(os.Args[0], "-test.run=^TestLockHelper$")
	cmd.Env = append(os.Environ(), "RAMPART_LOCK_HELPER="+dir)
	stdin, _ := cmd.StdinPipe()
	stdout, _ := cmd.StdoutPipe()
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	defer func() { stdin.Close(); cmd.Wait() }()
	line, _ := bufio.NewReader(stdout).ReadString('\n')
	if line != "locked\n" {
		t.Fatalf("helper said %q", line)
	}
	host, _ := os.Hostname()
	holder := fmt.Sprintf("pid %d on host %s", cmd.Process.Pid, host)

	_, err := Create(dir, testManifest(4))
	if err == nil || !strings.Contains(err.Error(), "in use by another rampart ("+holder) {
		t.Fatalf("second writer: got %v, want a refusal naming %q", err, holder)
	}
	if _, _, err := Resume(dir, testManifest(4)); err == nil || !strings.Contains(err.Error(), holder) {
		t.Errorf("resume: got %v, want a refusal naming %q", err, holder)
	}
	if err := WriteRun(dir, testManifest(4), nil); err == nil || !strings.Contains(err.Error(), holder) {
		t.Errorf("WriteRun: got %v, want a refusal naming %q", err, holder)
	}
	if err := checkNotWriting(dir); err == nil || !strings.Contains(err.Error(), "still being written") {
		t.Errorf("merge check: got %v", err)
	}
	// The refused writers wrote nothing: no manifest, no records.
	for _, f := range []string{ManifestFile, RealisationsFile} {
		if _, err := os.Stat(filepath.Join(dir, f)); err == nil {
			t.Errorf("a refused writer wrote %s", f)
		}
	}
	// A crash (SIGKILL) releases the lock: the kernel closes the file.
	cmd.Process.Kill()
	cmd.Wait()
	writeTestRun(t, dir, testManifest(4))
}

func TestLockSameProcessCounts(t *testing.T) {
	dir := t.TempDir()
	outer, err := LockDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	writeTestRun(t, dir, testManifest(3)) // Create locks again, Close releases its count
	if _, err := os.Stat(filepath.Join(dir, RealisationsFile)); err != nil {
		t.Fatal(err)
	}
	heldLocks.Lock()
	n := len(heldLocks.m)
	heldLocks.Unlock()
	if n != 1 {
		t.Errorf("%d locks held after the store closed, want the outer one", n)
	}
	outer()
	heldLocks.Lock()
	n = len(heldLocks.m)
	heldLocks.Unlock()
	if n != 0 {
		t.Errorf("%d locks held after release", n)
	}
}

// TestBitFlips flips every bit of the rows of a records file in turn. An
// unsealed file (no digest: an interrupted run) must refuse every flip
// naming the line, except a flip of a row's newline, which tears the file
// there and drops the rows after it (resume runs them again); a sealed file
// must refuse every flip.
func TestBitFlips(t *testing.T) {
	dir := t.TempDir()
	m := testManifest(6)
	want := writeTestRun(t, dir, m)
	path := filepath.Join(dir, RealisationsFile)
	orig, _ := os.ReadFile(path)
	sealed, err := ReadManifest(dir)
	if err != nil {
		t.Fatal(err)
	}
	header := bytes.IndexByte(orig, '\n') + 1
	var refused, torn, flips int
	for i := header; i < len(orig); i++ {
		for bit := range 8 {
			b := bytes.Clone(orig)
			b[i] ^= 1 << bit
			flips++
			recs, _, err := ReadRecords(bytes.NewReader(b), path, m)
			switch {
			case err != nil:
				if !strings.Contains(err.Error(), path+" line ") {
					t.Fatalf("byte %d bit %d: error %v does not name the line", i, bit, err)
				}
				refused++
			case orig[i] == '\n' && reflect.DeepEqual(recs, want[:len(recs)]) && len(recs) < len(want):
				torn++
			default:
				t.Fatalf("byte %d bit %d accepted: %d records", i, bit, len(recs))
			}
			if _, _, err := ReadRecords(bytes.NewReader(b), path, sealed); err == nil {
				t.Fatalf("byte %d bit %d accepted by the sealed reader", i, bit)
			}
		}
	}
	if refused+torn != flips || torn > 6*8 {
		t.Errorf("%d flips: %d refused, %d torn", flips, refused, torn)
	}
	t.Logf("%d single-bit flips: %d refused by the row checksums, %d tore the file at a newline; all refused when sealed", flips, refused, torn)
}

// TestUnphysicalRows checks rows with a valid checksum but values no shot
// can give.
func TestUnphysicalRows(t *testing.T) {
	m := testManifest(3)
	header := strings.Join(m.Columns, ",") + "\n"
	row := func(fields string) string { return fields + "," + rowChecksum(fields) + "\n" }
	for _, c := range []struct {
		name, row, want string
	}{
		{"contrast above 1", row("0,0,5.8,0.1,0,0.5,0,0.9,0.9"), "contrast = 5.8 is outside [0, 1]"},
		{"negative contrast", row("0,0,-3,0.1,0,0.5,0,0.9,0.9"), "contrast = -3 is outside [0, 1]"},
		{"NaN contrast", row("0,0,NaN,0.1,0,0.5,0,0.9,0.9"), "contrast is NaN, not a finite number"},
		{"infinite phase", row("0,0,0.5,+Inf,0,0.5,0,0.9,0.9"), "phase_rad is +Inf"},
		{"NaN input", row("0,NaN,0.5,0.1,0,0.5,0,0.9,0.9"), "input 1 is NaN"},
		{"|z| above 1", row("0,0,0.5,0.1,0,3,0,0.9,0.9"), "|z| = 3 is outside"},
		{"no checksum", "0,0,0.5,0.1,0,0.5,0,0.9,0.9,zz\n", "checksum \"zz\" does not match"},
		{"index out of range", row("3,0,0.5,0.1,0,0.5,0,0.9,0.9"), "realisation 3 out of order"},
		{"huge index", row("99999999999999999999,0,0.5,0.1,0,0.5,0,0.9,0.9"), "is not a non-negative integer"},
	} {
		_, _, err := ReadRecords(strings.NewReader(header+c.row), "r.csv", m)
		if err == nil || !strings.Contains(err.Error(), "r.csv line 2: ") || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want r.csv line 2: ...%s", c.name, err, c.want)
		}
	}
}

// TestDigest checks that a sealed file edited consistently (the row's
// checksum recomputed) is still refused by the digest.
func TestDigest(t *testing.T) {
	dir := t.TempDir()
	writeTestRun(t, dir, testManifest(4))
	path := filepath.Join(dir, RealisationsFile)
	b, _ := os.ReadFile(path)
	lines := strings.Split(string(b), "\n")
	f := strings.Split(lines[2], ",")
	f[3] = "0.5" // a plausible contrast
	body := strings.Join(f[:len(f)-1], ",")
	lines[2] = body + "," + rowChecksum(body)
	os.WriteFile(path, []byte(strings.Join(lines, "\n")), 0o644)
	if _, _, err := Read(dir); err == nil || !strings.Contains(err.Error(), "does not match the digest in its manifest") {
		t.Errorf("got %v, want a digest mismatch", err)
	}
}

// TestResumeRefusesOtherBuildOrNumerics runs a shard under one build and
// resumes and merges it under another, and merges shards of different
// numerics.
func TestResumeRefusesOtherBuildOrNumerics(t *testing.T) {
	root := t.TempDir()
	m := testManifest(8)
	m.Shard = &Shard{1, 2}
	a := filepath.Join(root, "a")
	restore := version.Override(version.Info{Version: "v1.0.0", Revision: "aaaa"})
	writeTestRun(t, a, m)
	restore()

	restore = version.Override(version.Info{Version: "v1.1.0", Revision: "bbbb"})
	defer restore()
	if _, _, err := Resume(a, m); err == nil || !strings.Contains(err.Error(), "records of rampart v1.0.0 (revision aaaa), not v1.1.0 (revision bbbb)") {
		t.Errorf("resume under another build: %v", err)
	}
	m2 := m
	m2.Shard = &Shard{2, 2}
	b := filepath.Join(root, "b")
	writeTestRun(t, b, m2)
	if _, _, err := Merge([]string{a, b}); err == nil || !strings.Contains(err.Error(), "records of rampart") {
		t.Errorf("merge across builds: %v", err)
	}
	m3 := m2
	n := *m.Numerics
	n.StepS = 2e-7
	m3.Numerics = &n
	c := filepath.Join(root, "c")
	writeTestRun(t, c, m3)
	if _, _, err := Merge([]string{b, c}); err == nil || !strings.Contains(err.Error(), "numerics grid 96, step 2e-07 s") {
		t.Errorf("merge across numerics: %v", err)
	}
}

func TestMergeCarriesSpecAndRefusesUnsealed(t *testing.T) {
	root := t.TempDir()
	m := testManifest(5)
	m.YieldSpec, m.Confidence = &Spec{MinContrast: 0.9}, 0.9
	var dirs []string
	for k := 1; k <= 2; k++ {
		mk := m
		mk.Shard = &Shard{k, 2}
		d := filepath.Join(root, strconv.Itoa(k))
		writeTestRun(t, d, mk)
		dirs = append(dirs, d)
	}
	got, recs, err := Merge(dirs)
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) != 5 || got.YieldSpec == nil || *got.YieldSpec != *m.YieldSpec || got.Confidence != 0.9 || got.Shard != nil {
		t.Errorf("merged manifest %+v with %d records", got, len(recs))
	}
	// An unsealed shard (every row present, closed by a crash) is refused.
	mf := filepath.Join(dirs[1], ManifestFile)
	b, _ := os.ReadFile(mf)
	b = bytes.Replace(b, []byte(`"records_sha256"`), []byte(`"unused"`), 1)
	os.WriteFile(mf, b, 0o644)
	if _, _, err := Merge(dirs); err == nil || !strings.Contains(err.Error(), "was not sealed") {
		t.Errorf("unsealed shard: %v", err)
	}
}

// TestHugeCounts checks the shard arithmetic at sizes whose products
// overflow int64, against exact integer arithmetic done by hand.
func TestHugeCounts(t *testing.T) {
	for _, c := range []struct {
		samples  int
		sh       Shard
		from, to int
	}{
		{1 << 62, Shard{3, 4}, 1 << 61, 3 << 60},                       // 2^62 * 2/4 = 2^61, 2^62 * 3/4 = 3 * 2^60
		{math.MaxInt64, Shard{2, 2}, math.MaxInt64 / 2, math.MaxInt64}, // floor((2^63-1)/2) = 2^62-1
		{10, Shard{3, 3}, 6, 10},
	} {
		if from, to := c.sh.Range(c.samples); from != c.from || to != c.to {
			t.Errorf("shard %v of %d: [%d, %d), want [%d, %d)", c.sh, c.samples, from, to, c.from, c.to)
		}
	}
	for _, s := range []string{"3/4", "1/1"} {
		if _, err := ParseShard(s); err != nil {
			t.Errorf("%s: %v", s, err)
		}
	}
	for _, s := range []string{"0/4", "5/4", "1/0", "a/b", "9999999999999999999999/1", "1/2/3", "-1/2"} {
		if _, err := ParseShard(s); err == nil {
			t.Errorf("ParseShard(%q) accepted", s)
		}
	}
	m := testManifest(MaxSamples + 1)
	if err := m.validate(); err == nil {
		t.Error("a manifest beyond MaxSamples validated")
	}
}

// FuzzReadRecords feeds arbitrary bytes to the records reader: it must not
// panic, and what it accepts must be in order and physical.
func FuzzReadRecords(f *testing.F) {
	m := testManifest(4)
	var b strings.Builder
	b.WriteString(strings.Join(m.Columns, ",") + "\n")
	for i := range 4 {
		b.WriteString(testRecord(i).format(false, false))
	}
	f.Add([]byte(b.String()))
	f.Add([]byte(strings.Join(m.Columns, ",") + "\n0,1,2\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		recs, valid, err := ReadRecords(bytes.NewReader(data), "fuzz", m)
		if err != nil {
			return
		}
		if valid > int64(len(data)) {
			t.Fatalf("valid prefix %d beyond %d bytes", valid, len(data))
		}
		for i, r := range recs {
			if r.Index != i || r.check() != nil {
				t.Fatalf("accepted record %d: %+v", i, r)
			}
		}
	})
}

// TestResumeNotARunLeavesNoLock resumes a directory that holds no run: it
// is refused, and no lock file is left in it (the lock is taken only on a
// run directory).
func TestResumeNotARunLeavesNoLock(t *testing.T) {
	dir := t.TempDir()
	if _, _, err := Resume(dir, testManifest(4)); err == nil || !strings.Contains(err.Error(), "not an ensemble directory (no manifest.json)") {
		t.Errorf("resume of an empty directory: %v", err)
	}
	if _, err := os.Stat(filepath.Join(dir, LockFile)); err == nil {
		t.Errorf("the refused resume left %s in the directory", LockFile)
	}
}
