package report_test

import (
	"fmt"
	"log"
	"os"
	"path/filepath"

	"rampart/cmd/internal/plots"
	"rampart/cmd/internal/report"
)

func ExampleReport_Write() {
	contrast := []float64{0.962, 0.971, 0.958, 0.990, 0.981, 0.944, 0.975, 0.968}
	fig, err := plots.Histogram(contrast, plots.HistogramOptions{XLabel: "contrast"})
	if err != nil {
		log.Fatal(err)
	}
	svg, err := fig.SVG()
	if err != nil {
		log.Fatal(err)
	}
	r := &report.Report{
		Title:   "rampart run: demo",
		Command: "rampart run --scenario demo.toml --samples 8 --seed 1 --report out",
		Seed:    1,
		Sections: []report.Section{{
			Heading: "Contrast",
			Tables: []report.Table{{
				Caption: "Contrast over 8 realisations",
				Header:  []string{"statistic", "contrast"},
				Rows:    [][]string{{"mean", "0.969"}, {"p05", "0.949"}},
			}},
			Figures: []report.Figure{{ID: "contrast", Caption: "Contrast of each realisation.", SVG: svg}},
		}},
	}
	dir, err := os.MkdirTemp("", "report")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	path, err := r.Write(filepath.Join(dir, "out"))
	if err != nil {
		log.Fatal(err)
	}
	rel, _ := filepath.Rel(dir, path)
	fmt.Println(rel)
	// Output:
	// out/report.html
}
