package present

import (
	"bufio"
	"fmt"
	"io"
	"strings"

	"rampart/design"
	"rampart/internal/plural"
)

// RobustReport is the result of rampart robust: the optimisation on its
// tuning ensemble, and the ranking of the result against the reference
// (and any candidates) on a fresh ensemble of another seed.
type RobustReport struct {
	Scenario  string              `json:"scenario"`
	Objective string              `json:"objective"`
	Terms     int                 `json:"terms"`
	Samples   int                 `json:"samples"`
	Seed      uint64              `json:"seed"`
	RampFile  string              `json:"ramp_file,omitempty"`
	Result    design.RobustResult `json:"result"`
	// Fresh is the ranking on the fresh ensemble (absent when interrupted).
	Fresh      *RankReport `json:"fresh,omitempty"`
	FreshSeed  uint64      `json:"fresh_seed"`
	FreshShots int         `json:"fresh_samples"`
}

// RobustGrid returns the optimisation's summary.
func RobustGrid(rep RobustReport) *Grid {
	r := rep.Result
	g := NewGrid("Robust optimisation on the tuning ensemble", "Quantity", "Value")
	g.Append("Objective ("+rep.Objective+") of the reference", Fixed(r.Reference, 5))
	g.Append("Objective of the best ramp found", Fixed(r.Value, 5))
	g.Append("Evaluations (ensembles of "+fmt.Sprint(rep.Samples)+", seed "+fmt.Sprint(rep.Seed)+")", fmt.Sprint(len(r.History)))
	coef := make([]string, len(r.Coef))
	for i, c := range r.Coef {
		coef[i] = Sig(c, 4)
	}
	g.Append("Correction coefficients (units of the cruise speed)", strings.Join(coef, " "))
	return g
}

// PrintRobust prints the optimisation and the fresh ranking.
func PrintRobust(w io.Writer, rep RobustReport) error {
	notes := []string{"The tuning ensemble's objective is biased upwards for the ramp tuned on it (the draws it was chosen on); the ranking below is on fresh draws."}
	if rep.Result.Interrupted {
		notes = []string{"Interrupted: the best ramp so far is kept; no fresh ranking was run."}
	}
	if err := RobustGrid(rep).RenderNoted(w, notes); err != nil {
		return err
	}
	if rep.Fresh == nil {
		return nil
	}
	fmt.Fprintf(w, "\nFresh ensemble: %s per ramp, seed %d (independent of the tuning draws)\n", plural.Count(rep.FreshShots, "realisation"), rep.FreshSeed)
	return RankingGrid(*rep.Fresh).RenderNoted(w, RankingNotes(*rep.Fresh))
}

// WriteRobustHistory writes the optimisation history as CSV: the
// evaluation, its objective, the best so far and the coefficients.
func WriteRobustHistory(w io.Writer, r design.RobustResult) error {
	bw := bufio.NewWriter(w)
	cols := []string{"eval", "value", "best"}
	for i := range r.Coef {
		cols = append(cols, fmt.Sprintf("c%d", i+1))
	}
	fmt.Fprintln(bw, strings.Join(cols, ","))
	for _, s := range r.History {
		row := []string{fmt.Sprint(s.Eval), Sig(s.Value, -1), Sig(s.Best, -1)}
		for _, c := range s.Coef {
			row = append(row, Sig(c, -1))
		}
		fmt.Fprintln(bw, strings.Join(row, ","))
	}
	return bw.Flush()
}

// RobustHistoryFigure plots the objective of each evaluation and the best
// so far, to base.png and base.svg.
func RobustHistoryFigure(base string, rep RobustReport) error {
	fig, err := robustHistory(rep)
	if err != nil || fig == nil {
		return err
	}
	return fig.WriteFiles(base)
}
