package mc

import (
	"bytes"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"testing"
)

// testShards writes the ensemble m as count sealed shards under root and
// returns their directories in shard order.
func testShards(t *testing.T, root string, m Manifest, count int) []string {
	t.Helper()
	var dirs []string
	for k := 1; k <= count; k++ {
		mk := m
		mk.Shard = &Shard{k, count}
		d := filepath.Join(root, strconv.Itoa(k))
		writeTestRun(t, d, mk)
		dirs = append(dirs, d)
	}
	return dirs
}

// TestMergedWriteRunStreams: the rows streamed shard by shard give the
// file, manifest and columns of the unsharded run written by Store, and
// the in-memory Merge the same records.
func TestMergedWriteRunStreams(t *testing.T) {
	root := t.TempDir()
	m := testManifest(11)
	one := filepath.Join(root, "one")
	want := writeTestRun(t, one, m)
	dirs := testShards(t, root, m, 3)
	g, err := OpenShards([]string{dirs[2], dirs[0], dirs[1]}) // any order
	if err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(root, "merged")
	o := NewOutcomes(0)
	if err := g.WriteRun(out, o.Add); err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{RealisationsFile, ManifestFile} {
		a, _ := os.ReadFile(filepath.Join(out, f))
		b, _ := os.ReadFile(filepath.Join(one, f))
		if !bytes.Equal(a, b) {
			t.Errorf("merged %s differs from the unsharded run's:\n%s\nwant\n%s", f, a, b)
		}
	}
	if !reflect.DeepEqual(o, OutcomesOf(want)) {
		t.Errorf("streamed columns %+v differ from those of the records", o)
	}
	_, recs, err := Merge(dirs)
	if err != nil || !reflect.DeepEqual(recs, want) {
		t.Errorf("Merge: %d records, %v; want the %d written", len(recs), err, len(want))
	}
}

// TestMergeTiling: shards that leave a realisation out or hold one twice
// are refused from their manifests, naming the realisation.
func TestMergeTiling(t *testing.T) {
	root := t.TempDir()
	m := testManifest(9)
	dirs := testShards(t, root, m, 3) // [0, 3), [3, 6), [6, 9)
	for _, c := range []struct {
		name string
		dirs []string
		want string
	}{
		{"gap", []string{dirs[0], dirs[2]}, "realisation 3 is in none of the shards (the next, " + dirs[2] + ", starts at 6)"},
		{"tail missing", []string{dirs[0], dirs[1]}, "realisation 6 is in none of the shards"},
		{"twice", []string{dirs[0], dirs[1], dirs[1], dirs[2]}, "realisation 3 appears in more than one shard: " + dirs[1] + " and " + dirs[1] + " both hold it"},
	} {
		if _, err := OpenShards(c.dirs); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want %q", c.name, err, c.want)
		}
	}
}

// TestMergedWriteRunLeavesNothing: a row that fails its checksum in the
// last shard, found after the rows before it were copied, leaves the
// output directory without a records file or manifest.
func TestMergedWriteRunLeavesNothing(t *testing.T) {
	root := t.TempDir()
	dirs := testShards(t, root, testManifest(6), 2)
	path := filepath.Join(dirs[1], RealisationsFile)
	b, _ := os.ReadFile(path)
	i := bytes.LastIndex(b, []byte(",0.9"))
	b[i+3] = '8' // one digit of the last row's contrast
	os.WriteFile(path, b, 0o644)
	g, err := OpenShards(dirs)
	if err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(root, "merged")
	err = g.WriteRun(out, nil)
	if err == nil || !strings.Contains(err.Error(), "line 4: checksum") {
		t.Errorf("got %v, want the altered row refused naming its line", err)
	}
	for _, f := range []string{RealisationsFile, ManifestFile} {
		if _, err := os.Stat(filepath.Join(out, f)); err == nil {
			t.Errorf("%s written by a merge that failed", f)
		}
	}
}

// TestTopUp: an unsharded random-sampler run grows on resume with more
// samples (its manifest unsealed at once, so that an interrupted top-up
// resumes), keeps its looks and seals again at the new size; other runs
// are refused.
func TestTopUp(t *testing.T) {
	dir := t.TempDir()
	m := testManifest(4)
	writeTestRun(t, dir, m)
	if err := RecordLook(dir, 1); err != nil {
		t.Fatal(err)
	}
	big := testManifest(7)
	st, recs, err := Resume(dir, big)
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) != 4 {
		t.Fatalf("resumed %d records, want the 4 of the run", len(recs))
	}
	if got, err := ReadManifest(dir); err != nil || got.Samples != 7 || got.RecordsSHA256 != "" || got.Looks != 1 {
		t.Errorf("manifest while topping up: %+v, %v; want 7 samples, unsealed, 1 look", got, err)
	}
	st.Append(testRecord(4)) // interrupted after one row
	st.Close()
	st, recs, err = Resume(dir, big)
	if err != nil || len(recs) != 5 {
		t.Fatalf("resume of an interrupted top-up: %d records, %v", len(recs), err)
	}
	st.Append(testRecord(5))
	st.Append(testRecord(6))
	if err := st.Close(); err != nil {
		t.Fatal(err)
	}
	got, recs, err := Read(dir)
	if err != nil || len(recs) != 7 || got.RecordsSHA256 == "" || got.Looks != 1 {
		t.Errorf("topped-up run: %d records, digest %q, %d looks, %v; want 7, sealed, 1", len(recs), got.RecordsSHA256, got.Looks, err)
	}

	for _, c := range []struct {
		name string
		old  func(*Manifest)
		newN int
		want string
	}{
		{"shrink", func(*Manifest) {}, 3, "an ensemble grows, it does not shrink"},
		{"lhs", func(m *Manifest) { m.Sampler = "lhs" }, 6, "only a random-sampler ensemble is topped up"},
		{"shard", func(m *Manifest) { m.Shard = &Shard{1, 1} }, 6, "a shard is not topped up"},
	} {
		d := t.TempDir()
		old := testManifest(4)
		c.old(&old)
		writeTestRun(t, d, old)
		nm := old
		nm.Samples = c.newN
		if _, _, err := Resume(d, nm); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want %q", c.name, err, c.want)
		}
	}
}

// TestNextLook: the look after those recorded, a given look at or above
// the count, and a refusal below it.
func TestNextLook(t *testing.T) {
	for _, c := range []struct {
		looks, given, want int
		refused            bool
	}{
		{0, 0, 1, false}, {2, 0, 3, false}, {2, 2, 2, false}, {2, 5, 5, false}, {3, 1, 0, true},
	} {
		got, err := Manifest{Looks: c.looks}.NextLook(c.given)
		if got != c.want || (err != nil) != c.refused {
			t.Errorf("looks %d, given %d: got %d, %v; want %d (refused %v)", c.looks, c.given, got, err, c.want, c.refused)
		}
	}
}

// TestMergeUnsealedCorrupt: a shard that is not sealed and holds a row
// that does not verify is refused naming the file and line, not counted as
// holding none of its realisations.
func TestMergeUnsealedCorrupt(t *testing.T) {
	root := t.TempDir()
	dirs := testShards(t, root, testManifest(6), 2)
	m, err := ReadManifest(dirs[1])
	if err != nil {
		t.Fatal(err)
	}
	m.RecordsSHA256 = "" // as a run stopped before it closed
	if err := writeJSON(filepath.Join(dirs[1], ManifestFile), m); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dirs[1], RealisationsFile)
	b, _ := os.ReadFile(path)
	i := bytes.Index(b, []byte(",0.9"))
	b[i+3] = '8'
	os.WriteFile(path, b, 0o644)
	_, err = OpenShards(dirs)
	if err == nil || !strings.Contains(err.Error(), dirs[1]+" is incomplete and its records do not verify: "+path+" line 2: checksum") {
		t.Errorf("got %v, want the row named", err)
	}
}
