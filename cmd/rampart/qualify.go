package main

import (
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/outfile"
	"rampart/cmd/internal/report"
	"rampart/cmd/internal/scenario"
	"rampart/cmd/internal/spec"
	"rampart/mc"
)

type qualifyOptions struct {
	decisionOptions
	spec    string
	look    int
	readout readoutOptions
}

// qualificationFile is the verdict in the output directory of qualify.
const qualificationFile = "qualification.json"

func newQualifyCmd(e env) *cobra.Command {
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

--out DIR keeps the ensemble as rampart run does, with the verdict in
qualification.json; --resume DIR continues it. --look K numbers this
qualification in a sequence on one ensemble that is topped up and qualified
again (1 the first time): each look spends its share of the confidence, so
the sequence keeps the stated confidence.
--shard k/n runs slice k into DIR and prints how to merge the slices and
qualify the merged ensemble.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			return runQualify(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), o, cmd.Flags().Changed("confidence"))
		},
	}
	o.add(cmd, 1000, "the qualification")
	confidenceFromSpec(cmd)
	addReadoutFlags(cmd, &o.readout)
	f := cmd.Flags()
	f.StringVar(&o.spec, "spec", "", "spec `file` (TOML) of the criteria to meet")
	f.IntVar(&o.look, "look", 1, "number `K` of this qualification of a topped-up ensemble (1 the first time)")
	cmd.MarkFlagRequired("spec")
	return cmd
}

// qualifyReport is what qualify --json prints.
type qualifyReport struct {
	mc.Qualification
	Spec    string     `json:"spec"`
	Summary mc.Summary `json:"summary"`
	Gyro    *mc.Gyro   `json:"gyro,omitempty"`
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
	req, err := readRequirements(o.spec, o.ens.confidence, confidenceGiven)
	if err != nil {
		return err
	}
	o.ens.confidence = req.Confidence
	if o.look < 1 {
		return fmt.Errorf("--look %d: want 1 for a first qualification, 2, 3, ... each time the ensemble is topped up and qualified again", o.look)
	}
	req.Look = o.look
	sc, cfg, budget, err := o.load()
	if err != nil {
		return err
	}
	ro, err := o.readout.of(sc)
	if err != nil {
		return err
	}
	ctx, stop := signalContext()
	defer stop()
	run, err := runEnsemble(ctx, e, stderr, sc, cfg, budget, o.ens, "qualify")
	if err != nil {
		return err
	}
	if err := checkRecords(run.records); err != nil {
		return fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	sum := summarise(run.manifest, run.records, req.Confidence, req.Yield)
	dir := o.ens.dir()
	if o.ens.shard != "" {
		if err := writeResults(dir, sum, run.records, req.Yield); err != nil {
			return err
		}
		return printShardNote(stdout, o.ens, []string{""}, "qualify the merged ensemble")
	}
	q := mc.Qualify(run.records, req, run.manifest.ScaleFactorS, run.manifest.Seed)
	rep := qualifyReport{Qualification: q, Spec: o.spec, Summary: sum, Gyro: ro.gyro(sum)}
	if dir != "" {
		if err := writeResults(dir, sum, run.records, req.Yield); err != nil {
			return err
		}
		if err := outfile.Write(filepath.Join(dir, qualificationFile), func(w io.Writer) error { return writeJSON(w, rep) }); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %d realisations, %s and %s to %s\n", len(run.records), summaryFile, qualificationFile, dir)
	}
	cfg = run.realiser.Config()
	ramp, specLine := cfg.Sequence.Up.Name()+" ramp", "Spec: "+o.spec
	if o.report != "" {
		if err := writeQualifyReport(e, stderr, o, sc, run, rep, req.Yield, setupText(sc, cfg, ramp, budget, ensembleLine(run, o.ens), specLine)); err != nil {
			return err
		}
	}
	if o.json {
		if err := writeJSON(stdout, rep); err != nil {
			return err
		}
	} else {
		printHeader(stdout, sc, cfg, ramp, budget, ensembleLine(run, o.ens), specLine)
		if err := printQualification(stdout, rep); err != nil {
			return err
		}
	}
	if q.Verdict == mc.Pass {
		return nil
	}
	return &exitError{code: q.ExitCode(), err: fmt.Errorf("%s against spec %q: %s", q.Verdict, o.spec, strings.Join(deciding(q), "; "))}
}

// checkRecords refuses records whose contrast or bias is not a number (a
// shot whose arms do not overlap at all has no phase), on which no
// statistic can be decided.
func checkRecords(recs []mc.Record) error {
	for _, r := range recs {
		if r.Contrast != r.Contrast || r.BiasRad != r.BiasRad {
			return fmt.Errorf("realisation %d has contrast %g and bias %g rad: no statistic is defined over it; the noise budget is too large for this sequence", r.Index, r.Contrast, r.BiasRad)
		}
	}
	return nil
}

// deciding lists the criteria behind an overall verdict other than pass:
// those that fail, or else those undecided with what would decide them.
func deciding(q mc.Qualification) []string {
	var out []string
	for _, c := range q.Criteria {
		if c.Verdict != q.Verdict {
			continue
		}
		s := c.Name
		if c.Verdict == mc.Undecided {
			s += " (" + toDecide(c, q.LookConfidence) + ")"
		}
		out = append(out, s)
	}
	return out
}

// toDecide says how many more realisations would decide an undecided
// criterion; conf is the look's one-sided confidence.
func toDecide(c mc.Criterion, conf float64) string {
	switch {
	case c.Verdict != mc.Undecided:
		return ""
	case c.NoBoundBelow > 0:
		return fmt.Sprintf("no %s %% bound below %d realisations: about %d more", sig(100*conf, 4), c.NoBoundBelow, c.Extra)
	case c.OutOfReach:
		return "out of reach: the value sits on the limit"
	}
	return fmt.Sprintf("about %d more realisations", c.Extra)
}

// criterionLabels name the statistics of the criteria in figures.
var criterionLabels = map[string]string{
	mc.CriterionContrastMean: "mean contrast",
	mc.CriterionContrastP05:  "contrast p05",
	mc.CriterionBiasRad:      "|bias| p95 (rad)",
	mc.CriterionBiasDegPerH:  "|bias| p95 (deg/h)",
	mc.CriterionYield:        "yield",
}

// criterionFormat formats the values of a criterion in its unit.
func criterionFormat(c mc.Criterion) func(float64) string {
	if c.Unit == "" {
		return func(x float64) string { return fixed(x, 5) }
	}
	return func(x float64) string { return sci(x, 3) }
}

func printQualification(w io.Writer, rep qualifyReport) error {
	if err := criteriaGrid(rep).Render(w); err != nil {
		return err
	}
	for _, line := range criteriaNotes(rep) {
		fmt.Fprintln(w, line)
	}
	fmt.Fprintln(w)
	if err := gyroGrid(rep.Summary, rep.Gyro).Render(w); err != nil {
		return err
	}
	if rep.Gyro == nil {
		fmt.Fprintln(w, noReadout)
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, verdictLine(rep.Qualification))
	return nil
}

// criteriaGrid returns the table of a qualification's criteria.
func criteriaGrid(rep qualifyReport) *grid {
	q, s := rep.Qualification, rep.Summary
	conf := sig(100*q.LookConfidence, 4) + " %"
	t := newGrid("The criteria of spec "+rep.Spec+" against the ensemble", "Criterion", "Limit", "Unit", "Measured",
		"Lower bound ("+conf+" one-sided)", "Upper bound ("+conf+" one-sided)", "Margin", "Verdict", "To decide", "Measured (deg/h)")
	for _, c := range q.Criteria {
		f := criterionFormat(c)
		limit := "<= " + f(c.Limit)
		if c.AtLeast {
			limit = ">= " + f(c.Limit)
		}
		degPerH := ""
		if c.Unit == "rad" {
			degPerH = sci(mc.BiasDegPerH(c.Value, s.ScaleFactorS), 3)
		}
		t.Append(c.Name, limit, c.Unit, f(c.Value), f(c.Lo), f(c.Hi), f(c.Margin), c.Verdict.String(), toDecide(c, q.LookConfidence), degPerH)
	}
	return t
}

// criteriaNotes explain the criteria table: the yield's count and how a
// bound decides.
func criteriaNotes(rep qualifyReport) []string {
	var out []string
	if s := rep.Summary; s.Yield != nil {
		out = append(out, fmt.Sprintf("Yield: %d of %d realisations inside %s.", s.Yield.Inside, s.Samples, yieldLimits(s.Yield.Spec, s.ScaleFactorS)))
	}
	q := rep.Qualification
	out = append(out, "A limit \"at least\" passes when the lower bound clears it and fails when the upper bound misses it; \"at most\" the other way round.")
	return append(out, fmt.Sprintf("Look %d: each bound is one-sided at %s %%, this look's share of the %s %% claim, so that qualifying again after topping up the ensemble keeps it; the advice in \"To decide\" is for the next look. Quantiles have exact order-statistic bounds, the mean a bootstrap-t, the yield Clopper-Pearson; a fail is corrected for the number of criteria (Holm).",
		q.Look, sig(100*q.LookConfidence, 4), sig(100*q.Confidence, 3)))
}

// verdictLine states the overall verdict and what decides it.
func verdictLine(q mc.Qualification) string {
	conf := sig(100*q.Confidence, 3) + " %"
	switch q.Verdict {
	case mc.Pass:
		return fmt.Sprintf("Verdict: pass. Every criterion is met with %s confidence over %d realisations.", conf, q.Samples)
	case mc.Fail:
		return fmt.Sprintf("Verdict: fail. Missed with %s confidence: %s.", conf, strings.Join(deciding(q), ", "))
	}
	return fmt.Sprintf("Verdict: undecided. Not decided at %s confidence over %d realisations: %s.", conf, q.Samples, strings.Join(deciding(q), ", "))
}

// qualifySection takes what qualify --json prints and shows the verdict,
// the criteria table and the gyroscope figures; the ensemble's own section
// is the caller's to add.
func qualifySection(q qualifyReport) (report.Section, error) {
	text := append([]string{verdictLine(q.Qualification)}, criteriaNotes(q)...)
	if q.Gyro == nil {
		text = append(text, noReadout)
	}
	return report.Section{
		Heading: "Qualification against " + q.Spec,
		Text:    strings.Join(text, "\n\n"),
		Tables:  []report.Table{criteriaGrid(q).table(), gyroGrid(q.Summary, q.Gyro).table()},
	}, nil
}

// writeQualifyReport writes the report of a qualification: the drive and
// co-moving dynamics of the ramp, the ensemble and the verdict.
func writeQualifyReport(e env, stderr io.Writer, o qualifyOptions, sc *scenario.Scenario, run *ensembleRun, rep qualifyReport, yield mc.Spec, setup string) error {
	ens, err := ensembleSection("Ensemble", "qualify-", rep.Summary, run.records, yield, "")
	if err != nil {
		return err
	}
	q, err := qualifySection(rep)
	if err != nil {
		return err
	}
	cfgs, name := oneRamp(run.realiser.Config())
	return writeDecisionReport(e, stderr, o.decisionOptions, "Qualification of "+name+" on "+sc.Name+" against "+o.spec, sc, cfgs, name, setup, ens, q)
}

// yieldLimits describes a yield spec, with its bias limit as a rotation rate.
func yieldLimits(y mc.Spec, scaleFactorS float64) string {
	var lim []string
	if y.MinContrast > 0 {
		lim = append(lim, "contrast >= "+sig(y.MinContrast, 6))
	}
	if y.MaxAbsBiasRad > 0 {
		lim = append(lim, fmt.Sprintf("|bias| <= %s rad (%s deg/h)", sig(y.MaxAbsBiasRad, 6), sig(mc.BiasDegPerH(y.MaxAbsBiasRad, scaleFactorS), 3)))
	}
	return strings.Join(lim, " and ")
}
