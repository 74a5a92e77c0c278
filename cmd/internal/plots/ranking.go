package plots

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// An Estimate is a value with its interval, e.g. a ramp's 5th-percentile
// contrast with its bootstrap interval.
type Estimate struct {
	Name          string
	Value, Lo, Hi float64
	// OpenLo and OpenHi mark an end that does not exist (no order
	// statistic gives it at the ensemble's size): the whisker runs to Lo
	// or Hi, the statistic's range end, without a cap.
	OpenLo, OpenHi bool
}

// RankingOptions configures Ranking.
type RankingOptions struct {
	Title      string
	ValueLabel string // the ranking metric with its unit, e.g. "contrast p05"

	// Markers are vertical lines, e.g. the spec limit.
	Markers []Marker

	WidthIn, HeightIn float64 // figure size; zero: 6.4 in wide, height from the number of estimates
}

// Ranking returns a dot-and-whisker chart: one row per estimate, the first
// at the top, with a dot at the value and a whisker over the interval.
func Ranking(items []Estimate, opts RankingOptions) (*Figure, error) {
	if len(items) == 0 {
		return nil, errors.New("plots: ranking without estimates")
	}
	n := len(items)
	names := make([]string, n)
	pos := make([]float64, n)
	values, lo, hi := make([]float64, n), make([]float64, n), make([]float64, n)
	dots := make(plotter.XYs, n)
	for i, e := range items {
		names[n-1-i] = e.Name
		pos[i] = float64(n - 1 - i)
		values[i], lo[i], hi[i] = e.Value, e.Lo, e.Hi
		dots[i] = plotter.XY{X: e.Value, Y: pos[i]}
	}
	for i, e := range items {
		if !finite(e.Value) || !finite(e.Lo) || !finite(e.Hi) {
			return nil, fmt.Errorf("plots: estimate %d (%q) is %v in [%v, %v]: want finite values", i, e.Name, e.Value, e.Lo, e.Hi)
		}
		if e.Lo > e.Hi {
			return nil, fmt.Errorf("plots: estimate %d (%q) has interval [%v, %v]: lo is above hi", i, e.Name, e.Lo, e.Hi)
		}
	}
	if err := checkMarkers("marker", opts.Markers, false); err != nil {
		return nil, err
	}

	p := newPlot(opts.Title, opts.ValueLabel, "")
	p.Add(newGrid(true, false))
	p.NominalY(names...)
	p.Y.Min, p.Y.Max = -0.5, float64(n)-0.5

	height := opts.HeightIn
	if height <= 0 {
		height = math.Max(2.2, 1.1+0.38*float64(n))
	}
	f := newFigure(p, opts.WidthIn, height)
	w := whiskers{pos: pos, lo: lo, hi: hi, horizontal: true,
		style: draw.LineStyle{Color: seriesColor(0), Width: vg.Points(1.5)}, cap: vg.Points(7)}
	for i, e := range items {
		if e.OpenLo || e.OpenHi {
			if w.open == nil {
				w.open = make([][2]bool, n)
			}
			w.open[i] = [2]bool{e.OpenLo, e.OpenHi}
		}
	}
	p.Add(w)
	sc, err := plotter.NewScatter(dots)
	if err != nil {
		return nil, fmt.Errorf("plots: ranking: %w", err)
	}
	sc.GlyphStyle = draw.GlyphStyle{Color: seriesColor(0), Radius: vg.Points(3.5), Shape: draw.CircleGlyph{}}
	p.Add(sc)
	addMarkers(f, opts.Markers, false, 0)
	return f, nil
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
