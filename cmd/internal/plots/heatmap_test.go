package plots

import (
	"math"
	"strings"
	"testing"
)

func TestMapElements(t *testing.T) {
	x := []float64{0, 0.25, 0.5, 0.75, 1}
	y := []float64{0, 0.5, 1}
	z := make([][]float64, len(x))
	for i := range x {
		for _, yj := range y {
			z[i] = append(z[i], x[i]+yj)
		}
	}
	f, err := Map(x, y, z, MapOptions{Title: "Scan", XLabel: "t_r (us)", YLabel: "depth (kHz)", ZLabel: "contrast",
		Contour: &Marker{Label: "spec 1", Value: 1}})
	if err != nil {
		t.Fatal(err)
	}
	d := render(t, f)
	// The legend: the colour's meaning, six values from the darkest
	// band's middle up (range 0 to 2 in 16 colours: 2 * 0.5/16 = 0.0625
	// for the first), and the contour's label.
	wantTexts(t, d, "Scan", "t_r (us)", "depth (kHz)", "contrast", "0.0625", "spec 1")
	// The contour (palette blue) is drawn twice: the line and its legend
	// thumbnail. z = x + y crosses 1 inside the grid, so the line is there.
	if got := d.count("stroke:#4477AA"); got != 2 {
		t.Errorf("contour: %d paths, want 2 (line and legend)", got)
	}
	// Without a crossing inside the range, no contour line (only data).
	f, err = Map(x, y, z, MapOptions{Contour: &Marker{Label: "spec 5", Value: 5}})
	if err != nil {
		t.Fatal(err)
	}
	if got := render(t, f).count("stroke:#4477AA"); got != 0 {
		t.Errorf("contour outside the range: %d paths, want 0", got)
	}
}

func TestMapErrors(t *testing.T) {
	z2 := [][]float64{{0, 1}, {1, 2}}
	for _, tc := range []struct {
		name string
		x, y []float64
		z    [][]float64
		opts MapOptions
		msg  string
	}{
		{"small", []float64{0}, []float64{0, 1}, [][]float64{{0, 1}}, MapOptions{}, "at least 2 x 2"},
		{"order", []float64{1, 0}, []float64{0, 1}, z2, MapOptions{}, "not strictly increasing"},
		{"cols", []float64{0, 1}, []float64{0, 1}, z2[:1], MapOptions{}, "columns of z"},
		{"rows", []float64{0, 1}, []float64{0, 1}, [][]float64{{0}, {1, 2}}, MapOptions{}, "column 0 has 1 values"},
		{"inf", []float64{0, 1}, []float64{0, 1}, [][]float64{{0, math.Inf(1)}, {1, 2}}, MapOptions{}, "infinite"},
		{"nan", []float64{0, 1}, []float64{0, 1}, [][]float64{{math.NaN(), math.NaN()}, {math.NaN(), math.NaN()}}, MapOptions{}, "without a finite value"},
		{"contour", []float64{0, 1}, []float64{0, 1}, z2, MapOptions{Contour: &Marker{Value: math.NaN()}}, "want a finite value"},
	} {
		_, err := Map(tc.x, tc.y, tc.z, tc.opts)
		if err == nil || !strings.Contains(err.Error(), tc.msg) {
			t.Errorf("%s: error %v, want one containing %q", tc.name, err, tc.msg)
		}
	}
}
