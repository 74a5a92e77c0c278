package present

import (
	"bufio"
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
	"rampart/stats"
)

// ToleranceCurvesFile holds the tolerance curves in the output directory.
const ToleranceCurvesFile = "tolerance-curves.csv"

// toleranceStatusNotes explain the statuses of a tolerance search.
var toleranceStatusNotes = map[mc.ToleranceStatus]string{
	mc.ToleranceAboveRange: "above-range: the spec holds up to the largest amplitude searched, so the tolerance shown is a lower bound.",
	mc.ToleranceBelowRange: "below-range: the spec holds with the source off but fails at the smallest amplitude searched (1/1000 of the start).",
	mc.ToleranceNone:       "fails-without-source: the spec fails even with the source off; the other sources or the sequence itself break it.",
	mc.ToleranceUndecided:  "undecided-without-source: the spec fails at the start and is undecided even with the source off: the ensembles are too small to show it holds; run with more --samples",
	mc.TolerancePredicted:  "predicted: the noise transfer functions put the binding criterion's estimate at its limit there, but the confirming ensemble did not show the spec holds (at the limit it cannot, with confidence): an estimate of the tolerance, above the demonstrated one.",
}

// ToleranceGrid returns the tolerance table: a row per source searched.
func ToleranceGrid(rep ToleranceReport) *Grid {
	conf := Sig(100*(1-stats.LookAlpha(1-rep.Requirements.Confidence, 1)), 4) + " %" // the first look's share (mc.Qualify)
	t := NewGrid("The tolerance of each noise source against spec "+rep.Spec, "Source", "Unit", "Nominal", "Tolerance", "Status",
		"Binding criterion", "At the tolerance", "Bounds ("+conf+" one-sided)", "At the tolerance (deg/h)", "Curve points")
	for _, res := range rep.Results {
		nominal := "off"
		if res.Nominal != nil {
			nominal = Sig(*res.Nominal, 4)
		}
		tol, value, bounds, degPerH := "-", "", "", ""
		if a, ok := res.Tolerance(); ok {
			tol = Sig(a, 3)
			if res.Status == mc.ToleranceAboveRange {
				tol = ">= " + tol
			}
			if res.Method == mc.MethodKernels {
				tol += " (kernels)"
			}
			if c, ok := res.Binding(*res.At); ok {
				f := criterionFormat(c)
				value, bounds = f(c.Value), criterionBounds(c, f)
				if c.Unit == "rad" {
					degPerH = Sci(mc.BiasDegPerH(c.Value, rep.ScaleFactorS), 3)
				}
			}
		}
		metric := res.Metric
		if !res.Monotone {
			metric += " *"
		}
		t.Append(res.Source, res.Unit, nominal, tol, string(res.Status), metric, value, bounds, degPerH, fmt.Sprint(len(res.Points)))
	}
	return t
}

// ToleranceNotes explain the tolerance table: what a tolerance is, and
// the statuses and marks it shows.
func ToleranceNotes(rep ToleranceReport) []string {
	each := "Each tolerance holds with every other source at its value in the budget."
	if slices.ContainsFunc(rep.Results, func(r mc.ToleranceResult) bool { return r.Source == mc.SourceBudget }) {
		each = "Each tolerance holds with every other source at its value in the budget; budget is the factor by which the whole budget may be scaled."
	}
	out := []string{
		each,
		fmt.Sprintf("The tolerance is the largest amplitude shown to meet every criterion (an undecided one counts as failing), to a relative precision of %s.", Sig(rep.Results[0].Precision, 3)),
	}
	byKernels := func(r mc.ToleranceResult) bool { return r.Method == mc.MethodKernels }
	switch {
	case !slices.ContainsFunc(rep.Results, byKernels):
	case slices.ContainsFunc(rep.Results, func(r mc.ToleranceResult) bool { return !byKernels(r) }):
		out[1] = "Searched by Monte Carlo, a t" + out[1][len("The t"):]
	default:
		out = out[:1] // nothing here was searched by Monte Carlo
	}
	statuses := map[mc.ToleranceStatus]bool{}
	monotone := true
	for _, res := range rep.Results {
		statuses[res.Status] = true
		monotone = monotone && res.Monotone
	}
	for _, s := range []mc.ToleranceStatus{mc.ToleranceAboveRange, mc.ToleranceBelowRange, mc.ToleranceNone, mc.ToleranceUndecided, mc.TolerancePredicted} {
		if statuses[s] {
			out = append(out, toleranceStatusNotes[s]+undecidedMore(rep, s))
		}
	}
	if note := yieldBySampling(rep); note != "" {
		out = append(out, note)
	}
	out = append(out, kernelToleranceNotes(rep)...)
	if !monotone {
		out = append(out, "* The criterion's value was not monotone in the amplitude over the ensembles tried (sampling noise); the curves carry its monotone envelope.")
	}
	return out
}

// undecidedMore completes the note of undecided-without-source with how
// many more realisations per ensemble would decide the source off.
func undecidedMore(rep ToleranceReport, s mc.ToleranceStatus) string {
	if s != mc.ToleranceUndecided {
		return ""
	}
	n := 0
	for _, res := range rep.Results {
		if res.Status == s {
			n = max(n, res.OffExtra())
		}
	}
	if n == 0 {
		return "."
	}
	return fmt.Sprintf(" (about %d more per ensemble would decide it).", n)
}

// yieldBySampling warns when every tolerance found is bound by the yield
// at n of n: each is the amplitude at which the first of the n
// realisations leaves the yield's window, and the bound that n of n
// allows (the Clopper-Pearson bound alpha^(1/n)) sits just above the
// limit, so the tolerances are set by the ensemble's size rather than by
// the physics.
func yieldBySampling(rep ToleranceReport) string {
	found := 0
	for _, res := range rep.Results {
		if res.At == nil {
			continue
		}
		c, ok := res.Binding(*res.At)
		if !ok || c.Name != mc.CriterionYield || c.Value != 1 {
			return ""
		}
		found++
	}
	if found == 0 {
		return ""
	}
	return fmt.Sprintf("Warning: every tolerance is bound by the yield at %d of %s: one realisation leaving the yield's window fails the bound, so the tolerances are set by the ensemble size, not by the physics; run with more --samples.", rep.Samples, plural.Count(rep.Samples, "realisation"))
}

// ToleranceSection takes what tolerance --json prints and shows the
// tolerance table and the curve of each source.
func ToleranceSection(rep ToleranceReport) (report.Section, error) {
	figs, err := figures(toleranceFigures(rep))
	if err != nil {
		return report.Section{}, err
	}
	return report.Section{
		Heading: "Tolerances",
		Text:    strings.Join(ToleranceNotes(rep), "\n\n"),
		Tables:  []report.Table{ToleranceGrid(rep).Table()},
		Figures: figs,
	}, nil
}

// WriteToleranceCurves writes the curves of every search as CSV, and a
// figure of each, to dir.
func WriteToleranceCurves(dir string, rep ToleranceReport) error {
	if err := atomicfile.Write(filepath.Join(dir, ToleranceCurvesFile), func(w io.Writer) error {
		bw := bufio.NewWriter(w)
		fmt.Fprintln(bw, "source,unit,amplitude,metric,limit,value,lo,hi,envelope_value,envelope_lo,envelope_hi,holds")
		for _, res := range rep.Results {
			for _, p := range res.Points {
				c, _ := res.Binding(p)
				bound := func(x float64, missing bool) string {
					if missing {
						return "" // no order statistic bounds it at this size
					}
					return Sig(x, -1)
				}
				fmt.Fprintf(bw, "%s,%s,%s,%s,%s,%s,%s,%s,%s,%s,%s,%t\n", res.Source, res.Unit, Sig(p.Amplitude, -1), res.Metric, Sig(c.Limit, -1),
					Sig(p.Value, -1), bound(p.Lo, p.NoLo), bound(p.Hi, p.NoHi), Sig(p.Envelope.Value, -1), bound(p.Envelope.Lo, p.EnvNoLo), bound(p.Envelope.Hi, p.EnvNoHi), p.Holds)
			}
		}
		return bw.Flush()
	}); err != nil {
		return err
	}
	nfs, err := toleranceFigures(rep)
	if err != nil {
		return err
	}
	return writeFigures(dir, nfs)
}

// toleranceFigures returns the curve of each search that has one (two
// amplitudes or more), named tolerance-SOURCE.
func toleranceFigures(rep ToleranceReport) ([]namedFigure, error) {
	var out []namedFigure
	for _, res := range rep.Results {
		if res.Method == mc.MethodKernels {
			if nf, ok, err := kernelToleranceFigure(res); err != nil {
				return nil, fmt.Errorf("figure of the tolerance of %s: %w", res.Source, err)
			} else if ok {
				out = append(out, nf)
			}
			continue
		}
		if len(res.Points) < 2 {
			continue
		}
		fig, err := toleranceFigure(res, rep.Requirements.Confidence)
		if err != nil {
			return nil, fmt.Errorf("figure of the tolerance of %s: %w", res.Source, err)
		}
		caption := fmt.Sprintf("The binding criterion %s against the amplitude of %s (%s): its monotone envelope (the running worst value from the lowest amplitude up) with its one-sided bounds, the spec limit and the tolerance.", res.Metric, res.Source, res.Unit)
		if !res.Monotone {
			caption += " The estimates at each amplitude, not monotone over the ensembles tried (sampling noise), are drawn beside it."
		}
		out = append(out, namedFigure{name: "tolerance-" + strings.ReplaceAll(res.Source, ".", "-"), caption: caption, fig: fig})
	}
	return out, nil
}

// toleranceFigure plots the monotone envelope of the binding criterion of
// one search against the amplitude (the running worst value from the
// lowest amplitude up, which the tolerance rests on), with its one-sided
// bounds, the limit and the tolerance; when sampling noise made the
// estimates themselves non-monotone, they are drawn too.
func toleranceFigure(res mc.ToleranceResult, confidence float64) (*plots.Figure, error) {
	x, y, raw, lo, hi := toleranceCurve(res)
	c, _ := res.Binding(res.Points[0])
	opts := plots.LinesOptions{
		Title:  fmt.Sprintf("Tolerance of %s: %s", res.Source, res.Status),
		XLabel: fmt.Sprintf("%s (%s)", res.Source, res.Unit),
		YLabel: criterionLabels[res.Metric],
		LogX:   !strings.HasPrefix(res.Unit, "dB"),
		Bands:  []plots.Band{{Name: fmt.Sprintf("%s %% one-sided bounds", Sig(100*confidence, 3)), X: x, Lo: lo, Hi: hi}},
		HLines: []plots.Marker{{Label: "spec limit " + Sig(c.Limit, 4), Value: c.Limit}},
	}
	if a, ok := res.Tolerance(); ok {
		opts.VLines = []plots.Marker{{Label: "tolerance " + Sig(a, 3) + " " + res.Unit, Value: a}}
	}
	series := []plots.Series{{Name: criterionLabels[res.Metric] + " (monotone envelope)", X: x, Y: y}}
	if !res.Monotone {
		series = append(series, plots.Series{Name: "estimate at each amplitude", X: x, Y: raw})
	}
	return plots.Lines(series, opts)
}

// toleranceCurve returns what a tolerance figure draws: the amplitudes,
// the envelope's value, the raw estimates, and the envelope's bounds.
func toleranceCurve(res mc.ToleranceResult) (x, envelope, raw, lo, hi []float64) {
	for _, p := range res.Points {
		x, envelope, raw = append(x, p.Amplitude), append(envelope, p.Envelope.Value), append(raw, p.Value)
		lo, hi = append(lo, p.Envelope.Lo), append(hi, p.Envelope.Hi)
	}
	return x, envelope, raw, lo, hi
}

// ToleranceReport is what tolerance --json prints.
type ToleranceReport struct {
	Spec         string               `json:"spec"`
	Requirements mc.Requirements      `json:"requirements"`
	Samples      int                  `json:"samples"`
	Seed         uint64               `json:"seed"`
	Sampler      string               `json:"sampler"`
	ScaleFactorS float64              `json:"scale_factor_s"`
	Results      []mc.ToleranceResult `json:"results"`
	// Numerics is the nominal shot's estimated numerical error.
	Numerics *sim.ErrorEstimate `json:"numerics_error,omitempty"`
	// KernelsSkipped says why the noise processes were searched by Monte
	// Carlo rather than found from the noise transfer functions.
	KernelsSkipped string `json:"kernels_skipped,omitempty"`
}
