package main

import (
	"context"
	"fmt"

	"rampart/cmd/internal/present"
	"rampart/design"
	"rampart/mc"
	"rampart/scenario"
)

// demoDesign is the demo's design stage: the shortest ramp of the demo's
// own smooth shape (sin2, which fails the spec at the scenario's 150 us)
// that meets the demo spec, by the search of rampart edge over its ramp-up
// time in us, with Steps bisections. (The inverse-gap ramp still passed at
// 60 us, and below 30 us its shots cost ten times as much: no edge the demo
// could afford to show.)
var demoDesign = struct {
	shape  string
	lo, hi float64
	steps  int
}{"sin2", 250, 400, 2}

// designSearch returns the demo's edge search, its sampler still unset.
func (d *demo) designSearch() (design.Edge, error) {
	req, err := d.requirements()
	if err != nil {
		return design.Edge{}, err
	}
	s := design.Edge{Lo: demoDesign.lo, Hi: demoDesign.hi, Steps: demoDesign.steps, Requirements: req}
	return s, s.Validate()
}

// designStage runs the design search and prints what it found.
func (d *demo) designStage() error {
	search, err := d.designSearch()
	if err != nil {
		return err
	}
	o := d.demoEnsemble(d.opts.samples)
	search.Sample = func(ctx context.Context, x float64) (design.Sample, error) {
		sc := *d.base
		sc.Ramp = scenario.Ramp{Shape: demoDesign.shape, DurationUS: x}
		cfg, err := sc.Config()
		if err != nil {
			return design.Sample{}, err
		}
		budget, err := sc.Budget()
		if err != nil {
			return design.Sample{}, err
		}
		ens := mc.Ensemble{Config: cfg, Budget: budget, Samples: o.samples, Seed: o.seed, Sampler: o.sampler}
		set := design.Set("ramp.duration_us", x)
		run, _, err := runPart(ctx, d.env, d.stderr, &sc, ens, nil, o, "", "design "+set)
		if err != nil {
			return design.Sample{}, err
		}
		if err := mc.CheckDecidable(run.records); err != nil {
			return design.Sample{}, fmt.Errorf("%s: %w", set, err)
		}
		return design.Sample{Records: run.records, ScaleFactorS: run.manifest.ScaleFactorS, Seed: run.manifest.Seed, LossPossible: run.manifest.LossPossible}, nil
	}
	ctx, stop := signalContext()
	defer stop()
	res, err := search.Find(ctx)
	if err != nil {
		return err
	}
	d.design = present.EdgeReport{Scenario: d.base.Name, Key: "ramp.duration_us", Spec: demoSpec, Samples: o.samples, Seed: o.seed, EdgeResult: res}
	fmt.Fprintf(d.out, "6. Designing the ramp: how long must the %s ramp be to meet the spec? The shortest, searched over %s to %s us with %d realisations per point\n\n",
		demoDesign.shape, present.Sig(demoDesign.lo, 6), present.Sig(demoDesign.hi, 6), o.samples)
	return present.PrintEdge(d.out, d.design)
}
