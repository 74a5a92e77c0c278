package plots

import (
	"errors"
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot/palette/moreland"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// MapOptions configures Map.
type MapOptions struct {
	Title  string
	XLabel string // with its unit
	YLabel string // with its unit
	ZLabel string // what the colour shows, with its unit, for the legend

	// Contour, if set, draws the line where the value crosses Contour.Value
	// (a spec limit, say), labelled in the legend.
	Contour *Marker

	WidthIn, HeightIn float64 // figure size; zero: 6.4 in by 3.8 in
}

// mapSteps is the number of colours of a map; the legend shows every
// third.
const mapSteps = 16

// Map returns a colour map of z over a rectangular grid, z[i][j] the value
// at (x[i], y[j]), with x and y strictly increasing and at least two of
// each. The colours run through Moreland's extended black-body map
// (perceptually ordered and readable in grey scale) from the smallest value
// (dark) to the largest (light); NaN cells are left white. The legend gives
// the value at the middle of every third colour band.
//
// References:
//   - K. Moreland, "Why we use bad color maps and what you can do about
//     it", Electronic Imaging 2016, HVEI-133.
func Map(x, y []float64, z [][]float64, opts MapOptions) (*Figure, error) {
	if len(x) < 2 || len(y) < 2 {
		return nil, fmt.Errorf("plots: map of %d x %d points: want at least 2 x 2", len(x), len(y))
	}
	if err := errors.Join(increasing("x", x), increasing("y", y)); err != nil {
		return nil, err
	}
	if len(z) != len(x) {
		return nil, fmt.Errorf("plots: map has %d x values and %d columns of z: want as many", len(x), len(z))
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for i, col := range z {
		if len(col) != len(y) {
			return nil, fmt.Errorf("plots: map column %d has %d values for %d y values: want as many", i, len(col), len(y))
		}
		for _, v := range col {
			if math.IsInf(v, 0) {
				return nil, fmt.Errorf("plots: map column %d has an infinite value", i)
			}
			if !math.IsNaN(v) {
				lo, hi = math.Min(lo, v), math.Max(hi, v)
			}
		}
	}
	if math.IsInf(lo, 1) {
		return nil, errors.New("plots: map without a finite value")
	}
	if lo == hi { // one colour: give the palette a range to map onto
		lo, hi = lo-0.5, hi+0.5
	}
	if opts.Contour != nil {
		if err := checkMarkers("contour", []Marker{*opts.Contour}, false); err != nil {
			return nil, err
		}
	}
	g := grid{x, y, z}
	cm := moreland.ExtendedBlackBody()
	cm.SetMin(lo)
	cm.SetMax(hi)
	pal := cm.Palette(mapSteps)
	p := newPlot(opts.Title, opts.XLabel, opts.YLabel)
	h := plotter.NewHeatMap(g, pal)
	h.Min, h.Max = lo, hi
	h.NaN = color.White
	p.Add(h)
	f := newFigure(p, opts.WidthIn, opts.HeightIn)
	if opts.ZLabel != "" {
		f.addLegend(opts.ZLabel)
	}
	cols := pal.Colors()
	for k := 0; k < mapSteps; k += 3 {
		v := lo + (hi-lo)*(float64(k)+0.5)/mapSteps
		f.addLegend(formatTick(v, 'g', 4), swatch{cols[k]})
	}
	if c := opts.Contour; c != nil && c.Value > lo && c.Value < hi {
		ct := plotter.NewContour(g, []float64{c.Value}, nil)
		sty := draw.LineStyle{Color: seriesColor(0), Width: vg.Points(2)}
		ct.LineStyles = []draw.LineStyle{sty}
		p.Add(ct)
		f.addLegend(c.Label, lineThumb{sty})
	}
	return f, nil
}

func increasing(what string, v []float64) error {
	if err := checkFinite("map "+what, v); err != nil {
		return err
	}
	for i := 1; i < len(v); i++ {
		if !(v[i] > v[i-1]) {
			return fmt.Errorf("plots: map %s values are not strictly increasing at %d (%g after %g)", what, i, v[i], v[i-1])
		}
	}
	return nil
}

// grid is z over x and y as plotter.GridXYZ.
type grid struct {
	x, y []float64
	z    [][]float64
}

func (g grid) Dims() (c, r int)   { return len(g.x), len(g.y) }
func (g grid) Z(c, r int) float64 { return g.z[c][r] }
func (g grid) X(c int) float64    { return g.x[c] }
func (g grid) Y(r int) float64    { return g.y[r] }

// swatch is a legend thumbnail filled with one colour.
type swatch struct{ c color.Color }

func (s swatch) Thumbnail(c *draw.Canvas) {
	c.SetColor(s.c)
	c.Fill(c.Rectangle.Path())
}

// lineThumb is a legend thumbnail of a line.
type lineThumb struct{ sty draw.LineStyle }

func (l lineThumb) Thumbnail(c *draw.Canvas) {
	y := c.Center().Y
	c.StrokeLine2(l.sty, c.Min.X, y, c.Max.X, y)
}
