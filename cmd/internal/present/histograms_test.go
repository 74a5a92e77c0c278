package present

import (
	"slices"
	"strings"
	"testing"

	"rampart/mc"
)

// TestBiasHistogramLeavesOutLost: a lost shot (its atom scattered: z = 0,
// contrast 0) has no phase, so the bias histogram holds the 10 shots with
// a fringe of these 15 and its title says how many were lost. The lost
// records carry a bias of 3 rad here, which the histogram must not see.
func TestBiasHistogramLeavesOutLost(t *testing.T) {
	var recs []mc.Record
	for i := range 15 {
		r := mc.Record{Index: i, Contrast: 0.9, BiasRad: 1e-5 * float64(i), Z: complex(0.9, 0)}
		if i%3 == 0 {
			r = mc.Record{Index: i, BiasRad: 3}
		}
		recs = append(recs, r)
	}
	o := mc.OutcomesOf(recs)
	b := fringeBias(o)
	if len(b) != 10 || slices.Contains(b, 3) {
		t.Errorf("fringe biases %v: want the 10 shots with a fringe, no 3 rad", b)
	}
	sum := mc.Summarise(recs, 1, 0, 1, 0.95, mc.Spec{})
	_, bias, err := ensembleFigures(sum, recs, mc.Spec{})
	if err != nil {
		t.Fatal(err)
	}
	svg, err := bias.SVG()
	if err != nil {
		t.Fatal(err)
	}
	if want := "Bias of the 10 shots with a fringe (5 of 15 realisations lost)"; !strings.Contains(string(svg), want) {
		t.Errorf("the bias histogram's SVG lacks the title %q", want)
	}
}
