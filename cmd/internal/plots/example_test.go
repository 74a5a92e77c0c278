package plots_test

import (
	"fmt"
	"log"
	"os"
	"path/filepath"

	"rampart/cmd/internal/plots"
)

func ExampleHistogram() {
	contrast := []float64{0.962, 0.971, 0.958, 0.990, 0.981, 0.944, 0.975, 0.968}
	f, err := plots.Histogram(contrast, plots.HistogramOptions{
		Title:   "Contrast over 8 realisations",
		XLabel:  "contrast",
		Markers: []plots.Marker{{Label: "spec: contrast ≥ 0.95", Value: 0.95}},
	})
	if err != nil {
		log.Fatal(err)
	}
	dir, err := os.MkdirTemp("", "plots")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	if err := f.WriteFiles(filepath.Join(dir, "contrast")); err != nil {
		log.Fatal(err)
	}
	entries, _ := os.ReadDir(dir)
	for _, e := range entries {
		fmt.Println(e.Name())
	}
	// Output:
	// contrast.png
	// contrast.svg
}

func ExampleLines() {
	tolerance := plots.Series{Name: "contrast p05", X: []float64{0.1, 1, 10}, Y: []float64{0.99, 0.96, 0.7}}
	interval := plots.Band{Name: "95 % interval", X: tolerance.X, Lo: []float64{0.98, 0.94, 0.65}, Hi: []float64{1, 0.97, 0.74}}
	f, err := plots.Lines([]plots.Series{tolerance}, plots.LinesOptions{
		XLabel: "skew (ns)",
		YLabel: "contrast p05",
		LogX:   true,
		Bands:  []plots.Band{interval},
		HLines: []plots.Marker{{Label: "spec", Value: 0.95}},
	})
	if err != nil {
		log.Fatal(err)
	}
	svg, err := f.SVG()
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println(string(svg[:21]))
	// Output:
	// <?xml version="1.0"?>
}
