package plots

import (
	"errors"
	"fmt"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg/draw"

	"rampart/internal/plural"
)

// A Series is one named curve of a line plot, drawn through its points in
// the order given.
type Series struct {
	Name string // legend entry; none if empty
	X, Y []float64
}

// A Band is a filled region between two curves over common abscissae, such
// as a confidence interval around a series.
type Band struct {
	Name      string // legend entry; none if empty
	X, Lo, Hi []float64
}

// LinesOptions configures Lines.
type LinesOptions struct {
	Title  string
	XLabel string // with its unit, e.g. "t (ms)"
	YLabel string // with its unit, e.g. "Ω (rad/s)"
	LogX   bool
	LogY   bool

	// Bands are drawn beneath the series, band i in a pale version of the
	// colour of series i.
	Bands []Band

	// HLines are horizontal reference lines (e.g. a spec limit), VLines
	// vertical ones (e.g. a found tolerance).
	HLines, VLines []Marker

	WidthIn, HeightIn float64 // figure size; zero: 6.4 in by 3.8 in
}

// Lines returns a plot of several named series on common axes. Each series
// needs at least two points, and on a log axis positive coordinates.
func Lines(series []Series, opts LinesOptions) (*Figure, error) {
	if len(series) == 0 {
		return nil, errors.New("plots: line plot without series")
	}
	for i, s := range series {
		what := fmt.Sprintf("series %d (%q)", i, s.Name)
		if len(s.X) != len(s.Y) {
			return nil, fmt.Errorf("plots: %s has %d x values and %d y values: want as many of each", what, len(s.X), len(s.Y))
		}
		if len(s.X) < 2 {
			return nil, fmt.Errorf("plots: %s has %s: want at least 2", what, plural.Count(len(s.X), "point"))
		}
		if err := errors.Join(checkAxis(what+" x", s.X, opts.LogX), checkAxis(what+" y", s.Y, opts.LogY)); err != nil {
			return nil, err
		}
	}
	for i, b := range opts.Bands {
		what := fmt.Sprintf("band %d (%q)", i, b.Name)
		if len(b.Lo) != len(b.X) || len(b.Hi) != len(b.X) {
			return nil, fmt.Errorf("plots: %s has %d x, %d lo and %d hi values: want as many of each", what, len(b.X), len(b.Lo), len(b.Hi))
		}
		if len(b.X) < 2 {
			return nil, fmt.Errorf("plots: %s has %s: want at least 2", what, plural.Count(len(b.X), "point"))
		}
		if err := errors.Join(checkAxis(what+" x", b.X, opts.LogX), checkAxis(what+" lo", b.Lo, opts.LogY), checkAxis(what+" hi", b.Hi, opts.LogY)); err != nil {
			return nil, err
		}
	}
	if err := checkMarkers("horizontal line", opts.HLines, opts.LogY); err != nil {
		return nil, err
	}
	if err := checkMarkers("vertical line", opts.VLines, opts.LogX); err != nil {
		return nil, err
	}

	p := newPlot(opts.Title, opts.XLabel, opts.YLabel)
	if opts.LogX {
		p.X.Scale = plot.LogScale{}
		p.X.Tick.Marker = ticker{log: true}
	}
	if opts.LogY {
		p.Y.Scale = plot.LogScale{}
		p.Y.Tick.Marker = ticker{log: true}
	}
	p.Add(newGrid(true, true))
	f := newFigure(p, opts.WidthIn, opts.HeightIn)
	for i, b := range opts.Bands {
		ring := make(plotter.XYs, 0, 2*len(b.X))
		for j := range b.X {
			ring = append(ring, plotter.XY{X: b.X[j], Y: b.Lo[j]})
		}
		for j := len(b.X) - 1; j >= 0; j-- {
			ring = append(ring, plotter.XY{X: b.X[j], Y: b.Hi[j]})
		}
		poly, err := plotter.NewPolygon(ring)
		if err != nil {
			return nil, fmt.Errorf("plots: band %d (%q): %w", i, b.Name, err)
		}
		poly.Color = withAlpha(seriesColor(i), 0.22)
		poly.LineStyle = draw.LineStyle{}
		p.Add(poly)
		f.addLegend(b.Name, poly)
	}
	for i, s := range series {
		xys := make(plotter.XYs, len(s.X))
		for j := range s.X {
			xys[j] = plotter.XY{X: s.X[j], Y: s.Y[j]}
		}
		line, err := plotter.NewLine(xys)
		if err != nil {
			return nil, fmt.Errorf("plots: series %d (%q): %w", i, s.Name, err)
		}
		line.LineStyle = seriesStyle(i)
		p.Add(line)
		f.addLegend(s.Name, line)
	}
	addMarkers(f, opts.HLines, true, 0)
	addMarkers(f, opts.VLines, false, len(opts.HLines))
	return f, nil
}
