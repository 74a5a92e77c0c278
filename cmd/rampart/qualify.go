package main

import (
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/present"
	"rampart/cmd/internal/spec"
	"rampart/internal/atomicfile"
	"rampart/internal/plural"
	"rampart/mc"
	"rampart/scenario"
)

type qualifyOptions struct {
	decisionOptions
	spec string
	look int
	// lookGiven: --look was given; otherwise the look is the one after
	// those recorded in the --resume directory's manifest.
	lookGiven bool
	readout   readoutOptions
	// signal is the signal whose verdict gates the exit code: "true" (the
	// simulated bias) or "measured" (with the read-out's noise).
	signal string
}

// The values of --signal.
const (
	signalTrue     = "true"
	signalMeasured = "measured"
)

// newQualifyCmd returns the command; run is what it runs with the parsed
// options (runQualify outside tests).
func newQualifyCmd(e env, run func(e env, stdout, stderr io.Writer, o qualifyOptions, confidenceGiven bool) error) *cobra.Command {
	var o qualifyOptions
	cmd := &cobra.Command{
		Use:   "qualify --scenario FILE --spec SPEC.toml",
		Short: "Qualify the scenario's ramp against a spec: pass, fail or undecided",
		Long: `Run a Monte Carlo ensemble of the scenario under its noise budget (as rampart
run does) and check it against the criteria of a spec file: mean and
5th-percentile contrast, 95th percentile of |bias| (in rad or deg/h) and the
yield of realisations inside a contrast and a bias limit. Each criterion gets
its measured value, its one-sided confidence bounds at the spec's confidence
(--confidence overrides it), its margin and a verdict: pass when the bound on
the bad side clears the limit, fail when the bound on the good side misses it,
undecided otherwise, with an estimate of how many more realisations would
decide it. The exit code gates lab automation: 0 pass, 1 fail, 3 undecided,
2 bad input.

With a read-out (the scenario's [readout] or --atoms and --cycle-s) the
criteria are also decided on the measured signal: each realisation's bias
with the projection noise of its atoms and the detection noise added, as a
read-out would see it (contrast criteria are the same for both). Both tables
are shown, labelled; --signal measured makes the measured verdict the one
that sets the exit code (default: the true, simulated signal).

--out DIR keeps the ensemble as rampart run does, with the verdict in
qualification.json; --resume DIR continues it, and with a larger --samples
tops it up (random sampler). Each qualification on one ensemble is a look
that spends its share of the confidence, so that a sequence of them, topped
up in between, keeps the stated confidence: the directory's manifest counts
the looks taken and the next qualification there takes the next look.
--look K sets the look number (1 the first time) for an ensemble kept
elsewhere; one below the recorded count is refused.
--shard k/n runs slice k into DIR and prints how to merge the slices and
qualify the merged ensemble.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			o.lookGiven = cmd.Flags().Changed("look")
			return run(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), o, cmd.Flags().Changed("confidence"))
		},
	}
	o.add(cmd, 1000, "the qualification")
	confidenceFromSpec(cmd)
	addReadoutFlags(cmd, &o.readout)
	f := cmd.Flags()
	f.StringVar(&o.spec, "spec", "", "spec `file` (TOML) of the criteria to meet")
	f.IntVar(&o.look, "look", 1, "number `K` of this qualification of a topped-up ensemble (default: 1, or the next after those recorded in the --resume directory)")
	f.StringVar(&o.signal, "signal", signalTrue, "the signal whose verdict sets the exit code: "+signalTrue+" (simulated) or "+signalMeasured+" (with the read-out's projection and detection noise; needs a read-out)")
	cmd.MarkFlagRequired("spec")
	return cmd
}

// readRequirements reads a spec file; a --confidence given on the command
// line (override) replaces the file's.
func readRequirements(path string, confidence float64, override bool) (mc.Requirements, error) {
	req, err := spec.Read(path)
	if err != nil {
		return mc.Requirements{}, err
	}
	if override {
		req.Confidence = confidence
		if err := req.Validate(); err != nil {
			return mc.Requirements{}, fmt.Errorf("--confidence %g for spec %q: %w", confidence, path, err)
		}
	}
	if req.Confidence == 0 {
		req.Confidence = mc.DefaultConfidence
	}
	return req, nil
}

func runQualify(e env, stdout, stderr io.Writer, o qualifyOptions, confidenceGiven bool) error {
	if err := o.validate(); err != nil {
		return err
	}
	if err := o.ens.checkResumeRun(); err != nil {
		return err
	}
	req, err := readRequirements(o.spec, o.ens.confidence, confidenceGiven)
	if err != nil {
		return err
	}
	o.ens.confidence = req.Confidence
	if o.signal != signalTrue && o.signal != signalMeasured {
		return fmt.Errorf("--signal %q: want %q or %q", o.signal, signalTrue, signalMeasured)
	}
	if o.look < 1 {
		return fmt.Errorf("--look %d: want 1 for a first qualification, 2, 3, ... each time the ensemble is topped up and qualified again", o.look)
	}
	if _, err := o.lookAt(); err != nil { // refused before anything runs
		return err
	}
	sc, cfg, budget, err := o.load(stderr)
	if err != nil {
		return err
	}
	ro, err := o.readout.of(sc)
	if err != nil {
		return err
	}
	if o.signal == signalMeasured && ro.Atoms == 0 {
		return fmt.Errorf("--signal measured needs a read-out: give the scenario a [readout] table or --atoms N and --cycle-s T")
	}
	ctx, stop := signalContext()
	defer stop()
	o.ens.scaleFactor = o.ens.scaleFactor || req.NeedsScaleFactor()
	run, err := runEnsemble(ctx, e, stderr, sc, cfg, budget, o.ens, "qualify")
	if err != nil {
		return err
	}
	if err := mc.CheckDecidable(run.records); err != nil {
		return fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	if req.Look, err = o.lookAt(); err != nil { // again, under the directory's lock
		return err
	}
	sum := run.summarise(req.Confidence, req.Yield)
	// The measured signal, with the read-out's projection and detection
	// noise (docs/model.md, Gyroscope figures); nil without a read-out.
	sum.Measured = ro.Measure(mc.OutcomesOf(run.records), run.manifest.Seed, req.Confidence, req.Yield)
	dir := o.ens.dir()
	if o.ens.shard != "" {
		if err := present.WriteResults(dir, sum, run.records, req.Yield); err != nil {
			return err
		}
		return present.PrintShardNote(stdout, o.ens.shard, o.ens.dir(), []string{""}, "qualify the merged ensemble")
	}
	req.LossPossible = run.manifest.LossPossible
	q := mc.Qualify(run.records, req, run.manifest.ScaleFactorS, run.manifest.Seed)
	rep := present.QualifyReport{Qualification: q, Spec: o.spec, Summary: sum, Gyro: ro.Gyro(sum), Signal: o.signal}
	if m := ro.MeasuredRecords(run.records, run.manifest.Seed); m != nil {
		qm := mc.Qualify(m, req, run.manifest.ScaleFactorS, run.manifest.Seed)
		rep.MeasuredSignal = &qm
	}
	gate := rep.Gating()
	if rep.Kernel, err = kernelPrediction(run.realiser.Config(), budget, defaultKernelMemoryMiB); err != nil {
		return err
	}
	if dir != "" {
		// The look is counted before the verdict is written or shown, so
		// that no verdict is seen whose look the directory does not count.
		if err := mc.RecordLook(dir, q.Look); err != nil {
			return err
		}
		if err := present.WriteResults(dir, sum, run.records, req.Yield); err != nil {
			return err
		}
		if err := atomicfile.Write(filepath.Join(dir, present.QualificationFile), func(w io.Writer) error { return present.WriteJSON(w, rep) }); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %s, %s and %s to %s (look %d recorded)\n", plural.Count(len(run.records), "realisation"), present.SummaryFile, present.QualificationFile, dir, q.Look)
	}
	cfg = run.realiser.Config()
	ramp, specLine := cfg.Sequence.Up.Name()+" ramp", "Spec: "+o.spec
	if o.report != "" {
		if err := writeQualifyReport(e, stderr, o, sc, run, rep, req.Yield, present.SetupText(sc, cfg, ramp, budget, present.EnsembleLine(run.manifest, len(run.records), run.fresh, run.elapsed), present.NumericsLine(&run.numerics), specLine)); err != nil {
			return err
		}
	}
	if o.json {
		if err := present.WriteJSON(stdout, rep); err != nil {
			return err
		}
	} else {
		present.PrintHeader(stdout, sc, cfg, ramp, budget, present.EnsembleLine(run.manifest, len(run.records), run.fresh, run.elapsed), present.NumericsLine(&run.numerics), specLine)
		if err := present.PrintQualification(stdout, rep); err != nil {
			return err
		}
	}
	if gate.Verdict == mc.Pass {
		return nil
	}
	which := ""
	if rep.MeasuredSignal != nil {
		which = " (" + o.signal + " signal)"
	}
	return &exitError{code: gate.ExitCode(), err: fmt.Errorf("%s against spec %q%s: %s", gate.Verdict, o.spec, which, strings.Join(present.Deciding(gate), "; "))}
}

// lookAt returns the look number of this qualification: --look if given,
// else the one after the looks recorded in the manifest of the --resume
// directory (1 for a new ensemble). A --look below the recorded count is
// refused (mc.Manifest.NextLook).
func (o qualifyOptions) lookAt() (int, error) {
	given := 0
	if o.lookGiven {
		given = o.look
	}
	if o.ens.resume == "" || o.ens.shard != "" || !mc.HasRun(o.ens.resume) {
		return max(given, 1), nil
	}
	m, err := mc.ReadManifest(o.ens.resume)
	if err != nil {
		return 0, err
	}
	return m.NextLook(given)
}

// writeQualifyReport writes the report of a qualification: the drive and
// co-moving dynamics of the ramp, the ensemble and the verdict.
func writeQualifyReport(e env, stderr io.Writer, o qualifyOptions, sc *scenario.Scenario, run *ensembleRun, rep present.QualifyReport, yield mc.Spec, setup string) error {
	ens, err := present.EnsembleSection("Ensemble", "qualify-", rep.Summary, run.records, yield, "")
	if err != nil {
		return err
	}
	q, err := present.QualifySection(rep)
	if err != nil {
		return err
	}
	cfgs, name := present.OneRamp(run.realiser.Config())
	return writeDecisionReport(e, stderr, o.decisionOptions, "Qualification of "+name+" on "+sc.Name+" against "+o.spec, sc, cfgs, name, setup, ens, q)
}
