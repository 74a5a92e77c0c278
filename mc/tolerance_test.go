package mc

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"strings"
	"testing"

	"rampart/noise"
)

// evaluatorOf turns a per-realisation model of the budget into an
// Evaluator on n realisations with common random numbers (synthetic), and
// logs the budgets it is called with.
func evaluatorOf(n int, model func(b Budget, z1, z2 float64) (contrast, bias float64), calls *[]Budget) Evaluator {
	return func(_ context.Context, b Budget) ([]Record, error) {
		if calls != nil {
			*calls = append(*calls, b)
		}
		return synthetic(n, 21, func(z1, z2 float64) (float64, float64) { return model(b, z1, z2) }), nil
	}
}

func TestToleranceMonotone(t *testing.T) {
	// Contrast 1 - c (sigma z)^2 with c = 1000 and z standard normal: its
	// 5th percentile is 1 - c sigma^2 q, q = chi2_1(0.95) = 1.959964^2 =
	// 3.841459, so a p05 of at least 0.9 allows sigma up to sqrt(0.1 / (1000
	// q)) = 5.102e-3 (0.51 %). The confidence bound moves q to about q + 1.6449
	// se, with se = sqrt(0.05 x 0.95) / (f(q) sqrt(N)) the standard error of
	// the sample quantile and f(q) = 0.029819 the chi2_1 density there: for N =
	// 2000, se = 0.163 (4.3 % of q, 2.1 % in sigma). Tolerance: 3 se plus the
	// precision, 7.4 % in sigma. The budget has the common depth error off: the
	// search must start at RefDepthRel and bracket upwards.
	const n, precision = 2000, 0.01
	var calls []Budget
	eval := evaluatorOf(n, func(b Budget, z1, _ float64) (float64, float64) {
		x := b.DepthCommonRel * z1
		return 1 - 1000*x*x, 0
	}, &calls)
	s := ToleranceSearch{Requirements: Requirements{ContrastP05Min: 0.9}, Seed: 3, Options: ToleranceOptions{Precision: precision}}
	res, err := s.Source(context.Background(), eval, ParamDepthCommon)
	if err != nil {
		t.Fatal(err)
	}
	if calls[0].DepthCommonRel != RefDepthRel {
		t.Errorf("first amplitude: got %v, want the reference %v", calls[0].DepthCommonRel, RefDepthRel)
	}
	if res.Unit != Relative || res.Nominal != nil || res.Metric != CriterionContrastP05 || !res.Monotone {
		t.Errorf("row %+v: want unit relative, no nominal, metric %s, monotone", res, CriterionContrastP05)
	}
	tol, ok := res.Tolerance()
	if !ok {
		t.Fatalf("no tolerance: %+v", res)
	}
	se := math.Sqrt(0.05*0.95) / (0.029819 * math.Sqrt(n))
	want := math.Sqrt(0.1 / (1000 * (3.841459 + 1.6449*se)))
	if rel := 3*se/3.841459/2 + precision; math.Abs(tol-want) > rel*want {
		t.Errorf("tolerance: got %v, want %v (rel tol %.3g)", tol, want, rel)
	}
	for i, p := range res.Points {
		if i > 0 && !(p.Amplitude > res.Points[i-1].Amplitude) {
			t.Errorf("points not in increasing amplitude: %v then %v", res.Points[i-1].Amplitude, p.Amplitude)
		}
		if i > 0 && p.Value > res.Points[i-1].Value {
			t.Errorf("p05 rises with amplitude at %v: %v after %v", p.Amplitude, p.Value, res.Points[i-1].Value)
		}
		if p.Envelope != (Interval{Value: p.Value, Lo: p.Lo, Hi: p.Hi}) {
			t.Errorf("monotone curve at %v: envelope %+v differs from the point %v [%v, %v]", p.Amplitude, p.Envelope, p.Value, p.Lo, p.Hi)
		}
		if p.Holds != (p.Amplitude <= tol) {
			t.Errorf("point %v holds = %v with tolerance %v", p.Amplitude, p.Holds, tol)
		}
	}
	consistent(t, s, eval, tol, func(a float64) Budget { return Budget{DepthCommonRel: a} }, precision)
}

// consistent checks the promise of a tolerance a: the spec holds at a and
// does not at (1 + precision) a (it fails or is undecided).
func consistent(t *testing.T, s ToleranceSearch, eval Evaluator, a float64, at func(float64) Budget, precision float64) {
	t.Helper()
	for _, tt := range []struct {
		scale float64
		want  Verdict
	}{{1, Pass}, {1 + precision, Fail}} {
		recs, err := eval(context.Background(), at(tt.scale*a))
		if err != nil {
			t.Fatal(err)
		}
		if got := Qualify(recs, s.Requirements, s.ScaleFactorS, s.Seed).Verdict; (got == Pass) != (tt.want == Pass) {
			t.Errorf("at %g x the tolerance %g: verdict %v, want %v", tt.scale, a, got, tt.want)
		}
	}
}

// TestToleranceLinearBias is the analytic case: a bias linear in the skew,
// b = alpha tau, with tau ~ N(0, sigma^2). |b| / (alpha sigma) is |N(0,1)|,
// whose 95th percentile is the normal 97.5th percentile 1.959964 (standard
// result), so a 95th percentile of |b| at most B allows
//
//	sigma* = B / (1.959964 alpha).
//
// The search demands that the one-sided 95% upper bound clear B, which
// moves the quantile to about 1.959964 + 1.6449 se, with se = sqrt(0.95 x
// 0.05) / (2 phi(1.959964) sqrt(N)) = 1.8645 / sqrt(N) the standard error
// of the sample quantile (normal approximation, phi(1.96) = 0.058445):
//
//	sigma_c = B / ((1.959964 + 1.6449 x 1.8645 / sqrt(N)) alpha).
//
// With N = 10000, se = 0.0186 (0.95 % of the quantile): sigma_c must agree
// within 3 se plus the precision (3.3 %), sigma* within that plus the
// bound's shift (1.6 %). (This seed's sample quantile happens to lie 2.4 se
// below the population's.)
func TestToleranceLinearBias(t *testing.T) {
	const n, alpha, limit, precision = 10000, 1e5, 1e-3, 0.004 // rad/s, rad
	eval := evaluatorOf(n, func(b Budget, z1, _ float64) (float64, float64) { return 1, alpha * b.SkewS * z1 }, nil)
	s := ToleranceSearch{
		Budget:       Budget{SkewS: 50e-9}, // fails: the search must check the source off and bracket downwards
		Requirements: Requirements{AbsBiasP95MaxRad: limit},
		Seed:         4,
		Options:      ToleranceOptions{Precision: precision},
	}
	res, err := s.Source(context.Background(), eval, ParamSkew)
	if err != nil {
		t.Fatal(err)
	}
	tol, ok := res.Tolerance()
	if !ok || res.Unit != "ns" || *res.Nominal != 50 || res.Metric != CriterionBiasRad {
		t.Fatalf("row %+v: want a tolerance in ns, nominal 50 ns, metric %s", res, CriterionBiasRad)
	}
	se := 1.8645 / math.Sqrt(n)
	shift := 1.6449 * se / 1.959964
	analytic := limit / (1.959964 * alpha) * 1e9
	bounded := limit / ((1.959964 + 1.6449*se) * alpha) * 1e9
	rel := 3*se/1.959964 + precision
	if math.Abs(tol-bounded) > rel*bounded {
		t.Errorf("tolerance: got %v ns, want %v ns from the confidence bound (rel tol %.3g)", tol, bounded, rel)
	}
	if math.Abs(tol-analytic) > (rel+shift)*analytic {
		t.Errorf("tolerance: got %v ns, want %v ns = B / (1.96 alpha) (rel tol %.3g)", tol, analytic, rel+shift)
	}
	if math.Abs(res.At.Value-limit) > (rel+shift)*limit || res.At.Hi > limit {
		t.Errorf("metric at the tolerance %v [%v, %v]: want its upper bound just under %v", res.At.Value, res.At.Lo, res.At.Hi, limit)
	}
	consistent(t, s, eval, tol*1e-9, func(a float64) Budget { return Budget{SkewS: a} }, precision)
}

// TestToleranceJoint scales a two-source budget: b = alpha1 tau + alpha2
// delta with tau and delta independent normal, so |b| is |N(0, s^2)| with
// s = k sqrt((alpha1 sigma1)^2 + (alpha2 sigma2)^2) at scale k, and the
// largest k is B / (q s(1)) with q the bounded quantile of
// TestToleranceLinearBias (N = 10000: se = 0.0186, 0.95 % of the quantile;
// tolerance 3 se plus the precision, 3.3 %).
func TestToleranceJoint(t *testing.T) {
	const n, limit = 10000, 1e-3
	const a1, s1, a2, s2 = 1e5, 4e-9, 300, 2e-6 // 4e-4 and 6e-4 rad
	eval := evaluatorOf(n, func(b Budget, z1, z2 float64) (float64, float64) {
		return 1, a1*b.SkewS*z1 + a2*b.DepthDifferentialRel*z2
	}, nil)
	s := ToleranceSearch{Budget: Budget{SkewS: s1, DepthDifferentialRel: s2}, Requirements: Requirements{AbsBiasP95MaxRad: limit},
		Seed: 5, Options: ToleranceOptions{Precision: 0.004}}
	res, err := s.Source(context.Background(), eval, SourceBudget)
	if err != nil {
		t.Fatal(err)
	}
	k, ok := res.Tolerance()
	se := 1.8645 / math.Sqrt(n)
	want := limit / ((1.959964 + 1.6449*se) * math.Hypot(a1*s1, a2*s2))
	if rel := 3*se/1.959964 + 0.004; !ok || math.Abs(k-want) > rel*want || res.Unit != "x budget" {
		t.Errorf("joint scale: got %v %s (found %v), want %v (rel tol %.3g)", k, res.Unit, ok, want, rel)
	}
	consistent(t, s, eval, k, func(a float64) Budget { return s.Budget.Scaled(a) }, 0.004)
}

// TestToleranceNoiseLevel searches the white RIN floor: with the bias
// sqrt(S / S0) alpha z, the level S at the tolerance is S0 (B / (q alpha))^2,
// i.e. RIN0 + 20 log10(B / (q alpha)) dB/Hz, with q the bounded quantile of
// TestToleranceLinearBias (N = 4000: se = 0.029, 1.5 % of the quantile;
// tolerance 3 se plus the precision, 4.9 % in amplitude or 0.42 dB). The
// PSD handed to the evaluator must stay white.
func TestToleranceNoiseLevel(t *testing.T) {
	const n, alpha, limit, rin0 = 4000, 1e-3, 1e-3, -110.0
	s0 := noise.IntensityFromRIN(rin0)
	eval := func(_ context.Context, b Budget) ([]Record, error) {
		w, ok := b.RIN.(noise.White)
		if b.RIN != nil && !ok {
			t.Fatalf("RIN PSD %T: want noise.White", b.RIN)
		}
		k := math.Sqrt(w.Level / s0)
		return synthetic(n, 21, func(z1, _ float64) (float64, float64) { return 1, alpha * k * z1 }), nil
	}
	s := ToleranceSearch{Budget: Budget{RIN: noise.White{Level: s0}}, Requirements: Requirements{AbsBiasP95MaxRad: limit}, Seed: 6,
		Options: ToleranceOptions{Precision: 0.005}}
	res, err := s.Source(context.Background(), eval, SourceRIN)
	if err != nil {
		t.Fatal(err)
	}
	got, ok := res.Tolerance()
	q := 1.959964 + 1.6449*1.8645/math.Sqrt(n)
	want := rin0 + 20*math.Log10(limit/(q*alpha))
	tol := 20 * math.Log10(1+3*1.8645/math.Sqrt(n)/1.959964+0.005)
	if !ok || math.Abs(got-want) > tol || res.Unit != "dB/Hz" || math.Abs(*res.Nominal-rin0) > 1e-9 {
		t.Errorf("RIN tolerance: got %v %s (found %v, nominal %v), want %v dB/Hz (tol %.2g dB)", got, res.Unit, ok, *res.Nominal, want, tol)
	}
}

// TestToleranceEnds checks the searches that end without bracketing a
// tolerance, and the units of a tabulated PSD and of the pulse area.
func TestToleranceEnds(t *testing.T) {
	always := func(holds bool) Evaluator {
		return evaluatorOf(20, func(Budget, float64, float64) (float64, float64) {
			if holds {
				return 1, 0
			}
			return 0.5, 0
		}, nil)
	}
	onlyOff := evaluatorOf(20, func(b Budget, _, _ float64) (float64, float64) {
		if b.SkewS > 0 {
			return 0.5, 0
		}
		return 1, 0
	}, nil)
	// Off: mean contrast 0.905 with sd 0.05, undecided against 0.9 with 20
	// realisations (standard error 0.011); on: 0.5, failing.
	undecidedOff := evaluatorOf(20, func(b Budget, z1, _ float64) (float64, float64) {
		if b.SkewS > 0 {
			return 0.5, 0
		}
		return 0.905 + 0.05*z1, 0
	}, nil)
	table, err := noise.NewTable([]float64{1, 1e3}, []float64{1e-10, 1e-12})
	if err != nil {
		t.Fatal(err)
	}
	req := Requirements{ContrastMeanMin: 0.9}
	for _, tt := range []struct {
		name     string
		budget   Budget
		source   string
		eval     Evaluator
		status   ToleranceStatus
		unit     string
		at       float64 // the tolerance in unit; 0: none
		npoints  int
		firstAmp float64
	}{
		// Capped at 30 %, below 1000 x the 1 % reference: 1, 4, 16, 30 %.
		{"above range", Budget{}, SourcePulse, always(true), ToleranceAboveRange, Relative, 0.3, 4, 0.01},
		// The scale of a table: 1, 4, ..., 256, then 1000.
		{"table", Budget{Phase: table}, SourcePhase, always(true), ToleranceAboveRange, "x rms", 1000, 6, 1},
		{"fails without", Budget{}, ParamSkew, always(false), ToleranceNone, "ns", 0, 1, 10},
		{"undecided without", Budget{}, ParamSkew, undecidedOff, ToleranceUndecided, "ns", 0, 1, 10},
		// 10 ns down by 4 to the bound 10 ns / 1000.
		{"below range", Budget{}, ParamSkew, onlyOff, ToleranceBelowRange, "ns", 0, 6, 0.01},
	} {
		t.Run(tt.name, func(t *testing.T) {
			s := ToleranceSearch{Budget: tt.budget, Requirements: req, Seed: 1}
			res, err := s.Source(context.Background(), tt.eval, tt.source)
			if err != nil {
				t.Fatal(err)
			}
			got, ok := res.Tolerance()
			const tol = 1e-9 // relative: rounding of the unit conversions
			if res.Status != tt.status || res.Unit != tt.unit || ok != (tt.at != 0) || math.Abs(got-tt.at) > tol*tt.at {
				t.Errorf("got status %s, unit %q, tolerance %v (%v), want %s, %q, %v", res.Status, res.Unit, got, ok, tt.status, tt.unit, tt.at)
			}
			if len(res.Points) != tt.npoints || math.Abs(res.Points[0].Amplitude-tt.firstAmp) > tol*tt.firstAmp {
				t.Errorf("got %d points from %v, want %d from %v", len(res.Points), res.Points[0].Amplitude, tt.npoints, tt.firstAmp)
			}
			// The evaluation with the source off is kept when the start failed.
			searchedOff := tt.status != ToleranceAboveRange
			if (res.Off != nil) != searchedOff || searchedOff && (res.Off.Amplitude != 0 || res.Off.Holds != (tt.status == ToleranceBelowRange) || res.Off.Value != res.Off.Criteria[0].Value) {
				t.Errorf("off point %+v: want one at amplitude 0 holding only below range: %v", res.Off, searchedOff)
			}
			if extra := res.OffExtra(); (extra > 0) != (tt.status == ToleranceUndecided) {
				t.Errorf("%d more realisations to decide the source off, want some only when undecided", extra)
			}
		})
	}
}

// TestToleranceEnvelope feeds the curve a value that rises again at one
// amplitude (as a finite ensemble's can): the envelope keeps the worst value
// seen at or below each amplitude, and the curve is flagged non-monotone.
func TestToleranceEnvelope(t *testing.T) {
	pt := func(a, v float64, holds bool) TolerancePoint {
		return TolerancePoint{Amplitude: a, Holds: holds, Criteria: []Criterion{{Name: CriterionContrastP05, AtLeast: true, Limit: 0.9, Value: v, Lo: v - 0.01, Hi: v + 0.01}}}
	}
	var res ToleranceResult
	res.finish([]TolerancePoint{pt(4, 0.93, true), pt(1, 0.95, true), pt(2, 0.96, true), pt(8, 0.85, false)}, 4, func(a float64) float64 { return 10 * a })
	wantEnv := []float64{0.95, 0.95, 0.93, 0.85}
	wantAmp := []float64{10, 20, 40, 80}
	for i, p := range res.Points {
		if p.Envelope.Value != wantEnv[i] || p.Envelope.Lo != wantEnv[i]-0.01 || p.Amplitude != wantAmp[i] {
			t.Errorf("point %d: amplitude %v envelope %+v, want %v and value %v, lo %v (exact)", i, p.Amplitude, p.Envelope, wantAmp[i], wantEnv[i], wantEnv[i]-0.01)
		}
	}
	if res.Monotone || res.At == nil || res.At.Amplitude != 40 || res.At.Envelope.Value != 0.93 || res.Metric != CriterionContrastP05 {
		t.Errorf("got monotone %v, at %+v, metric %q: want false, 40 with envelope 0.93, %s", res.Monotone, res.At, res.Metric, CriterionContrastP05)
	}
}

func TestToleranceWidest(t *testing.T) {
	// Clock: 1e-5 x 1000 = 1e-2, under its cap of 0.1. Skew: 50 ns x 1000
	// capped at 10 us. The joint scale stops where the skew reaches its cap,
	// 10 us / 50 ns = 200, which gives the clock only 2e-3.
	s := ToleranceSearch{Budget: Budget{ClockRel: 1e-5, SkewS: 50e-9, DepthCommonRel: 0.01}}
	w := s.Widest()
	if w.ClockRel != 1e-2 || w.SkewS != 10e-6 || w.DepthCommonRel != 0.01 {
		t.Errorf("widest: got clock %v, skew %v, depth %v, want 1e-2, 1e-5, 0.01 (exact)", w.ClockRel, w.SkewS, w.DepthCommonRel)
	}
}

func TestToleranceErrors(t *testing.T) {
	eval := evaluatorOf(5, func(Budget, float64, float64) (float64, float64) { return 1, 0 }, nil)
	s := ToleranceSearch{Requirements: Requirements{ContrastMeanMin: 0.9}}
	if _, err := s.Source(context.Background(), eval, "laser"); err == nil {
		t.Error("unknown source: got no error")
	}
	if _, err := s.Joint(context.Background(), eval); err == nil {
		t.Error("joint search of an empty budget: got no error")
	}
	if _, err := (ToleranceSearch{}).Source(context.Background(), eval, ParamSkew); err == nil {
		t.Error("no requirements: got no error")
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := s.Source(ctx, eval, ParamSkew); err != context.Canceled {
		t.Errorf("cancelled: got %v, want context.Canceled", err)
	}
}

// TestToleranceSkewRun searches the skew tolerance on the simulation (the
// test ensemble's ring and 150 us inverse ramp, 16 realisations, the common
// depth error at its budget value of 1 %) and checks it against ordinary
// runs stored and read back at the tolerance and at (1 + precision) times
// it: the 95th percentile of |bias| of the first is the metric the search
// reports (the same records, so exactly), and the spec holds there and not
// above. The bias is about 5.7e3 rad/s x skew (a local derivative measured
// when this test was written), so a limit of 2e-4 rad puts the tolerance
// near 2e-4 / (1.96 x 5.7e3) = 18 ns, below the 50 ns of the budget.
func TestToleranceSkewRun(t *testing.T) {
	const samples, precision = 69, 0.1 // 69: the least that bounds a p95 at look 1 (stats.MinSamplesUpper)
	base := testEnsemble(t, samples, false)
	base.Budget = Budget{DepthCommonRel: 0.01, SkewS: 50e-9}
	run := func(b Budget) []Record {
		e := base
		e.Budget = b
		dir := t.TempDir()
		if err := runToDir(t, e, dir, nil, 2, 0); err != nil {
			t.Fatal(err)
		}
		_, recs, err := Read(dir)
		if err != nil {
			t.Fatal(err)
		}
		return recs
	}
	eval := func(ctx context.Context, b Budget) ([]Record, error) {
		e := base
		e.Budget = b
		r, err := NewRealiser(e)
		if err != nil {
			return nil, err
		}
		var recs []Record
		_, err = r.Run(ctx, 0, samples, 2, func(rec Record) error { recs = append(recs, rec); return nil })
		return recs, err
	}
	s := ToleranceSearch{Budget: base.Budget, Requirements: Requirements{AbsBiasP95MaxRad: 2e-4}, Seed: 1,
		Options: ToleranceOptions{Precision: precision}}
	res, err := s.Source(context.Background(), eval, ParamSkew)
	if err != nil {
		t.Fatal(err)
	}
	tol, ok := res.Tolerance()
	if !ok || res.Status != ToleranceFound {
		t.Fatalf("no tolerance found: %+v", res)
	}
	t.Logf("skew tolerance %.3g ns, p95 |bias| %.4g [%.4g, %.4g] rad; %d points", tol, res.At.Value, res.At.Lo, res.At.Hi, len(res.Points))
	at := run(Budget{DepthCommonRel: 0.01, SkewS: tol * 1e-9})
	sum := Summarise(at, base.Seed, 0, 1, 0.95, Spec{})
	if sum.AbsBiasRad.P95 != res.At.Value {
		t.Errorf("p95 |bias| of a run at the tolerance: got %v, want %v, the search's (exact: the same records)", sum.AbsBiasRad.P95, res.At.Value)
	}
	if q := Qualify(at, s.Requirements, 0, s.Seed); q.Verdict != Pass {
		t.Errorf("run at the tolerance %.4g ns: verdict %v, want pass", tol, q.Verdict)
	}
	above := run(Budget{DepthCommonRel: 0.01, SkewS: (1 + precision) * tol * 1e-9})
	if q := Qualify(above, s.Requirements, 0, s.Seed); q.Verdict == Pass {
		t.Errorf("run at %g x the tolerance: verdict pass, want fail or undecided", 1+precision)
	}
}

func ExampleToleranceSearch() {
	// A bias of 1e5 rad/s times the skew, on 2000 realisations; the spec
	// allows a 95th percentile of |bias| of 1 mrad at 95% confidence,
	// reached a little below 1e-3 / (1.96 x 1e5) = 5.1 ns.
	eval := func(_ context.Context, b Budget) ([]Record, error) {
		return synthetic(2000, 1, func(z1, _ float64) (float64, float64) { return 1, 1e5 * b.SkewS * z1 }), nil
	}
	s := ToleranceSearch{Budget: Budget{SkewS: 50e-9}, Requirements: Requirements{AbsBiasP95MaxRad: 1e-3}, Seed: 1}
	res, err := s.Source(context.Background(), eval, ParamSkew)
	if err != nil {
		panic(err)
	}
	tol, _ := res.Tolerance()
	fmt.Printf("%s: %.3g %s (%s, budget %g %s), p95 |bias| %.3g rad\n", res.Source, tol, res.Unit, res.Status, *res.Nominal, res.Unit, res.At.Value)
	// Output: timing.skew_ns: 4.82 ns (found, budget 50 ns), p95 |bias| 0.000967 rad
}

// TestToleranceTemperatureCap checks that the temperature spread is
// searched no further than the start temperature (where one draw in six
// would be clamped at 0 K), alone and with the whole budget: a spec that
// always holds ends above-range at 20 nK, and the budget of a 5 nK spread
// at a factor 20/5 = 4 (exact).
func TestToleranceTemperatureCap(t *testing.T) {
	holds := evaluatorOf(20, func(Budget, float64, float64) (float64, float64) { return 1, 0 }, nil)
	s := ToleranceSearch{Budget: Budget{TemperatureSpreadK: 5e-9}, Requirements: Requirements{ContrastMeanMin: 0.9}, Seed: 1, StartTemperatureK: 20e-9}
	for _, c := range []struct {
		source string
		want   float64
	}{{SourceTemperature, 20}, {SourceBudget, 4}} {
		res, err := s.Source(context.Background(), holds, c.source)
		if err != nil {
			t.Fatal(err)
		}
		got, ok := res.Tolerance()
		if res.Status != ToleranceAboveRange || !ok || math.Abs(got-c.want) > 1e-9*c.want {
			t.Errorf("%s: status %s, tolerance %v (%v), want above-range at %v", c.source, res.Status, got, ok, c.want)
		}
	}
	s.StartTemperatureK = 0 // ground-state start: the source's own cap, 1 uK
	res, _ := s.Source(context.Background(), holds, SourceTemperature)
	if got, _ := res.Tolerance(); math.Abs(got-1000) > 1e-9*1000 {
		t.Errorf("no start temperature: tolerance %v nK, want the cap 1000 nK", got)
	}
}

// TestToleranceMissingBounds checks that a point whose binding quantile
// has no lower bound at its ensemble size (the range's end stands in)
// writes that bound as null, and that the envelope resting on it does too,
// from there up (the range's end is the worst value, so no later bound
// replaces it).
func TestToleranceMissingBounds(t *testing.T) {
	crit := func(v, lo float64, noLo int) Criterion {
		return Criterion{Name: CriterionContrastP05, AtLeast: true, Limit: 0.9, Value: v, Lo: lo, Hi: 1, NoLo: noLo, Verdict: Pass}
	}
	pts := []TolerancePoint{
		{Amplitude: 1, Holds: true, Criteria: []Criterion{crit(0.99, 0.98, 0)}},
		// 59: the smallest ensemble with a lower order-statistic bound on
		// a 5th percentile at 95 % (Wilks 1941, as stats computes it).
		{Amplitude: 2, Holds: true, Criteria: []Criterion{crit(0.97, 0, 59)}},
		{Amplitude: 3, Holds: true, Criteria: []Criterion{crit(0.95, 0.94, 0)}},
	}
	var res ToleranceResult
	res.finish(pts, 0, func(a float64) float64 { return a })
	want := []struct{ noLo, envNoLo bool }{{false, false}, {true, true}, {false, true}}
	for i, p := range res.Points {
		if p.NoLo != want[i].noLo || p.EnvNoLo != want[i].envNoLo {
			t.Errorf("point %d: NoLo %v, EnvNoLo %v; want %v, %v", i, p.NoLo, p.EnvNoLo, want[i].noLo, want[i].envNoLo)
		}
	}
	b, err := json.Marshal(res.Points[1])
	if err != nil {
		t.Fatal(err)
	}
	if s := string(b); !strings.Contains(s, `"lo":null`) || !strings.Contains(s, `"envelope":{"value":0.97,"lo":null,"hi":1}`) {
		t.Errorf("point without a lower bound: JSON %s, want lo and the envelope's lo null", s)
	}
	b, _ = json.Marshal(res.Points[0])
	if s := string(b); !strings.Contains(s, `"lo":0.98`) {
		t.Errorf("point with its bounds: JSON %s, want lo 0.98", s)
	}
}
