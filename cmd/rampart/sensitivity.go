package main

import (
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/outfile"
	"rampart/cmd/internal/plots"
	"rampart/cmd/internal/present"
	"rampart/cmd/internal/report"
	"rampart/mc"
)

type sensitivityOptions struct {
	decisionOptions
	base int
}

// sensitivityFile holds the indices and derivatives in the output directory.
const sensitivityFile = "sensitivity.json"

func newSensitivityCmd(e env) *cobra.Command {
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
			return runSensitivity(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), o)
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

// sensitivityReport is what sensitivity --json prints.
type sensitivityReport struct {
	Inputs       []string        `json:"inputs"`
	BaseRows     int             `json:"base_rows"`
	Shots        int             `json:"shots"`
	Seed         uint64          `json:"seed"`
	Sampler      string          `json:"sampler"`
	ScaleFactorS float64         `json:"scale_factor_s"`
	Indices      mc.SobolResult  `json:"indices"`
	Derivatives  []mc.Derivative `json:"derivatives"`
}

// sensitivityTag records the design in a run's fingerprint (see ensembleJob).
type sensitivityTag struct {
	BaseRows int      `json:"sensitivity_base_rows"`
	Inputs   []string `json:"sensitivity_inputs"`
}

func runSensitivity(e env, stdout, stderr io.Writer, o sensitivityOptions) error {
	if err := o.validate(); err != nil {
		return err
	}
	if o.base < 2 {
		return fmt.Errorf("--base %d: want at least 2 base rows (256 is usual)", o.base)
	}
	sc, cfg, budget, err := o.load()
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
			return fmt.Errorf("--resume %s holds a design of %d shots, %d base rows for these %d inputs, not %d: give --base %d", o.ens.resume, m.Samples, m.Samples/d, d-2, o.base, m.Samples/d)
		}
	}
	ctx, stop := signalContext()
	defer stop()
	job := ensembleJob{realiser: r, runner: design, records: design.Len(), tag: sensitivityTag{BaseRows: o.base, Inputs: design.Inputs()}}
	run, err := runJob(ctx, e, stderr, sc, job, o.ens, o.ens.dir(), "sensitivity")
	if err != nil {
		return err
	}
	if o.ens.shard != "" {
		return printShardNote(stdout, o.ens, []string{""}, "compute the indices of the merged design")
	}
	if err := checkRecords(run.records); err != nil {
		return fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	indices, err := design.Indices(run.records, o.ens.confidence)
	if err != nil {
		return err
	}
	rep := sensitivityReport{
		Inputs: design.Inputs(), BaseRows: o.base, Shots: design.Len(), Seed: o.ens.seed, Sampler: o.ens.sampler,
		ScaleFactorS: run.manifest.ScaleFactorS, Indices: indices, Derivatives: mc.LocalDerivatives(r),
	}
	if dir := o.ens.dir(); dir != "" {
		if err := writeSensitivity(dir, rep); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %d shots, %s and the bar charts to %s\n", len(run.records), sensitivityFile, dir)
	}
	cfg, ramp := r.Config(), r.Config().Sequence.Up.Name()+" ramp"
	var work ensembleWork
	work.add(run)
	what := fmt.Sprintf("Saltelli design of %d base rows x (%d inputs + 2) = %d shots", o.base, len(rep.Inputs), rep.Shots)
	designLine := strings.Replace(work.line(what, o.ens), "Ensembles: ", "Design: ", 1)
	if o.report != "" {
		sens, err := sensitivitySection(rep)
		if err != nil {
			return err
		}
		cfgs, name := oneRamp(cfg)
		if err := writeDecisionReport(e, stderr, o.decisionOptions, "Sensitivity of "+name+" on "+sc.Name+" to its noise sources", sc, cfgs, name,
			setupText(sc, cfg, ramp, budget, designLine), sens); err != nil {
			return err
		}
	}
	if o.json {
		return writeJSON(stdout, rep)
	}
	printHeader(stdout, sc, cfg, ramp, budget, designLine)
	return printSensitivity(stdout, rep)
}

func printSensitivity(w io.Writer, rep sensitivityReport) error {
	if err := sobolGrid(rep).Render(w); err != nil {
		return err
	}
	fmt.Fprintf(w, "\n%s\n\n", sobolNote(rep))
	d := derivativeGrid(rep)
	if d == nil {
		fmt.Fprintln(w, noDerivatives)
		return nil
	}
	fmt.Fprintln(w, derivativesLead)
	return d.Render(w)
}

// sobolGrid returns the table of the Sobol' indices, a row per input.
func sobolGrid(rep sensitivityReport) *present.Grid {
	conf := present.Sig(100*rep.Indices.Confidence, 3) + " % interval"
	f := func(x float64) string { return present.Fixed(x, 3) }
	t := present.NewGrid(fmt.Sprintf("Sobol' indices of contrast and bias, %d shots", rep.Shots), "Input", "Contrast S1", conf, "Contrast ST", conf, "Bias S1", conf, "Bias ST", conf)
	for _, in := range rep.Indices.Inputs {
		row := []string{in.Name}
		for _, i := range []mc.Interval{in.ContrastFirst, in.ContrastTotal, in.BiasFirst, in.BiasTotal} {
			row = append(row, f(i.Value), interval(i.Lo, i.Hi, f))
		}
		t.Append(row...)
	}
	return t
}

// sobolNote explains the indices and gives the spread they apportion.
func sobolNote(rep sensitivityReport) string {
	biasStd := math.Sqrt(rep.Indices.BiasVariance)
	return fmt.Sprintf("S1: the share of the variance an input causes alone; ST: with all its interactions (ST >= S1; 1 - sum S1 is the share of interactions). Spread over the design: contrast std %s, bias std %s rad (%s deg/h). Bootstrap intervals over the %d rows; small negative values are sampling error about zero.",
		present.Sci(math.Sqrt(rep.Indices.ContrastVariance), 3), present.Sci(biasStd, 3), present.Sci(mc.BiasDegPerH(biasStd, rep.ScaleFactorS), 3), rep.BaseRows)
}

// noDerivatives and derivativesLead introduce the table of local
// derivatives, or say why there is none.
const (
	noDerivatives   = "No static errors in the budget: no local derivatives."
	derivativesLead = "Local derivatives of one shot at nominal, central differences over the step h (one budget standard deviation):"
)

// derivativeGrid returns the table of local derivatives, nil without a
// static error in the budget.
func derivativeGrid(rep sensitivityReport) *present.Grid {
	if len(rep.Derivatives) == 0 {
		return nil
	}
	t := present.NewGrid(strings.TrimSuffix(derivativesLead, ":"), "Input", "Step h", "Unit", "dC/dx", "d2C/dx2", "Contrast change C'' h^2/2",
		"db/dx (rad per unit)", "Bias shift b' h (rad)", "Bias shift b' h (deg/h)")
	for _, d := range rep.Derivatives {
		shift := d.BiasRad * d.StepSI
		t.Append(d.Input, present.Sig(d.StepSI, 4), siUnit(d.Input), present.Sci(d.Contrast, 3), present.Sci(d.ContrastSecond, 3), present.Sci(d.ContrastSecond*d.StepSI*d.StepSI/2, 3),
			present.Sci(d.BiasRad, 3), present.Sci(shift, 3), present.Sci(mc.BiasDegPerH(shift, rep.ScaleFactorS), 3))
	}
	return t
}

// sensitivitySection takes what sensitivity --json prints and shows the
// Sobol' index table with its bar charts and the local derivatives.
func sensitivitySection(rep sensitivityReport) (report.Section, error) {
	figs, err := figures(sensitivityFigures(rep))
	if err != nil {
		return report.Section{}, err
	}
	sec := report.Section{
		Heading: "Sensitivity",
		Text:    sobolNote(rep),
		Tables:  []report.Table{sobolGrid(rep).Table()},
		Figures: figs,
	}
	if d := derivativeGrid(rep); d != nil {
		sec.Tables = append(sec.Tables, d.Table())
	} else {
		sec.Text += "\n\n" + noDerivatives
	}
	return sec, nil
}

// siUnit is the SI unit of a static parameter, which its name carries.
func siUnit(param string) string {
	switch {
	case strings.HasSuffix(param, "_s"):
		return "s"
	case strings.HasSuffix(param, "_k"):
		return "K"
	}
	return "1 (relative)"
}

// writeSensitivity writes the indices and their bar charts to dir.
func writeSensitivity(dir string, rep sensitivityReport) error {
	if err := outfile.Write(filepath.Join(dir, sensitivityFile), func(w io.Writer) error { return writeJSON(w, rep) }); err != nil {
		return err
	}
	nfs, err := sensitivityFigures(rep)
	if err != nil {
		return err
	}
	return writeFigures(dir, nfs)
}

// sensitivityFigures returns the bar charts of the indices of the contrast
// and of the bias, named sensitivity-contrast and sensitivity-bias.
func sensitivityFigures(rep sensitivityReport) ([]namedFigure, error) {
	var out []namedFigure
	for _, output := range []struct {
		name, label string
		first       func(mc.SobolInput) mc.Interval
		total       func(mc.SobolInput) mc.Interval
	}{
		{"contrast", "contrast", func(i mc.SobolInput) mc.Interval { return i.ContrastFirst }, func(i mc.SobolInput) mc.Interval { return i.ContrastTotal }},
		{"bias", "bias", func(i mc.SobolInput) mc.Interval { return i.BiasFirst }, func(i mc.SobolInput) mc.Interval { return i.BiasTotal }},
	} {
		first := plots.BarSeries{Name: "first order S1"}
		total := plots.BarSeries{Name: "total ST"}
		for _, in := range rep.Indices.Inputs {
			for _, s := range []struct {
				b *plots.BarSeries
				i mc.Interval
			}{{&first, output.first(in)}, {&total, output.total(in)}} {
				s.b.Values, s.b.Lo, s.b.Hi = append(s.b.Values, s.i.Value), append(s.b.Lo, s.i.Lo), append(s.b.Hi, s.i.Hi)
			}
		}
		fig, err := plots.Bars(rep.Inputs, []plots.BarSeries{first, total}, plots.BarsOptions{
			Title:      fmt.Sprintf("Sobol' indices of the %s, %d shots", output.label, rep.Shots),
			ValueLabel: "share of the variance of the " + output.label,
			Horizontal: true,
		})
		if err != nil {
			return nil, fmt.Errorf("bar chart of the %s indices: %w", output.label, err)
		}
		caption := fmt.Sprintf("First-order and total Sobol' indices of the %s for each input, with their %s %% bootstrap intervals.", output.label, present.Sig(100*rep.Indices.Confidence, 3))
		out = append(out, namedFigure{name: "sensitivity-" + output.name, caption: caption, fig: fig})
	}
	return out, nil
}
