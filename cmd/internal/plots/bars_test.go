package plots

import (
	"math"
	"testing"
)

var sources = []string{"depth common", "drive phase", "clock", "skew"}

func sobol() []BarSeries {
	return []BarSeries{
		{Name: "first order", Values: []float64{0.1, 0.3, 0.05, 0.4}, Lo: []float64{0.05, 0.25, 0, 0.35}, Hi: []float64{0.15, 0.35, 0.1, 0.45}},
		{Name: "total", Values: []float64{0.12, 0.35, -0.01, 0.45}},
	}
}

func TestBarsElements(t *testing.T) {
	for _, horizontal := range []bool{false, true} {
		f, err := Bars(sources, sobol(), BarsOptions{Title: "Sobol' indices", ValueLabel: "index", CategoryLabel: "source", Horizontal: horizontal})
		if err != nil {
			t.Fatal(err)
		}
		d := render(t, f)
		wantTexts(t, d, append([]string{"Sobol' indices", "index", "source", "first order", "total"}, sources...)...)
		// Per series: one bar per category and a legend swatch; error bars
		// only on the first series, three strokes each (whisker, two caps).
		for _, c := range []struct {
			part string
			want int
		}{
			{"fill:#4477AA", len(sources) + 1},
			{"fill:#EE6677", len(sources) + 1},
			{"stroke:#4D4D4D", 3 * len(sources)},
		} {
			if got := d.count(c.part); got != c.want {
				t.Errorf("horizontal %v, %s: got %d paths, want %d", horizontal, c.part, got, c.want)
			}
		}
		if horizontal {
			// Categories run down from the top (smaller y is higher up).
			first, _ := d.text(sources[0])
			last, _ := d.text(sources[len(sources)-1])
			if first.Y >= last.Y {
				t.Errorf("horizontal: first category at y %v, last at %v: want the first on top", first.Y, last.Y)
			}
		}
	}
}

func TestBarsErrors(t *testing.T) {
	for _, tc := range []struct {
		name       string
		categories []string
		series     []BarSeries
		want       []string
	}{
		{"no categories", nil, sobol(), []string{"without categories"}},
		{"no series", sources, nil, []string{"without series"}},
		{"lengths", sources, []BarSeries{{Name: "S1", Values: []float64{1, 2}}}, []string{`"S1"`, "2 values for 4 categories"}},
		{"NaN", sources, []BarSeries{{Name: "S1", Values: []float64{1, math.NaN(), 0, 0}}}, []string{"[1]", "NaN"}},
		{"lo only", sources, []BarSeries{{Name: "S1", Values: make([]float64, 4), Lo: make([]float64, 4)}}, []string{"4 lo and 0 hi"}},
		{"lo above hi", sources, []BarSeries{{Name: "ST", Values: make([]float64, 4), Lo: []float64{0, 0, 1, 0}, Hi: make([]float64, 4)}}, []string{`"ST"`, "interval 2 is [1, 0]"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Bars(tc.categories, tc.series, BarsOptions{})
			wantError(t, err, tc.want...)
		})
	}
}
