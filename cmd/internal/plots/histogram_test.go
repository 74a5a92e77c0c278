package plots

import (
	"math"
	"math/rand/v2"
	"testing"
)

// histogramFill is the style of a histogram bar: palette blue #4477AA at
// 85 % over white.
const histogramFill = "fill:#608BB7"

func TestHistogramBars(t *testing.T) {
	for _, tc := range []struct {
		name   string
		values []float64
		bins   int
		want   int
	}{
		{"set bins", []float64{0, 1, 2, 3, 4, 5, 6, 7, 8, 9}, 7, 7},
		{"one value", []float64{0.5}, 0, 1},
		{"equal values", []float64{2, 2, 2}, 0, 1},
		{"many bins asked", []float64{0, 1}, 12, 12},
	} {
		t.Run(tc.name, func(t *testing.T) {
			f, err := Histogram(tc.values, HistogramOptions{XLabel: "x (rad)", Bins: tc.bins})
			if err != nil {
				t.Fatal(err)
			}
			if got := render(t, f).count(histogramFill); got != tc.want {
				t.Errorf("got %d bars, want %d", got, tc.want)
			}
		})
	}
}

func TestHistogramTextAndMarkers(t *testing.T) {
	values := []float64{0.91, 0.95, 0.97, 0.975, 0.98, 0.99}
	f, err := Histogram(values, HistogramOptions{
		Title:   "Contrast of 6 realisations",
		XLabel:  "contrast",
		Markers: []Marker{{Label: "spec ≥ 0.95", Value: 0.95}, {Label: "p05", Value: 0.93}, {Value: 0.8}},
	})
	if err != nil {
		t.Fatal(err)
	}
	d := render(t, f)
	wantTexts(t, d, "Contrast of 6 realisations", "contrast", "realisations", "spec ≥ 0.95", "p05")
	// Each labelled marker is a line in the data and one in the legend; the
	// unlabelled one only the line.
	for _, m := range []struct {
		stroke string
		want   int
	}{{"stroke:#222222", 2}, {"stroke:#CC3311", 2}, {"stroke:#009988", 1}} {
		if got := d.count(m.stroke); got != m.want {
			t.Errorf("%s: got %d paths, want %d", m.stroke, got, m.want)
		}
	}
	// The marker at 0.8 lies outside the sample; the axis reaches it.
	wantTexts(t, d, "0.80")
}

// TestBinsCounts checks the bin edges and counts, and that every value lands
// in a bin (exact: counts are integers). The maximum belongs to the last bin.
func TestBinsCounts(t *testing.T) {
	got := bins([]float64{10, 0, 0.5, 2, 3, 4, 5, 6, 7, 8}, 5)
	for i, b := range got {
		if b.Weight != 2 || b.Min != float64(2*i) || b.Max != float64(2*i+2) {
			t.Errorf("bin %d: got [%v, %v) with %v, want [%d, %d) with 2", i, b.Min, b.Max, b.Weight, 2*i, 2*i+2)
		}
	}

	one := bins([]float64{3, 3}, 0)
	if len(one) != 1 || one[0].Weight != 2 || one[0].Min >= 3 || one[0].Max <= 3 || one[0].Min+one[0].Max != 6 {
		t.Errorf("equal values: got %+v, want one bin of 2 centred on 3", one)
	}

	// Freedman-Diaconis on N = 1000 standard normal values: IQR = 1.349
	// (2 x 0.6745, normal quartiles), width = 2 x 1.349 / 10 = 0.27, so the
	// range of about 6.5 gives about 24 bins (above Sturges' 11); the bounds
	// allow for the sample's own range and IQR.
	r := rand.New(rand.NewPCG(1, 2))
	sample := make([]float64, 1000)
	for i := range sample {
		sample[i] = r.NormFloat64()
	}
	auto := bins(sample, 0)
	total := 0.0
	for _, b := range auto {
		total += b.Weight
	}
	if total != 1000 {
		t.Errorf("counts sum to %v, want 1000", total)
	}
	if n := len(auto); n < 18 || n > 32 {
		t.Errorf("Freedman-Diaconis: got %d bins, want 18 to 32", n)
	}

	// A sample with a zero interquartile range gets the Sturges count:
	// ceil(1 + log2 10) = 5 bins.
	flat := []float64{0, 1, 1, 1, 1, 1, 1, 1, 1, 2}
	if n := len(bins(flat, 0)); n != 5 {
		t.Errorf("zero IQR: got %d bins, want 5", n)
	}
	// A skewed sample whose wide IQR gives Freedman-Diaconis fewer bins
	// than Sturges: 100 values, half at 0.5 to 0.6 and half at 0.99 to 1.
	// IQR about 0.445, width 2 x 0.445 / 100^(1/3) = 0.19, so range 0.5 / 0.19
	// = 2.6 bins; Sturges gives ceil(1 + log2 100) = 8.
	skewed := make([]float64, 100)
	for i := range skewed {
		if i < 50 {
			skewed[i] = 0.5 + 0.1*float64(i)/49
		} else {
			skewed[i] = 0.99 + 0.01*float64(i-50)/49
		}
	}
	if n := len(bins(skewed, 0)); n != 8 {
		t.Errorf("skewed: got %d bins, want the Sturges 8", n)
	}
}

func TestHistogramErrors(t *testing.T) {
	for _, tc := range []struct {
		name   string
		values []float64
		opts   HistogramOptions
		want   []string
	}{
		{"empty", nil, HistogramOptions{}, []string{"empty sample"}},
		{"NaN", []float64{1, math.NaN()}, HistogramOptions{}, []string{"sample[1]", "NaN"}},
		{"Inf", []float64{math.Inf(-1)}, HistogramOptions{}, []string{"sample[0]", "-Inf"}},
		{"bins", []float64{1}, HistogramOptions{Bins: -2}, []string{"-2 bins"}},
		{"marker", []float64{1}, HistogramOptions{Markers: []Marker{{Label: "spec", Value: math.NaN()}}}, []string{"marker 0", "spec", "NaN"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Histogram(tc.values, tc.opts)
			wantError(t, err, tc.want...)
		})
	}
}
