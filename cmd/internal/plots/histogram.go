package plots

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Bin counts chosen for a sample stay within these bounds.
const (
	minAutoBins = 5
	maxAutoBins = 50
)

// HistogramOptions configures Histogram.
type HistogramOptions struct {
	Title  string
	XLabel string // the sampled quantity with its unit, e.g. "bias (rad)"
	YLabel string // if empty, "realisations"

	// Bins is the number of equal-width bins over the sample's range. If
	// Bins is zero, it is the larger of the Freedman-Diaconis and Sturges
	// counts, kept within 5 to 50.
	Bins int

	// Markers are vertical lines, e.g. a spec limit or the 5th percentile.
	// The x axis always extends to show them.
	Markers []Marker

	WidthIn, HeightIn float64 // figure size; zero: 6.4 in by 3.8 in
}

// Histogram returns a histogram of the counts of values in equal-width bins
// spanning the sample's range. A sample whose values are all equal gets one
// bin, centred on the value.
func Histogram(values []float64, opts HistogramOptions) (*Figure, error) {
	if len(values) == 0 {
		return nil, errors.New("plots: histogram of an empty sample")
	}
	if err := checkFinite("sample", values); err != nil {
		return nil, err
	}
	if opts.Bins < 0 {
		return nil, fmt.Errorf("plots: histogram with %d bins: want a positive number, or 0 to choose", opts.Bins)
	}
	if err := checkMarkers("marker", opts.Markers, false); err != nil {
		return nil, err
	}
	ylabel := opts.YLabel
	if ylabel == "" {
		ylabel = "realisations"
	}
	p := newPlot(opts.Title, opts.XLabel, ylabel)
	p.Add(newGrid(false, true))
	h := &plotter.Histogram{
		Bins:      bins(values, opts.Bins),
		FillColor: tint(seriesColor(0), 0.85),
		LineStyle: draw.LineStyle{Color: seriesColor(0), Width: vg.Points(0.6)},
	}
	p.Add(h)
	p.Y.Min = 0
	f := newFigure(p, opts.WidthIn, opts.HeightIn)
	addMarkers(f, opts.Markers, false, 0)
	return f, nil
}

// bins sorts a copy of values into n equal-width bins or, if n is zero, into
// the larger of the Freedman-Diaconis count (D. Freedman and P. Diaconis,
// Z. Wahrscheinlichkeitstheorie verw. Gebiete 57, 453 (1981)),
//
//	k = range / (2 IQR / cbrt(N)),
//
// and the Sturges count 1 + log2(N) (H. A. Sturges, J. Am. Stat. Assoc. 21,
// 65 (1926)), kept within 5 to 50. The Sturges floor keeps a skewed sample,
// such as contrasts piled up below 1, from a handful of wide bins.
func bins(values []float64, n int) []plotter.HistogramBin {
	sorted := slices.Clone(values)
	slices.Sort(sorted)
	lo, hi := sorted[0], sorted[len(sorted)-1]
	if lo == hi {
		half := 0.5 * math.Max(1e-3*math.Abs(lo), 1e-12)
		if lo == 0 {
			half = 0.5e-3
		}
		return []plotter.HistogramBin{{Min: lo - half, Max: hi + half, Weight: float64(len(values))}}
	}
	if n == 0 {
		count := float64(len(sorted))
		k := 1 + math.Log2(count)
		iqr := stat.Quantile(0.75, stat.LinInterp, sorted, nil) - stat.Quantile(0.25, stat.LinInterp, sorted, nil)
		if iqr > 0 {
			k = math.Max(k, (hi-lo)/(2*iqr/math.Cbrt(count)))
		}
		n = int(math.Min(math.Max(math.Ceil(k), minAutoBins), maxAutoBins))
	}
	width := (hi - lo) / float64(n)
	out := make([]plotter.HistogramBin, n)
	for i := range out {
		out[i].Min = lo + float64(i)*width
		out[i].Max = lo + float64(i+1)*width
	}
	out[n-1].Max = hi
	for _, v := range sorted {
		i := min(int((v-lo)/width), n-1)
		out[i].Weight++
	}
	return out
}
