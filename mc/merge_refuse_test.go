package mc

import (
	"path/filepath"
	"strings"
	"testing"

	"rampart/internal/version"
)

// TestMergeRefusesForeignShard: a shard that does not belong to the
// ensemble of the first is refused, naming its directory and the field in
// which it differs; so is a shard of another build, an incomplete one and
// one summarised with another spec.
func TestMergeRefusesForeignShard(t *testing.T) {
	root := t.TempDir()
	m := testManifest(8)
	dirs := testShards(t, root, m, 2)
	for _, c := range []struct {
		name  string
		alter func(*Manifest)
		want  string
	}{
		{"scenario", func(o *Manifest) { o.Fingerprint = "g" }, "a different scenario or noise budget"},
		{"seed", func(o *Manifest) { o.Seed = 8 }, "seed 8, not 7"},
		{"samples", func(o *Manifest) { o.Samples = 10 }, "10 samples, not 8"},
		{"sampler", func(o *Manifest) { o.Sampler = "lhs" }, `sampler "lhs", not "random"`},
		{"numerics", func(o *Manifest) { o.Numerics = &Numerics{Grid: 192, StepS: 1e-7, Levels: 1, Scheme: SplitScheme} }, "numerics grid 192"},
		{"columns", func(o *Manifest) { o.Columns = Columns([]Param{{Name: "skew_s"}}, false, false) }, "different columns"},
		{"spec", func(o *Manifest) { o.YieldSpec = &Spec{MinContrast: 0.5} }, "was summarised with another yield spec or confidence"},
	} {
		o := m
		c.alter(&o)
		o.Shard = &Shard{2, 2}
		d := filepath.Join(root, c.name)
		writeTestRun(t, d, o)
		_, _, err := Merge([]string{dirs[0], d})
		if err == nil || !strings.Contains(err.Error(), d) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want %s named with %q", c.name, err, d, c.want)
		}
	}

	// Another build: the shard's directory and both builds named.
	restore := version.Override(version.Info{Version: "v9.9.9", Revision: "ffff"})
	o := m
	o.Shard = &Shard{2, 2}
	d := filepath.Join(root, "build")
	writeTestRun(t, d, o)
	restore()
	if _, _, err := Merge([]string{dirs[0], d}); err == nil || !strings.Contains(err.Error(), d+" is not a shard") || !strings.Contains(err.Error(), "v9.9.9") {
		t.Errorf("another build: got %v", err)
	}

	// An incomplete shard: its directory and its count named.
	o = m
	o.Shard = &Shard{2, 2}
	d = filepath.Join(root, "short")
	st, err := Create(d, o)
	if err != nil {
		t.Fatal(err)
	}
	st.Append(testRecord(4))
	st.Close()
	if _, _, err := Merge([]string{dirs[0], d}); err == nil || !strings.Contains(err.Error(), d+" is incomplete: 1 of 4 realisations") {
		t.Errorf("incomplete shard: got %v", err)
	}

	// The same shard twice under two names.
	twin := filepath.Join(root, "twin")
	writeTestRun(t, twin, func() Manifest { o := m; o.Shard = &Shard{2, 2}; return o }())
	if _, _, err := Merge([]string{dirs[0], dirs[1], twin}); err == nil || !strings.Contains(err.Error(), "realisation 4 appears in more than one shard: "+dirs[1]+" and "+twin) {
		t.Errorf("duplicated shard: got %v", err)
	}
}
