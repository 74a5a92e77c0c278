package plots

import (
	"errors"
	"fmt"
	"image/color"
	"math"
	"slices"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// A BarSeries is one bar per category, e.g. the first-order Sobol' index of
// every noise source.
type BarSeries struct {
	Name   string    // legend entry, e.g. "first order"; none if empty
	Values []float64 // one per category

	// Lo and Hi are the interval bounds drawn as error bars, one per
	// category; both nil for no error bars.
	Lo, Hi []float64
}

// BarsOptions configures Bars.
type BarsOptions struct {
	Title         string
	CategoryLabel string // axis label of the categories; may be empty
	ValueLabel    string // the quantity with its unit

	// Horizontal lays the bars along x, categories down the y axis from the
	// top, which suits long category names.
	Horizontal bool

	WidthIn, HeightIn float64 // figure size; zero: 6.4 in wide, height from the number of bars
}

// groupWidth is the share of a category's slot that its bars fill.
const groupWidth = 0.8

// Bars returns a grouped bar chart: for each category one bar per series,
// side by side in series order, from zero to the value, with error bars
// where a series has bounds.
func Bars(categories []string, series []BarSeries, opts BarsOptions) (*Figure, error) {
	if len(categories) == 0 {
		return nil, errors.New("plots: bar chart without categories")
	}
	if len(series) == 0 {
		return nil, errors.New("plots: bar chart without series")
	}
	for i, s := range series {
		what := fmt.Sprintf("bar series %d (%q)", i, s.Name)
		if len(s.Values) != len(categories) {
			return nil, fmt.Errorf("plots: %s has %d values for %d categories: want one per category", what, len(s.Values), len(categories))
		}
		if err := checkFinite(what, s.Values); err != nil {
			return nil, err
		}
		if err := checkIntervals(what, s.Values, s.Lo, s.Hi); err != nil {
			return nil, err
		}
	}

	n, m := len(categories), len(series)
	p := newPlot(opts.Title, opts.ValueLabel, opts.CategoryLabel)
	p.Add(newGrid(opts.Horizontal, !opts.Horizontal))
	names := slices.Clone(categories)
	if opts.Horizontal {
		slices.Reverse(names)
		p.NominalY(names...)
		p.Y.Label.Text = opts.CategoryLabel
		p.X.Label.Text = opts.ValueLabel
		p.Y.Min, p.Y.Max = -0.5, float64(n)-0.5
	} else {
		p.NominalX(names...)
		p.X.Label.Text = opts.CategoryLabel
		p.Y.Label.Text = opts.ValueLabel
		p.X.Min, p.X.Max = -0.5, float64(n)-0.5
	}

	height := opts.HeightIn
	if height <= 0 {
		height = defaultHeightIn
		if opts.Horizontal {
			height = math.Max(2.4, 1.2+0.22*float64(n*m))
		}
	}
	f := newFigure(p, opts.WidthIn, height)
	width := groupWidth / float64(m)
	for j, s := range series {
		offset := -groupWidth/2 + (float64(j)+0.5)*width
		if opts.Horizontal {
			offset = -offset // first series on top, as in the legend
		}
		pos := make([]float64, n)
		for i := range pos {
			pos[i] = float64(i) + offset
			if opts.Horizontal {
				pos[i] = float64(n-1-i) + offset
			}
		}
		b := barSet{pos: pos, values: s.Values, width: width, horizontal: opts.Horizontal, color: seriesColor(j)}
		p.Add(b)
		f.addLegend(s.Name, b)
		if s.Lo != nil {
			p.Add(whiskers{pos: pos, lo: s.Lo, hi: s.Hi, horizontal: opts.Horizontal,
				style: draw.LineStyle{Color: whiskerColor, Width: vg.Points(1)}, cap: vg.Points(5)})
		}
	}
	return f, nil
}

// barSet draws one series of bars from zero to values[i] at positions
// pos[i], width wide in data units of the category axis.
type barSet struct {
	pos, values []float64
	width       float64
	horizontal  bool
	color       color.NRGBA
}

func (b barSet) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	for i := range b.pos {
		lo, hi := b.pos[i]-b.width/2, b.pos[i]+b.width/2
		var pts []vg.Point
		if b.horizontal {
			x0, x1, y0, y1 := trX(0), trX(b.values[i]), trY(lo), trY(hi)
			pts = []vg.Point{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}}
		} else {
			x0, x1, y0, y1 := trX(lo), trX(hi), trY(0), trY(b.values[i])
			pts = []vg.Point{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}}
		}
		c.FillPolygon(b.color, c.ClipPolygonXY(pts))
	}
}

// DataRange spans the values and zero, where the bars start.
func (b barSet) DataRange() (xmin, xmax, ymin, ymax float64) {
	vmin, vmax := 0.0, 0.0
	for _, v := range b.values {
		vmin, vmax = math.Min(vmin, v), math.Max(vmax, v)
	}
	if b.horizontal {
		return vmin, vmax, math.Inf(1), math.Inf(-1)
	}
	return math.Inf(1), math.Inf(-1), vmin, vmax
}

func (b barSet) Thumbnail(c *draw.Canvas) {
	pts := []vg.Point{
		{X: c.Min.X, Y: c.Min.Y}, {X: c.Max.X, Y: c.Min.Y},
		{X: c.Max.X, Y: c.Max.Y}, {X: c.Min.X, Y: c.Max.Y},
	}
	c.FillPolygon(b.color, pts)
}
