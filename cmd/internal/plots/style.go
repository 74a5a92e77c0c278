package plots

import (
	"image/color"

	xfont "golang.org/x/image/font"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Default figure size: a 16:9.5 frame that reads well inline at page width
// and at 150 dpi as a file.
const (
	defaultWidthIn  = 6.4
	defaultHeightIn = 3.8
)

// palette is Paul Tol's "bright" qualitative scheme (SRON/EPS/TN/09-002),
// distinguishable under the common forms of colour blindness.
var palette = []color.NRGBA{
	{0x44, 0x77, 0xAA, 0xFF}, // blue
	{0xEE, 0x66, 0x77, 0xFF}, // red
	{0x22, 0x88, 0x33, 0xFF}, // green
	{0xCC, 0xBB, 0x44, 0xFF}, // yellow
	{0x66, 0xCC, 0xEE, 0xFF}, // cyan
	{0xAA, 0x33, 0x77, 0xFF}, // purple
	{0xBB, 0xBB, 0xBB, 0xFF}, // grey
}

// dashes cycle once the palette is used up, so that series 8 and up stay
// distinguishable from series 1 to 7.
var dashes = [][]vg.Length{
	nil,
	{vg.Points(6), vg.Points(3)},
	{vg.Points(2), vg.Points(2)},
}

// Reference lines (spec limits, percentiles) are dark and dashed, so that
// they never read as data.
var markerStyles = []draw.LineStyle{
	{Color: color.NRGBA{0x22, 0x22, 0x22, 0xFF}, Width: vg.Points(1.2), Dashes: []vg.Length{vg.Points(5), vg.Points(3)}},
	{Color: color.NRGBA{0xCC, 0x33, 0x11, 0xFF}, Width: vg.Points(1.2), Dashes: []vg.Length{vg.Points(7), vg.Points(2), vg.Points(1.5), vg.Points(2)}},
	{Color: color.NRGBA{0x00, 0x99, 0x88, 0xFF}, Width: vg.Points(1.2), Dashes: []vg.Length{vg.Points(1.5), vg.Points(2)}},
}

var (
	inkColor     = color.NRGBA{0x33, 0x33, 0x33, 0xFF} // text, axes and ticks
	gridColor    = color.NRGBA{0xE4, 0xE4, 0xE4, 0xFF}
	whiskerColor = color.NRGBA{0x4D, 0x4D, 0x4D, 0xFF} // error bars on coloured bars
)

// seriesColor returns the colour of series i.
func seriesColor(i int) color.NRGBA { return palette[i%len(palette)] }

// seriesStyle returns the line style of series i.
func seriesStyle(i int) draw.LineStyle {
	return draw.LineStyle{
		Color:  seriesColor(i),
		Width:  vg.Points(1.5),
		Dashes: dashes[(i/len(palette))%len(dashes)],
	}
}

// markerStyle returns the line style of reference line i.
func markerStyle(i int) draw.LineStyle { return markerStyles[i%len(markerStyles)] }

// tint returns the opaque colour of c laid with opacity a in [0, 1] over
// white.
func tint(c color.NRGBA, a float64) color.NRGBA {
	mix := func(v uint8) uint8 { return uint8(a*float64(v) + (1-a)*255 + 0.5) }
	return color.NRGBA{mix(c.R), mix(c.G), mix(c.B), 0xFF}
}

// withAlpha returns c with opacity a in [0, 1].
func withAlpha(c color.NRGBA, a float64) color.NRGBA {
	c.A = uint8(a*255 + 0.5)
	return c
}

func textStyle(size vg.Length, weight xfont.Weight) text.Style {
	return text.Style{
		Color:   inkColor,
		Font:    font.From(font.Font{Typeface: "Liberation", Variant: "Sans", Weight: weight}, size),
		Handler: plot.DefaultTextHandler,
	}
}

// newPlot returns a plot in the house style with the given title and axis
// labels. Axes use linear ticks with shared formatting until set otherwise.
func newPlot(title, xlabel, ylabel string) *plot.Plot {
	p := plot.New()
	p.BackgroundColor = color.White
	p.Title.Text = title
	p.Title.Padding = vg.Points(8)
	p.Title.TextStyle = textStyle(12, xfont.WeightBold)
	p.Title.TextStyle.XAlign = draw.XCenter
	p.Title.TextStyle.YAlign = draw.YTop
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Color = inkColor
		a.Width = vg.Points(0.6)
		a.Padding = vg.Points(4)
		a.Label.Padding = vg.Points(4)
		xa, ya := a.Label.TextStyle.XAlign, a.Label.TextStyle.YAlign
		a.Label.TextStyle = textStyle(10.5, xfont.WeightNormal)
		a.Label.TextStyle.XAlign, a.Label.TextStyle.YAlign = xa, ya
		xa, ya = a.Tick.Label.XAlign, a.Tick.Label.YAlign
		a.Tick.Label = textStyle(9, xfont.WeightNormal)
		a.Tick.Label.XAlign, a.Tick.Label.YAlign = xa, ya
		a.Tick.Color = inkColor
		a.Tick.Width = vg.Points(0.6)
		a.Tick.Length = vg.Points(4)
		a.Tick.Marker = ticker{}
	}
	p.X.Label.Text = xlabel
	p.Y.Label.Text = ylabel
	return p
}

// newGrid returns the pale grid drawn under the data.
func newGrid(vertical, horizontal bool) *plotter.Grid {
	g := plotter.NewGrid()
	sty := draw.LineStyle{Color: gridColor, Width: vg.Points(0.5)}
	g.Vertical, g.Horizontal = draw.LineStyle{}, draw.LineStyle{}
	if vertical {
		g.Vertical = sty
	}
	if horizontal {
		g.Horizontal = sty
	}
	return g
}

// newLegend returns an empty legend in the house style.
func newLegend() plot.Legend {
	l := plot.NewLegend()
	l.TextStyle = textStyle(9, xfont.WeightNormal)
	l.ThumbnailWidth = vg.Points(22)
	l.Padding = vg.Points(3)
	l.Top, l.Left = true, true
	return l
}
