package design

import (
	"math"
	"testing"

	"rampart/mc"
	"rampart/stats"
)

// TestObjectiveLeavesLostShotsOutOfTheBias: a lost shot (photon
// scattering: z = 0, contrast 0) counts as contrast 0 but has no phase, so
// the p05-bias objective's bias quantile is over the shots with a fringe,
// as mc.Summarise's is. With half of 100 shots lost, counting their bias as 0
// would pull the 95th percentile of |bias| down.
func TestObjectiveLeavesLostShotsOutOfTheBias(t *testing.T) {
	var recs []mc.Record
	var kept []float64
	for i := range 100 {
		r := mc.Record{Index: i, Contrast: 0.99, BiasRad: 1e-4 * float64(i+1), Z: complex(0.99, 0)}
		if i%2 == 0 {
			r = mc.Record{Index: i} // lost
		} else {
			kept = append(kept, r.BiasRad)
		}
		recs = append(recs, r)
	}
	o := Objective{Name: ObjectiveBias, Weight: 10}
	got := o.Value(recs)
	c := make([]float64, len(recs))
	for i, r := range recs {
		c[i] = r.Contrast
	}
	want := stats.Quantile(c, 0.05) - 10*stats.Quantile(kept, 0.95)
	if math.Abs(got-want) > 1e-15 {
		t.Errorf("objective %.17g, want %.17g (p05 of all contrasts less 10 x p95 of the kept shots' |bias|)", got, want)
	}
}
