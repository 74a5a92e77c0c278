package design

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"rampart/mc"
)

// monotone is a synthetic search problem whose truth is known: at value x
// the contrast of a realisation is Normal(mu(x), sigma), with mu chosen so
// that the true 5th percentile is the non-decreasing step function
//
//	q05(x) = limit - 5 sigma       for x < edge - width,
//	q05(x) = limit - 1e-6 sigma    for edge - width <= x < edge,
//	q05(x) = limit + 3 sigma       for x >= edge,
//
// so the spec "p05 contrast at least limit" holds exactly for x >= edge,
// and every point the bisection tries in the band below the edge is on the
// brink of the null: the least favourable case for a false pass, where each
// such point wrongly passes with nearly its full level.
type monotone struct {
	limit, edge, width, sigma float64
	n                         int
	rng                       *rand.Rand
}

func (m *monotone) q05(x float64) float64 {
	switch {
	case x >= m.edge:
		return m.limit + 3*m.sigma
	case x >= m.edge-m.width:
		return m.limit - 1e-6*m.sigma
	}
	return m.limit - 5*m.sigma
}

// z05 is the standard normal 5th percentile, -1.6448536269514722
// (Abramowitz & Stegun 26.2.23 tables; scipy.stats.norm.ppf(0.05)).
const z05 = -1.6448536269514722

func (m *monotone) sample(_ context.Context, x float64) (Sample, error) {
	mu := m.q05(x) - z05*m.sigma
	recs := make([]mc.Record, m.n)
	for i := range recs {
		recs[i] = mc.Record{Index: i, Contrast: mu + m.sigma*m.rng.NormFloat64()}
	}
	return Sample{Records: recs, ScaleFactorS: 1, Seed: 1}, nil
}

// falsePassRate runs reps searches of the problem and returns the fraction
// that report a value where the spec does not in truth hold (below the
// edge), and the fraction that find a value at all.
func falsePassRate(t *testing.T, m *monotone, e Edge, reps int) (falsePass, found float64) {
	t.Helper()
	e.Sample = m.sample
	bad, ok := 0, 0
	for range reps {
		r, err := e.Find(context.Background())
		if err != nil {
			t.Fatal(err)
		}
		if r.Found {
			ok++
			if r.Value < m.edge {
				bad++
			}
		}
	}
	return float64(bad) / float64(reps), float64(ok) / float64(reps)
}

// TestEdgeCoverage is the seeded coverage simulation of Edge's confidence:
// on a monotone problem whose edge is known, the search as a whole must
// report a value where the spec fails at most 1 - confidence of the time,
// within three standard errors of the simulation, at small and large
// ensembles. Its power check: with the whole alpha spent at every point
// (no correction), the same simulation exceeds the nominal rate, so the
// correction is needed and the test can fail.
func TestEdgeCoverage(t *testing.T) {
	const confidence = 0.95
	for _, tc := range []struct {
		name string
		n    int
		reps int
	}{
		{"n=100", 100, 1500},
		{"n=1000", 1000, 400},
	} {
		t.Run(tc.name, func(t *testing.T) {
			m := &monotone{limit: 0.95, edge: 0.5, width: 0.3, sigma: 0.01, n: tc.n,
				rng: rand.New(rand.NewPCG(13, uint64(tc.n)))}
			e := Edge{Lo: 0.1, Hi: 1, Steps: 6,
				Requirements: mc.Requirements{Confidence: confidence, ContrastP05Min: m.limit}}
			rate, found := falsePassRate(t, m, e, tc.reps)
			alpha := 1 - confidence
			se := math.Sqrt(alpha * (1 - alpha) / float64(tc.reps))
			t.Logf("false pass %.4f (nominal %g, se %.4f), found %.3f", rate, alpha, se, found)
			if rate > alpha+3*se {
				t.Errorf("false-pass rate %.4f above nominal %g + 3 se (%.4f)", rate, alpha, se)
			}
			if found < 0.5 {
				t.Errorf("search found a value in %.3f of runs: the problem is too hard to test the rate", found)
			}
			// Power check: a search that forgets the correction (every
			// point at the full alpha: the search's confidence 1 - m alpha)
			// must show a false-pass rate above nominal, or this simulation
			// could not catch a missing correction.
			naive := e
			naive.Requirements.Confidence = 1 - alpha*float64(e.Evaluations())
			m.rng = rand.New(rand.NewPCG(14, uint64(tc.n)))
			naiveRate, _ := falsePassRate(t, m, naive, tc.reps)
			t.Logf("uncorrected: false pass %.4f", naiveRate)
			if naiveRate <= alpha {
				t.Errorf("uncorrected search: false-pass rate %.4f not above nominal %g: the simulation has no power", naiveRate, alpha)
			}
		})
	}
}

// TestEdgeBracket checks the bisection on a problem without noise: every
// realisation at x >= edge has contrast 1 and below it 0, so each verdict
// is certain and the bracket must hold the edge, (Hi - Lo) / 2^Steps wide
// (bisection, exact arithmetic), for both directions.
func TestEdgeBracket(t *testing.T) {
	const edge = 0.37
	certain := func(good func(x float64) bool) func(context.Context, float64) (Sample, error) {
		return func(_ context.Context, x float64) (Sample, error) {
			recs := make([]mc.Record, 200)
			for i := range recs {
				recs[i].Index = i
				if good(x) {
					recs[i].Contrast = 1
				}
			}
			return Sample{Records: recs, ScaleFactorS: 1, Seed: 1}, nil
		}
	}
	for _, tc := range []struct {
		name    string
		largest bool
		good    func(x float64) bool
	}{
		{"smallest", false, func(x float64) bool { return x >= edge }},
		{"largest", true, func(x float64) bool { return x <= edge }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			e := Edge{Lo: 0.1, Hi: 1, Steps: 6, Largest: tc.largest,
				Requirements: mc.Requirements{ContrastP05Min: 0.9}, Sample: certain(tc.good)}
			r, err := e.Find(context.Background())
			if err != nil {
				t.Fatal(err)
			}
			width := (e.Hi - e.Lo) / 64
			if !r.Found || r.Bracket[0] > edge || r.Bracket[1] < edge || math.Abs(r.Bracket[1]-r.Bracket[0]-width) > 1e-12 {
				t.Fatalf("found %v, bracket %v: want one %g wide around %g", r.Found, r.Bracket, width, edge)
			}
			if !tc.good(r.Value) || r.At.Verdict != mc.Pass || len(r.Evaluations) != e.Evaluations() {
				t.Errorf("value %g (verdict %v) after %d evaluations: want a passing value after %d", r.Value, r.At.Verdict, len(r.Evaluations), e.Evaluations())
			}
			if want := 1 - 0.05/8; math.Abs(r.At.LookConfidence-want) > 1e-12 {
				t.Errorf("point confidence %g, want 1 - 0.05/8 = %g (Bonferroni)", r.At.LookConfidence, want)
			}
		})
	}
	// The good end failing: nothing found, one evaluation.
	e := Edge{Lo: 0.1, Hi: 1, Steps: 6, Requirements: mc.Requirements{ContrastP05Min: 0.9},
		Sample: certain(func(float64) bool { return false })}
	if r, err := e.Find(context.Background()); err != nil || r.Found || len(r.Evaluations) != 1 {
		t.Errorf("nowhere passing: found %v after %d evaluations (err %v), want none after 1", r.Found, len(r.Evaluations), err)
	}
}
