package sim

import "testing"

// TestRingMagnusReuse checks that what a shot reuses of the ring
// potential's first Magnus term from the shot before (sim/ringexact.go,
// ringOp.build) changes no bit: each shot of a sequence, run after other
// shots on one simulator, equals the same shot on a fresh simulator. The
// sequence changes, one at a time, the potential, the depth (a new
// eigensystem), the skew and the rotation (new angles) and repeats a
// shot (everything reused). The pieces of a stretch, which share the
// eigensystem and differ in the angle, are held by TestRingPotentialExact
// (RingErrorRad against the split-step reference).
func TestRingMagnusReuse(t *testing.T) {
	cfg := benchConfig(t, 3)
	tilt := RingPotential{TiltRad: 1e-3, LowRad: 1, Harmonics: []DepthHarmonic{{Order: 2, Rel: 1e-3}}}
	other := RingPotential{TiltRad: 2e-3, LowRad: 0.3}
	shots := []Shot{
		{Potential: tilt},
		{Potential: tilt},
		{Potential: other},
		{Potential: tilt},
		{Potential: tilt, DepthRel: [2]float64{1e-3, 1e-3}},
		{Potential: tilt},
		{Potential: tilt, SkewS: 1e-6},
		{Potential: tilt},
		{Potential: tilt, RotationOffsetRadS: 0.5},
		{Potential: tilt},
		{},
		{Potential: tilt},
	}
	s, err := NewSimulator(cfg)
	if err != nil {
		t.Fatal(err)
	}
	for i, sh := range shots {
		got := s.Run(sh, nil).Z
		fresh, err := NewSimulator(cfg)
		if err != nil {
			t.Fatal(err)
		}
		want := fresh.Run(sh, nil).Z
		if got != want {
			t.Errorf("shot %d: %v after the shots before, %v on a fresh simulator", i, got, want)
		}
	}
}
