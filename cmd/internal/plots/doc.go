// Package plots draws rampart's figures with gonum/plot: histograms of an
// ensemble, line plots of named series, grouped bar charts with error bars
// and dot-and-whisker rankings. Each builder checks its data and returns a
// *Figure, which renders to SVG (for inline HTML) and PNG (for files).
//
// Every figure shares one light style: Liberation Sans text, a colour-blind
// safe palette (Paul Tol's "bright" scheme), a pale grid and the legend to the
// right of the axes, outside the data. Axis labels are the caller's and should
// carry the unit, e.g. "bias (rad)" or "t (ms)". Tick labels on one axis share
// one notation and precision, and use a true minus sign (U+2212).
//
// Rendering is deterministic: the same data and options give the same SVG and
// PNG bytes. Interval bounds (Lo, Hi) are absolute values of the bounds, not
// distances from the estimate.
package plots
