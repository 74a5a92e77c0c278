package mc

import (
	"math"
	"testing"
)

// TestMeasuredBiasVariance checks the read-out's phase noise against the
// standard quantum limit (docs/model.md, Gyroscope figures; common
// practice, Itano et al., Phys. Rev. A 47, 3554 (1993)): on a seeded
// ensemble the variance of the measured bias less that of the true bias
// is mean(1/(C^2 N)) (plus mean(sigma_d^2/(C^2 N^2)) with detection noise),
// within three standard errors of the difference. The ensemble is large
// enough that the standard error is under 3 % of the expectation, so a
// formula off by a factor C or 2 fails.
func TestMeasuredBiasVariance(t *testing.T) {
	const n = 20000
	for _, tc := range []struct {
		atoms, detection float64
	}{
		{1000, 0},  // projection noise alone
		{1000, 30}, // detection noise 30 atoms rms: 0.9 of the projection variance
		{1e4, 0},   // more atoms
		{100, 0},   // few atoms: sigma about 0.15 rad at C = 0.7
	} {
		ro := Readout{Atoms: tc.atoms, CycleS: 1, DetectionAtoms: tc.detection}
		o := NewOutcomes(n)
		rng := Substream(11, 0, "test/outcomes")
		for i := 0; i < n; i++ {
			c := 0.4 + 0.5*rng.Float64()
			b := 1e-2 * rng.NormFloat64()
			o.Add(Record{Index: i, Contrast: c, BiasRad: b, Z: complex(c, 0)})
		}
		const seed = 5
		var want float64
		d := make([]float64, n)
		var mb, mm float64
		meas := make([]float64, n)
		for i := range n {
			c := o.Contrast[i]
			want += (1 + tc.detection*tc.detection/tc.atoms) / (c * c * tc.atoms) / n
			meas[i] = ro.MeasuredBias(seed, i, c, o.BiasRad[i])
			mb += o.BiasRad[i] / n
			mm += meas[i] / n
		}
		for i := range n {
			d[i] = (meas[i]-mm)*(meas[i]-mm) - (o.BiasRad[i]-mb)*(o.BiasRad[i]-mb)
		}
		got, sd := meanStd(d)
		se := sd / math.Sqrt(n)
		if se > 0.03*want {
			t.Fatalf("N %g: standard error %.3g too large against %.3g to test", tc.atoms, se, want)
		}
		if math.Abs(got-want) > 3*se {
			t.Errorf("N %g, sigma_d %g: var(measured) - var(true) = %.5g, want mean(1/(C^2 N)) = %.5g (se %.2g)", tc.atoms, tc.detection, got, want, se)
		}
		// Measure reports the same draws.
		m := ro.Measure(o, seed, 0.95, Spec{MaxAbsBiasRad: 0.02})
		if ms, _ := meanStd(meas); math.Abs(m.BiasRad.Mean-ms) > 1e-15 {
			t.Errorf("Measure mean %.6g, want %.6g", m.BiasRad.Mean, ms)
		}
		k := 0
		for _, x := range meas {
			if math.Abs(x) <= 0.02 {
				k++
			}
		}
		if m.Yield.Inside != k {
			t.Errorf("measured yield %d inside, want %d", m.Yield.Inside, k)
		}
	}
	if (Readout{}).Measure(NewOutcomes(1), 1, 0.95, Spec{}) != nil {
		t.Error("Measure without a read-out is not nil")
	}
}

// TestMeasuredRecordsQualify checks that qualification on the measured
// records decides on the measured signal: with a true bias of zero the
// measured bias is normal with sigma = PhaseSigmaRad(C) (detection.go), so
// the 95th percentile of its magnitude is 1.959964 sigma (the normal
// quantile z_0.975, Abramowitz & Stegun table 26.1). The criterion's
// one-sided bounds must bracket it; the true records' p95 is zero. The
// records' draws are those of Measure, and a lost shot stays lost.
func TestMeasuredRecordsQualify(t *testing.T) {
	const n, c = 4000, 0.8
	ro := Readout{Atoms: 1000, CycleS: 1, DetectionAtoms: 20}
	recs := make([]Record, n)
	for i := range recs {
		recs[i] = Record{Index: i, Contrast: c, Z: complex(c, 0)}
	}
	recs[7] = Record{Index: 7} // lost
	const seed = 9
	m := ro.MeasuredRecords(recs, seed)
	if !m[7].Lost() || m[7].BiasRad != 0 {
		t.Errorf("a lost record became %+v", m[7])
	}
	if m[3].BiasRad != ro.MeasuredBias(seed, 3, c, 0) || m[3].PhaseRad != m[3].BiasRad {
		t.Errorf("record 3: bias %g phase %g, want MeasuredBias %g for both", m[3].BiasRad, m[3].PhaseRad, ro.MeasuredBias(seed, 3, c, 0))
	}
	if recs[3].BiasRad != 0 {
		t.Error("MeasuredRecords changed its input")
	}
	sigma := ro.PhaseSigmaRad(c)
	want := 1.959964 * sigma
	req := Requirements{AbsBiasP95MaxRad: 10 * want}
	q := Qualify(m, req, 1, seed)
	cr := q.Criteria[0]
	if !(cr.Lo <= want && want <= cr.Hi) {
		t.Errorf("measured |bias| p95 %.5g with bounds [%.5g, %.5g]: want them to bracket 1.96 sigma = %.5g", cr.Value, cr.Lo, cr.Hi, want)
	}
	if tq := Qualify(recs, req, 1, seed); tq.Criteria[0].Value != 0 {
		t.Errorf("true |bias| p95 %g, want 0", tq.Criteria[0].Value)
	}
	if (Readout{}).MeasuredRecords(recs, seed) != nil {
		t.Error("MeasuredRecords without a read-out is not nil")
	}
}
