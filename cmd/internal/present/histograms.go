package present

import (
	"fmt"
	"path/filepath"

	"rampart/cmd/internal/plots"
	"rampart/mc"
)

// ensembleFigures returns the contrast and bias histograms of an ensemble,
// marking the 5th percentile of the contrast and the spec's limits.
func ensembleFigures(sum mc.Summary, recs []mc.Record, spec mc.Spec) (contrast, bias *plots.Figure, err error) {
	return outcomeFigures(sum, mc.OutcomesOf(recs), spec)
}

// outcomeFigures is ensembleFigures from the ensemble's output columns.
// The bias histogram holds the shots with a fringe: a lost shot (its atom
// scattered, z = 0) has no phase (mc.Record.Lost).
func outcomeFigures(sum mc.Summary, o *mc.Outcomes, spec mc.Spec) (contrast, bias *plots.Figure, err error) {
	c, b := o.Contrast, fringeBias(o)
	cm := []plots.Marker{{Label: "5th percentile " + Fixed(sum.Contrast.P05, 4), Value: sum.Contrast.P05}}
	if spec.MinContrast > 0 {
		cm = append(cm, plots.Marker{Label: "spec: contrast ≥ " + Sig(spec.MinContrast, 6), Value: spec.MinContrast})
	}
	var bm []plots.Marker
	if spec.MaxAbsBiasRad > 0 {
		bm = []plots.Marker{
			{Label: "spec: bias ≥ −" + Sig(spec.MaxAbsBiasRad, 6) + " rad", Value: -spec.MaxAbsBiasRad},
			{Label: "spec: bias ≤ " + Sig(spec.MaxAbsBiasRad, 6) + " rad", Value: spec.MaxAbsBiasRad},
		}
	}
	n := Sig(float64(len(c)), 6) + " realisations"
	contrast, err = plots.Histogram(c, plots.HistogramOptions{Title: "Contrast of the shots, " + n, XLabel: "contrast |z|", Markers: cm})
	if err != nil {
		return nil, nil, err
	}
	biasTitle := "Bias of the shots, " + n
	switch lost := len(c) - len(b); {
	case lost == len(c):
		// No phase to show: the lost shots' placeholder 0 stands in, said so.
		b, biasTitle = o.BiasRad, "No bias: all "+n+" lost (no fringe)"
	case lost > 0:
		biasTitle = fmt.Sprintf("Bias of the %s shots with a fringe (%s of %s lost)", Sig(float64(len(b)), 6), Sig(float64(lost), 6), n)
	}
	bias, err = plots.Histogram(b, plots.HistogramOptions{Title: biasTitle, XLabel: "bias (rad)", Markers: bm})
	if err != nil {
		return nil, nil, err
	}
	return contrast, bias, nil
}

// writeHistograms writes the contrast and bias histograms of an ensemble
// to dir as PNG and SVG.
func writeHistograms(dir string, sum mc.Summary, o *mc.Outcomes, spec mc.Spec) error {
	c, b, err := outcomeFigures(sum, o, spec)
	if err != nil {
		return err
	}
	if err := c.WriteFiles(filepath.Join(dir, "contrast")); err != nil {
		return err
	}
	return b.WriteFiles(filepath.Join(dir, "bias"))
}

// fringeBias returns the biases of the shots with a fringe, leaving out
// the lost ones (z = 0 and contrast 0: mc.Record.Lost), which have none.
func fringeBias(o *mc.Outcomes) []float64 {
	b := make([]float64, 0, len(o.BiasRad))
	for i, x := range o.BiasRad {
		if !(o.ZRe[i] == 0 && o.ZIm[i] == 0 && o.Contrast[i] == 0) {
			b = append(b, x)
		}
	}
	return b
}
