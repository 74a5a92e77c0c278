package mc

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"rampart/stats"
)

// TestRankNoBound: where no order statistic bounds a quantile (too few
// realisations), a ranking marks the missing end instead of passing off
// the end of the metric's range as a bound, and writes it as null in the
// JSON, the differences built from it too. The smallest size with a
// two-sided interval of the 5th percentile at the Bonferroni level
// 1 - 0.05/2 = 0.975 for two ramps needs (1 - p)^n <= 0.0125 for its lower
// end (Wilks 1941; Hahn, Meeker and Escobar 2017, sec. 5.2): n >=
// ln 0.0125 / ln 0.95 = 85.4, so 86, checked here against that closed form
// and stats.MinSamplesLower.
func TestRankNoBound(t *testing.T) {
	want := int(math.Ceil(math.Log(0.0125) / math.Log(0.95)))
	if want != 86 || stats.MinSamplesLower(1, 0.05, 0.9875) != want {
		t.Fatalf("closed form %d, stats.MinSamplesLower %d: want 86 both", want, stats.MinSamplesLower(1, 0.05, 0.9875))
	}
	for _, tc := range []struct {
		n    int
		none bool
	}{{20, true}, {85, true}, {86, false}, {200, false}} {
		a := synthetic(tc.n, 3, func(z1, _ float64) (float64, float64) { return 0.8 + 0.02*z1, 0 })
		b := synthetic(tc.n, 3, func(z1, _ float64) (float64, float64) { return 0.9 + 0.02*z1, 0 })
		r, err := Rank([]string{"a", "b"}, [][]Record{a, b}, MetricP05, Spec{}, 0.95, 1)
		if err != nil {
			t.Fatal(err)
		}
		js, err := json.Marshal(r)
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range r.Ranking {
			if p.NoLo != tc.none || p.NoHi || (p.NoBoundBelow == want) != tc.none {
				t.Errorf("n = %d, %s: NoLo %v NoHi %v NoBoundBelow %d; want a missing lower end (%d) only below %d", tc.n, p.Name, p.NoLo, p.NoHi, p.NoBoundBelow, want, want)
			}
		}
		if d := r.Ranking[1].DiffToBest; (d.NoLo && d.NoHi) != tc.none {
			t.Errorf("n = %d: difference to the best %+v, want both ends missing exactly when the lower bounds are", tc.n, d)
		}
		nulls := strings.Count(string(js), `"lo":null`) + strings.Count(string(js), `"hi":null`)
		// Missing: each place's lo (2), both ends of the second place's
		// two differences (4, one to the best and one to next).
		if wantNulls := map[bool]int{true: 2 + 2 + 2, false: 0}[tc.none]; nulls != wantNulls {
			t.Errorf("n = %d: %d null ends in %s, want %d", tc.n, nulls, js, wantNulls)
		}
	}
}

// TestCriterionNoBound: a qualification of a 5th-percentile criterion on
// too few realisations marks the missing lower bound and writes it as
// null. On the first look the bound is one-sided at the look's confidence
// c (stats.LookAlpha: 96.96 % of a 95 % claim), and the smallest sample
// bounding the 5th percentile from below needs (1 - p)^n <= 1 - c (Wilks
// 1941): n >= ln(1 - c) / ln 0.95 = 68.1, so 69, checked here against the
// closed form at the look's confidence; with 69 it has one.
func TestCriterionNoBound(t *testing.T) {
	req := Requirements{ContrastP05Min: 0.5}
	for _, tc := range []struct {
		n    int
		none bool
	}{{10, true}, {68, true}, {69, false}} {
		recs := synthetic(tc.n, 4, func(z1, _ float64) (float64, float64) { return 0.9 + 0.01*z1, 0 })
		q := Qualify(recs, req, 1, 0)
		want := int(math.Ceil(math.Log(1-q.LookConfidence) / math.Log(0.95)))
		if want != 69 {
			t.Fatalf("closed form at %g: %d, want 69", q.LookConfidence, want)
		}
		c := q.Criteria[0]
		if c.Name != CriterionContrastP05 || (c.NoLo == want) != tc.none || (c.NoLo != 0) != tc.none || c.NoHi != 0 {
			t.Errorf("n = %d: %s NoLo %d NoHi %d, want NoLo %d only below %d", tc.n, c.Name, c.NoLo, c.NoHi, want, want)
		}
		js, err := json.Marshal(c)
		if err != nil {
			t.Fatal(err)
		}
		if strings.Contains(string(js), `"lo":null`) != tc.none || strings.Contains(string(js), `"hi":null`) || !strings.Contains(string(js), `"hi":`) {
			t.Errorf("n = %d: %s: want lo null only below %d, hi a number", tc.n, js, want)
		}
	}
}
