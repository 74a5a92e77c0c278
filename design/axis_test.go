package design

import (
	"reflect"
	"strings"
	"testing"
)

func TestParseAxis(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want Axis
	}{
		// Linspace: the ends included, evenly spaced (by definition).
		{"ramp.duration_us=50:300:6", Axis{"ramp.duration_us", []float64{50, 100, 150, 200, 250, 300}}},
		{"lattice.depth_khz=10,15,20", Axis{"lattice.depth_khz", []float64{10, 15, 20}}},
		{" motion.laps = 1 , 2 ", Axis{"motion.laps", []float64{1, 2}}},
		{"x=1:0:3", Axis{"x", []float64{1, 0.5, 0}}},
	} {
		got, err := ParseAxis(tc.in)
		if err != nil || !reflect.DeepEqual(got, tc.want) {
			t.Errorf("ParseAxis(%q) = %v, %v; want %v", tc.in, got, err, tc.want)
		}
	}
	for _, tc := range []struct{ in, msg string }{
		{"ramp.duration_us", "want KEY=FROM:TO:N"},
		{"=1,2", "want KEY=FROM:TO:N"},
		{"k=1:2", "has 2 parts"},
		{"k=1:2:1", "not a count from 2"},
		{"k=1:x:3", "TO \"x\" is not a finite number"},
		{"k=1:1:3", "want a range"},
		{"k=1,NaN", "\"NaN\" is not a finite number"},
	} {
		_, err := ParseAxis(tc.in)
		if err == nil || !strings.Contains(err.Error(), tc.msg) {
			t.Errorf("ParseAxis(%q) error %v, want one containing %q", tc.in, err, tc.msg)
		}
	}
}

func TestGrid(t *testing.T) {
	pts, err := Grid([]Axis{{"a", []float64{1, 2}}, {"b", []float64{0.5, 1e-7, 3}}})
	if err != nil {
		t.Fatal(err)
	}
	// The last axis varies fastest; the overrides read back exactly.
	want := []Point{
		{[]float64{1, 0.5}, []string{"a=1", "b=0.5"}}, {[]float64{1, 1e-7}, []string{"a=1", "b=1e-07"}}, {[]float64{1, 3}, []string{"a=1", "b=3"}},
		{[]float64{2, 0.5}, []string{"a=2", "b=0.5"}}, {[]float64{2, 1e-7}, []string{"a=2", "b=1e-07"}}, {[]float64{2, 3}, []string{"a=2", "b=3"}},
	}
	if !reflect.DeepEqual(pts, want) {
		t.Errorf("Grid = %v, want %v", pts, want)
	}
	for _, axes := range [][]Axis{nil, {{"a", []float64{1}}, {"a", []float64{2}}}, {{"a", nil}},
		{{"a", make([]float64, 101)}, {"b", make([]float64, 100)}}} {
		if _, err := Grid(axes); err == nil {
			t.Errorf("Grid(%v): no error", axes)
		}
	}
}
