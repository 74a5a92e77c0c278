package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"rampart/cmd/internal/present"
	"strings"
	"syscall"
	"testing"

	"rampart/mc"
)

// TestHugeCounts: sample counts and shards whose index arithmetic overflowed
// int64 (and panicked) are refused with exit 2 and one line.
func TestHugeCounts(t *testing.T) {
	out := filepath.Join(t.TempDir(), "out")
	for _, c := range []struct {
		name string
		args []string
		want string
	}{
		{"2^62 samples, shard 3/4", []string{"--samples", "4611686018427387904", "--shard", "3/4", "--out", out}, "--samples 4611686018427387904: at most 1000000000 realisations"},
		{"2^63-1 samples, shard 2/2", []string{"--samples", "9223372036854775807", "--shard", "2/2", "--out", out}, "at most 1000000000 realisations"},
		{"shard beyond int", []string{"--shard", "1/99999999999999999999", "--out", out}, `shard "1/99999999999999999999" is not k/n`},
		{"shard without --out", []string{"--shard", "1/2"}, "--shard 1/2 needs --out DIR"},
		{"sites", []string{"--set", "ring.sites=9223372036854775807"}, "ring.sites = 9223372036854775807 is out of range: want an integer from 1 to 4096"},
	} {
		_, stderr, code := execute(t, append([]string{"run", "--scenario", ensembleScenario}, c.args...)...)
		if code != 2 || strings.Count(stderr, "\n") != 1 || !strings.Contains(stderr, c.want) {
			t.Errorf("%s: exit %d, stderr %q; want exit 2 and one line containing %q", c.name, code, stderr, c.want)
		}
	}
	if _, err := os.Stat(out); err == nil {
		t.Errorf("a refused run created %s", out)
	}
	_, stderr, code := execute(t, "sensitivity", "--scenario", ensembleScenario, "--base", "99999999999")
	if code != 2 || !strings.Contains(stderr, "--base 99999999999: at most 10000000 base rows") {
		t.Errorf("sensitivity --base 99999999999: exit %d, stderr %q", code, stderr)
	}
	// More workers than realisations idle; 2^63-1 of them must not be started.
	if _, stderr, code := execute(t, "run", "--scenario", ensembleScenario, "--samples", "2", "--workers", "9223372036854775807"); code != 0 {
		t.Errorf("--workers 2^63-1: exit %d, stderr %q", code, stderr)
	}
}

// TestSpecialOutputs: outputs refuse devices, FIFOs and directories and
// leave them as they were; a symlink to a regular file is written through.
func TestSpecialOutputs(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "fifo")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		args []string
		want string
	}{
		{"ramp --out /dev/null", []string{"ramp", "--scenario", "testdata/scenarios/benchmark.toml", "--out", "/dev/null"}, `--out /dev/null: it is a device`},
		{"ramp --out FIFO", []string{"ramp", "--scenario", "testdata/scenarios/benchmark.toml", "--out", fifo}, "a FIFO (named pipe)"},
		{"ramp --out directory", []string{"ramp", "--scenario", "testdata/scenarios/benchmark.toml", "--out", dir}, "a directory"},
		{"shot --trace FIFO", []string{"shot", "--scenario", "testdata/scenarios/benchmark.toml", "--trace", fifo}, "a FIFO (named pipe)"},
	} {
		_, stderr, code := execute(t, c.args...)
		if code != 2 || !strings.Contains(stderr, c.want) || !strings.Contains(stderr, "replaces only regular files") {
			t.Errorf("%s: exit %d, stderr %q, want exit 2 and %q", c.name, code, stderr, c.want)
		}
	}
	if fi, err := os.Stat("/dev/null"); err != nil || fi.Mode()&os.ModeDevice == 0 {
		t.Fatalf("/dev/null is no longer a device")
	}
	if fi, err := os.Lstat(fifo); err != nil || fi.Mode()&os.ModeNamedPipe == 0 {
		t.Errorf("the FIFO was replaced")
	}
	target := filepath.Join(dir, "profile.csv")
	os.WriteFile(target, []byte("old"), 0o644)
	link := filepath.Join(dir, "link.csv")
	os.Symlink(target, link)
	if _, stderr, code := execute(t, "ramp", "--scenario", "testdata/scenarios/benchmark.toml", "--out", link); code != 0 {
		t.Fatalf("ramp --out link: %s", stderr)
	}
	if b, _ := os.ReadFile(target); !strings.HasPrefix(string(b), "t_s,") {
		t.Errorf("the link's target holds %.20q, want the profile", b)
	}
}

// TestSpecialInputs: a scenario that is a device or FIFO is refused at once.
func TestSpecialInputs(t *testing.T) {
	fifo := filepath.Join(t.TempDir(), "s.toml")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	for _, path := range []string{"/dev/zero", fifo} {
		_, stderr, code := execute(t, "shot", "--scenario", path)
		if code != 2 || !strings.Contains(stderr, "not a regular file") {
			t.Errorf("%s: exit %d, stderr %q", path, code, stderr)
		}
	}
	_, stderr, code := execute(t, "qualify", "--scenario", ensembleScenario, "--spec", "nope.toml")
	if code != 2 || !strings.Contains(stderr, `spec "nope.toml": cannot read the spec file (--spec; a TOML file of [contrast], [bias], [yield] or [scale_factor] criteria, README: Spec reference): no such file or directory`) {
		t.Errorf("missing spec: exit %d, stderr %q", code, stderr)
	}
}

// TestMergeTakesSpecFromShards: shards run with a yield spec and confidence
// merge to the unsharded summary without repeating the flags.
func TestMergeTakesSpecFromShards(t *testing.T) {
	dir := t.TempDir()
	args := []string{"run", "--scenario", ensembleScenario, "--samples", "6", "--seed", "4", "--min-contrast", "0.95", "--confidence", "0.9"}
	want, stderr, code := execute(t, append(args, "--json")...)
	if code != 0 {
		t.Fatal(stderr)
	}
	var shards []string
	for _, k := range []string{"1/2", "2/2"} {
		d := filepath.Join(dir, k[:1])
		if _, stderr, code := execute(t, append(args, "--shard", k, "--out", d)...); code != 0 {
			t.Fatalf("shard %s: %s", k, stderr)
		}
		shards = append(shards, d)
	}
	got, stderr, code := execute(t, append([]string{"merge", "--json"}, shards...)...)
	if code != 0 {
		t.Fatal(stderr)
	}
	if got != want {
		t.Errorf("merge without spec flags:\n%s\nwant the unsharded summary\n%s", got, want)
	}
	var sum struct {
		Yield *struct{ Inside int } `json:"yield"`
	}
	if json.Unmarshal([]byte(got), &sum); sum.Yield == nil {
		t.Errorf("merged summary has no yield: %s", got)
	}

	// A shard summarised with another yield spec and confidence merges
	// when the merged run's spec and confidence are given, to the summary
	// of an unsharded run with them.
	other := filepath.Join(dir, "other2")
	if _, stderr, code := execute(t, "run", "--scenario", ensembleScenario, "--samples", "6", "--seed", "4", "--shard", "2/2", "--out", other); code != 0 {
		t.Fatalf("shard 2/2 without a spec: %s", stderr)
	}
	mixed := []string{"merge", "--json", shards[0], other}
	if _, stderr, code := execute(t, mixed...); code != 2 || !strings.Contains(stderr, "was summarised with another yield spec or confidence") {
		t.Errorf("mixed summaries without flags: exit %d, stderr %q; want the refusal", code, stderr)
	}
	got, stderr, code = execute(t, append(mixed, "--min-contrast", "0.95", "--confidence", "0.9")...)
	if code != 0 || got != want {
		t.Errorf("mixed summaries with the spec and confidence given: exit %d, stderr %q\n%s\nwant the unsharded summary\n%s", code, stderr, got, want)
	}

	// A flipped digit in a shard's row is refused naming file and line,
	// and the refused merge leaves no --out directory behind.
	path := filepath.Join(shards[1], mc.RealisationsFile)
	b, _ := os.ReadFile(path)
	lines := strings.Split(string(b), "\n")
	lines[2] = strings.Replace(lines[2], "0.9", "0.8", 1)
	os.WriteFile(path, []byte(strings.Join(lines, "\n")), 0o644)
	out := filepath.Join(dir, "merged")
	_, stderr, code = execute(t, append([]string{"merge", "--out", out}, shards...)...)
	if code != 2 || !strings.Contains(stderr, path+" line 3: checksum") {
		t.Errorf("corrupted shard: exit %d, stderr %q", code, stderr)
	}
	if _, err := os.Lstat(out); err == nil {
		entries, _ := os.ReadDir(out)
		t.Errorf("a refused merge left %s behind, holding %d entries", out, len(entries))
	}
	_, stderr, code = execute(t, append(args, "--shard", "2/2", "--resume", shards[1])...)
	if code != 2 || !strings.Contains(stderr, path+" line 3: checksum") {
		t.Errorf("resume of a corrupted shard: exit %d, stderr %q", code, stderr)
	}
}

// TestManifestRecordsBuildAndNumerics: the manifest names the build, the
// numerics, the yield spec and the digest of the records.
func TestManifestRecordsBuildAndNumerics(t *testing.T) {
	out := filepath.Join(t.TempDir(), "out")
	if _, stderr, code := execute(t, "run", "--scenario", ensembleScenario, "--samples", "3", "--min-contrast", "0.9", "--out", out); code != 0 {
		t.Fatal(stderr)
	}
	m, err := mc.ReadManifest(out)
	if err != nil {
		t.Fatal(err)
	}
	if m.Rampart != testBuild || m.Numerics == nil || m.Numerics.Grid == 0 || !(m.Numerics.StepS > 0) ||
		m.YieldSpec == nil || m.YieldSpec.MinContrast != 0.9 || len(m.RecordsSHA256) != 64 {
		t.Errorf("manifest %+v", m)
	}
	sum, _ := os.ReadFile(filepath.Join(out, present.SummaryFile))
	if !strings.HasPrefix(string(sum), "{\n  \"rampart\": {\n    \"version\": \"test\",") {
		t.Errorf("summary.json does not start with the build: %.80s", sum)
	}
}

// TestReportNamesBuild: an HTML report says which build produced it.
func TestReportNamesBuild(t *testing.T) {
	dir := t.TempDir()
	if _, stderr, code := execute(t, "run", "--scenario", ensembleScenario, "--samples", "2", "--report", dir); code != 0 {
		t.Fatal(stderr)
	}
	b, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil || !strings.Contains(string(b), "<dd>by rampart test (revision test)</dd>") {
		t.Errorf("report does not name the build (%v)", err)
	}
}
