package plots

import (
	"fmt"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg/draw"
)

// A Marker is a reference line across the data area at one axis value, such
// as a spec limit or the 5th percentile of a sample.
type Marker struct {
	Label string  // legend entry, e.g. "spec: contrast ≥ 0.95"; none if empty
	Value float64 // position, in the unit of the axis it marks
}

// refLine draws a Marker: a vertical line at x = Value, or a horizontal one
// at y = Value.
type refLine struct {
	value      float64
	horizontal bool
	style      draw.LineStyle
}

func (r refLine) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	if r.horizontal {
		y := trY(r.value)
		c.StrokeLine2(r.style, c.Min.X, y, c.Max.X, y)
		return
	}
	x := trX(r.value)
	c.StrokeLine2(r.style, x, c.Min.Y, x, c.Max.Y)
}

// DataRange widens only the marked axis, so that a marker is always in view.
func (r refLine) DataRange() (xmin, xmax, ymin, ymax float64) {
	xmin, xmax, ymin, ymax = math.Inf(1), math.Inf(-1), math.Inf(1), math.Inf(-1)
	if r.horizontal {
		return xmin, xmax, r.value, r.value
	}
	return r.value, r.value, ymin, ymax
}

func (r refLine) Thumbnail(c *draw.Canvas) {
	y := c.Center().Y
	c.StrokeLine2(r.style, c.Min.X, y, c.Max.X, y)
}

// addMarkers adds ms to f as vertical lines, or horizontal ones, continuing
// the marker style sequence from first.
func addMarkers(f *Figure, ms []Marker, horizontal bool, first int) {
	for i, m := range ms {
		r := refLine{value: m.Value, horizontal: horizontal, style: markerStyle(first + i)}
		f.plot.Add(r)
		f.addLegend(m.Label, r)
	}
}

// checkMarkers returns an error if a marker value is not finite, or not
// positive on a log axis.
func checkMarkers(what string, ms []Marker, log bool) error {
	for i, m := range ms {
		if math.IsNaN(m.Value) || math.IsInf(m.Value, 0) {
			return fmt.Errorf("plots: %s %d (%q) is %v: want a finite value", what, i, m.Label, m.Value)
		}
		if log && m.Value <= 0 {
			return fmt.Errorf("plots: %s %d (%q) is %v: a log axis needs a positive value", what, i, m.Label, m.Value)
		}
	}
	return nil
}

// checkFinite returns an error naming the first value of vs that is NaN or
// infinite; what names the slice, e.g. `series "arm +1" y`.
func checkFinite(what string, vs []float64) error {
	for i, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("plots: %s[%d] is %v: want finite values", what, i, v)
		}
	}
	return nil
}

// checkAxis returns an error naming the first value of vs that is NaN or
// infinite, or not positive when log is set.
func checkAxis(what string, vs []float64, log bool) error {
	if err := checkFinite(what, vs); err != nil || !log {
		return err
	}
	for i, v := range vs {
		if v <= 0 {
			return fmt.Errorf("plots: %s[%d] is %v: a log axis needs positive values", what, i, v)
		}
	}
	return nil
}
