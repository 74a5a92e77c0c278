package main

import (
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"rampart/internal/version"
)

// TestSbatchGolden pins the script written for the README's cluster
// example at a given rate, by a build of known version.
func TestSbatchGolden(t *testing.T) {
	defer version.Override(version.Info{Version: "v1.2.3", Revision: "abc123"})()
	line := append(append([]string{}, slurmCases[0].line...), "--workers", "4", "--out", "run7", "--json")
	p, _, err := planSbatch(line, sbatchOptions{shards: 16, rate: 50, mergeTime: "01:00:00", rampart: "rampart"})
	if err != nil {
		t.Fatal(err)
	}
	p.setTime()
	var b strings.Builder
	if err := writeSbatch(&b, p); err != nil {
		t.Fatal(err)
	}
	golden(t, "sbatch-run.sh", b.String())
}

// TestSbatchPlan checks the parts of the script a scheduler acts on, from
// the command line: array size, CPUs from --workers, the time limit from
// the rate (worked by hand beside each case), the shard's and the final
// step's flags.
func TestSbatchPlan(t *testing.T) {
	for _, c := range []struct {
		name      string
		line      []string
		o         sbatchOptions
		cpus      int
		time      string
		shard     []string // the shard's flags
		final     []string // the final step's flags
		directive string   // a line the script must hold
	}{
		// 100000 / 16 = 6250 per shard at 50 x 4 per s: 31.25 s; 2 x 31.25 + 600 = 662.5 s, up to 12 min.
		{"run", []string{"run", "--scenario", "s.toml", "--samples", "100000", "--workers", "4", "--out=all", "--json"},
			sbatchOptions{shards: 16, rate: 50}, 4, "00:12:00",
			[]string{"--scenario", "s.toml", "--samples", "100000"}, []string{"--scenario", "s.toml", "--samples", "100000", "--json"}, "#SBATCH --array=1-16"},
		// 10^6 / 128 = 7813 (rounded up) at 0.1 per s, one CPU (no --workers): 78130 s; 2 x 78130 + 600 = 156860 s = 1 d 19 h 34 min 20 s, up to 1-19:35:00.
		{"qualify, no --workers", []string{"qualify", "--scenario", "s.toml", "--spec", "q.toml", "--samples", "1000000", "--out", "q", "--report", "rep"},
			sbatchOptions{shards: 128, rate: 0.1}, 1, "1-19:35:00",
			[]string{"--scenario", "s.toml", "--spec", "q.toml", "--samples", "1000000"}, []string{"--scenario", "s.toml", "--spec", "q.toml", "--samples", "1000000", "--report", "rep"}, "#SBATCH --cpus-per-task=1"},
		// --workers 0 is every core: a task claims one. 256 base rows / 4 = 64 at 1 per s: 64 s; 128 + 600 = 728 s, up to 13 min.
		{"sensitivity, --workers 0", []string{"sensitivity", "--scenario", "s.toml", "--workers", "0", "--out", "d"},
			sbatchOptions{shards: 4, rate: 1, partition: "short"}, 1, "00:13:00",
			[]string{"--scenario", "s.toml"}, []string{"--scenario", "s.toml"}, "#SBATCH --partition=short"},
		// Rank's scenario files stay; 200 / 2 = 100 at 10 x 2 per s: 5 s; 610 s, up to 11 min.
		{"rank", []string{"rank", "--scenario", "s.toml", "--ramp", "a=sin2", "other.toml", "--workers", "2", "--out", "r"},
			sbatchOptions{shards: 2, rate: 10}, 2, "00:11:00",
			[]string{"--scenario", "s.toml", "--ramp", "a=sin2", "other.toml"}, []string{"--scenario", "s.toml", "--ramp", "a=sin2", "other.toml"}, "#SBATCH --output=r.shards/slurm-%A_%a.out"},
	} {
		c.o.mergeTime, c.o.rampart = "01:00:00", "rampart"
		p, _, err := planSbatch(c.line, c.o)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		p.setTime()
		if p.CPUs != c.cpus || slurmTime(p.Time) != c.time || !slices.Equal(p.ShardArgs, c.shard) || !slices.Equal(p.FinalArgs, c.final) {
			t.Errorf("%s: %d CPUs, time %s, shard %q, final %q; want %d, %s, %q, %q", c.name, p.CPUs, slurmTime(p.Time), p.ShardArgs, p.FinalArgs, c.cpus, c.time, c.shard, c.final)
		}
		var b strings.Builder
		writeSbatch(&b, p)
		if !strings.Contains(b.String(), "\n"+c.directive+"\n") || !strings.Contains(b.String(), "\n#SBATCH --time="+c.time+"\n") {
			t.Errorf("%s: the script lacks %q or its time limit:\n%s", c.name, c.directive, b.String())
		}
	}
}

// TestSbatchRefuses: command lines that cannot run as a job array are
// refused before anything is written, saying what to do.
func TestSbatchRefuses(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "all")
	sc := []string{"--scenario", ensembleScenario}
	for _, c := range []struct {
		name string
		args []string
		want string
	}{
		{"no command", []string{"sbatch"}, "no command line given"},
		{"tolerance", []string{"sbatch", "--", "tolerance", "--out", out}, "a tolerance search is sequential"},
		{"edge", []string{"sbatch", "--", "edge", "--out", out}, "its confirmation at the found value V is rampart qualify --set KEY=V, which shards"},
		{"robust", []string{"sbatch", "--", "robust", "--out", out}, "its fresh ranking is rampart rank"},
		{"shot", []string{"sbatch", "--", "shot"}, "sbatch shot: want a command that runs ensembles"},
		{"no --out", append([]string{"sbatch", "--", "run"}, sc...), "no --out DIR"},
		{"--shard", append([]string{"sbatch", "--", "run", "--shard", "1/2", "--out", out}, sc...), "has --shard 1/2: leave it out"},
		{"--resume", append([]string{"sbatch", "--", "run", "--resume", out}, sc...), "has --resume"},
		{"noise-free scan", append([]string{"sbatch", "--", "scan", "--vary", "ring.sites=10,20", "--out", out}, sc...), "give scan --ensemble"},
		{"more shards than samples", append([]string{"sbatch", "--shards", "20", "--", "run", "--samples", "10", "--out", out}, sc...), "--shards 20: more tasks than the 10 realisations"},
		{"more shards than base rows", append([]string{"sbatch", "--shards", "20", "--", "sensitivity", "--base", "16", "--out", out}, sc...), "than the 16 base rows"},
		// 10^9 / 16 = 62.5 M per shard, over mc.MaxInProcess = 10^7: 100 shards or more.
		{"shards too large", append([]string{"sbatch", "--rate", "1", "--", "run", "--samples", "1000000000", "--out", out}, sc...), "--shards 16: shards of 62500000 realisations, more than the 10000000 one process holds; give --shards 100 or more"},
		{"bad flag in the line", []string{"sbatch", "--", "run", "--samplez", "3"}, "the command line: unknown flag: --samplez"},
		{"bad merge time", append([]string{"sbatch", "--merge-time", "1h", "--", "run", "--out", out}, sc...), "--merge-time 1h: want a time limit [D-]HH:MM:SS"},
		{"negative rate", append([]string{"sbatch", "--rate", "-1", "--", "run", "--out", out}, sc...), "--rate -1: want a positive rate"},
		{"bad input seen by the probe", []string{"sbatch", "--", "run", "--scenario", "nope.toml", "--out", out}, "measuring the rate with 8 realisations"},
	} {
		_, stderr, code := execute(t, c.args...)
		if code != 2 || !strings.Contains(stderr, c.want) {
			t.Errorf("%s: exit %d, %q; want 2 and %q", c.name, code, stderr, c.want)
		}
	}
	if entries, _ := os.ReadDir(dir); len(entries) != 0 {
		t.Errorf("refused command lines left %d files in %s", len(entries), dir)
	}
}

// TestSlurmTime: Slurm's [D-]HH:MM:SS both ways.
func TestSlurmTime(t *testing.T) {
	for _, c := range []struct {
		d time.Duration
		s string
	}{
		{0, "00:00:00"},
		{61 * time.Second, "00:01:01"},
		{25*time.Hour + 2*time.Second, "1-01:00:02"},
		{1500 * time.Millisecond, "00:00:02"}, // rounded up
	} {
		if got := slurmTime(c.d); got != c.s {
			t.Errorf("slurmTime(%v) = %s, want %s", c.d, got, c.s)
		}
	}
	if d, err := parseSlurmTime("2-03:04:05"); err != nil || d != 51*time.Hour+4*time.Minute+5*time.Second {
		t.Errorf("parseSlurmTime(2-03:04:05) = %v, %v", d, err)
	}
	for _, bad := range []string{"1h", "01:60:00", "1:2", ""} {
		if _, err := parseSlurmTime(bad); err == nil {
			t.Errorf("parseSlurmTime(%q): no error", bad)
		}
	}
}

// TestSbatchProbeAndScript measures the rate (the README example, without
// --rate) and runs the written script's tasks with bash as Slurm would
// (SLURM_ARRAY_TASK_ID 1 to N, then 0) for rank, sensitivity, scan and
// qualify (the last two run under Slurm too, when there is one): the merged
// directory holds the files of the unsharded run, byte for byte, and the
// final step exits as the unsharded run does; a task run again (as after a
// pre-emption) continues.
func TestSbatchProbeAndScript(t *testing.T) {
	if testing.Short() {
		t.Skip("builds rampart and runs ensembles")
	}
	bin := filepath.Join(t.TempDir(), "rampart")
	build := exec.Command("go", "build", "-o", bin, ".")
	build.Dir = filepath.Join(repoRoot, "cmd", "rampart")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	for _, c := range []struct {
		name  string
		flags []string
		line  []string
	}{
		{"rank", []string{"--shards", "2"}, []string{"rank", "--scenario", "testdata/scenarios/ensemble.toml", "--ramp", "a=sin2", "--ramp", "b=minjerk", "--samples", "30", "--seed", "3", "--out", "r"}},
		{"sensitivity", []string{"--shards", "3", "--rate", "100"}, []string{"sensitivity", "--scenario", "testdata/scenarios/ensemble.toml", "--base", "8", "--seed", "3", "--out", "d"}},
		{"scan", []string{"--shards", "2", "--rate", "100"}, []string{"scan", "--scenario", "testdata/scenarios/ensemble.toml", "--ensemble", "--vary", "lattice.depth_khz=18:22:2", "--samples", "20", "--seed", "3", "--out", "s"}},
		{"qualify", []string{"--shards", "2", "--rate", "100"}, []string{"qualify", "--scenario", "testdata/scenarios/ensemble.toml", "--spec", "testdata/specs/tight.toml", "--samples", "40", "--seed", "3", "--out", "q"}},
	} {
		root := t.TempDir()
		one, sharded := filepath.Join(root, "one"), filepath.Join(root, "sharded")
		for _, d := range []string{one, sharded} {
			os.Mkdir(d, 0o755)
			os.Symlink(filepath.Join(repoRoot, "testdata"), filepath.Join(d, "testdata"))
		}
		ctx, cancel := context.WithTimeout(context.Background(), 2*time.Minute)
		want := runIn(ctx, t, one, bin, c.line...)
		gen := runIn(ctx, t, sharded, bin, append(append(append([]string{"sbatch"}, c.flags...), "--"), c.line...)...)
		if gen.code != 0 {
			t.Fatalf("%s: rampart sbatch: exit %d: %s", c.name, gen.code, gen.stderr)
		}
		if !slices.Contains(c.flags, "--rate") && !strings.HasPrefix(gen.stderr, "rate ") {
			t.Errorf("%s: no measured rate reported: %q", c.name, gen.stderr)
		}
		out := c.line[len(c.line)-1]
		n, _ := strconv.Atoi(c.flags[1])
		// Tasks 1 to n, then the merge, 0; task 1 runs twice, as a
		// resubmitted task does, and must continue, not fail. (The merge
		// run twice would qualify twice: a second look, counted.)
		ids := []string{"1"}
		for k := 1; k <= n; k++ {
			ids = append(ids, strconv.Itoa(k))
		}
		for _, id := range append(ids, "0") {
			task := exec.CommandContext(ctx, "bash", out+".sbatch")
			task.Dir = sharded
			task.Env = append(os.Environ(), "RAMPART="+bin, "SLURM_ARRAY_TASK_ID="+id, "SLURM_CPUS_PER_TASK=1")
			b, _ := task.CombinedOutput()
			if code := task.ProcessState.ExitCode(); (id != "0" && code != 0) || (id == "0" && code != want.code) {
				t.Fatalf("%s: task %s: exit %d (the unsharded run %d):\n%s", c.name, id, code, want.code, b)
			}
		}
		cancel()
		compareTrees(t, filepath.Join(one, out), filepath.Join(sharded, out))
	}
}
