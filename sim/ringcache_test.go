package sim

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

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

// mulH1Blocks is mulH1 from the blocks themselves (the reference of
// TestRingMulH1).
func (mg *ringMagnus) mulH1Blocks(y, x []complex128, k int) {
	clear(y)
	for _, blk := range mg.blocks {
		src := x[blk.from*k : (blk.from+1)*k]
		dst := y[blk.to*k : (blk.to+1)*k]
		bsrc := x[blk.to*k : (blk.to+1)*k]
		bdst := y[blk.from*k : (blk.from+1)*k]
		for nn := range k {
			row := blk.h[nn*k : (nn+1)*k]
			var z complex128
			xn := bsrc[nn]
			for p, a := range row {
				z += a * src[p]
				bdst[p] += complexConj(a) * xn
			}
			dst[nn] += z
		}
	}
}

// TestRingMulH1 checks the product with the first Magnus term from
// stackRows' real rows (kernel.Combine) against the blocks' own complex
// product on the benchmark ring's cruise, for a tilt with a second
// harmonic (class shifts 1 and 2) and a harmonic of order N/2 (a block
// within the classes' half turn). The two sum in different orders: seen
// 4e-16 of the largest element; tolerance 1e-14.
func TestRingMulH1(t *testing.T) {
	s, err := NewSimulator(benchConfig(t, 100))
	if err != nil {
		t.Fatal(err)
	}
	b, cfg := s.basis, s.cfg
	v0 := 2 * math.Pi * cfg.DepthHz
	es := diagonalise(b, cfg.Ring.rotationalRate(), 500, v0)
	rng := rand.New(rand.NewPCG(1, 2))
	x := make([]complex128, b.Size())
	for i := range x {
		x[i] = complex(rng.NormFloat64(), rng.NormFloat64())
	}
	for _, p := range []RingPotential{
		{TiltRad: 1e-3, LowRad: 1, Harmonics: []DepthHarmonic{{Order: 2, Rel: 1e-3}}},
		{Harmonics: []DepthHarmonic{{Order: 10, Rel: 1e-3, PhaseRad: 0.4}}},
	} {
		r := newRingOp(p.waves(cfg.Ring, v0, 1), 0)
		r.build(b, &es, 0.3, 500, 1, 0.0375)
		got, want := make([]complex128, len(x)), make([]complex128, len(x))
		r.mag.mulH1(got, x, b.Block)
		r.mag.mulH1Blocks(want, x, b.Block)
		var scale, diff float64
		for i := range want {
			scale = math.Max(scale, cmplxAbs(want[i]))
			diff = math.Max(diff, cmplxAbs(got[i]-want[i]))
		}
		t.Logf("%v: largest element %.3g, difference %.3g", p, scale, diff)
		if diff > 1e-14*scale || scale == 0 {
			t.Errorf("%v: H1 x from the rows differs from the blocks' by %.3g (largest %.3g, tol 1e-14 relative)", p, diff, scale)
		}
	}
}

// TestBesselJSeries checks split's Bessel functions, the power series
// below x = 0.1 (Abramowitz and Stegun 9.1.10), against math.Jn: seen
// within 3.5e-16 relative; tolerance 1e-15 relative.
func TestBesselJSeries(t *testing.T) {
	for _, x := range []float64{1e-6, 3.4e-4, 1e-2, 0.099, 0.5} {
		j := make([]float64, 8)
		besselJ(j, x)
		for n, v := range j {
			want := math.Jn(n, x)
			if math.Abs(v-want) > 1e-15*math.Abs(want) {
				t.Errorf("J_%d(%g) = %.17g, math.Jn %.17g (tol 1e-15 relative)", n, x, v, want)
			}
		}
	}
}

// BenchmarkShotRingPotentialDrawn is BenchmarkShotRingPotential's tilted
// shot with a tilt that changes from shot to shot (as an ensemble's draws
// do): the first Magnus term is built anew every shot, only the overlaps
// (which depend on the eigensystem alone) are reused.
func BenchmarkShotRingPotentialDrawn(b *testing.B) {
	for _, laps := range []float64{1, 100} {
		b.Run(fmt.Sprintf("laps=%g", laps), func(b *testing.B) {
			s, err := NewSimulator(benchConfig(b, laps))
			if err != nil {
				b.Fatal(err)
			}
			i := 0
			reportCPU(b, func() {
				i++
				sh := Shot{Potential: RingPotential{TiltRad: 1e-3 * (1 + 1e-3*float64(i%7)), LowRad: 1, Harmonics: []DepthHarmonic{{Order: 2, Rel: 1e-3}}}}
				s.Run(sh, nil)
			})
		})
	}
}
