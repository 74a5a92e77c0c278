package present

import (
	"fmt"
	"io"
	"path/filepath"
	"slices"
	"strings"

	"rampart/cmd/internal/plots"
	"rampart/cmd/internal/report"
	"rampart/internal/atomicfile"
	"rampart/internal/plural"
	"rampart/mc"
	"rampart/sim"
)

// RankReport is what rank --json prints: the ranking and, for context,
// each ramp's ensemble.
type RankReport struct {
	mc.Ranking
	Ramps []RampReport `json:"ramps"`
	// MeasuredSignal ranks the ramps by the measured signal (each bias with
	// the read-out's projection and detection noise,
	// mc.Readout.MeasuredRecords), for a metric of the bias (bias-spread,
	// or a yield with a bias limit) and with a read-out; nil otherwise.
	// The embedded Ranking is that of the true, simulated signal.
	MeasuredSignal *mc.Ranking `json:"measured_signal,omitempty"`
}

// PrintRanking writes the ranking table with its notes and, when the
// ranking has one, the ranking by the measured signal, each labelled.
func PrintRanking(w io.Writer, rep RankReport) error {
	if rep.MeasuredSignal != nil {
		fmt.Fprintln(w, "By the true (simulated) signal:")
	}
	if err := RankingGrid(rep).RenderNoted(w, RankingNotes(rep)); err != nil {
		return err
	}
	if g := MeasuredRankingGrid(rep); g != nil {
		fmt.Fprintln(w)
		fmt.Fprintln(w, "By the measured signal ("+readoutNoise(rep.Ramps[0].Summary.Measured)+"; the context columns are the true signal's):")
		return g.Render(w)
	}
	return nil
}

// MeasuredRankingGrid returns the table of the ranking by the measured
// signal, nil without one.
func MeasuredRankingGrid(rep RankReport) *Grid {
	if rep.MeasuredSignal == nil {
		return nil
	}
	m := rep
	m.Ranking = *rep.MeasuredSignal
	g := RankingGrid(m)
	g.caption = strings.Replace(g.caption, ", best first", " of the measured signal, best first", 1)
	return g
}

// RampReport is one ramp's ensemble in a ranking.
type RampReport struct {
	Name              string     `json:"name"`
	Spec              string     `json:"spec"`
	RampUpS           float64    `json:"ramp_up_s"`
	Dir               string     `json:"dir,omitempty"`
	ContrastMean      float64    `json:"contrast_mean"`
	AbsBiasP95Rad     float64    `json:"abs_bias_p95_rad"`
	AbsBiasP95DegPerH float64    `json:"abs_bias_p95_deg_per_h"`
	Summary           mc.Summary `json:"summary"`
	Gyro              *mc.Gyro   `json:"gyro,omitempty"`
}

// metricFormat formats a value of a ranking metric.
func metricFormat(metric string) func(float64) string {
	switch metric {
	case mc.MetricYield:
		return func(x float64) string { return Fixed(x, 4) }
	case mc.MetricBiasSpread:
		return func(x float64) string { return Sci(x, 3) }
	}
	return func(x float64) string { return Fixed(x, 5) }
}

// RankingGrid returns the ranking table: the places best first, with the
// metric and the paired differences, and each ramp's ensemble for context.
func RankingGrid(rep RankReport) *Grid {
	r := rep.Ranking
	conf := fmt.Sprintf("%s %% interval", Sig(100*r.Confidence, 3))
	f := metricFormat(r.Metric)
	byName := map[string]RampReport{}
	withGyro, withLost := false, false
	for _, rr := range rep.Ramps {
		byName[rr.Name] = rr
		withGyro = withGyro || rr.Gyro != nil
		withLost = withLost || rr.Summary.Lost > 0
	}
	// The context columns, less the one the ranking's metric already is.
	context := []string{"Mean contrast", "|bias| p95 (rad)", "|bias| p95 (deg/h)"}
	keep := []bool{r.Metric != mc.MetricMean, r.Metric != mc.MetricBiasSpread, true}
	header := []string{"Place and ramp", metricLabels[r.Metric], conf, "Diff to best", conf, "Diff to next", conf, "Resolved"}
	for i, c := range context {
		if keep[i] {
			header = append(header, c)
		}
	}
	if withLost {
		header = append(header, "Lost shots")
	}
	if withGyro {
		header = append(header, "ARW (deg/sqrt(h))")
	}
	t := NewGrid(fmt.Sprintf("Ramps ranked by %s, best first", strings.ToLower(metricLabels[r.Metric])), header...)
	for _, p := range r.Ranking {
		rr := byName[p.Name]
		next, nextCI := "", ""
		if d := p.DiffToNext; d != nil {
			next, nextCI = f(d.Value), partialCell(*d, f)
		}
		own := interval(p.Lo, p.Hi, f)
		if p.NoLo || p.NoHi {
			own = noneBelow(p.NoBoundBelow)
		}
		row := []string{fmt.Sprintf("%d. %s", p.Place, p.Name), f(p.Value), own,
			f(p.DiffToBest.Value), partialCell(p.DiffToBest, f), next, nextCI, YesNo(p.Resolved)}
		for i, c := range []string{Fixed(rr.ContrastMean, 5), Sci(rr.AbsBiasP95Rad, 3), Sci(rr.AbsBiasP95DegPerH, 3)} {
			if keep[i] {
				row = append(row, c)
			}
		}
		if withLost {
			row = append(row, lostCell(rr.Summary))
		}
		if withGyro {
			arw := ""
			if rr.Gyro != nil {
				arw = Sci(rr.Gyro.AngleRandomWalkDegPerSqrtH, 3)
			}
			row = append(row, arw)
		}
		t.Append(row...)
	}
	return t
}

// RankingNotes explain the ranking table: the order, the intervals and, with
// a read-out, the angle random walk.
func RankingNotes(rep RankReport) []string {
	r := rep.Ranking
	better := "higher"
	if !r.HigherBetter {
		better = "lower"
	}
	out := []string{fmt.Sprintf("Best first by %s (%s is better), over %s per ramp. Every statement holds simultaneously at %s %%: quantile and yield intervals are exact (order statistics, Clopper-Pearson) at 1 - (1 - c)/k for k ramps, and two ramps differ when their intervals do not overlap; mean differences are paired over the same noise draws with a max-type bootstrap over all pairs. A place is resolved when it is separated from every other ramp.",
		strings.ToLower(metricLabels[r.Metric]), better, plural.Count(r.Samples, "realisation"), Sig(100*r.Confidence, 3))}
	for _, p := range r.Ranking {
		if p.NoLo || p.NoHi {
			out = append(out, fmt.Sprintf("none below %d: no order statistic bounds the quantile at the simultaneous confidence from fewer than %d realisations per ramp, so no place can be resolved by it.", p.NoBoundBelow, p.NoBoundBelow))
			break
		}
	}
	for _, rr := range rep.Ramps {
		if rr.Summary.Lost > 0 {
			out = append(out, lostNote)
			break
		}
	}
	if g := rep.Ramps[0].Gyro; g != nil {
		out = append(out, fmt.Sprintf("ARW: the angle random walk at each ramp's mean contrast, %s atoms per shot, one shot per %s s.", Sig(g.Atoms, 6), Sig(g.CycleS, 6)))
	}
	return out
}

// lostNote explains the lost-shots column of a ranking.
const lostNote = "Lost shots: the realisations whose atom scattered a photon from the lattice light and left no fringe (docs/model.md, Perturbations); they count as contrast 0 in the contrast columns, which is why the mean contrast can lie below the 5th percentile, outside every yield, and not in the |bias| columns."

// lostCell is the count of lost shots of an ensemble with its share.
func lostCell(s mc.Summary) string {
	if s.Samples == 0 {
		return fmt.Sprint(s.Lost)
	}
	return fmt.Sprintf("%d (%s %%)", s.Lost, Sig(100*float64(s.Lost)/float64(s.Samples), 2))
}

// RampDefinition is what defined a ramp: its --ramp SPEC or its scenario
// file.
func RampDefinition(r RampReport) string {
	return strings.TrimPrefix(r.Spec, "--ramp "+r.Name+"=")
}

// WriteRanking writes the ranking and its figure to dir.
func WriteRanking(dir string, rep RankReport) error {
	if err := atomicfile.Write(filepath.Join(dir, RankingFile), func(w io.Writer) error { return WriteJSON(w, rep) }); err != nil {
		return err
	}
	nfs, err := rankingFigure(rep)
	if err != nil {
		return err
	}
	return writeFigures(dir, nfs)
}

// rankingFigure plots each ramp's metric with its interval, best first: one
// figure, named ranking.
func rankingFigure(rep RankReport) ([]namedFigure, error) {
	items := make([]plots.Estimate, len(rep.Ranking.Ranking))
	for i, p := range rep.Ranking.Ranking {
		items[i] = plots.Estimate{Name: p.Name, Value: p.Value, Lo: p.Lo, Hi: p.Hi, OpenLo: p.NoLo, OpenHi: p.NoHi}
	}
	fig, err := plots.Ranking(items, plots.RankingOptions{
		Title:      fmt.Sprintf("Ramps ranked by %s, %s each", strings.ToLower(metricLabels[rep.Metric]), plural.Count(rep.Samples, "realisation")),
		ValueLabel: metricLabels[rep.Metric],
	})
	if err != nil {
		return nil, err
	}
	caption := fmt.Sprintf("Each ramp's %s with its %s %% interval, best first.", strings.ToLower(metricLabels[rep.Metric]), Sig(100*rep.Confidence, 3))
	if slices.ContainsFunc(items, func(e plots.Estimate) bool { return e.OpenLo || e.OpenHi }) {
		caption += " A whisker end without a cap does not exist at this ensemble size (no order statistic gives it): the whisker runs to the end of the statistic's range."
	}
	return []namedFigure{{name: "ranking", caption: caption, fig: fig}}, nil
}

// RankSections takes the ranking (rank --json's object), each ramp's
// configuration, its records by name and the yield spec, and shows the
// ranking table and figure, then each ramp's ensemble, best first, its
// figures' ids prefixed "rank-NAME-" (a '.' in NAME as '_', and the place
// added should that make two prefixes the same).
func RankSections(rep RankReport, cfgs []NamedConfig, recs map[string][]mc.Record, spec mc.Spec) ([]report.Section, error) {
	figs, err := figures(rankingFigure(rep))
	if err != nil {
		return nil, err
	}
	out := []report.Section{{
		Heading: "Ranking",
		Text:    strings.Join(RankingNotes(rep), "\n\n"),
		Tables:  rankingTables(rep),
		Figures: figs,
	}}
	byName := map[string]RampReport{}
	for _, rr := range rep.Ramps {
		byName[rr.Name] = rr
	}
	prefixes := map[string]bool{}
	for _, p := range rep.Ranking.Ranking {
		i := slices.IndexFunc(cfgs, func(c NamedConfig) bool { return c.Name == p.Name })
		rr, ok := byName[p.Name]
		if i < 0 || !ok || recs[p.Name] == nil {
			return nil, fmt.Errorf("ranking report: ramp %q lacks its configuration, summary or records", p.Name)
		}
		// A ramp's name may hold a '.', which an id may not.
		prefix := "rank-" + strings.ReplaceAll(p.Name, ".", "_") + "-"
		if prefixes[prefix] {
			prefix += fmt.Sprint(p.Place) + "-"
		}
		prefixes[prefix] = true
		up := cfgs[i].Config.Sequence.Up
		peak, _ := sim.PeakSpeed(up)
		text := fmt.Sprintf("Place %d: %s = %s, ramp-up %s of %s us with a peak speed of %s rad/s, on the noise draws that every ramp shares.",
			p.Place, p.Name, RampDefinition(rr), up.Name(), Sig(up.Duration()*1e6, 6), Sig(peak, 5))
		sec, err := EnsembleSection("Ensemble of "+p.Name, prefix, rr.Summary, recs[p.Name], spec, text)
		if err != nil {
			return nil, err
		}
		out = append(out, sec)
	}
	return out, nil
}

// RankingFile is the ranking in the output directory of rank.
const RankingFile = "ranking.json"

// metricLabels name the ranking metrics in tables and figures.
var metricLabels = map[string]string{
	mc.MetricP05:        "Contrast p05",
	mc.MetricMean:       "Mean contrast",
	mc.MetricYield:      "Yield",
	mc.MetricBiasSpread: "|bias| p95 (rad)",
}

// rankingTables returns the ranking's report tables: the true signal's
// and, with one, the measured signal's.
func rankingTables(rep RankReport) []report.Table {
	out := []report.Table{RankingGrid(rep).Table()}
	if g := MeasuredRankingGrid(rep); g != nil {
		out = append(out, g.Table())
	}
	return out
}

// partialCell formats a ranking's difference interval, or noneBelow when
// an end of it does not exist (a quantile no order statistic bounds at
// this ensemble size).
func partialCell(d mc.PartialInterval, f func(float64) string) string {
	if d.NoLo || d.NoHi {
		return noneBelow(d.NoBoundBelow)
	}
	return interval(d.Lo, d.Hi, f)
}
