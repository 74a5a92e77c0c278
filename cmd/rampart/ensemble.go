package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"path/filepath"
	"runtime"
	"syscall"
	"time"

	"github.com/schollz/progressbar/v3"
	"github.com/spf13/cobra"
	"golang.org/x/term"

	"rampart/internal/plural"
	"rampart/mc"
	"rampart/scenario"
	"rampart/sim"
)

// ensembleOptions are the ensemble flags that run, rank, qualify, tolerance
// and sensitivity share.
type ensembleOptions struct {
	samples    int
	seed       uint64
	workers    int
	sampler    string
	out        string
	resume     string
	shard      string
	confidence float64
	// scaleFactor measures each realisation's scale-factor error
	// (mc.Ensemble.ScaleFactor); a scale-factor criterion sets it too.
	scaleFactor bool
	// yield is the yield spec the run is summarised with, recorded in the
	// manifest so that merge reproduces the summary (nil: none).
	yield *mc.Spec
}

func addEnsembleFlags(cmd *cobra.Command, o *ensembleOptions, defaultSamples int) {
	f := cmd.Flags()
	f.IntVar(&o.samples, "samples", defaultSamples, "number of realisations `N` in the ensemble")
	f.Uint64Var(&o.seed, "seed", 1, "seed `S`: realisation i depends only on (S, i)")
	f.IntVar(&o.workers, "workers", 0, "worker goroutines `W` (0: one per core)")
	f.StringVar(&o.sampler, "sampler", "random", "design of the static parameters: random, lhs or sobol")
	f.StringVar(&o.out, "out", "", "write the realisations, summary and plots to `DIR`")
	f.StringVar(&o.resume, "resume", "", "continue the interrupted run in `DIR` (same scenario and flags)")
	f.StringVar(&o.shard, "shard", "", "run only slice `k/n` of the ensemble (merge the slices with rampart merge)")
	f.Float64Var(&o.confidence, "confidence", 0.95, "confidence `level` of the intervals, in (0, 1)")
	f.BoolVar(&o.scaleFactor, "scale-factor", false, "also measure each realisation's scale-factor error K_shot/K - 1 in ppm (two more shots per realisation; on by itself for a spec with [scale_factor])")
}

func (o *ensembleOptions) validate() error {
	if o.shard != "" {
		// Checked here, before any simulation, and again against the
		// sample count where the job is made.
		if _, err := mc.ParseShard(o.shard); err != nil {
			return fmt.Errorf("--shard: %w", err)
		}
	}
	switch {
	case o.samples < 1:
		return fmt.Errorf("--samples %d: need at least 1 realisation", o.samples)
	case o.samples > mc.MaxSamples:
		return fmt.Errorf("--samples %d: at most %d realisations (the most a run directory holds; merge and summaries keep 32 bytes a realisation, a run in one process about 200: run large ensembles in shards)", o.samples, mc.MaxSamples)
	case o.workers < 0:
		return fmt.Errorf("--workers %d: need 0 (one per core) or more", o.workers)
	case !(o.confidence > 0 && o.confidence < 1):
		return fmt.Errorf("--confidence %g: want a level in (0, 1), such as 0.95", o.confidence)
	case o.shard != "" && o.dir() == "":
		return fmt.Errorf("--shard %s needs --out DIR: the slices are kept there for rampart merge", o.shard)
	case o.out != "" && o.resume != "" && filepath.Clean(o.out) != filepath.Clean(o.resume):
		return fmt.Errorf("--out %s and --resume %s name different directories; give one", o.out, o.resume)
	}
	if err := o.checkOutputs(); err != nil {
		return err
	}
	for _, s := range mc.Samplers {
		if o.sampler == s {
			return nil
		}
	}
	return fmt.Errorf("--sampler %q: want random, lhs or sobol", o.sampler)
}

// heldDirs release the run directories the running command keeps locked
// after their stores close, so that the summary and figures it writes
// afterwards are under the lock too; run (main.go) releases them when the
// command returns (the kernel would at exit in any case).
var heldDirs []func() error

// releaseRunDirs releases what runJob kept (mc.JobResult.Release).
func releaseRunDirs() {
	for _, unlock := range heldDirs {
		unlock()
	}
	heldDirs = nil
}

// dir returns the output directory, if any.
func (o *ensembleOptions) dir() string {
	if o.resume != "" {
		return o.resume
	}
	return o.out
}

// ensembleRun is a finished (or interrupted) ensemble of one configuration.
type ensembleRun struct {
	manifest mc.Manifest
	records  []mc.Record
	realiser *mc.Realiser
	elapsed  time.Duration
	fresh    int // realisations simulated in this invocation
	// numerics is the estimated numerical error of the nominal shot,
	// checked before the run (preflight).
	numerics sim.ErrorEstimate
}

// summarise summarises the run's records (with the numerics estimate the
// manifest records).
func (run *ensembleRun) summarise(confidence float64, spec mc.Spec) mc.Summary {
	return run.manifest.Summarise(run.records, confidence, spec)
}

// interruptedError reports an ensemble stopped by a signal; its exit code is
// 130, the shell's convention for SIGINT.
func interruptedError(done, total int, dir string) error {
	msg := fmt.Sprintf("interrupted after %d of %s", done, plural.Count(total, "realisation"))
	if dir != "" {
		msg += fmt.Sprintf("; they are kept in %s: continue with the same command and --resume %s", dir, dir)
	} else {
		msg += " (nothing kept: give --out DIR to keep realisations across an interruption)"
	}
	return &exitError{code: 130, err: errors.New(msg)}
}

// signalContext is cancelled by Ctrl-C or SIGTERM.
func signalContext() (context.Context, context.CancelFunc) {
	return signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
}

// runEnsemble runs (or resumes) the ensemble of a scenario configuration
// cfg under budget, storing it in the options' directory if one is given.
func runEnsemble(ctx context.Context, e env, stderr io.Writer, sc *scenario.Scenario, cfg sim.Config, budget mc.Budget, o ensembleOptions, label string) (*ensembleRun, error) {
	ens := mc.Ensemble{Config: cfg, Budget: budget, Samples: o.samples, Seed: o.seed, Sampler: o.sampler, ScaleFactor: o.scaleFactor}
	return runEnsembleOf(ctx, e, stderr, sc, ens, o, o.dir(), label)
}

// runEnsembleOf is runEnsemble for a prepared ensemble and directory.
func runEnsembleOf(ctx context.Context, e env, stderr io.Writer, sc *scenario.Scenario, ens mc.Ensemble, o ensembleOptions, dir, label string) (*ensembleRun, error) {
	r, err := mc.NewRealiser(ens)
	if err != nil {
		return nil, fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	return runJob(ctx, e, stderr, sc, ensembleJob{realiser: r, runner: r, records: ens.Samples}, o, dir, o.resume != "", label)
}

// ensembleJob is a run of records to store: records [0, records) of runner
// (the realiser itself, or a sensitivity design of its shots).
type ensembleJob struct {
	realiser *mc.Realiser
	runner   interface {
		Run(ctx context.Context, from, to, workers int, emit func(mc.Record) error) (int, error)
	}
	records int
	// tag is what, beside the scenario, sets this run's records apart from
	// another's (a design, a searched amplitude, a shared noise grid); it is
	// hashed into the fingerprint. Nil for a plain ensemble of the scenario.
	tag any
	// resume is the directory an interruption message tells the user to
	// resume, if not the run's own (a command that keeps several runs in
	// one directory resumes them all at once).
	resume string
}

// runJob runs a job, storing it in dir if one is given (resuming the run
// there if resume).
func runJob(ctx context.Context, e env, stderr io.Writer, sc *scenario.Scenario, job ensembleJob, o ensembleOptions, dir string, resume bool, label string) (*ensembleRun, error) {
	// Every ensemble command passes here: its nominal shot's numerics are
	// checked before anything is written (preflight).
	what := fmt.Sprintf("scenario %q, %s ramp", sc.Name, job.realiser.Config().Sequence.Up.Name())
	est, err := preflight(what, job.realiser.Config())
	if err != nil {
		return nil, err
	}
	// The ring potential's model error travels with the numerical error
	// into the summaries, reports and JSON.
	est.ModelBiasRad = warnRingModel(stderr, what, job.realiser.Config(), job.realiser.Ensemble().Budget.Apparatus)
	hash, text, err := sc.Fingerprint()
	if err != nil {
		return nil, err
	}
	if job.tag != nil {
		if hash, text, err = scenario.WithTag(hash, text, job.tag); err != nil {
			return nil, err
		}
	}
	j := mc.Job{Realiser: job.realiser, Runner: job.runner, Records: job.records,
		// A directory to resume that holds no run yet was made by a job
		// stopped before its first run (checkResumeRun, nothingStarted):
		// the run starts there.
		Fingerprint: hash, Scenario: text, Dir: dir, Resume: dir != "" && resume && mc.HasRun(dir), Workers: o.workers,
		YieldSpec: o.yield, Confidence: o.confidence, NumericsError: &est}
	if o.shard != "" {
		sh, err := mc.ParseShard(o.shard)
		if err != nil {
			return nil, fmt.Errorf("--shard: %w", err)
		}
		if sh.Count > job.records {
			return nil, fmt.Errorf("--shard %s: more shards than the %s", o.shard, plural.Count(job.records, "realisation"))
		}
		j.Shard = &sh
	}
	var bar progress = silent{}
	var t0, wall time.Time
	left, fresh, batch := 0, 0, o.workers
	if batch == 0 {
		batch = runtime.GOMAXPROCS(0)
	}
	j.Started = func(total, resumed int) {
		bar = newProgress(stderr, total, resumed, label)
		t0 = e.now()
		// The duration note reads the wall clock, not e.now: it is shown
		// only for runs beyond an hour, and e.now's readings are counted by
		// tests.
		wall, left = time.Now(), total-resumed
	}
	j.Recorded = func() {
		if fresh++; fresh == batch { // the first batch measures the rate
			fmt.Fprint(stderr, durationNote(fresh, time.Since(wall), left-fresh, dir))
		}
		bar.Add(1)
	}
	res, err := j.Execute(ctx)
	if res == nil {
		return nil, err
	}
	if res.Release != nil {
		heldDirs = append(heldDirs, res.Release)
	}
	bar.Finish()
	run := &ensembleRun{manifest: res.Manifest, records: res.Records, realiser: job.realiser,
		elapsed: e.now().Sub(t0), fresh: res.Fresh, numerics: est}
	if err != nil {
		if errors.Is(err, context.Canceled) {
			hint := dir
			if job.resume != "" {
				hint = job.resume
			}
			from, to := res.Manifest.Range()
			return run, interruptedError(len(run.records), to-from, hint)
		}
		return run, err
	}
	return run, nil
}

// progress is a progress bar on a terminal and silent elsewhere.
type progress interface {
	Add(int) error
	Finish() error
}

type silent struct{}

func (silent) Add(int) error { return nil }
func (silent) Finish() error { return nil }

func newProgress(w io.Writer, total, done int, label string) progress {
	return newProgressOf(w, total, done, label, "shots")
}

// newProgressOf is newProgress counting units other than shots.
func newProgressOf(w io.Writer, total, done int, label, units string) progress {
	f, ok := w.(*os.File)
	if !ok || !term.IsTerminal(int(f.Fd())) {
		return silent{}
	}
	bar := progressbar.NewOptions(total,
		progressbar.OptionSetWriter(w),
		progressbar.OptionSetDescription(label),
		progressbar.OptionShowCount(),
		progressbar.OptionShowIts(),
		progressbar.OptionSetItsString(units),
		progressbar.OptionSetPredictTime(true),
		progressbar.OptionThrottle(200*time.Millisecond),
		progressbar.OptionClearOnFinish(),
	)
	bar.Add(done)
	return bar
}
