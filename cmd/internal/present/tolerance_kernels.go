package present

import (
	"fmt"
	"strings"

	"rampart/cmd/internal/plots"
	"rampart/mc"
)

// kernelToleranceNotes say, for each tolerance found from the noise
// transfer functions, that it was, what it rests on, and what the
// confirming ensemble gave.
func kernelToleranceNotes(rep ToleranceReport) []string {
	var out []string
	for _, res := range rep.Results {
		kt := res.Kernel
		if res.Method != mc.MethodKernels || kt == nil {
			continue
		}
		if res.At == nil || kt.Confirm == nil {
			out = append(out, fmt.Sprintf("%s (kernels): with the source off, the ensemble's estimate of %s is already on the bad side of its limit: no level is left to the process.", res.Source, kt.Binding))
			continue
		}
		c, _ := res.Binding(*res.At)
		f := criterionFormat(c)
		s := fmt.Sprintf("%s (kernels): estimated from the noise transfer functions (docs/model.md, Noise transfer functions), not searched: %s %s is the level at which the predicted %s meets its limit %s (predicted %s), the process itself costing a mean contrast loss of %s and a bias std %s rad, the rest of the budget taken from the ensemble with it off. The ensemble at that level, the whole budget on, gives the row's values: %s %s, verdict %s",
			res.Source, Sig(kt.Amplitude, 4), res.Unit, kt.Binding, f(c.Limit), f(kt.Predicted), lossCell(kt.ContrastLoss), Sci(kt.BiasStdRad, 3), kt.Binding, f(c.Value), *kt.Confirm)
		if *kt.Confirm != mc.Pass {
			s += " (the estimate sits on the limit at a predicted tolerance, so undecided, or a fail within the estimate's standard error, is what agreement looks like; --kernels=false searches the demonstrated tolerance)"
		}
		s += "."
		if len(kt.Unpredicted) > 0 {
			s += " The kernels do not predict " + strings.Join(kt.Unpredicted, " or ") + ": the confirmation alone decides them."
		}
		for _, w := range kt.Warnings {
			s += " Warning: " + w + "; the confirmation is the answer to trust."
		}
		out = append(out, s)
	}
	if rep.KernelsSkipped != "" {
		out = append(out, "Kernels: "+rep.KernelsSkipped+".")
	}
	return out
}

// lossCell prints a predicted mean contrast loss; a negative one within
// rounding of zero (a process that only moves the phase, whose kernel
// sums to zero up to rounding) reads "0 (rounding)".
func lossCell(x float64) string {
	if x < 0 && x > -lossRounding {
		return "0 (rounding)"
	}
	return Sci(x, 3)
}

// lossRounding is the size below which a negative predicted contrast loss
// is rounding: the kernel's sums are of terms of order one, each rounded
// to about 1e-16, over up to 1e5 frequencies.
const lossRounding = 1e-11

// kernelToleranceFigure plots a tolerance found from the kernels: the
// binding criterion as they predict it against the amplitude, the spec
// limit, the tolerance, and the confirming ensemble's estimate there as
// the segment between its one-sided bounds; ok is false when there is no
// curve (no level was left to the process).
func kernelToleranceFigure(res mc.ToleranceResult) (namedFigure, bool, error) {
	kt := res.Kernel
	if kt == nil || len(kt.Curve) < 2 || res.At == nil {
		return namedFigure{}, false, nil
	}
	c, _ := res.Binding(*res.At)
	var x, y []float64
	for _, p := range kt.Curve {
		x, y = append(x, p.Amplitude), append(y, p.Predicted)
	}
	a := res.At.Amplitude
	fig, err := plots.Lines([]plots.Series{
		{Name: "kernels", X: x, Y: y},
		{Name: "Monte Carlo bounds", X: []float64{a, a}, Y: []float64{c.Lo, c.Hi}},
	}, plots.LinesOptions{
		Title:  fmt.Sprintf("%s from the kernels: %s", res.Source, res.Status),
		XLabel: fmt.Sprintf("%s (%s)", res.Source, res.Unit),
		YLabel: criterionLabels[res.Metric],
		LogX:   !strings.HasPrefix(res.Unit, "dB"),
		HLines: []plots.Marker{{Label: "spec limit " + Sig(c.Limit, 4), Value: c.Limit}},
		VLines: []plots.Marker{{Label: "tolerance " + Sig(a, 3) + " " + res.Unit, Value: a}},
	})
	if err != nil {
		return namedFigure{}, false, err
	}
	caption := fmt.Sprintf("The binding criterion %s of %s (%s) as the noise transfer functions predict it, with the rest of the budget from the ensemble with the process off; the spec limit, the tolerance where they meet, and the confirming ensemble's estimate there (%s) as the segment between its one-sided bounds.",
		res.Metric, res.Source, res.Unit, criterionFormat(c)(c.Value))
	return namedFigure{name: "tolerance-" + strings.ReplaceAll(res.Source, ".", "-"), caption: caption, fig: fig}, true, nil
}
