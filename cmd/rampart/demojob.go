package main

import (
	"fmt"
	"slices"
	"strings"

	"rampart"
	"rampart/cmd/internal/present"
	"rampart/cmd/internal/spec"
	"rampart/mc"
	"rampart/scenario"
)

// The stages of the demo after the noise-free comparison: the ranking, the
// qualification of the winner, its tolerances and the report. They call
// the same code as rank, qualify and tolerance.

// demoEnsemble returns the ensemble options of the demo with n samples.
func (d *demo) demoEnsemble(n int) ensembleOptions {
	return ensembleOptions{samples: n, seed: d.opts.seed, workers: d.opts.workers, sampler: "random", confidence: mc.DefaultConfidence}
}

// requirements reads the demo's spec from the binary.
func (d *demo) requirements() (mc.Requirements, error) {
	data, err := rampart.Demo.ReadFile(demoSpec)
	if err != nil {
		return mc.Requirements{}, err
	}
	req, err := spec.Parse(demoSpec, data)
	if err == nil && req.Confidence == 0 {
		req.Confidence = mc.DefaultConfidence
	}
	return req, err
}

// inputs returns the demo's noise budget, spec and read-out.
func (d *demo) inputs() (mc.Budget, mc.Requirements, mc.Readout, error) {
	budget, err := d.base.Budget()
	if err != nil {
		return mc.Budget{}, mc.Requirements{}, mc.Readout{}, err
	}
	req, err := d.requirements()
	if err != nil {
		return mc.Budget{}, mc.Requirements{}, mc.Readout{}, err
	}
	ro, err := readoutOptions{}.of(d.base)
	return budget, req, ro, err
}

func (d *demo) rank() error {
	budget, req, ro, err := d.inputs()
	if err != nil {
		return err
	}
	ctx, stop := signalContext()
	defer stop()
	o := d.demoEnsemble(d.opts.samples)
	rep, recs, work, err := rankContestants(ctx, d.env, d.stderr, d.cs, budget, o, mc.MetricP05, req.Yield, ro)
	if err != nil {
		return err
	}
	d.ranking, d.recs = rep, recs
	d.winner = slices.IndexFunc(d.cs, func(c scenario.Contestant) bool { return c.Name == rep.Ranking.Ranking[0].Name })
	w := d.out
	fmt.Fprintf(w, "2. The three ramps under the noise budget, ranked by the 5th-percentile contrast\n")
	fmt.Fprintf(w, "Noise budget: %s\n", present.BudgetLine(budget))
	if note := present.ClampNote(d.cs[0].Config, budget); note != "" {
		fmt.Fprintln(w, note)
	}
	fmt.Fprintf(w, "%s\n", work.Line(fmt.Sprintf("%d ramps x %d realisations on common random numbers", len(d.cs), o.samples), o.seed, o.sampler, o.shard))
	for _, line := range present.RampNumericsLines(rep) {
		fmt.Fprintln(w, line)
	}
	fmt.Fprintln(w)
	return present.PrintRanking(w, rep)
}

func (d *demo) qualifyWinner() error {
	budget, req, ro, err := d.inputs()
	if err != nil {
		return err
	}
	req.LossPossible = budget.LossPossible()
	ramp := d.ranking.Ramps[d.winner]
	q := mc.Qualify(d.recs[d.winner], req, ramp.Summary.ScaleFactorS, d.opts.seed)
	d.qualify = present.QualifyReport{Qualification: q, Spec: demoSpec, Summary: ramp.Summary, Gyro: ro.Gyro(ramp.Summary)}
	// The measured signal, as qualify decides it (docs/model.md, Gyroscope
	// figures).
	if m := ro.MeasuredRecords(d.recs[d.winner], d.opts.seed); m != nil {
		qm := mc.Qualify(m, req, ramp.Summary.ScaleFactorS, d.opts.seed)
		d.qualify.MeasuredSignal = &qm
	}
	fmt.Fprintf(d.out, "3. The winner, %s, qualified against the spec %s on its %d realisations\n\n", ramp.Name, demoSpec, len(d.recs[d.winner]))
	if err := present.PrintQualification(d.out, d.qualify); err != nil {
		return err
	}
	if q.Verdict != mc.Pass {
		fmt.Fprintf(d.out, "Deciding: %s\n", strings.Join(present.Deciding(q), "; "))
	}
	return nil
}

func (d *demo) tolerances() error {
	budget, req, ro, err := d.inputs()
	if err != nil {
		return err
	}
	names, err := toleranceSources(budget, "", ro)
	if err != nil {
		return err
	}
	ctx, stop := signalContext()
	defer stop()
	c := d.cs[d.winner]
	o := d.demoEnsemble(d.opts.toleranceSamples)
	rep, work, err := searchTolerances(ctx, d.env, d.stderr, c.Scenario, c.Config, budget, req, names, o, demoTolerancePrecision, ro, true)
	if err != nil {
		return err
	}
	rep.Spec = demoSpec
	d.tol = rep
	fmt.Fprintf(d.out, "4. Hardware tolerances for %s: the largest amplitude of each source (the others as budgeted) at which the spec still holds\n", c.Name)
	fmt.Fprintf(d.out, "%s\n\n", work.Line(fmt.Sprintf("%d realisations at each amplitude tried, on common random numbers", o.samples), o.seed, o.sampler, o.shard))
	return present.ToleranceGrid(rep).RenderNoted(d.out, present.ToleranceNotes(rep))
}

// demoTolerancePrecision is the relative precision of the demo's tolerance
// search (a factor 1.1 between the amplitude that holds and the one that
// fails), coarser than the command's default to keep the demo short.
const demoTolerancePrecision = 0.1

func (d *demo) writeReport() error {
	cfgs := make([]present.NamedConfig, len(d.cs))
	recs := map[string][]mc.Record{}
	for i, c := range d.cs {
		cfgs[i] = present.NamedConfig{Name: c.Name, Config: c.Config}
		recs[c.Name] = d.recs[i]
	}
	winner := d.cs[d.winner].Name
	secs, err := present.DriveAndDynamics(cfgs, winner)
	if err != nil {
		return err
	}
	req, err := d.requirements()
	if err != nil {
		return err
	}
	ranked, err := present.RankSections(d.ranking, cfgs, recs, req.Yield)
	if err != nil {
		return err
	}
	qual, err := present.QualifySection(d.qualify)
	if err != nil {
		return err
	}
	tol, err := present.ToleranceSection(d.tol)
	if err != nil {
		return err
	}
	resp, err := present.ResponseSection(*d.response)
	if err != nil {
		return err
	}
	text, err := rampart.Demo.ReadFile(demoScenario)
	if err != nil {
		return err
	}
	r := newReport(d.env, "rampart demo: which ramp, and what hardware", d.base, string(text), nil, d.opts.seed)
	r.Sections = append(append(append(secs, ranked...), qual, tol, resp), present.EdgeSections(d.design)...)
	path, err := r.Write(d.opts.report)
	if err != nil {
		return fmt.Errorf("--report %s: %w", d.opts.report, err)
	}
	fmt.Fprintf(d.out, "7. The report: %s (one self-contained page; open it in a browser)\n", path)
	return nil
}
