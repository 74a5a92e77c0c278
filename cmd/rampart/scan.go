package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"slices"
	"strings"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/present"
	"rampart/cmd/internal/spec"
	"rampart/design"
	"rampart/internal/plural"
	"rampart/mc"
	"rampart/scenario"
	"rampart/sim"
)

type scanOptions struct {
	scenario string
	sets     []string
	vary     []string
	ensemble bool
	spec     string
	ens      ensembleOptions
	json     bool
	report   string
	check    bool
}

// newScanCmd returns the command; run is what it runs with the parsed
// options (runScan outside tests).
func newScanCmd(e env, run func(e env, stdout, stderr io.Writer, o scanOptions) error) *cobra.Command {
	var o scanOptions
	cmd := &cobra.Command{
		Use:   "scan --scenario FILE --vary KEY=FROM:TO:N [--vary KEY2=...]",
		Short: "Scan one or two scenario keys: the noise-free shot or the ensemble at each point",
		Long: `Scan one or two number keys of the scenario over a grid (KEY=FROM:TO:N, N
values evenly spaced, both ends included) or a list (KEY=V1,V2,...), each
value applied as --set KEY=VALUE is. At each point it simulates the
noise-free shot that rampart shot simulates, the apparatus's effects
included (contrast, phase, phase - K Omega with K the nominal scale factor,
ground-band populations, the ramp's peak speed), or with --ensemble the
ensemble under the noise budget: the
5th-percentile contrast and the 95th percentile of |bias| with their exact
intervals, and with --spec the yield inside the spec's yield limits with
its Clopper-Pearson interval. Every point's ensemble starts from the same
--seed, so realisation i draws the same perturbations everywhere (common
random numbers) and the differences between points are not the scatter of
the draws.

--out DIR writes scan.csv, scan.json and the figures (lines against one
key, a colour map over two with the spec's contour); with --ensemble each
point's realisations are kept in DIR/point-NNN, and --resume DIR continues
an interrupted scan. --shard k/n (with --ensemble) runs slice k of every
point's ensemble into DIR/point-NNN and prints how to merge the slices
(rampart merge, point by point) and finish the scan on the merged set
(--resume), which gives the files of one unsharded scan.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			return run(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), o)
		},
	}
	addScenarioFlags(cmd, &o.scenario, &o.sets)
	addEnsembleFlags(cmd, &o.ens, 200)
	f := cmd.Flags()
	f.StringArrayVar(&o.vary, "vary", nil, "scan a key: `KEY=FROM:TO:N` or KEY=V1,V2,... (once or twice)")
	f.BoolVar(&o.ensemble, "ensemble", false, "scan the ensemble under the noise budget, not the noise-free shot")
	f.StringVar(&o.spec, "spec", "", "spec `file` (TOML) whose limits are drawn and whose yield limits are counted")
	f.BoolVar(&o.json, "json", false, "print the scan as one JSON object")
	f.BoolVar(&o.check, "check", false, "estimate the numerical error at every point of a noise-free scan, not only at its corners and centre")
	addReportFlag(cmd, &o.report)
	cmd.MarkFlagRequired("vary")
	return cmd
}

func (o *scanOptions) validate() error {
	// The scan's own refusals first: they say more than the shared
	// ensemble checks would about the same flags.
	switch {
	case len(o.vary) > 2:
		return fmt.Errorf("--vary given %d times: scan one or two keys", len(o.vary))
	case o.ens.shard != "" && !o.ensemble:
		return fmt.Errorf("--shard %s: only an --ensemble scan is sharded; a noise-free scan has no ensembles to merge (run parts of the range as separate scans)", o.ens.shard)
	case o.ensemble && o.check:
		return errors.New("--check: an --ensemble scan checks each point's numerics before its ensemble runs; --check is for the noise-free scan")
	case !o.ensemble && o.ens.resume != "":
		return fmt.Errorf("--resume %s: only an --ensemble scan keeps runs to resume; a noise-free scan is rerun whole", o.ens.resume)
	}
	if err := o.ens.validate(); err != nil {
		return err
	}
	if err := checkReportDir(o.report); err != nil {
		return err
	}
	return o.ens.checkResumeDir()
}

func runScan(e env, stdout, stderr io.Writer, o scanOptions) error {
	if err := o.validate(); err != nil {
		return err
	}
	axes := make([]design.Axis, len(o.vary))
	for i, v := range o.vary {
		a, err := design.ParseAxis(v)
		if err != nil {
			return fmt.Errorf("--vary: %w", err)
		}
		axes[i] = a
	}
	pts, err := design.Grid(axes)
	if err != nil {
		return fmt.Errorf("--vary: %w", err)
	}
	rep := present.ScanReport{Ensemble: o.ensemble}
	for _, a := range axes {
		rep.Keys = append(rep.Keys, a.Key)
	}
	var yield mc.Spec
	if o.spec != "" {
		req, err := spec.Read(o.spec)
		if err != nil {
			return err
		}
		rep.ContrastLimit, rep.BiasLimitRad, yield = req.ContrastP05Min, req.AbsBiasP95MaxRad, req.Yield
		if yield.Active() {
			o.ens.yield = &yield
		}
	}
	// Every point is loaded before anything runs, so that a bad value is
	// reported at once and no directory is left half-written.
	scs := make([]*scenario.Scenario, len(pts))
	cfgs := make([]sim.Config, len(pts))
	budgets := make([]mc.Budget, len(pts))
	for i, p := range pts {
		sets := append(slices.Clone(o.sets), p.Sets...)
		if scs[i], cfgs[i], budgets[i], err = scenario.LoadBudget(o.scenario, sets); err != nil {
			return fmt.Errorf("scan point %s: %w", strings.Join(p.Sets, " "), err)
		}
	}
	rep.Scenario = scs[0].Name
	dir := o.ens.dir()
	if dir != "" {
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return err
		}
	}
	ctx, stop := signalContext()
	defer stop()
	rep.Points = make([]present.ScanPoint, len(pts))
	if !o.ensemble {
		bar := newProgress(stderr, len(pts), 0, "scan")
		// Each point is the shot rampart shot simulates: the apparatus's
		// effects (field offset and gradient, scattering, radius error,
		// ring potential)
		// from the one builder shot uses, scenario.Scenario.Apparatus.
		shots := make([]design.NominalShot, len(pts))
		values := make([][]float64, len(pts))
		for i, p := range pts {
			values[i] = p.Values
		}
		check := design.CheckPoints(values)
		for i := range pts {
			app, err := scs[i].Apparatus()
			if err != nil {
				return err
			}
			shots[i] = design.NominalShot{Config: cfgs[i], Apparatus: app, Check: o.check || check[i]}
		}
		nom, err := design.ScanNominal(ctx, shots, o.ens.workers, func() { bar.Add(1) })
		bar.Finish()
		if err != nil {
			if ctx.Err() != nil {
				return &exitError{code: 130, err: fmt.Errorf("scan interrupted: nothing kept (a noise-free scan is rerun whole)")}
			}
			return fmt.Errorf("scenario %q: %w", rep.Scenario, err)
		}
		for i, p := range pts {
			rep.Points[i] = present.ScanPoint{Values: p.Values, Nominal: &nom[i]}
		}
	} else {
		rep.Samples, rep.Seed, rep.Confidence = o.ens.samples, o.ens.seed, o.ens.confidence
		// One noise grid for every point, as rank has for its ramps, so
		// that the noise processes are drawn alike at every point too.
		grid, err := mc.SharedGrid(cfgs, budgets[0])
		if err != nil {
			return fmt.Errorf("scenario %q: %w", rep.Scenario, err)
		}
		var subs []string
		for i, p := range pts {
			ens := mc.Ensemble{Config: cfgs[i], Budget: budgets[i], Samples: o.ens.samples, Seed: o.ens.seed, Sampler: o.ens.sampler}
			tag := grid.Apply(&ens)
			run, _, err := runPart(ctx, e, stderr, scs[i], ens, tag, o.ens, fmt.Sprintf("point-%03d", i), "scan "+strings.Join(p.Sets, " "))
			if err != nil {
				return err
			}
			if o.ens.shard != "" { // a slice decides nothing: merged first
				subs = append(subs, fmt.Sprintf("point-%03d", i))
				continue
			}
			if err := mc.CheckDecidable(run.records); err != nil {
				return fmt.Errorf("scan point %s: %w", strings.Join(p.Sets, " "), err)
			}
			m := design.MetricsOf(run.manifest.Summarise(run.records, o.ens.confidence, yield))
			est := run.numerics
			rep.Points[i] = present.ScanPoint{Values: p.Values, Ensemble: &m, Numerics: &est}
		}
		if o.ens.shard != "" {
			return present.PrintShardNote(stdout, o.ens.shard, dir, subs, "finish the scan on the merged set")
		}
	}
	if dir != "" {
		if err := present.WriteScan(dir, rep); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %s, %s and the figures to %s\n", present.ScanCSVFile, present.ScanJSONFile, dir)
	}
	if o.report != "" {
		secs, err := present.ScanSections(rep)
		if err != nil {
			return err
		}
		r := newReport(e, "Scan of "+strings.Join(rep.Keys, " and ")+" on "+rep.Scenario, scs[0], scenarioText(o.scenario), o.sets, rep.Seed)
		r.NoDraws = !o.ensemble
		r.Sections = secs
		if err := writeReport(stderr, r, o.report); err != nil {
			return err
		}
	}
	write := present.PrintScan
	if o.json {
		write = func(w io.Writer, rep present.ScanReport) error { return present.WriteJSON(w, rep) }
	}
	if err := write(stdout, rep); err != nil {
		return err
	}
	if _, _, _, missed := present.ScanNumerics(rep); len(missed) > 0 {
		// As shot: the figures are written, and the exit status says they
		// are not to be trusted.
		return &exitError{code: ExitCheckFailed, err: fmt.Errorf("the numerics miss their targets at %s of %d, first %s: %s",
			plural.Count(len(missed), "point"), len(rep.Points), present.ScanPointName(rep, missed[0]), missed[0].NumericsError().Remedy)}
	}
	return nil
}
