package main

import (
	"bytes"
	"context"
	"errors"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"rampart/mc"
)

// slurmCases are the command lines the job-array test runs sharded under
// Slurm and unsharded, as a user types them in a directory holding the
// repository's testdata. The first is the README's cluster example
// (checked by TestReadmeClusterExample).
var slurmCases = []struct {
	name   string
	sbatch []string // the generator's flags
	line   []string // the command line, without --out
	out    string
}{
	{"run", []string{"--shards", "4"},
		[]string{"run", "--scenario", "testdata/scenarios/ensemble.toml", "--samples", "400", "--seed", "7",
			"--min-contrast", "0.5", "--max-bias-rad", "2e-3"}, "run7"},
	{"qualify", []string{"--shards", "3", "--rate", "200"},
		[]string{"qualify", "--scenario", "testdata/scenarios/ensemble.toml", "--spec", "testdata/specs/tight.toml",
			"--samples", "90", "--seed", "3"}, "q"},
	{"scan", []string{"--shards", "2", "--rate", "100"},
		[]string{"scan", "--scenario", "testdata/scenarios/ensemble.toml", "--ensemble", "--vary", "lattice.depth_khz=18:22:3",
			"--samples", "40", "--seed", "3"}, "scan"},
}

// TestSlurmJobArray runs each case under a real Slurm: rampart sbatch
// writes the script, the two submission lines it prints are run (the
// merge with sbatch --wait), and the merged directory must hold the files
// of the unsharded run byte for byte, with the same exit code. The cluster
// is the one SLURM_CONF names (.ci/run brings one up with .ci/slurm-up);
// without one the test is skipped, and fails under CI=true.
func TestSlurmJobArray(t *testing.T) {
	if _, err := exec.LookPath("sbatch"); err != nil || os.Getenv("SLURM_CONF") == "" {
		msg := "no Slurm cluster to submit to (sbatch not on PATH, or SLURM_CONF unset): .ci/run installs slurm-wlm and brings one up with .ci/slurm-up DIR"
		if os.Getenv("CI") == "true" {
			t.Fatal(msg)
		}
		t.Skip(msg)
	}
	bin := filepath.Join(t.TempDir(), "rampart")
	build := exec.Command("go", "build", "-o", bin, ".")
	build.Dir = filepath.Join(repoRoot, "cmd", "rampart")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	for _, c := range slurmCases {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			root := t.TempDir()
			one, sharded := filepath.Join(root, "one"), filepath.Join(root, "sharded")
			for _, d := range []string{one, sharded} {
				os.Mkdir(d, 0o755)
				os.Symlink(filepath.Join(repoRoot, "testdata"), filepath.Join(d, "testdata"))
			}
			line := append(append([]string{}, c.line...), "--out", c.out)
			ctx, cancel := context.WithTimeout(context.Background(), 3*time.Minute)
			defer cancel()
			wantCode := runIn(ctx, t, one, bin, line...).code

			gen := runIn(ctx, t, sharded, bin, append(append(append([]string{"sbatch"}, c.sbatch...), "--"), line...)...)
			if gen.code != 0 {
				t.Fatalf("rampart sbatch: exit %d: %s", gen.code, gen.stderr)
			}
			// The printed submission lines, the merge waited for.
			lines := strings.Split(strings.TrimSpace(gen.stdout), "\n")
			submit, merge := strings.TrimSpace(lines[len(lines)-2]), strings.TrimSpace(lines[len(lines)-1])
			if !strings.HasPrefix(submit, "jid=$(sbatch ") || !strings.HasPrefix(merge, "sbatch --dependency=afterok:") {
				t.Fatalf("rampart sbatch printed no submission lines:\n%s", gen.stdout)
			}
			merge = strings.Replace(merge, "sbatch ", "sbatch --wait ", 1)
			t0 := time.Now()
			sub := exec.CommandContext(ctx, "bash", "-c", "set -e; "+submit+"; echo submitted $jid; "+merge)
			sub.Dir = sharded
			sub.Env = append(os.Environ(), "RAMPART="+bin)
			out, err := sub.CombinedOutput()
			code := 0
			var ee *exec.ExitError
			if errors.As(err, &ee) {
				code = ee.ExitCode()
			} else if err != nil {
				t.Fatalf("submitting: %v\n%s", err, out)
			}
			t.Logf("%s: shards and merge ran under Slurm in %s", c.name, time.Since(t0).Round(time.Second))
			if code != wantCode {
				t.Errorf("the merge task exited %d, the unsharded run %d\n%s%s", code, wantCode, out, slurmLogs(sharded, c.out))
			}
			compareTrees(t, filepath.Join(one, c.out), filepath.Join(sharded, c.out))
		})
	}
}

type runResult struct {
	stdout, stderr string
	code           int
}

// runIn runs the binary in dir.
func runIn(ctx context.Context, t *testing.T, dir, bin string, args ...string) runResult {
	t.Helper()
	cmd := exec.CommandContext(ctx, bin, args...)
	cmd.Dir = dir
	var out, errs bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errs
	err := cmd.Run()
	var ee *exec.ExitError
	if err != nil && !errors.As(err, &ee) {
		t.Fatalf("%s %s: %v", bin, strings.Join(args, " "), err)
	}
	return runResult{out.String(), errs.String(), cmd.ProcessState.ExitCode()}
}

// compareTrees requires every file of want (but the locks, which name the
// process that held them) in got with the same bytes.
func compareTrees(t *testing.T, want, got string) {
	t.Helper()
	n := 0
	err := filepath.WalkDir(want, func(path string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() || d.Name() == mc.LockFile {
			return err
		}
		rel, _ := filepath.Rel(want, path)
		a, _ := os.ReadFile(path)
		b, err := os.ReadFile(filepath.Join(got, rel))
		switch {
		case err != nil:
			t.Errorf("the merged result lacks %s", rel)
		case !bytes.Equal(a, b):
			t.Errorf("merged %s differs from the unsharded run's", rel)
		}
		n++
		return nil
	})
	if err != nil || n == 0 {
		t.Errorf("unsharded result %s: %d files, %v", want, n, err)
	}
}

// slurmLogs returns the tasks' logs, for a failure message.
func slurmLogs(dir, out string) string {
	logs, _ := filepath.Glob(filepath.Join(dir, out+".shards", "slurm-*.out"))
	var b strings.Builder
	for _, l := range logs {
		s, _ := os.ReadFile(l)
		b.WriteString("\n--- " + filepath.Base(l) + "\n" + string(s))
	}
	return b.String()
}

// TestReadmeClusterExample: the README's cluster example is the command
// line the job-array test runs (slurmCases[0]) and its GNU parallel
// variant the same line, so that the README shows what is tested.
func TestReadmeClusterExample(t *testing.T) {
	b, err := os.ReadFile(filepath.Join(repoRoot, "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	c := slurmCases[0]
	line := "rampart sbatch " + strings.Join(c.sbatch, " ") + " -- " + strings.Join(c.line, " ") + " --out " + c.out
	if n := strings.Count(string(b), "\n"+line+"\n"); n != 1 {
		t.Errorf("README.md holds the GNU parallel line %q %d times, want once", line, n)
	}
	if !strings.Contains(string(b), "\n$ "+line+"\n") {
		t.Errorf("README.md lacks the cluster example %q", "$ "+line)
	}
}
