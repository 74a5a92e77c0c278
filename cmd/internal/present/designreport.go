package present

import (
	"fmt"
	"strings"

	"rampart/cmd/internal/plots"
	"rampart/cmd/internal/report"
	"rampart/internal/plural"
)

// ScanSections returns the report section of a scan: its table, notes and
// figures (ids scan-contrast and scan-bias, as --out names them).
func ScanSections(rep ScanReport) ([]report.Section, error) {
	figs, err := figures(ScanFigures(rep))
	if err != nil {
		return nil, err
	}
	what := "noise-free shot"
	if rep.Ensemble {
		what = fmt.Sprintf("ensemble of %s from seed %d at every point (common random numbers)", plural.Count(rep.Samples, "realisation"), rep.Seed)
	}
	text := fmt.Sprintf("A scan of %s over %s, the %s.\n\n%s", strings.Join(rep.Keys, " and "), plural.Count(len(rep.Points), "point"), what, strings.Join(ScanNotes(rep), "\n\n"))
	return []report.Section{{
		Heading: "Scan of " + strings.Join(rep.Keys, " and "),
		Text:    text,
		Tables:  []report.Table{ScanGrid(rep).Table()},
		Figures: figs,
	}}, nil
}

// EdgeSections returns the report section of an edge search: what was
// found, with its bracket and confidence, and the points qualified.
func EdgeSections(rep EdgeReport) []report.Section {
	return []report.Section{{
		Heading: "Edge of " + rep.Key + " against spec " + rep.Spec,
		Text:    strings.Join(EdgeLines(rep), "\n\n"),
		Tables:  []report.Table{EdgeGrid(rep).Table()},
	}}
}

// RobustSections returns the report sections of a robust optimisation:
// its summary and history figure, then (unless interrupted) the ranking
// on the fresh ensemble with its figure.
func RobustSections(rep RobustReport) ([]report.Section, error) {
	notes := []string{"The tuning ensemble's objective is biased upwards for the ramp tuned on it (the draws it was chosen on); the ranking on fresh draws follows."}
	if rep.Result.Interrupted {
		notes = []string{"Interrupted: the best ramp so far is kept; no fresh ranking was run."}
	}
	var figs []report.Figure
	if fig, err := robustHistory(rep); err != nil {
		return nil, err
	} else if fig != nil {
		f, err := figure("robust-history", "The objective of each evaluation on the tuning ensemble and the best so far.", fig)
		if err != nil {
			return nil, err
		}
		figs = append(figs, f)
	}
	out := []report.Section{{
		Heading: "Robust optimisation (" + rep.Objective + ")",
		Text:    strings.Join(notes, "\n\n"),
		Tables:  []report.Table{RobustGrid(rep).Table()},
		Figures: figs,
	}}
	if rep.Fresh == nil {
		return out, nil
	}
	rfigs, err := figures(rankingFigure(*rep.Fresh))
	if err != nil {
		return nil, err
	}
	return append(out, report.Section{
		Heading: "Ranking on the fresh ensemble",
		Text: fmt.Sprintf("%s per ramp, seed %d (independent of the tuning draws).\n\n%s",
			plural.Count(rep.FreshShots, "realisation"), rep.FreshSeed, strings.Join(RankingNotes(*rep.Fresh), "\n\n")),
		Tables:  []report.Table{RankingGrid(*rep.Fresh).Table()},
		Figures: rfigs,
	}), nil
}

// robustHistory returns the figure of the optimisation history, or nil
// for fewer than two evaluations.
func robustHistory(rep RobustReport) (*plots.Figure, error) {
	var x, v, b []float64
	for _, s := range rep.Result.History {
		x, v, b = append(x, float64(s.Eval)), append(v, s.Value), append(b, s.Best)
	}
	if len(x) < 2 {
		return nil, nil
	}
	return plots.Lines([]plots.Series{{Name: "evaluation", X: x, Y: v}, {Name: "best so far", X: x, Y: b}},
		plots.LinesOptions{Title: "Robust optimisation of " + rep.Scenario, XLabel: "evaluation", YLabel: "objective (" + rep.Objective + ")"})
}
