package plots

import (
	"bytes"
	"fmt"
	"image/color"
	"io"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"

	"rampart/internal/atomicfile"
)

// FileDPI is the resolution of the PNG that WriteFiles writes.
const FileDPI = 150

// A Figure is a finished plot, ready to render. Rendering does not change
// it: every render of a Figure gives the same bytes.
type Figure struct {
	plot    *plot.Plot
	legend  plot.Legend
	entries int // legend entries; the legend is drawn only when there are some

	width, height vg.Length
}

func newFigure(p *plot.Plot, widthIn, heightIn float64) *Figure {
	if widthIn <= 0 {
		widthIn = defaultWidthIn
	}
	if heightIn <= 0 {
		heightIn = defaultHeightIn
	}
	return &Figure{plot: p, legend: newLegend(), width: vg.Length(widthIn) * vg.Inch, height: vg.Length(heightIn) * vg.Inch}
}

// addLegend adds a legend entry.
func (f *Figure) addLegend(name string, thumbs ...plot.Thumbnailer) {
	if name == "" {
		return
	}
	f.legend.Add(name, thumbs...)
	f.entries++
}

// margin is the white border around everything drawn.
const margin = vg.Length(6)

// draw draws the figure on c: the plot, and the legend in a column to the
// right of the axes, top-aligned with the data area, where it cannot hide
// data.
func (f *Figure) draw(c draw.Canvas) {
	c.SetColor(color.White)
	c.Fill(c.Rectangle.Path())
	area := draw.Crop(c, margin, -margin, margin, -margin)
	if f.entries == 0 {
		f.plot.Draw(area)
		return
	}
	const gap = vg.Length(10)
	lw := f.legend.Rectangle(area).Size().X
	plotArea := draw.Crop(area, 0, -(lw + gap), 0, 0)
	f.plot.Draw(plotArea)
	data := f.plot.DataCanvas(plotArea)
	legendArea := area
	legendArea.Min.X = plotArea.Max.X + gap
	legendArea.Min.Y = data.Min.Y
	legendArea.Max.Y = data.Max.Y
	f.legend.Draw(legendArea)
}

// SVG renders the figure as a standalone SVG document. The text names
// Liberation Sans with Arial, Helvetica and sans-serif as fallbacks: Arial
// has the same metrics, so labels keep the widths they were laid out with.
func (f *Figure) SVG() ([]byte, error) {
	c := vgsvg.New(f.width, f.height)
	f.draw(draw.New(c))
	var b bytes.Buffer
	if _, err := c.WriteTo(&b); err != nil {
		return nil, fmt.Errorf("plots: render SVG: %w", err)
	}
	return bytes.ReplaceAll(b.Bytes(), []byte("font-family:Liberation Sans;"),
		[]byte("font-family:'Liberation Sans',Arial,Helvetica,sans-serif;")), nil
}

// PNG renders the figure as a PNG image at dpi dots per inch (FileDPI if
// dpi is zero).
func (f *Figure) PNG(dpi int) ([]byte, error) {
	if dpi < 0 {
		return nil, fmt.Errorf("plots: PNG resolution %d dpi is negative", dpi)
	}
	if dpi == 0 {
		dpi = FileDPI
	}
	c := vgimg.NewWith(vgimg.UseWH(f.width, f.height), vgimg.UseDPI(dpi), vgimg.UseBackgroundColor(color.White))
	f.draw(draw.New(c))
	var b bytes.Buffer
	if _, err := (vgimg.PngCanvas{Canvas: c}).WriteTo(&b); err != nil {
		return nil, fmt.Errorf("plots: render PNG: %w", err)
	}
	return b.Bytes(), nil
}

// WriteFiles writes the figure to base+".svg" and base+".png" (at FileDPI).
// Both are rendered before either is written, and each file is written whole
// or not at all (see package atomicfile).
func (f *Figure) WriteFiles(base string) error {
	svg, err := f.SVG()
	if err != nil {
		return err
	}
	png, err := f.PNG(FileDPI)
	if err != nil {
		return err
	}
	for _, file := range []struct {
		path string
		data []byte
	}{{base + ".svg", svg}, {base + ".png", png}} {
		err := atomicfile.Write(file.path, func(w io.Writer) error {
			_, err := w.Write(file.data)
			return err
		})
		if err != nil {
			return fmt.Errorf("plots: %w", err)
		}
	}
	return nil
}
