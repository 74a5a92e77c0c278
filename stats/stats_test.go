package stats

import (
	"math"
	"math/cmplx"
	"testing"
)

func TestQuantileAgainstNumPy(t *testing.T) {
	// numpy.quantile(x, p, method='linear') with numpy.mean and numpy.std(ddof=1)
	// (NumPy 1.24.2, testdata/reference/stats_reference.json). Absolute
	// tolerance 1e-12 scaled by the data range: NumPy interpolates from the upper
	// neighbour when the fraction is at least 1/2, which differs in the last
	// bits.
	for _, r := range reference(t).Quantiles {
		scale := 1.0
		for _, x := range r.Data {
			scale = max(scale, math.Abs(x))
		}
		tol := 1e-12 * scale
		qs := Quantiles(r.Data, r.P...)
		for k, p := range r.P {
			if got := Quantile(r.Data, p); math.Abs(got-r.Linear[k]) > tol {
				t.Errorf("Quantile(%v, %v): got %v, want %v (tol %g)", r.Data, p, got, r.Linear[k], tol)
			}
			if qs[k] != Quantile(r.Data, p) {
				t.Errorf("Quantiles(%v)[%d] = %v differs from Quantile = %v", r.Data, k, qs[k], Quantile(r.Data, p))
			}
		}
		if got := Mean(r.Data); math.Abs(got-r.Mean) > tol {
			t.Errorf("Mean(%v): got %v, want %v (tol %g)", r.Data, got, r.Mean, tol)
		}
		if r.StdDDOF1 != nil {
			if got := StdDev(r.Data); math.Abs(got-*r.StdDDOF1) > tol {
				t.Errorf("StdDev(%v): got %v, want %v (tol %g)", r.Data, got, *r.StdDDOF1, tol)
			}
		} else if got := StdDev(r.Data); !math.IsNaN(got) {
			t.Errorf("StdDev of one value: got %v, want NaN", got)
		}
	}
}

func TestQuantileExactCases(t *testing.T) {
	// Exact facts of definition 7 (Hyndman and Fan, Am. Stat. 50, 361 (1996)):
	// p = 0 and 1 give the extremes, the median of an even sample is the midpoint
	// of the middle pair, and the input is left unsorted.
	x := []float64{4, 1, 3, 2}
	for _, c := range []struct{ p, want float64 }{{0, 1}, {1, 4}, {0.5, 2.5}, {1.0 / 3, 2}, {0.25, 1.75}} {
		if got := Quantile(x, c.p); got != c.want {
			t.Errorf("Quantile(%v, %v): got %v, want %v (exact)", x, c.p, got, c.want)
		}
	}
	if x[0] != 4 || x[1] != 1 {
		t.Errorf("Quantile reordered its input: %v", x)
	}
	if got := Quantile([]float64{1, math.NaN()}, 0.5); !math.IsNaN(got) {
		t.Errorf("Quantile with NaN: got %v, want NaN (as numpy.quantile)", got)
	}
	if got := Quantile(nil, 0.5); !math.IsNaN(got) {
		t.Errorf("Quantile of empty sample: got %v, want NaN", got)
	}
}

func TestVarianceLargeOffset(t *testing.T) {
	// {4, 7, 13, 16} has mean 10 and variance (36+9+9+36)/3 = 30 by hand; shifted
	// by 1e9 it is the usual illustration of the cancellation that defeats the
	// one-pass sum-of-squares formula (common practice). Relative tolerance 1e-9.
	x := []float64{1e9 + 4, 1e9 + 7, 1e9 + 13, 1e9 + 16}
	if got := Variance(x); math.Abs(got-30) > 30e-9 {
		t.Errorf("Variance: got %v, want 30 (rel tol 1e-9)", got)
	}
	if got := Mean(x); got != 1e9+10 {
		t.Errorf("Mean: got %v, want %v (exact)", got, 1e9+10)
	}
	// IEEE arithmetic: an infinite value makes the mean infinite, as numpy.mean.
	if got := Mean([]float64{1, math.Inf(1)}); !math.IsInf(got, 1) {
		t.Errorf("Mean with +Inf: got %v, want +Inf", got)
	}
}

func TestMeanComplex(t *testing.T) {
	// Averaged-fringe contrast |mean z| (docs/model.md, Statistics): two shots of unit
	// contrast with phases +-pi/3 average to contrast cos(pi/3) = 1/2 at phase 0
	// (exact trigonometry; tolerance 1e-15 absolute).
	z := []complex128{cmplx.Rect(1, math.Pi/3), cmplx.Rect(1, -math.Pi/3)}
	m := MeanComplex(z)
	if math.Abs(cmplx.Abs(m)-0.5) > 1e-15 || math.Abs(cmplx.Phase(m)) > 1e-15 {
		t.Errorf("MeanComplex: got %v, want 0.5 at phase 0 (tol 1e-15)", m)
	}
}
