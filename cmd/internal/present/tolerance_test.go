package present

import (
	"encoding/json"
	"slices"
	"strings"
	"testing"

	"rampart/mc"
)

// TestToleranceCurveIsTheEnvelope checks that the tolerance figure draws
// what its caption and the table's note say, the monotone envelope and
// its bounds, and the raw estimates beside it only when they are not
// monotone.
func TestToleranceCurveIsTheEnvelope(t *testing.T) {
	res := mc.ToleranceResult{Source: "timing.skew_ns", Unit: "ns", Metric: mc.CriterionContrastP05, Status: mc.ToleranceFound, Points: []mc.TolerancePoint{
		{Amplitude: 1, Value: 0.95, Lo: 0.94, Envelope: mc.Interval{Value: 0.95, Lo: 0.94, Hi: 0.96}},
		{Amplitude: 2, Value: 0.96, Lo: 0.95, Envelope: mc.Interval{Value: 0.95, Lo: 0.94, Hi: 0.96}}, // rose: the envelope holds 0.95
		{Amplitude: 4, Value: 0.90, Lo: 0.89, Envelope: mc.Interval{Value: 0.90, Lo: 0.89, Hi: 0.91}},
	}}
	x, env, raw, lo, hi := toleranceCurve(res)
	if !slices.Equal(x, []float64{1, 2, 4}) || !slices.Equal(env, []float64{0.95, 0.95, 0.90}) || !slices.Equal(raw, []float64{0.95, 0.96, 0.90}) ||
		!slices.Equal(lo, []float64{0.94, 0.94, 0.89}) || !slices.Equal(hi, []float64{0.96, 0.96, 0.91}) {
		t.Errorf("curve x %v envelope %v raw %v bounds %v %v: want the envelope and its bounds", x, env, raw, lo, hi)
	}
	for _, monotone := range []bool{true, false} {
		res.Monotone = monotone
		nfs, err := toleranceFigures(ToleranceReport{Requirements: mc.Requirements{Confidence: 0.95}, Results: []mc.ToleranceResult{res}})
		if err != nil {
			t.Fatal(err)
		}
		if len(nfs) != 1 || !strings.Contains(nfs[0].caption, "monotone envelope") || strings.Contains(nfs[0].caption, "drawn beside it") == monotone {
			t.Errorf("monotone %v: caption %q", monotone, nfs[0].caption)
		}
		if nfs[0].name != "tolerance-timing-skew_ns" {
			t.Errorf("figure name %q, want tolerance-timing-skew_ns", nfs[0].name)
		}
	}
}

// TestToleranceNotesSampling checks the notes that say a tolerance table
// is limited by the ensemble's size: undecided-without-source with the
// realisations that would decide it, and the warning when every tolerance
// found binds on the yield at n of n (and its absence when one does not).
func TestToleranceNotesSampling(t *testing.T) {
	yield := func(v float64) mc.TolerancePoint {
		return mc.TolerancePoint{Amplitude: 1, Criteria: []mc.Criterion{{Name: mc.CriterionYield, Value: v, Verdict: mc.Pass}}}
	}
	at1, at97 := yield(1), yield(0.97)
	bound := func(at *mc.TolerancePoint) mc.ToleranceResult {
		return mc.ToleranceResult{Source: "timing.skew_ns", Metric: mc.CriterionYield, Status: mc.ToleranceFound, Monotone: true, At: at}
	}
	off := mc.TolerancePoint{Criteria: []mc.Criterion{{Name: mc.CriterionContrastMean, Verdict: mc.Undecided, Extra: 270}}}
	undecided := mc.ToleranceResult{Source: "pulses.area_rel", Status: mc.ToleranceUndecided, Monotone: true, Off: &off}
	for _, c := range []struct {
		name    string
		results []mc.ToleranceResult
		want    []string
		not     string
	}{
		{"all on yield at n of n", []mc.ToleranceResult{bound(&at1), bound(&at1)}, []string{"every tolerance is bound by the yield at 64 of 64 realisations"}, ""},
		{"one below n of n", []mc.ToleranceResult{bound(&at1), bound(&at97)}, nil, "Warning"},
		{"undecided off", []mc.ToleranceResult{bound(&at97), undecided}, []string{"undecided-without-source: the spec fails at the start and is undecided even with the source off", "(about 270 more per ensemble would decide it)."}, "Warning"},
	} {
		notes := strings.Join(ToleranceNotes(ToleranceReport{Samples: 64, Results: c.results}), "\n")
		for _, w := range c.want {
			if !strings.Contains(notes, w) {
				t.Errorf("%s: notes lack %q:\n%s", c.name, w, notes)
			}
		}
		if c.not != "" && strings.Contains(notes, c.not) {
			t.Errorf("%s: notes hold %q:\n%s", c.name, c.not, notes)
		}
	}
}

// TestReadoutKeysAgree checks that shot --json and the ensembles' JSON
// (rank, qualify, run) name the read-out figures with the same keys.
func TestReadoutKeysAgree(t *testing.T) {
	keys := func(v any) []string {
		b, err := json.Marshal(v)
		if err != nil {
			t.Fatal(err)
		}
		var m map[string]any
		if err := json.Unmarshal(b, &m); err != nil {
			t.Fatal(err)
		}
		var out []string
		for k := range m {
			out = append(out, k)
		}
		slices.Sort(out)
		return out
	}
	shot, ens := keys(ReadoutReport{}), keys(mc.Gyro{})
	for _, k := range []string{"atoms", "cycle_s", "projection_noise_rad_s", "projection_noise_deg_per_h", "angle_random_walk_deg_per_sqrt_h"} {
		if !slices.Contains(shot, k) || !slices.Contains(ens, k) {
			t.Errorf("key %s: shot has %v, the ensembles %v; want it in both", k, shot, ens)
		}
	}
}

// TestToleranceNotesBudgetRow checks that the note on the budget row
// appears only when the table has one (tolerance --joint).
func TestToleranceNotesBudgetRow(t *testing.T) {
	row := func(source string) mc.ToleranceResult {
		return mc.ToleranceResult{Source: source, Status: mc.ToleranceFound, Monotone: true}
	}
	for _, c := range []struct {
		results []mc.ToleranceResult
		want    bool
	}{
		{[]mc.ToleranceResult{row(mc.ParamSkew)}, false},
		{[]mc.ToleranceResult{row(mc.ParamSkew), row(mc.SourceBudget)}, true},
	} {
		notes := strings.Join(ToleranceNotes(ToleranceReport{Results: c.results}), "\n")
		if got := strings.Contains(notes, "budget is the factor"); got != c.want {
			t.Errorf("%d rows: budget note %v, want %v:\n%s", len(c.results), got, c.want, notes)
		}
	}
}

// TestToleranceNotesKernelsOnly checks that a table whose every row came
// from the kernels does not say its tolerances were searched by Monte
// Carlo, that a mixed table does, and that a predicted contrast loss
// negative only by rounding reads "0 (rounding)" while a real value keeps
// its digits.
func TestToleranceNotesKernelsOnly(t *testing.T) {
	kern := mc.ToleranceResult{Source: "field.noise_ug2_hz", Method: mc.MethodKernels, Status: mc.TolerancePredicted, Monotone: true, Precision: 0.05}
	mcRow := mc.ToleranceResult{Source: "timing.skew_ns", Status: mc.ToleranceFound, Monotone: true, Precision: 0.05}
	only := strings.Join(ToleranceNotes(ToleranceReport{Samples: 64, Results: []mc.ToleranceResult{kern}}), "\n")
	if strings.Contains(only, "Monte Carlo") || strings.Contains(only, "largest amplitude shown") {
		t.Errorf("kernels only: notes speak of a search:\n%s", only)
	}
	mixed := strings.Join(ToleranceNotes(ToleranceReport{Samples: 64, Results: []mc.ToleranceResult{mcRow, kern}}), "\n")
	if !strings.Contains(mixed, "Searched by Monte Carlo, a tolerance is the largest amplitude shown") {
		t.Errorf("mixed: notes lack the searched rows' definition:\n%s", mixed)
	}
	for _, c := range []struct {
		x    float64
		want string
	}{{-3.36e-22, "0 (rounding)"}, {0, Sci(0, 3)}, {2.5e-5, Sci(2.5e-5, 3)}, {-1e-6, Sci(-1e-6, 3)}} {
		if got := lossCell(c.x); got != c.want {
			t.Errorf("lossCell(%g) = %q, want %q", c.x, got, c.want)
		}
	}
}
