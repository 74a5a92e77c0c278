package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/present"
	"rampart/internal/plural"
	"rampart/mc"
)

type sensitivityOptions struct {
	decisionOptions
	base int
}

// newSensitivityCmd returns the command; run is what it runs with the parsed
// options (runSensitivity outside tests).
func newSensitivityCmd(e env, run func(e env, stdout, stderr io.Writer, o sensitivityOptions) error) *cobra.Command {
	var o sensitivityOptions
	cmd := &cobra.Command{
		Use:   "sensitivity --scenario FILE [--base N]",
		Short: "Apportion the spread of contrast and bias among the noise sources (Sobol' indices)",
		Long: `Apportion the shot-to-shot variance of contrast and bias among the sources of
the scenario's noise budget: first-order Sobol' indices (the share of the
variance a source causes alone) and total indices (with all its interactions),
by the Saltelli and Jansen estimators on a Saltelli design, with bootstrap
intervals. The inputs are the budget's active static errors (each pi/2 pulse
separately) and, as one group input each, the intensity and drive phase noise
during the shot. With N base rows (--base, default 256) and d inputs the
design runs N (d + 2) shots; the sampler defaults to sobol (Owen-scrambled
Sobol' points), the design's best. Also prints the local derivatives of one
shot's contrast and bias with respect to each static error at nominal, by
central differences over one budget standard deviation.

--out DIR keeps the design's shots as a run directory (with the design in
its fingerprint, so that --resume DIR refuses another design) and writes
sensitivity.json and bar charts of the indices (PNG and SVG). --shard k/n runs
slice k of the design's shots and prints how to merge the slices and compute
the indices of the merged design.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			if cmd.Flags().Changed("samples") {
				return fmt.Errorf("--samples does not apply to sensitivity: the design of --base N rows runs N (d + 2) shots for d inputs; give --base")
			}
			return run(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), o)
		},
	}
	o.add(cmd, 1, "the indices and derivatives")
	f := cmd.Flags()
	f.MarkHidden("samples")
	sampler := f.Lookup("sampler")
	sampler.DefValue = "sobol"
	sampler.Value.Set("sobol")
	f.IntVar(&o.base, "base", 256, "base rows `N` of the Saltelli design: N (d + 2) shots for d inputs")
	return cmd
}

// sensitivityTag records the design in a run's fingerprint (see ensembleJob).
type sensitivityTag struct {
	BaseRows int      `json:"sensitivity_base_rows"`
	Inputs   []string `json:"sensitivity_inputs"`
}

// maxSensitivityBase bounds --base: N (d + 2) shots with d <= 8 inputs make
// at most 10^8 shots, whose records (about 200 bytes each) the indices
// hold in memory.
const maxSensitivityBase = 10_000_000

func runSensitivity(e env, stdout, stderr io.Writer, o sensitivityOptions) error {
	if err := o.validate(); err != nil {
		return err
	}
	if err := o.ens.checkResumeRun(); err != nil {
		return err
	}
	if o.ens.scaleFactor {
		return fmt.Errorf("--scale-factor: sensitivity apportions the contrast and the bias; measure the scale factor with run, qualify, rank or tolerance")
	}
	if o.base < 2 {
		return fmt.Errorf("--base %d: want at least 2 base rows (256 is usual)", o.base)
	}
	if o.base > maxSensitivityBase {
		return fmt.Errorf("--base %d: at most %d base rows, so that the design's shots fit in one run", o.base, maxSensitivityBase)
	}
	sc, cfg, budget, err := o.load(stderr)
	if err != nil {
		return err
	}
	r, err := mc.NewRealiser(mc.Ensemble{Config: cfg, Budget: budget, Samples: o.base, Seed: o.ens.seed, Sampler: o.ens.sampler})
	if err != nil {
		return fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	design, err := mc.NewSensitivityDesign(r, o.base)
	if err != nil {
		return fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	if o.ens.resume != "" {
		if m, _, err := mc.Read(o.ens.resume); err == nil && m.Samples != design.Len() {
			d := len(design.Inputs()) + 2
			return fmt.Errorf("--resume %s holds a design of %s, %s for these %s, not %d: give --base %d", o.ens.resume, plural.Count(m.Samples, "shot"), plural.Count(m.Samples/d, "base row"), plural.Count(d-2, "input"), o.base, m.Samples/d)
		}
	}
	ctx, stop := signalContext()
	defer stop()
	job := ensembleJob{realiser: r, runner: design, records: design.Len(), tag: sensitivityTag{BaseRows: o.base, Inputs: design.Inputs()}}
	run, err := runJob(ctx, e, stderr, sc, job, o.ens, o.ens.dir(), o.ens.resume != "", "sensitivity")
	if err != nil {
		return err
	}
	if o.ens.shard != "" {
		return present.PrintShardNote(stdout, o.ens.shard, o.ens.dir(), []string{""}, "compute the indices of the merged design")
	}
	if err := mc.CheckDecidable(run.records); err != nil {
		return fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	indices, err := design.Indices(run.records, o.ens.confidence)
	if err != nil {
		return err
	}
	rep := present.SensitivityReport{
		Inputs: design.Inputs(), BaseRows: o.base, Shots: design.Len(), Seed: o.ens.seed, Sampler: o.ens.sampler,
		ScaleFactorS: run.manifest.ScaleFactorS, Indices: indices, Derivatives: mc.LocalDerivatives(r),
		Numerics: &run.numerics,
	}
	if dir := o.ens.dir(); dir != "" {
		if err := present.WriteSensitivity(dir, rep); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %s, %s and the bar charts to %s\n", plural.Count(len(run.records), "shot"), present.SensitivityFile, dir)
	}
	cfg, ramp := r.Config(), r.Config().Sequence.Up.Name()+" ramp"
	var work present.Work
	work.Add(run.fresh, len(run.records), run.elapsed)
	what := fmt.Sprintf("Saltelli design of %s x (%s + 2) = %s", plural.Count(o.base, "base row"), plural.Count(len(rep.Inputs), "input"), plural.Count(rep.Shots, "shot"))
	designLine := strings.Replace(work.Line(what, o.ens.seed, o.ens.sampler, o.ens.shard), "Ensembles: ", "Design: ", 1)
	if o.report != "" {
		sens, err := present.SensitivitySection(rep)
		if err != nil {
			return err
		}
		cfgs, name := present.OneRamp(cfg)
		if err := writeDecisionReport(e, stderr, o.decisionOptions, "Sensitivity of "+name+" on "+sc.Name+" to its noise sources", sc, cfgs, name,
			present.SetupText(sc, cfg, ramp, budget, designLine, present.NumericsLine(rep.Numerics)), sens); err != nil {
			return err
		}
	}
	if o.json {
		return present.WriteJSON(stdout, rep)
	}
	present.PrintHeader(stdout, sc, cfg, ramp, budget, designLine, present.NumericsLine(rep.Numerics))
	return present.PrintSensitivity(stdout, rep)
}
