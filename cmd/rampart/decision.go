package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/present"
	"rampart/cmd/internal/report"
	"rampart/mc"
	"rampart/scenario"
	"rampart/sim"
)

// decisionOptions are the options that rank, qualify, tolerance and
// sensitivity share: the scenario with its overrides, the ensemble flags of
// run, --json and --report.
type decisionOptions struct {
	scenario string
	sets     []string
	ens      ensembleOptions
	json     bool
	report   string
}

// add registers the options on cmd; what names the object --json prints.
func (o *decisionOptions) add(cmd *cobra.Command, defaultSamples int, what string) {
	addScenarioFlags(cmd, &o.scenario, &o.sets)
	addEnsembleFlags(cmd, &o.ens, defaultSamples)
	cmd.Flags().BoolVar(&o.json, "json", false, "print "+what+" as one JSON object")
	addReportFlag(cmd, &o.report)
}

// confidenceFromSpec documents --confidence on a command that reads a spec
// file, whose confidence it replaces only when given.
func confidenceFromSpec(cmd *cobra.Command) {
	f := cmd.Flags().Lookup("confidence")
	f.Usage = "confidence `level` of the verdicts, in (0.5, 1), in place of the spec file's (default: the spec's, or 0.95)"
	f.DefValue = "0"
}

// validate checks the ensemble flags; a shard is kept in --out DIR for
// rampart merge, so it needs one, and decides nothing, so it has no report.
func (o *decisionOptions) validate() error {
	if err := o.ens.validate(); err != nil {
		return err
	}
	switch {
	case o.ens.shard != "" && o.ens.dir() == "":
		return fmt.Errorf("--shard %s needs --out DIR: the slices are kept there for rampart merge", o.ens.shard)
	case o.ens.shard != "" && o.report != "":
		return fmt.Errorf("--report %s with --shard %s: a shard decides nothing to report; give --report when the merged set runs with --resume", o.report, o.ens.shard)
	}
	return checkReportDir(o.report)
}

// load reads the scenario, its configuration and its noise budget.
// The inputs outside the model's validity are warned about on stderr.
func (o *decisionOptions) load(stderr io.Writer) (*scenario.Scenario, sim.Config, mc.Budget, error) {
	sc, cfg, b, err := scenario.LoadBudget(o.scenario, o.sets)
	if err == nil {
		warnValidity(stderr, cfg)
	}
	return sc, cfg, b, err
}

// writeDecisionReport writes the report of a decision command: the drive
// profiles of cfgs, the co-moving dynamics of the one named best, then
// secs, the first of them led by setup (what was simulated and how).
func writeDecisionReport(e env, stderr io.Writer, o decisionOptions, title string, sc *scenario.Scenario, cfgs []present.NamedConfig, best, setup string, secs ...report.Section) error {
	r := newReport(e, title, sc, scenarioText(o.scenario), o.sets, o.ens.seed)
	lead, err := present.DriveAndDynamics(cfgs, best)
	if err != nil {
		return err
	}
	secs[0].Text = strings.TrimSpace(setup + "\n\n" + secs[0].Text)
	r.Sections = append(lead, secs...)
	return writeReport(stderr, r, o.report)
}
