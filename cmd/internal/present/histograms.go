package present

import (
	"path/filepath"

	"rampart/cmd/internal/plots"
	"rampart/mc"
)

// ensembleFigures returns the contrast and bias histograms of an ensemble,
// marking the 5th percentile of the contrast and the spec's limits.
func ensembleFigures(sum mc.Summary, recs []mc.Record, spec mc.Spec) (contrast, bias *plots.Figure, err error) {
	o := mc.OutcomesOf(recs)
	return outcomeFigures(sum, o.Contrast, o.BiasRad, spec)
}

// outcomeFigures is ensembleFigures from the contrast and bias columns.
func outcomeFigures(sum mc.Summary, c, b []float64, spec mc.Spec) (contrast, bias *plots.Figure, err error) {
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
	bias, err = plots.Histogram(b, plots.HistogramOptions{Title: "Bias of the shots, " + n, XLabel: "bias (rad)", Markers: bm})
	if err != nil {
		return nil, nil, err
	}
	return contrast, bias, nil
}

// writeHistograms writes the contrast and bias histograms of an ensemble
// to dir as PNG and SVG.
func writeHistograms(dir string, sum mc.Summary, o *mc.Outcomes, spec mc.Spec) error {
	c, b, err := outcomeFigures(sum, o.Contrast, o.BiasRad, spec)
	if err != nil {
		return err
	}
	if err := c.WriteFiles(filepath.Join(dir, "contrast")); err != nil {
		return err
	}
	return b.WriteFiles(filepath.Join(dir, "bias"))
}
