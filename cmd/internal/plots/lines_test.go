package plots

import (
	"math"
	"testing"
)

func ramp(name string, scale float64) Series {
	s := Series{Name: name}
	for i := 0; i <= 20; i++ {
		x := float64(i) / 20
		s.X = append(s.X, x)
		s.Y = append(s.Y, scale*x*x)
	}
	return s
}

func TestLinesElements(t *testing.T) {
	series := []Series{ramp("sin2", 1), ramp("minjerk", 2), ramp("", 3)}
	f, err := Lines(series, LinesOptions{
		Title:  "Drive profiles",
		XLabel: "t (ms)",
		YLabel: "Ω (rad/s)",
		Bands:  []Band{{Name: "95 % interval", X: []float64{0, 1}, Lo: []float64{0, 0.5}, Hi: []float64{0.2, 1.5}}},
		HLines: []Marker{{Label: "spec", Value: 2.5}},
		VLines: []Marker{{Label: "tolerance", Value: 0.7}},
	})
	if err != nil {
		t.Fatal(err)
	}
	d := render(t, f)
	wantTexts(t, d, "Drive profiles", "t (ms)", "Ω (rad/s)", "sin2", "minjerk", "95 % interval", "spec", "tolerance")
	// A named series is its curve and its legend thumbnail; the unnamed one
	// only its curve. The band (palette blue at 22 % opacity) likewise.
	for _, c := range []struct {
		parts []string
		want  int
	}{
		{[]string{"stroke:#4477AA"}, 2},
		{[]string{"stroke:#EE6677"}, 2},
		{[]string{"stroke:#228833"}, 1},
		{[]string{"fill:#4376A9", "fill-opacity:0.21961"}, 2},
		{[]string{"stroke:#222222"}, 2}, // first marker style: the horizontal line
		{[]string{"stroke:#CC3311"}, 2}, // second: the vertical line
	} {
		if got := d.count(c.parts...); got != c.want {
			t.Errorf("%q: got %d paths, want %d", c.parts, got, c.want)
		}
	}
}

func TestLinesLogAxis(t *testing.T) {
	s := Series{Name: "p05", X: []float64{1e-3, 1e-2, 0.1, 1, 10}, Y: []float64{1, 1, 0.99, 0.9, 0.5}}
	f, err := Lines([]Series{s}, LinesOptions{XLabel: "skew (ns)", YLabel: "contrast", LogX: true})
	if err != nil {
		t.Fatal(err)
	}
	wantTexts(t, render(t, f), "0.001", "0.01", "0.1", "1", "10")
}

func TestLinesErrors(t *testing.T) {
	good := ramp("a", 1)
	for _, tc := range []struct {
		name   string
		series []Series
		opts   LinesOptions
		want   []string
	}{
		{"no series", nil, LinesOptions{}, []string{"without series"}},
		{"lengths", []Series{{Name: "arm +1", X: []float64{0, 1, 2}, Y: []float64{0, 1}}}, LinesOptions{}, []string{`"arm +1"`, "3 x values and 2 y values"}},
		{"one point", []Series{{Name: "a", X: []float64{0}, Y: []float64{0}}}, LinesOptions{}, []string{"1 point:", "at least 2"}},
		{"NaN", []Series{good, {Name: "b", X: []float64{0, 1}, Y: []float64{0, math.NaN()}}}, LinesOptions{}, []string{`series 1 ("b") y[1]`, "NaN"}},
		{"log x", []Series{good}, LinesOptions{LogX: true}, []string{`series 0 ("a") x[0]`, "log axis"}},
		{"log y marker", []Series{{X: []float64{1, 2}, Y: []float64{1, 2}}}, LinesOptions{LogY: true, HLines: []Marker{{Label: "zero", Value: 0}}}, []string{"horizontal line 0", "log axis"}},
		{"band lengths", []Series{good}, LinesOptions{Bands: []Band{{Name: "ci", X: []float64{0, 1}, Lo: []float64{0}, Hi: []float64{1, 2}}}}, []string{`band 0 ("ci")`, "2 x, 1 lo and 2 hi"}},
		{"band Inf", []Series{good}, LinesOptions{Bands: []Band{{X: []float64{0, 1}, Lo: []float64{0, 0}, Hi: []float64{1, math.Inf(1)}}}}, []string{"hi[1]", "+Inf"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Lines(tc.series, tc.opts)
			wantError(t, err, tc.want...)
		})
	}
}
