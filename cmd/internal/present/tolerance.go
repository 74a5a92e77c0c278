package present

import (
	"bufio"
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"rampart/cmd/internal/plots"
	"rampart/cmd/internal/report"
	"rampart/internal/atomicfile"
	"rampart/mc"
	"rampart/stats"
)

// ToleranceCurvesFile holds the tolerance curves in the output directory.
const ToleranceCurvesFile = "tolerance-curves.csv"

// toleranceStatusNotes explain the statuses of a tolerance search.
var toleranceStatusNotes = map[mc.ToleranceStatus]string{
	mc.ToleranceAboveRange: "above-range: the spec holds up to the largest amplitude searched, so the tolerance shown is a lower bound.",
	mc.ToleranceBelowRange: "below-range: the spec holds with the source off but fails at the smallest amplitude searched (1/1000 of the start).",
	mc.ToleranceNone:       "fails-without-source: the spec fails even with the source off; the other sources or the sequence itself break it.",
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
			if c, ok := res.Binding(*res.At); ok {
				f := criterionFormat(c)
				value, bounds = f(c.Value), interval(c.Lo, c.Hi, f)
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
	out := []string{
		"Each tolerance holds with every other source at its value in the budget; budget is the factor by which the whole budget may be scaled.",
		fmt.Sprintf("The tolerance is the largest amplitude shown to meet every criterion (an undecided one counts as failing), to a relative precision of %s.", Sig(rep.Results[0].Precision, 3)),
	}
	statuses := map[mc.ToleranceStatus]bool{}
	monotone := true
	for _, res := range rep.Results {
		statuses[res.Status] = true
		monotone = monotone && res.Monotone
	}
	for _, s := range []mc.ToleranceStatus{mc.ToleranceAboveRange, mc.ToleranceBelowRange, mc.ToleranceNone} {
		if statuses[s] {
			out = append(out, toleranceStatusNotes[s])
		}
	}
	if !monotone {
		out = append(out, "* The criterion's value was not monotone in the amplitude over the ensembles tried (sampling noise); the curves carry its monotone envelope.")
	}
	return out
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
				fmt.Fprintf(bw, "%s,%s,%s,%s,%s,%s,%s,%s,%s,%s,%s,%t\n", res.Source, res.Unit, Sig(p.Amplitude, -1), res.Metric, Sig(c.Limit, -1),
					Sig(p.Value, -1), Sig(p.Lo, -1), Sig(p.Hi, -1), Sig(p.Envelope.Value, -1), Sig(p.Envelope.Lo, -1), Sig(p.Envelope.Hi, -1), p.Holds)
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
		if len(res.Points) < 2 {
			continue
		}
		fig, err := toleranceFigure(res, rep.Requirements.Confidence)
		if err != nil {
			return nil, fmt.Errorf("figure of the tolerance of %s: %w", res.Source, err)
		}
		caption := fmt.Sprintf("The binding criterion %s against the amplitude of %s (%s), with its one-sided bounds, the spec limit and the tolerance.", res.Metric, res.Source, res.Unit)
		out = append(out, namedFigure{name: "tolerance-" + strings.ReplaceAll(res.Source, ".", "-"), caption: caption, fig: fig})
	}
	return out, nil
}

// toleranceFigure plots the binding criterion of one search against the
// amplitude, with its one-sided bounds, the limit and the tolerance.
func toleranceFigure(res mc.ToleranceResult, confidence float64) (*plots.Figure, error) {
	var x, y, lo, hi []float64
	for _, p := range res.Points {
		x, y = append(x, p.Amplitude), append(y, p.Value)
		lo, hi = append(lo, p.Lo), append(hi, p.Hi)
	}
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
	return plots.Lines([]plots.Series{{Name: criterionLabels[res.Metric], X: x, Y: y}}, opts)
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
}
