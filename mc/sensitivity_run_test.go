package mc

import (
	"context"
	"math"
	"testing"

	"rampart/noise"
	"rampart/sim"
)

func runDesign(t *testing.T, d *SensitivityDesign) []Record {
	t.Helper()
	var recs []Record
	if _, err := d.Run(context.Background(), 0, d.Len(), 2, func(r Record) error { recs = append(recs, r); return nil }); err != nil {
		t.Fatal(err)
	}
	return recs
}

// TestSensitivityBiasSources runs the design on the simulation with a budget
// of five static sources of which only two move the phase: the
// differential depth (a dynamic phase from the arms' different zero-point
// energies) and the skew (it breaks the mirror symmetry of the arms); the
// common depth, the clock and the pulse areas act on both arms alike and
// leave the bias (sim's TestSymmetricErrorsNoBias and TestPulseAreaErrors).
// At these amplitudes the two give bias spreads of about 0.02 rad (1e-4 of
// differential depth) and 0.011 rad (2 us of skew at 5.7e3 rad/s), measured
// when this test was written. The other sources' total indices on the bias
// must be ~0: below 0.01 absolute, against interactions at the level of the
// common depth's 1 % change of the differential-depth slope (a variance
// share of order 1e-4). The two effective sources' total indices must be
// clear of zero (lower bounds above 0.05); their values are not checked
// closely, as n = 32 rows leave errors of 0.2 to 0.4 on them.
//
// The contrast indices are checked against a direct measurement of the
// variance shares (the definition of the indices, Saltelli et al., Global
// Sensitivity Analysis: The Primer (2008), ch. 4, estimated without the
// design): the contrast variance of an ensemble with only the common depth
// on, and with every source but it on, over that of the full budget, on
// common random numbers (each source keeps its sampler coordinate, so the
// ratios are nearly free of sampling error). Measured when this test was
// written (64 realisations each): 0.997 for the common depth and 1.3e-3
// for the rest together. The
// common depth's first and total indices must have that share inside their
// 95 % intervals and its total index above 0.7 (measured 0.91, half-width
// of its interval 0.23); the other inputs' total contrast indices must sum
// to at most 0.005 (measured 4e-4; the direct share of the rest rising
// tenfold fails) and each first index be within 0.02 of 0
// (measured at most 0.007, the skew's, inside its interval).
func TestSensitivityBiasSources(t *testing.T) {
	e := testEnsemble(t, 1, false)
	e.Sampler = "sobol"
	e.Budget = Budget{DepthCommonRel: 0.01, DepthDifferentialRel: 1e-4, ClockRel: 1e-5, SkewS: 2e-6, PulseAreaRel: 0.01}
	r, err := NewRealiser(e)
	if err != nil {
		t.Fatal(err)
	}
	d, err := NewSensitivityDesign(r, 32)
	if err != nil {
		t.Fatal(err)
	}
	wantInputs := []string{ParamDepthCommon, ParamDepthDifferential, ParamClock, ParamSkew, ParamPulse1, ParamPulse2}
	if got := d.Inputs(); len(got) != len(wantInputs) || d.Len() != 32*(len(wantInputs)+2) {
		t.Fatalf("inputs %v, %d points: want %v, %d", got, d.Len(), wantInputs, 32*(len(wantInputs)+2))
	}
	res, err := d.Indices(runDesign(t, d), 0.95)
	if err != nil {
		t.Fatal(err)
	}
	for k, in := range res.Inputs {
		t.Logf("%-24s contrast S %6.3f ST %6.3f  bias S %6.3f ST %6.3f [%6.3f, %6.3f]", in.Name,
			in.ContrastFirst.Value, in.ContrastTotal.Value, in.BiasFirst.Value, in.BiasTotal.Value, in.BiasTotal.Lo, in.BiasTotal.Hi)
		if in.Name != wantInputs[k] {
			t.Errorf("input %d: got %s, want %s", k, in.Name, wantInputs[k])
		}
		switch in.Name {
		case ParamDepthDifferential, ParamSkew:
			if in.BiasTotal.Lo < 0.05 {
				t.Errorf("%s: bias total index %+v, want its lower bound above 0.05", in.Name, in.BiasTotal)
			}
		default:
			if math.Abs(in.BiasTotal.Value) > 0.01 {
				t.Errorf("%s: bias total index %v, want ~0 (tol 0.01)", in.Name, in.BiasTotal)
			}
		}
	}

	share := func(b Budget) float64 {
		return contrastVariance(t, e, b, 64) / contrastVariance(t, e, e.Budget, 64)
	}
	common := share(Budget{DepthCommonRel: e.Budget.DepthCommonRel})
	rest := e.Budget
	rest.DepthCommonRel = 0
	others := share(rest)
	t.Logf("direct variance shares of the contrast: common depth %.4f, the rest %.3g", common, others)
	if others > 0.005 {
		t.Fatalf("the sources but the common depth carry %.3g of the contrast variance, want at most 0.005: the test's premise fails", others)
	}
	var sumOthers float64
	for _, in := range res.Inputs {
		if in.Name == ParamDepthCommon {
			for _, iv := range [][2]float64{{in.ContrastFirst.Lo, in.ContrastFirst.Hi}, {in.ContrastTotal.Lo, in.ContrastTotal.Hi}} {
				if !(iv[0] <= common && common <= iv[1]) {
					t.Errorf("%s: contrast index interval %v does not cover the direct share %.4f", in.Name, iv, common)
				}
			}
			if in.ContrastTotal.Value < 0.7 {
				t.Errorf("%s: contrast total index %.3f, want at least 0.7 (direct share %.4f)", in.Name, in.ContrastTotal.Value, common)
			}
			continue
		}
		sumOthers += in.ContrastTotal.Value
		if math.Abs(in.ContrastFirst.Value) > 0.02 {
			t.Errorf("%s: contrast first index %.4f, want within 0.02 of 0", in.Name, in.ContrastFirst.Value)
		}
	}
	if sumOthers > 0.005 {
		t.Errorf("total contrast indices of the inputs but the common depth sum to %.4f, want at most 0.005 (direct share %.3g)", sumOthers, others)
	}
}

// contrastVariance is the sample variance of the contrast over n
// realisations of ensemble e under budget b (random sampler, e's seed).
func contrastVariance(t *testing.T, e Ensemble, b Budget, n int) float64 {
	t.Helper()
	e.Budget, e.Samples, e.Sampler = b, n, "random"
	r, err := NewRealiser(e)
	if err != nil {
		t.Fatal(err)
	}
	w := r.NewWorker()
	var s, s2 float64
	for i := range n {
		c := w.Realise(i).Contrast
		s += c
		s2 += c * c
	}
	m := s / float64(n)
	return (s2/float64(n) - m*m) * float64(n) / float64(n-1)
}

// TestSensitivityNoiseGroups checks the group inputs of the noise processes:
// a row of A uses noise streams j, a row of B streams n + j, and a row of
// A_B^(k) takes B's stream for process k only, with A's static variates.
// The noise records of Worker.Shot(i) are those of stream i, so the rms
// values of the design's shots must equal those of realisations j or n + j
// exactly.
func TestSensitivityNoiseGroups(t *testing.T) {
	const n = 3
	e := testEnsemble(t, 2*n, true)
	e.Budget.PulseAreaRel = 0 // fewer inputs: five static, then rin and phase
	r, err := NewRealiser(e)
	if err != nil {
		t.Fatal(err)
	}
	d, err := NewSensitivityDesign(r, n)
	if err != nil {
		t.Fatal(err)
	}
	ins := d.Inputs()
	rin, phase := len(ins)-2, len(ins)-1
	if ins[rin] != SourceRIN || ins[phase] != SourcePhase {
		t.Fatalf("inputs %v: want rin and phase last", ins)
	}
	w := r.NewWorker()
	real := func(i int) Record { _, rec := w.Shot(i); return rec }
	for j := range n {
		a, b := real(j), real(n+j)
		for _, tt := range []struct {
			block      int
			rin, phase Record // whose noise the shot must carry
		}{{0, a, a}, {1, b, b}, {2 + rin, b, a}, {2 + phase, a, b}} {
			_, got := d.Shot(w, tt.block*n+j)
			if got.RINRms != tt.rin.RINRms || got.PhaseRms != tt.phase.PhaseRms {
				t.Errorf("block %d row %d: rms %v %v, want %v %v (exact)", tt.block, j, got.RINRms, got.PhaseRms, tt.rin.RINRms, tt.phase.PhaseRms)
			}
		}
		_, rowA := d.Shot(w, j)
		_, rowAB := d.Shot(w, (2+rin)*n+j)
		for k, v := range rowA.Inputs {
			if rowAB.Inputs[k] != v {
				t.Errorf("row %d of A_B^(rin): static input %d is %v, want A's %v", j, k, rowAB.Inputs[k], v)
			}
		}
	}
}

// TestSensitivityGroupIndices checks the estimator's view of a group input
// on a model with known indices, y = z + u(s), z the variate of the
// differential depth and u(s) a standard normal drawn from noise stream s:
// a sum of independent unit-variance terms, so S = ST = 1/2 for each
// (additive model, common practice). n = 4096 rows: the estimates'
// standard errors are about 0.01; tolerance 0.05 absolute.
func TestSensitivityGroupIndices(t *testing.T) {
	e := testEnsemble(t, 1, false)
	e.Sampler = "sobol"
	e.Budget = Budget{DepthDifferentialRel: 1, RIN: noise.White{Level: 1e-12}}
	r, err := NewRealiser(e)
	if err != nil {
		t.Fatal(err)
	}
	d, err := NewSensitivityDesign(r, 4096)
	if err != nil {
		t.Fatal(err)
	}
	x := make([]float64, 2)
	recs := make([]Record, d.Len())
	for j := range recs {
		d.saltelli.Point(j, x)
		u := Substream(1, int(x[1]), "u").NormFloat64()
		recs[j] = Record{Index: j, BiasRad: x[0] + u, Contrast: 1 - 0.01*x[0]*x[0]}
	}
	res, err := d.Indices(recs, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	for _, in := range res.Inputs {
		for name, got := range map[string]float64{"S": in.BiasFirst.Value, "ST": in.BiasTotal.Value} {
			if math.Abs(got-0.5) > 0.05 {
				t.Errorf("%s %s on the bias: got %v, want 0.5 (tol 0.05)", in.Name, name, got)
			}
		}
	}
	// The contrast depends on the depth alone: the stream's indices are 0.
	if rin := res.Inputs[1]; math.Abs(rin.ContrastTotal.Value) > 1e-12 || math.Abs(res.Inputs[0].ContrastTotal.Value-1) > 0.05 {
		t.Errorf("contrast totals: depth %v, rin %v, want 1 and 0", res.Inputs[0].ContrastTotal, rin.ContrastTotal)
	}
	if _, err := d.Indices(recs[1:], 0.95); err == nil {
		t.Error("indices from an incomplete design: got no error")
	}
}

// TestLocalDerivativesPulse checks the finite differences on the pulse
// areas, whose effect is known in closed form: pi/2 pulses of area
// (pi/2)(1 + e) scale the contrast by cos(pi e / 2) and leave the phase
// (two-level Rabi rotation, common practice; sim's TestPulseAreaErrors), so
// with step h
//
//	C' = 0,  C'' = 2 C0 (cos(pi h / 2) - 1) / h^2,  b' = b'' = 0,
//
// to rounding (tolerance 1e-9 relative on C”, 1e-9 absolute otherwise).
func TestLocalDerivativesPulse(t *testing.T) {
	e := testEnsemble(t, 1, false)
	const h = 0.02
	e.Budget = Budget{PulseAreaRel: h}
	r, err := NewRealiser(e)
	if err != nil {
		t.Fatal(err)
	}
	c0 := r.NewWorker().RunShot(sim.Shot{}, Record{}).Contrast
	ds := LocalDerivatives(r)
	if len(ds) != 2 || ds[0].Input != ParamPulse1 || ds[1].Input != ParamPulse2 {
		t.Fatalf("derivatives %+v: want the two pulse areas", ds)
	}
	want := 2 * c0 * (math.Cos(math.Pi*h/2) - 1) / (h * h)
	for _, d := range ds {
		if d.Step != h || d.Unit != "relative" || math.Abs(d.ContrastSecond-want) > 1e-9*math.Abs(want) || math.Abs(d.Contrast) > 1e-9 ||
			math.Abs(d.BiasRad) > 1e-9 || math.Abs(d.BiasRadSecond) > 1e-9 {
			t.Errorf("%s: got %+v, want step %v, C'' = %v and zero first derivative and bias (tol 1e-9)", d.Input, d, h, want)
		}
	}
}

// TestLocalDerivativesLabUnit checks that derivatives are per lab unit of
// the source (per ns of skew, the unit of its tolerance), not per SI unit:
// the step is the budget's 20 ns, and the first derivative of the bias
// equals the central difference of two shots skewed by +-20e-9 s, divided
// by 2 x 20 (definition; tolerance 1e-12 absolute, rounding only).
func TestLocalDerivativesLabUnit(t *testing.T) {
	e := testEnsemble(t, 1, false)
	e.Budget = Budget{SkewS: 20e-9}
	r, err := NewRealiser(e)
	if err != nil {
		t.Fatal(err)
	}
	w := r.NewWorker()
	plus := w.RunShot(sim.Shot{SkewS: 20e-9}, Record{})
	minus := w.RunShot(sim.Shot{SkewS: -20e-9}, Record{})
	want := sim.Wrap(plus.BiasRad-minus.BiasRad) / (2 * 20)
	ds := LocalDerivatives(r)
	if len(ds) != 1 || ds[0].Input != ParamSkew || ds[0].Step != 20 || ds[0].Unit != "ns" {
		t.Fatalf("derivatives %+v: want one, of %s, step 20 ns", ds, ParamSkew)
	}
	if got := ds[0].BiasRad; math.Abs(got-want) > 1e-12 || want == 0 {
		t.Errorf("db/dskew: got %v rad/ns, want %v (tol 1e-12, nonzero)", got, want)
	}
}
