package plots

import (
	"fmt"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// whiskers draws intervals [lo[i], hi[i]] along the value axis at positions
// pos[i] on the other axis, each with a cap at both ends. The value axis is
// x when horizontal is set, y otherwise.
type whiskers struct {
	pos, lo, hi []float64
	horizontal  bool
	style       draw.LineStyle
	cap         vg.Length // full cap width
	// open, if not nil, marks ends drawn without a cap: [i][0] the low
	// end of whisker i, [i][1] the high one (an end that does not exist).
	open [][2]bool
}

// capped reports whether end e (0 low, 1 high) of whisker i has a cap.
func (w whiskers) capped(i, e int) bool { return w.open == nil || !w.open[i][e] }

func (w whiskers) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	half := w.cap / 2
	for i := range w.pos {
		if w.horizontal {
			y, x0, x1 := trY(w.pos[i]), trX(w.lo[i]), trX(w.hi[i])
			c.StrokeLine2(w.style, x0, y, x1, y)
			if w.capped(i, 0) {
				c.StrokeLine2(w.style, x0, y-half, x0, y+half)
			}
			if w.capped(i, 1) {
				c.StrokeLine2(w.style, x1, y-half, x1, y+half)
			}
			continue
		}
		x, y0, y1 := trX(w.pos[i]), trY(w.lo[i]), trY(w.hi[i])
		c.StrokeLine2(w.style, x, y0, x, y1)
		if w.capped(i, 0) {
			c.StrokeLine2(w.style, x-half, y0, x+half, y0)
		}
		if w.capped(i, 1) {
			c.StrokeLine2(w.style, x-half, y1, x+half, y1)
		}
	}
}

func (w whiskers) DataRange() (xmin, xmax, ymin, ymax float64) {
	vmin, vmax := math.Inf(1), math.Inf(-1)
	for i := range w.lo {
		vmin, vmax = math.Min(vmin, w.lo[i]), math.Max(vmax, w.hi[i])
	}
	if w.horizontal {
		return vmin, vmax, math.Inf(1), math.Inf(-1)
	}
	return math.Inf(1), math.Inf(-1), vmin, vmax
}

// checkIntervals returns an error if lo and hi are not both nil or both as
// long as values, hold a value that is not finite, or have lo[i] > hi[i].
func checkIntervals(what string, values, lo, hi []float64) error {
	if lo == nil && hi == nil {
		return nil
	}
	if len(lo) != len(values) || len(hi) != len(values) {
		return fmt.Errorf("plots: %s has %d values, %d lo and %d hi bounds: want as many of each, or no bounds", what, len(values), len(lo), len(hi))
	}
	if err := checkFinite(what+" lo", lo); err != nil {
		return err
	}
	if err := checkFinite(what+" hi", hi); err != nil {
		return err
	}
	for i := range lo {
		if lo[i] > hi[i] {
			return fmt.Errorf("plots: %s interval %d is [%v, %v]: lo is above hi", what, i, lo[i], hi[i])
		}
	}
	return nil
}
