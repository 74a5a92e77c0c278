package mc

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"rampart/sim"
	"rampart/stats"
)

// synthetic returns n records whose contrast and bias f gives from
// realisation i's standard normal pair (z1, z2), drawn from
// Substream(seed, i, "test"): records of different "ramps" built from the
// same seed share their draws, as common random numbers do.
func synthetic(n int, seed uint64, f func(z1, z2 float64) (contrast, bias float64)) []Record {
	recs := make([]Record, n)
	for i := range recs {
		rng := Substream(seed, i, "test")
		z1, z2 := rng.NormFloat64(), rng.NormFloat64()
		c, b := f(z1, z2)
		recs[i] = Record{Index: i, Contrast: c, BiasRad: b}
	}
	return recs
}

func names(r Ranking) []string {
	var out []string
	for _, p := range r.Ranking {
		out = append(out, p.Name)
	}
	return out
}

// TestRankKnownOrder ranks ramps whose order is known by construction. With
// N = 400 realisations on common random numbers, the ramps differ by a
// fixed step (0.02 in p05 and mean contrast, 1e-3 rad in the bias spread
// of 1e-3 z1 per step, about 0.17 in yield) on a common 0.02 z1 scatter,
// plus a scatter of 0.005 z2 to 0.015 z2 (2e-4 rad) that differs between
// ramps. Paired differences then have standard errors of about 0.01 /
// sqrt(N) = 5e-4 for the mean and a few times that for a tail quantile or
// a yield (0.02): the steps are 8 or more standard errors, and every place
// must come out resolved.
func TestRankKnownOrder(t *testing.T) {
	const n = 400
	type ramp struct {
		name string
		f    func(z1, z2 float64) (float64, float64)
	}
	contrastRamps := func(step float64) []ramp {
		var out []ramp
		for k, name := range []string{"c", "a", "b"} { // given out of order
			off := []float64{2, 0, 1}[k] * step
			out = append(out, ramp{name, func(z1, z2 float64) (float64, float64) {
				return 0.9 - off + 0.02*z1 + 0.005*z2*float64(k+1), 0
			}})
		}
		return out
	}
	spreadRamps := []ramp{
		{"b", func(z1, z2 float64) (float64, float64) { return 1, 2e-3*z1 + 2e-4*z2 }},
		{"a", func(z1, z2 float64) (float64, float64) { return 1, 1e-3*z1 + 2e-4*z2 }},
		{"c", func(z1, z2 float64) (float64, float64) { return 1, 3e-3*z1 - 2e-4*z2 }},
	}
	// Yield of contrast >= 0.9: 0.9 + 0.02 z1 - shift is inside with
	// probability Phi(-shift / 0.02) = 0.5, 0.31, 0.16 for shifts 0, 0.01, 0.02.
	yieldRamps := contrastRamps(0.01)
	for _, tt := range []struct {
		metric string
		spec   Spec
		ramps  []ramp
	}{
		{MetricP05, Spec{}, contrastRamps(0.02)},
		{MetricMean, Spec{}, contrastRamps(0.02)},
		{MetricBiasSpread, Spec{}, spreadRamps},
		{MetricYield, Spec{MinContrast: 0.9}, yieldRamps},
	} {
		t.Run(tt.metric, func(t *testing.T) {
			var ns []string
			var recs [][]Record
			for _, r := range tt.ramps {
				ns = append(ns, r.name)
				recs = append(recs, synthetic(n, 3, r.f))
			}
			got, err := Rank(ns, recs, tt.metric, tt.spec, 0.95, 1)
			if err != nil {
				t.Fatal(err)
			}
			if want := []string{"a", "b", "c"}; !slices.Equal(names(got), want) {
				t.Fatalf("order: got %v, want %v", names(got), want)
			}
			for k, p := range got.Ranking {
				if !p.Resolved {
					t.Errorf("place %d (%s): not resolved; diff to next %+v", k+1, p.Name, p.DiffToNext)
				}
				if !(p.Lo <= p.Value && p.Value <= p.Hi) {
					t.Errorf("place %d: value %v outside its interval [%v, %v]", k+1, p.Value, p.Lo, p.Hi)
				}
				worse := p.DiffToBest.Value < 0
				if !got.HigherBetter {
					worse = p.DiffToBest.Value > 0
				}
				if k > 0 && (!worse || p.DiffToBest.Lo > p.DiffToBest.Value || p.DiffToBest.Hi < p.DiffToBest.Value) {
					t.Errorf("place %d: difference to the best %+v: want the worse side with the value inside its interval", k+1, p.DiffToBest)
				}
			}
			if got.Ranking[0].DiffToBest != (PartialInterval{}) || got.Ranking[2].DiffToNext != nil {
				t.Errorf("best's difference to itself %+v, last's difference to next %v: want zero and nil", got.Ranking[0].DiffToBest, got.Ranking[2].DiffToNext)
			}
			if tt.metric == MetricYield {
				// Exact for a yield: the interval is Clopper-Pearson at the
				// Bonferroni confidence 1 - 0.05/3 of three ramps.
				inside := int(math.Round(got.Ranking[0].Value * n))
				if e := stats.ClopperPearson(inside, n, 1-0.05/3); e.Lo != got.Ranking[0].Lo || e.Hi != got.Ranking[0].Hi {
					t.Errorf("yield interval: got [%v, %v], want Clopper-Pearson [%v, %v] (exact)", got.Ranking[0].Lo, got.Ranking[0].Hi, e.Lo, e.Hi)
				}
			}
		})
	}
}

// TestRankTie gives two ramps the same contrasts in a different order of
// realisations (a permutation), so their p05 and mean are equal exactly:
// they must be reported unresolved, while a clearly better third ramp is
// resolved from both.
func TestRankTie(t *testing.T) {
	const n = 200
	x := synthetic(n, 5, func(z1, z2 float64) (float64, float64) { return 0.8 + 0.02*z1, 0 })
	y := make([]Record, n)
	for i := range y {
		y[i] = Record{Index: i, Contrast: x[(i*7+3)%n].Contrast} // 7 is prime to 200: a permutation
	}
	best := make([]Record, n)
	for i := range best {
		best[i] = Record{Index: i, Contrast: x[i].Contrast + 0.05}
	}
	for _, metric := range []string{MetricP05, MetricMean} {
		got, err := Rank([]string{"x", "best", "y"}, [][]Record{x, best, y}, metric, Spec{}, 0.95, 2)
		if err != nil {
			t.Fatal(err)
		}
		if got.Ranking[0].Name != "best" || !got.Ranking[0].Resolved {
			t.Errorf("%s: first place %+v, want best, resolved", metric, got.Ranking[0])
		}
		for _, p := range got.Ranking[1:] {
			if p.Resolved {
				t.Errorf("%s: tied ramp %s reported resolved; ranking %+v", metric, p.Name, got.Ranking)
			}
		}
		if d := got.Ranking[1].DiffToNext; d.Value != 0 || !(d.Lo < 0 && d.Hi > 0) {
			t.Errorf("%s: difference of the tied pair %+v: want 0 with an interval about it", metric, *d)
		}
	}
}

// TestRankOrderFree: the ranking does not depend on the order in which the
// ramps and their records are given, because every interval uses the same
// resamples.
func TestRankOrderFree(t *testing.T) {
	a := synthetic(100, 1, func(z1, z2 float64) (float64, float64) { return 0.9 + 0.01*z1, 0 })
	b := synthetic(100, 1, func(z1, z2 float64) (float64, float64) { return 0.895 + 0.01*z1 + 0.003*z2, 0 })
	one, err := Rank([]string{"a", "b"}, [][]Record{a, b}, "", Spec{}, 0.9, 4)
	if err != nil {
		t.Fatal(err)
	}
	rev := slices.Clone(b)
	slices.Reverse(rev)
	two, err := Rank([]string{"b", "a"}, [][]Record{rev, a}, "", Spec{}, 0.9, 4)
	if err != nil {
		t.Fatal(err)
	}
	j1, _ := json.Marshal(one)
	j2, _ := json.Marshal(two)
	if string(j1) != string(j2) {
		t.Errorf("ranking depends on input order:\n%s\n%s", j1, j2)
	}
	if one.Metric != MetricP05 {
		t.Errorf("default metric: got %q, want %q", one.Metric, MetricP05)
	}
}

func TestRankErrors(t *testing.T) {
	a := synthetic(10, 1, func(z1, z2 float64) (float64, float64) { return 0.9, 0 })
	short := a[:9]
	shifted := slices.Clone(a)
	shifted[3].Index = 42
	nan := slices.Clone(a)
	nan[2].Contrast = math.NaN()
	for _, tt := range []struct {
		name   string
		names  []string
		recs   [][]Record
		metric string
		spec   Spec
		conf   float64
		want   string
	}{
		{"metric", []string{"a"}, [][]Record{a}, "median", Spec{}, 0.95, `unknown ranking metric "median"`},
		{"yield without spec", []string{"a"}, [][]Record{a}, MetricYield, Spec{}, 0.95, "needs a spec"},
		{"confidence", []string{"a"}, [][]Record{a}, "", Spec{}, 1, "confidence 1"},
		{"counts", []string{"a", "b"}, [][]Record{a}, "", Spec{}, 0.95, "2 ramp names for 1 record sets"},
		{"duplicate", []string{"a", "a"}, [][]Record{a, a}, "", Spec{}, 0.95, `"a" is given twice`},
		{"empty", []string{"a", "b"}, [][]Record{a, nil}, "", Spec{}, 0.95, `"b" has no realisations`},
		{"lengths", []string{"a", "b"}, [][]Record{a, short}, "", Spec{}, 0.95, "has 10 realisations"},
		{"indices", []string{"a", "b"}, [][]Record{a, shifted}, "", Spec{}, 0.95, `where ramp "a" has 3`},
		{"nan", []string{"a", "b"}, [][]Record{a, nan}, "", Spec{}, 0.95, "NaN"},
	} {
		_, err := Rank(tt.names, tt.recs, tt.metric, tt.spec, tt.conf, 1)
		if err == nil || !strings.Contains(err.Error(), tt.want) {
			t.Errorf("%s: got error %v, want one containing %q", tt.name, err, tt.want)
		}
	}
}

// TestRankRealRamps ranks sin2 against the inverse-engineered ramp on the
// test ensemble (150 us ramps to l0 = 68, half a lap, static noise) on the
// same draws: at a ramp this short (0.65 trap periods) the shortcut keeps a
// contrast of about 0.64 where sin2 leaves 0.03 (nominal shots, measured
// when this test was written; sim's TestInverseBeatsSin2ShortRamps shows the
// same at l0 = 20), so inverse must win by about 0.6, resolved on the mean.
// On p05 the places cannot be settled from 12 realisations: no order
// statistic bounds a 5th percentile at 1 - 0.025/2 below 366
// (stats.MinSamplesLower(1, 0.05, 0.9875)), so both are unresolved.
func TestRankRealRamps(t *testing.T) {
	const samples = 12
	ns := []string{"sin2", "inverse"}
	recs := make([][]Record, len(ns))
	for k, shape := range ns {
		e := testEnsemble(t, samples, false)
		up, err := sim.NewShape(shape, 150e-6, 2000, e.Config.TrapRadS())
		if err != nil {
			t.Fatal(err)
		}
		if e.Config.Sequence, err = sim.NewSequence(up, 0.5); err != nil {
			t.Fatal(err)
		}
		r, err := NewRealiser(e)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := r.Run(context.Background(), 0, samples, 2, func(rec Record) error {
			recs[k] = append(recs[k], rec)
			return nil
		}); err != nil {
			t.Fatal(err)
		}
	}
	for _, metric := range []string{MetricP05, MetricMean} {
		got, err := Rank(ns, recs, metric, Spec{}, 0.95, 7)
		if err != nil {
			t.Fatal(err)
		}
		first, second := got.Ranking[0], got.Ranking[1]
		resolved := metric == MetricMean
		if first.Name != "inverse" || first.Resolved != resolved || second.Resolved != resolved {
			t.Errorf("%s: ranking %+v, want inverse first, both places resolved %v", metric, got.Ranking, resolved)
		}
		// Tolerance 0.1 absolute on the gain: the static errors move each
		// ramp's contrast by about 0.02 (testEnsemble's budget).
		if d := -second.DiffToBest.Value; math.Abs(d-0.6) > 0.1 {
			t.Errorf("%s: gain of inverse over sin2: got %v, want %v (tol 0.1)", metric, d, 0.6)
		}
	}
}

func ExampleRank() {
	// Two ramps on the same 200 draws (common random numbers): "smooth"
	// loses 0.01 of contrast to "fast" in every realisation.
	fast := synthetic(200, 1, func(z1, z2 float64) (float64, float64) { return 0.95 + 0.01*z1, 0 })
	smooth := synthetic(200, 1, func(z1, z2 float64) (float64, float64) { return 0.94 + 0.01*z1, 0 })
	r, err := Rank([]string{"smooth", "fast"}, [][]Record{smooth, fast}, MetricP05, Spec{}, 0.95, 1)
	if err != nil {
		panic(err)
	}
	for _, p := range r.Ranking {
		fmt.Printf("%d %-6s p05 %.4f  vs best %+.4f  resolved %v\n", p.Place, p.Name, p.Value, p.DiffToBest.Value, p.Resolved)
	}
	// Output:
	// 1 fast   p05 0.9322  vs best +0.0000  resolved true
	// 2 smooth p05 0.9222  vs best -0.0100  resolved true
}
