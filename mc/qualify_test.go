package mc

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"rampart/sim"
)

// normalRecords are N = 400 realisations with contrast 0.95 + 0.01 z1 and
// bias 1e-3 z2 rad. The population 5th-percentile contrast is
// 0.95 - 0.01 x 1.6449 = 0.93355 and the 95th percentile of |bias| is
// 1.96e-3 rad (the normal 97.5th percentile, 1.959964, a standard result).
// The sample p05 has a standard error of sqrt(0.05 x 0.95) / (phi(1.6449)
// sqrt(N)) x 0.01 = 1.1e-3 (normal approximation of a sample quantile,
// phi(1.6449) = 0.10314), so limits 0.015 away are 13 standard errors clear.
func normalRecords() []Record {
	return synthetic(400, 9, func(z1, z2 float64) (float64, float64) { return 0.95 + 0.01*z1, 1e-3 * z2 })
}

func criterion(t *testing.T, q Qualification, name string) Criterion {
	t.Helper()
	for _, c := range q.Criteria {
		if c.Name == name {
			return c
		}
	}
	t.Fatalf("no criterion %s in %+v", name, q.Criteria)
	return Criterion{}
}

func TestQualifyVerdicts(t *testing.T) {
	recs := normalRecords()
	const k = 0.2 // s: a scale factor; 1.96e-3 rad is then 2021 deg/h
	for _, tt := range []struct {
		name string
		req  Requirements
		want map[string]Verdict
		all  Verdict
	}{
		{"pass", Requirements{ContrastMeanMin: 0.94, ContrastP05Min: 0.92, AbsBiasP95MaxRad: 3e-3, AbsBiasP95MaxDegPerH: 2500},
			map[string]Verdict{CriterionContrastMean: Pass, CriterionContrastP05: Pass, CriterionBiasRad: Pass, CriterionBiasDegPerH: Pass}, Pass},
		{"fail", Requirements{ContrastP05Min: 0.95, AbsBiasP95MaxRad: 3e-3},
			map[string]Verdict{CriterionContrastP05: Fail, CriterionBiasRad: Pass}, Fail},
		{"fail bias", Requirements{AbsBiasP95MaxRad: 1e-3, AbsBiasP95MaxDegPerH: 1500},
			map[string]Verdict{CriterionBiasRad: Fail, CriterionBiasDegPerH: Fail}, Fail},
		// The sample p05 is 0.93303 here (seed 9), with one-sided bounds
		// [0.93127, 0.93385] at look 1 (96.96 %); a limit 3e-4 above it
		// lies between them.
		{"undecided", Requirements{ContrastP05Min: 0.9333, ContrastMeanMin: 0.94},
			map[string]Verdict{CriterionContrastP05: Undecided, CriterionContrastMean: Pass}, Undecided},
		{"fail beats undecided", Requirements{ContrastP05Min: 0.9333, ContrastMeanMin: 0.96},
			map[string]Verdict{CriterionContrastP05: Undecided, CriterionContrastMean: Fail}, Fail},
	} {
		t.Run(tt.name, func(t *testing.T) {
			q := Qualify(recs, tt.req, k, 1)
			if len(q.Criteria) != len(tt.want) {
				t.Fatalf("got %d criteria, want %d", len(q.Criteria), len(tt.want))
			}
			for name, v := range tt.want {
				c := criterion(t, q, name)
				if c.Verdict != v {
					t.Errorf("%s: got %v (%+v), want %v", name, c.Verdict, c, v)
				}
				if !(c.Lo <= c.Value && c.Value <= c.Hi) {
					t.Errorf("%s: value %v outside its bounds [%v, %v]", name, c.Value, c.Lo, c.Hi)
				}
				margin := c.Value - c.Limit
				if !c.AtLeast {
					margin = -margin
				}
				if c.Margin != margin {
					t.Errorf("%s: margin got %v, want %v (exact)", name, c.Margin, margin)
				}
				if c.Verdict == Undecided && (c.Extra <= 0 || c.OutOfReach) {
					t.Errorf("%s: extra realisations %d (out of reach %v), want some", name, c.Extra, c.OutOfReach)
				}
			}
			if q.Verdict != tt.all {
				t.Errorf("overall: got %v, want %v", q.Verdict, tt.all)
			}
		})
	}

	// Values against the construction (tolerances: 3 standard errors of
	// each sample statistic, N = 400).
	q := Qualify(recs, Requirements{ContrastMeanMin: 0.5, ContrastP05Min: 0.5, AbsBiasP95MaxRad: 1, AbsBiasP95MaxDegPerH: 1e6}, k, 1)
	for _, c := range []struct {
		name      string
		want, tol float64
	}{
		{CriterionContrastMean, 0.95, 3 * 0.01 / 20},
		{CriterionContrastP05, 0.93355, 3 * 1.1e-3},
		// |Z|: sqrt(0.95 x 0.05) / (2 phi(1.96) sqrt(N)) = 0.0932 per unit sigma.
		{CriterionBiasRad, 1.96e-3, 3 * 0.0932e-3},
	} {
		if got := criterion(t, q, c.name).Value; math.Abs(got-c.want) > c.tol {
			t.Errorf("%s: got %v, want %v (tol %g)", c.name, got, c.want, c.tol)
		}
	}
	rad, deg := criterion(t, q, CriterionBiasRad), criterion(t, q, CriterionBiasDegPerH)
	if want := sim.RadPerSToDegPerH(rad.Value / k); math.Abs(deg.Value-want) > 1e-12*want {
		t.Errorf("deg/h: got %v, want %v = the rad value / K in deg/h (rel tol 1e-12)", deg.Value, want)
	}
}

// TestQualifyYield checks the yield criterion against hand-worked
// Clopper-Pearson bounds at look 1, whose level is alpha_1 = 0.05 x 6/pi^2
// = 0.0303964 (stats.LookAlpha). With every one of n = 60 realisations
// inside, the one-sided lower bound is alpha_1^(1/60) = 0.943439: a yield of
// at least 0.95, 0.96 or 0.99 is undecided; with all of 100 inside it is
// alpha_1^(1/100) = 0.965669 and 0.95 passes. The advice is at look 2,
// alpha_2 = alpha_1/4 = 0.00759909: with all N inside the bound clears L
// once N > ln alpha_2 / ln L, 95.13 for L = 0.95 (36 more than 60), 119.54
// for 0.96 (60 more), 485.53 for 0.99 (426 more). With none of 60 inside
// the upper bound is 1 - alpha_1^(1/60) = 0.0565613 and a yield of at least
// 0.5 fails. (Hand values from the closed form 1 - (1 - c)^(1/n) of
// ZeroFailureUpper, Python's math module.)
func TestQualifyYield(t *testing.T) {
	in := synthetic(60, 2, func(z1, z2 float64) (float64, float64) { return 0.9, 0 })
	in100 := synthetic(100, 2, func(z1, z2 float64) (float64, float64) { return 0.9, 0 })
	out := synthetic(60, 2, func(z1, z2 float64) (float64, float64) { return 0.1, 0 })
	spec := Spec{MinContrast: 0.5}
	for _, tt := range []struct {
		recs    []Record
		min     float64
		verdict Verdict
		lo, hi  float64
		extra   int
	}{
		{in100, 0.95, Pass, 0.965669, 1, 0},
		{in, 0.95, Undecided, 0.943439, 1, 36},
		{in, 0.96, Undecided, 0.943439, 1, 60},
		{in, 0.99, Undecided, 0.943439, 1, 426},
		{out, 0.5, Fail, 0, 0.0565613, 0},
	} {
		q := Qualify(tt.recs, Requirements{YieldMin: tt.min, Yield: spec}, 0, 1)
		c := criterion(t, q, CriterionYield)
		const tol = 5e-7 // absolute: the rounding of the hand values
		if c.Verdict != tt.verdict || math.Abs(c.Lo-tt.lo) > tol || math.Abs(c.Hi-tt.hi) > tol || c.Extra != tt.extra {
			t.Errorf("yield min %v: got %v [%v, %v] extra %d, want %v [%v, %v] extra %d (tol %g)",
				tt.min, c.Verdict, c.Lo, c.Hi, c.Extra, tt.verdict, tt.lo, tt.hi, tt.extra, tol)
		}
		if q.Verdict != tt.verdict {
			t.Errorf("yield min %v: overall %v, want %v", tt.min, q.Verdict, tt.verdict)
		}
	}
}

// TestQualifyOutOfReach: a limit equal to the estimate cannot be decided by
// more realisations under the 1/sqrt(n) model.
func TestQualifyOutOfReach(t *testing.T) {
	recs := normalRecords()
	mean := Qualify(recs, Requirements{ContrastMeanMin: 0.5}, 0, 1).Criteria[0].Value
	c := Qualify(recs, Requirements{ContrastMeanMin: mean}, 0, 1).Criteria[0]
	if c.Verdict != Undecided || !c.OutOfReach || c.Extra != 0 {
		t.Errorf("limit at the estimate: got %+v, want undecided and out of reach", c)
	}
}

func TestQualifyOrderFreeAndReproducible(t *testing.T) {
	recs := normalRecords()
	req := Requirements{Confidence: 0.9, ContrastP05Min: 0.93, AbsBiasP95MaxRad: 2e-3, YieldMin: 0.9, Yield: Spec{MinContrast: 0.93}}
	a := Qualify(recs, req, 1, 5)
	shuffled := slices.Clone(recs)
	rand.New(rand.NewPCG(1, 1)).Shuffle(len(shuffled), func(i, j int) { shuffled[i], shuffled[j] = shuffled[j], shuffled[i] })
	b := Qualify(shuffled, req, 1, 5)
	ja, _ := json.Marshal(a)
	jb, _ := json.Marshal(b)
	if string(ja) != string(jb) {
		t.Errorf("qualification depends on record order:\n%s\n%s", ja, jb)
	}
	if a.Confidence != 0.9 || !strings.Contains(string(ja), `"verdict":"`) {
		t.Errorf("JSON %s: want confidence 0.9 and verdicts by name", ja)
	}
}

func TestVerdictExitCodes(t *testing.T) {
	for _, tt := range []struct {
		v    Verdict
		name string
		code int
	}{{Pass, "pass", 0}, {Fail, "fail", 1}, {Undecided, "undecided", 3}} {
		if tt.v.String() != tt.name || tt.v.ExitCode() != tt.code || (Qualification{Verdict: tt.v}).ExitCode() != tt.code {
			t.Errorf("verdict %d: got %q exit %d, want %q exit %d", int(tt.v), tt.v, tt.v.ExitCode(), tt.name, tt.code)
		}
	}
}

func TestRequirementsValidate(t *testing.T) {
	for _, tt := range []struct {
		req  Requirements
		want string
	}{
		{Requirements{}, "no criterion"},
		{Requirements{Confidence: 0.5, ContrastP05Min: 0.9}, "confidence 0.5"},
		{Requirements{ContrastP05Min: 1.2}, "contrast.p05_min = 1.2"},
		{Requirements{AbsBiasP95MaxRad: math.NaN()}, "bias.abs_p95_max_rad = NaN"},
		{Requirements{YieldMin: 0.9}, "yield.min needs"},
		{Requirements{YieldMin: 1, Yield: Spec{MinContrast: 0.5}}, "never be shown"},
		{Requirements{ContrastP05Min: 0.9, Yield: Spec{MinContrast: 0.5}}, "without yield.min"},
	} {
		if err := tt.req.Validate(); err == nil || !strings.Contains(err.Error(), tt.want) {
			t.Errorf("%+v: got %v, want an error containing %q", tt.req, err, tt.want)
		}
	}
	if err := (Requirements{YieldMin: 0.99, Yield: Spec{MaxAbsBiasRad: 1e-3}}).Validate(); err != nil {
		t.Errorf("valid yield requirement: got %v", err)
	}
}

func ExampleQualify() {
	recs := synthetic(400, 9, func(z1, z2 float64) (float64, float64) { return 0.95 + 0.01*z1, 1e-3 * z2 })
	req := Requirements{Confidence: 0.95, ContrastP05Min: 0.92, AbsBiasP95MaxRad: 1.5e-3}
	q := Qualify(recs, req, 0.2, 1)
	for _, c := range q.Criteria {
		fmt.Printf("%-20s %.4g [%.4g, %.4g] limit %g: %v\n", c.Name, c.Value, c.Lo, c.Hi, c.Limit, c.Verdict)
	}
	fmt.Println(q.Verdict, "exit", q.ExitCode())
	// Output:
	// contrast.p05_min     0.933 [0.9313, 0.9338] limit 0.92: pass
	// bias.abs_p95_max_rad 0.001918 [0.001752, 0.00208] limit 0.0015: fail
	// fail exit 1
}
