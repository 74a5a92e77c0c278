package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"rampart/cmd/internal/present"
)

// rankArgs ranks three ramps of the fast ensemble: sin2, the
// inverse-engineered ramp and the 41-row table of the same sin2 ramp.
var rankArgs = []string{"rank", "--scenario", ensembleScenario, "--ramp", "sin2=sin2", "--ramp", "inverse=inverse",
	"--ramp", "table=file:testdata/ramps/sin2-41.csv", "--samples", "100", "--seed", "3"}

// TestRankGolden pins the ranking table, with the gyroscope figures of a
// read-out given by flags.
func TestRankGolden(t *testing.T) {
	stdout, stderr, code := execute(t, append(rankArgs, "--atoms", "1e4", "--cycle-s", "1")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	golden(t, "rank-ensemble.txt", stdout)
}

// rankJSON runs rank --json and decodes the ranking.
func rankJSON(t *testing.T, args ...string) present.RankReport {
	t.Helper()
	stdout, stderr, code := execute(t, append(args, "--json")...)
	if code != 0 {
		t.Fatalf("%q: exit %d: %s", args, code, stderr)
	}
	var rep present.RankReport
	if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
		t.Fatalf("not one JSON object: %v\n%s", err, stdout)
	}
	return rep
}

// TestRankReport checks that rank --report writes one page with every
// ramp's drive, the best ramp's dynamics, the ranking and its figure, and
// each ramp's histograms.
func TestRankReport(t *testing.T) {
	dir := t.TempDir()
	if _, stderr, code := execute(t, append(rankArgs, "--report", dir)...); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	ids := append(driveFigures, "ranking")
	for _, name := range []string{"sin2", "inverse", "table"} {
		ids = append(ids, "rank-"+name+"-contrast", "rank-"+name+"-bias")
	}
	readReport(t, dir, "rampart "+strings.Join(rankArgs, " ")+" --report", ids, 13,
		"Co-moving dynamics, nominal shot (inverse)", "1. inverse", "Ensemble of table", "table = file:testdata/ramps/sin2-41.csv")
}

// TestRankJSON checks the keys issue 4 asks for and the order: at 150 us
// (0.65 trap periods) the inverse-engineered ramp keeps the atom in the
// moving ground band and the sin2 ramp does not (README, demo), a gap far
// beyond the sampling error of 100 realisations (a p05 ranking of three
// ramps needs 94 to bound each 5th percentile at 1 - 0.05/6).
func TestRankJSON(t *testing.T) {
	stdout, _, code := execute(t, append(rankArgs, "--json")...)
	if code != 0 {
		t.Fatalf("exit %d", code)
	}
	var obj struct {
		Metric  string           `json:"metric"`
		Ranking []map[string]any `json:"ranking"`
	}
	if err := json.Unmarshal([]byte(stdout), &obj); err != nil {
		t.Fatal(err)
	}
	if obj.Metric != "p05" || len(obj.Ranking) != 3 {
		t.Fatalf("metric %q with %d places, want p05 with 3", obj.Metric, len(obj.Ranking))
	}
	for _, p := range obj.Ranking {
		for _, k := range []string{"name", "value", "lo", "hi", "resolved"} {
			if _, ok := p[k]; !ok {
				t.Errorf("place %v lacks %q", p, k)
			}
		}
	}
	if first := obj.Ranking[0]; first["name"] != "inverse" || first["resolved"] != true {
		t.Errorf("first place %v, want inverse, resolved", first)
	}
}

// TestRankTie: the same ramp under two names is an exact tie on common
// random numbers, which must be reported as unresolved.
func TestRankTie(t *testing.T) {
	rep := rankJSON(t, "rank", "--scenario", ensembleScenario, "--ramp", "a=sin2", "--ramp", "b=sin2", "--samples", "8")
	for _, p := range rep.Ranking.Ranking {
		if p.Resolved || p.DiffToBest.Value != 0 {
			t.Errorf("place %d (%s): resolved %v, difference to best %v; want an unresolved tie at 0", p.Place, p.Name, p.Resolved, p.DiffToBest.Value)
		}
	}
}

// TestRankStoresRuns checks that each ramp's ensemble is the one rampart
// run gives for that ramp, byte for byte (common random numbers are the
// same seed and draws, and a run directory is a run directory), and that
// the shards of every ramp, merged, rank as one run does.
func TestRankStoresRuns(t *testing.T) {
	dir := t.TempDir()
	args := []string{"rank", "--scenario", ensembleScenario, "--ramp", "s=sin2", "--ramp", "inv=inverse", "--samples", "6", "--seed", "4"}
	one := filepath.Join(dir, "one")
	want := rankJSON(t, append(args, "--out", one)...)
	if _, stderr, code := execute(t, "run", "--scenario", ensembleScenario, "--set", "ramp.shape=inverse", "--samples", "6", "--seed", "4", "--out", filepath.Join(dir, "run")); code != 0 {
		t.Fatalf("run: %s", stderr)
	}
	for _, f := range []string{"manifest.json", "realisations.csv", "summary.json"} {
		a, _ := os.ReadFile(filepath.Join(one, "inv", f))
		b, err := os.ReadFile(filepath.Join(dir, "run", f))
		if err != nil || !bytes.Equal(a, b) {
			t.Errorf("rank's inv/%s differs from run's (%v)", f, err)
		}
	}
	for _, f := range []string{present.RankingFile, "ranking.svg", "ranking.png"} {
		if _, err := os.Stat(filepath.Join(one, f)); err != nil {
			t.Errorf("rank --out: %v", err)
		}
	}

	for _, k := range []string{"1", "2"} {
		stdout, stderr, code := execute(t, append(args, "--shard", k+"/2", "--out", filepath.Join(dir, "d"+k))...)
		if code != 0 || !strings.Contains(stdout, "rampart merge --out ALL/inv D1/inv D2/inv") {
			t.Fatalf("shard %s: exit %d, stdout %q, stderr %q", k, code, stdout, stderr)
		}
	}
	all := filepath.Join(dir, "all")
	for _, r := range []string{"s", "inv"} {
		if _, stderr, code := execute(t, "merge", "--out", filepath.Join(all, r), filepath.Join(dir, "d1", r), filepath.Join(dir, "d2", r)); code != 0 {
			t.Fatalf("merge %s: %s", r, stderr)
		}
	}
	got := rankJSON(t, append(args, "--resume", all)...)
	for i := range got.Ramps {
		got.Ramps[i].Dir = want.Ramps[i].Dir
	}
	if a, b := jsonString(got), jsonString(want); a != b {
		t.Errorf("merged shards rank as\n%s\nwant\n%s", a, b)
	}
}

// TestRankScenarioFiles ranks scenario files that differ in the ramp only,
// and refuses one that differs in more.
func TestRankScenarioFiles(t *testing.T) {
	dir := t.TempDir()
	base, err := os.ReadFile(filepath.Join(repoRoot, ensembleScenario))
	if err != nil {
		t.Fatal(err)
	}
	inverse := filepath.Join(dir, "inverse.toml")
	deeper := filepath.Join(dir, "deeper.toml")
	write := func(path, from, to string) {
		if err := os.WriteFile(path, bytes.Replace(base, []byte(from), []byte(to), 1), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	write(inverse, `shape = "sin2"`, `shape = "inverse"`)
	write(deeper, "depth_khz = 20.0", "depth_khz = 25.0")
	rep := rankJSON(t, "rank", "--scenario", ensembleScenario, inverse, "--samples", "4")
	var names []string
	for _, p := range rep.Ranking.Ranking {
		names = append(names, p.Name)
	}
	if got := strings.Join(names, ","); got != "inverse,ensemble" {
		t.Errorf("places %s, want inverse,ensemble", got)
	}
	_, stderr, code := execute(t, "rank", "--scenario", ensembleScenario, deeper, "--samples", "4")
	if code != 2 || !strings.Contains(stderr, "differs from \""+ensembleScenario+"\" in lattice.depth_khz:") {
		t.Errorf("a file differing in lattice.depth_khz: exit %d, stderr %q", code, stderr)
	}
}

// TestRankBadInput: one clear line, exit 2 and nothing written.
func TestRankBadInput(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "out")
	rank := func(args ...string) []string {
		return append([]string{"rank", "--scenario", ensembleScenario, "--samples", "2", "--out", out}, args...)
	}
	expectRefused(t, out, []refusal{
		{"one ramp", rank("--ramp", "a=sin2"), "1 ramp to rank: give at least two"},
		{"no name", rank("--ramp", "sin2", "--ramp", "b=minjerk"), "--ramp sin2: want NAME=SPEC"},
		{"unknown shape", rank("--ramp", "a=cos2", "--ramp", "b=sin2"), `--ramp a=cos2: ramp "cos2": want sin2, minjerk, inverse, inverse:DESIGN_KHZ, inverse-gap, inverse-gap:DESIGN_KHZ or file:PATH`},
		{"bad design depth", rank("--ramp", "a=inverse:-3", "--ramp", "b=sin2"), `design depth "-3": want a depth V0/h in kHz > 0`},
		{"missing ramp file", rank("--ramp", "a=file:nowhere.csv", "--ramp", "b=sin2"), `--ramp a=file:nowhere.csv: ramp file "nowhere.csv": cannot read the file`},
		{"bad name", rank("--ramp", "a/b=sin2", "--ramp", "c=minjerk"), `ramp name "a/b": want letters, digits`},
		{"taken name", rank("--ramp", "a=sin2", "--ramp", "a=minjerk"), `the name "a" is taken by --ramp a=sin2`},
		{"unknown metric", rank("--ramp", "a=sin2", "--ramp", "b=minjerk", "--metric", "p10"), `--metric "p10": want one of p05, mean, yield, bias-spread`},
		{"yield without spec", rank("--ramp", "a=sin2", "--ramp", "b=minjerk", "--metric", "yield"), "--metric yield needs the spec of a good realisation"},
		{"shard without a directory", []string{"rank", "--scenario", ensembleScenario, "--ramp", "a=sin2", "--ramp", "b=minjerk", "--shard", "1/2"}, "--shard 1/2 needs --out DIR"},
		{"resume nothing", []string{"rank", "--scenario", ensembleScenario, "--ramp", "a=sin2", "--ramp", "b=minjerk", "--resume", out}, "--resume " + out + ": no such directory"},
		{"atoms without a cycle", rank("--ramp", "a=sin2", "--ramp", "b=minjerk", "--atoms", "1e4"), "--atoms 10000 needs a cycle time too"},
		{"report of a shard", rank("--ramp", "a=sin2", "--ramp", "b=minjerk", "--shard", "1/2", "--report", filepath.Join(dir, "report")), "a shard decides nothing to report"},
	})
}

// jsonString is the compact JSON of v, for comparing JSON objects in tests.
func jsonString(v any) string {
	b, _ := json.Marshal(v)
	return string(b)
}

// TestRankMeasuredSignal checks that a ranking by |bias| p95 with a
// read-out ranks the measured signal too, labelled: at 100 atoms the
// projection noise, sigma = 1/(C sqrt(N)) about 0.1 rad (the standard
// quantum limit, docs/model.md, Gyroscope figures), dwarfs every ramp's
// true bias, so each ramp's measured p95 sits near 1.96 sigma (the normal
// quantile, Abramowitz & Stegun table 26.1) at the ramp's contrast, while
// the true ranking is unchanged and a contrast metric has no measured one.
func TestRankMeasuredSignal(t *testing.T) {
	args := append(append([]string(nil), rankArgs...), "--atoms", "100", "--cycle-s", "1")
	rep := rankJSON(t, append(args, "--metric", "bias-spread")...)
	if rep.MeasuredSignal == nil {
		t.Fatal("no ranking of the measured signal")
	}
	byName := map[string]present.RampReport{}
	for _, r := range rep.Ramps {
		byName[r.Name] = r
	}
	for i, p := range rep.MeasuredSignal.Ranking {
		r := byName[p.Name]
		c := r.Summary.Contrast.Mean
		want := 1.959964 / (c * 10)
		if !(p.Lo <= want && want <= p.Hi) {
			t.Errorf("%s: measured |bias| p95 %.4g in [%.4g, %.4g], want it to hold 1.96/(C sqrt(N)) = %.4g", p.Name, p.Value, p.Lo, p.Hi, want)
		}
		if p.Value <= rep.Ranking.Ranking[i].Value && p.Value <= r.AbsBiasP95Rad {
			t.Errorf("%s: measured p95 %.3g not above the true %.3g", p.Name, p.Value, r.AbsBiasP95Rad)
		}
		if r.Summary.Measured == nil {
			t.Errorf("%s: summary without the measured signal", p.Name)
		}
	}
	if rep := rankJSON(t, args...); rep.MeasuredSignal != nil {
		t.Error("a p05 ranking has a measured one")
	}
	stdout, stderr, code := execute(t, append(args, "--metric", "bias-spread")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	for _, want := range []string{"By the true (simulated) signal:", "By the measured signal (projection noise of 100 atoms"} {
		if !strings.Contains(stdout, want) {
			t.Errorf("output lacks %q", want)
		}
	}
}

// TestRankLostShots: with photon scattering at 20 /s per arm (set by
// rate, the wavelength's rule off) many shots are lost, and the table
// shows how many per ramp, the count the JSON summary carries.
func TestRankLostShots(t *testing.T) {
	args := append(append([]string{}, rankArgs[:len(rankArgs)-4]...), "--samples", "100", "--seed", "3",
		"--set", "lattice.scattering_plus_per_s=20", "--set", "lattice.scattering_minus_per_s=20")
	rep := rankJSON(t, args...)
	lost := rep.Ramps[0].Summary.Lost
	if lost == 0 || lost == 100 {
		t.Fatalf("%d of 100 shots lost: the test needs some", lost)
	}
	stdout, stderr, code := execute(t, args...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if !strings.Contains(stdout, "Lost shots") || !strings.Contains(stdout, fmt.Sprintf(" %d (%s %%) |", lost, present.Sig(float64(lost), 2))) {
		t.Errorf("the table does not show %d lost shots per ramp:\n%s", lost, stdout)
	}
}
