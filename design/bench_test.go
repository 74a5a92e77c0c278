package design

import (
	"context"
	"testing"

	"rampart/scenario"
	"rampart/sim"
)

// BenchmarkScan2D is the scan target: a 20 x 20 scan of the demo's
// nominal shot over the ramp time (50 to 300 us) and the depth (10 to 30
// kHz), loading the scenario at each point as rampart scan does (goal: at
// most 5 s on a 2-core machine).
func BenchmarkScan2D(b *testing.B) {
	pts, err := Grid([]Axis{{"ramp.duration_us", Linspace(50, 300, 20)}, {"lattice.depth_khz", Linspace(10, 30, 20)}})
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		cfgs := make([]sim.Config, len(pts))
		for i, p := range pts {
			if _, cfgs[i], err = scenario.LoadConfig(demo, p.Sets); err != nil {
				b.Fatal(err)
			}
		}
		if _, err := ScanNominal(context.Background(), cfgs, 0, nil); err != nil {
			b.Fatal(err)
		}
	}
}
