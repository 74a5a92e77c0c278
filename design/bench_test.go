package design

import (
	"context"
	"testing"

	"rampart/mc"
	"rampart/scenario"
)

// BenchmarkScan2D is the scan target: a 20 x 20 scan of the demo's
// nominal shot (its apparatus included) over the ramp time (50 to 300 us) and the depth (10 to 30
// kHz), loading the scenario at each point as rampart scan does (goal: at
// most 5 s on a 2-core machine).
func BenchmarkScan2D(b *testing.B) {
	pts, err := Grid([]Axis{{"ramp.duration_us", Linspace(50, 300, 20)}, {"lattice.depth_khz", Linspace(10, 30, 20)}})
	if err != nil {
		b.Fatal(err)
	}
	values := make([][]float64, len(pts))
	for i, p := range pts {
		values[i] = p.Values
	}
	check := CheckPoints(values) // the corners and centre, as rampart scan checks them
	for b.Loop() {
		shots := make([]NominalShot, len(pts))
		for i, p := range pts {
			sc, cfg, err := scenario.LoadConfig(demo, p.Sets)
			if err != nil {
				b.Fatal(err)
			}
			app, err := sc.Apparatus()
			if err != nil {
				b.Fatal(err)
			}
			shots[i] = NominalShot{Config: cfg, Apparatus: app, Check: check[i]}
		}
		if _, err := ScanNominal(context.Background(), shots, 0, nil); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkRobustEvaluation is one objective evaluation of rampart robust
// on the demo: a 200-realisation ensemble of the demo's sin2 ramp with a
// 12-term correction. The target, an optimisation of 10 to 20
// parameters with a 200-realisation objective in at most 10 minutes on two
// cores, allows 600 s divided by this time evaluations.
func BenchmarkRobustEvaluation(b *testing.B) {
	_, cfg, budget, err := scenario.LoadBudget(demo, nil)
	if err != nil {
		b.Fatal(err)
	}
	r := Robust{Ensemble: mc.Ensemble{Config: cfg, Budget: budget, Samples: 200, Seed: 1, Sampler: "random"},
		Terms: 12, Objective: Objective{Name: ObjectiveP05}, MaxEvals: 100}
	coef := []float64{0.01, -0.02, 0.01, 0.005, -0.01, 0.002, 0.001, -0.003, 0.002, 0.001, -0.001, 0.0005}
	for b.Loop() {
		if _, _, err := r.Evaluate(context.Background(), coef); err != nil {
			b.Fatal(err)
		}
	}
}
