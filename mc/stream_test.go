package mc

import (
	"context"
	"math"
	"testing"

	"rampart/noise"
	"rampart/sim"
)

// streamedEnsemble runs e with the records stored or streamed (the
// threshold lowered below the record length, so that the streamed band
// starts within one line of the stored record's 1/(n dt)).
func streamedEnsemble(t *testing.T, e Ensemble, streamed bool) []Record {
	t.Helper()
	old := streamAbove
	defer func() { streamAbove = old }()
	if streamed {
		r0, err := NewRealiser(e)
		if err != nil {
			t.Fatal(err)
		}
		_, n := r0.noiseGrid()
		streamAbove = n - 1
	}
	r, err := NewRealiser(e)
	if err != nil {
		t.Fatal(err)
	}
	if (r.phaseStream != nil) != streamed {
		t.Fatalf("streamed = %v, but the realiser streams: %v", streamed, r.phaseStream != nil)
	}
	var recs []Record
	if _, err := r.Run(context.Background(), 0, e.Samples, 2, func(rec Record) error {
		recs = append(recs, rec)
		return nil
	}); err != nil {
		t.Fatal(err)
	}
	return recs
}

func TestStreamedNoiseStatistics(t *testing.T) {
	// Streamed records are other draws of the same processes: on a half-lap
	// benchmark shot under strong intensity (-100 dB/Hz) and drive phase
	// (-90 dBc/Hz, correlation 0.5) noise, the ensemble means of the
	// contrast, of the bias and of the records' rms, and the bias
	// variance, agree between stored and streamed records within 4
	// combined standard errors (two-sample z on means, common practice;
	// the variance through log s² with standard error sqrt(2/(n-1)) for a
	// Gaussian sample, from memory). The records' rms scatter by 4 % from
	// one realisation to the next, so the rms means detect a 2 % error in
	// a record's amplitude (4 % in its power); the bias variance (80 shots) only
	// a factor 2.5 (measured |z|: 0.1 to 1.4).
	if testing.Short() {
		t.Skip("two ensembles")
	}
	c := benchSequence(t)
	up, err := sim.NewShape("sin2", 150e-6, 500, c.TrapRadS())
	if err != nil {
		t.Fatal(err)
	}
	if c.Sequence, err = sim.NewSequence(up, 0.5); err != nil {
		t.Fatal(err)
	}
	bud := Budget{RIN: noise.White{Level: noise.IntensityFromRIN(-100)},
		Phase: noise.White{Level: noise.PhaseFromDBc(-90)}, PhaseCorrelation: 0.5}
	e := Ensemble{Config: c, Budget: bud, Samples: 80, Seed: 3}
	a, b := streamedEnsemble(t, e, false), streamedEnsemble(t, e, true)
	type stat struct {
		name string
		get  func(Record) float64
	}
	for _, s := range []stat{
		{"contrast", func(r Record) float64 { return r.Contrast }},
		{"bias", func(r Record) float64 { return r.BiasRad }},
		{"RIN rms", func(r Record) float64 { return r.RINRms }},
		{"phase rms arm +", func(r Record) float64 { return r.PhaseRms[0] }},
		{"phase rms arm -", func(r Record) float64 { return r.PhaseRms[1] }},
	} {
		ma, va := meanVar(a, s.get)
		mb, vb := meanVar(b, s.get)
		z := (ma - mb) / math.Sqrt(va/float64(len(a))+vb/float64(len(b)))
		t.Logf("%s: stored %.6g (sd %.3g), streamed %.6g (sd %.3g), z = %.2f", s.name, ma, math.Sqrt(va), mb, math.Sqrt(vb), z)
		if math.Abs(z) > 4 {
			t.Errorf("%s: means differ by %.2f standard errors", s.name, z)
		}
		if s.name == "bias" {
			zl := math.Log(va/vb) / math.Sqrt(2/float64(len(a)-1)+2/float64(len(b)-1))
			t.Logf("bias variance: log ratio in standard errors %.2f", zl)
			if math.Abs(zl) > 4 {
				t.Errorf("bias variance: stored %.3g, streamed %.3g (%.2f standard errors)", va, vb, zl)
			}
		}
	}
}

func meanVar(recs []Record, get func(Record) float64) (mean, variance float64) {
	for _, r := range recs {
		mean += get(r)
	}
	mean /= float64(len(recs))
	for _, r := range recs {
		d := get(r) - mean
		variance += d * d
	}
	return mean, variance / float64(len(recs)-1)
}
