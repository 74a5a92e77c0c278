package present

import (
	"slices"
	"testing"

	"rampart/mc"
)

// TestRankingGridContext checks that the ranking table's context columns
// leave out the one the metric already shows: ranked by the mean contrast,
// the table has one "Mean contrast" column, not two; by |bias| p95, one
// such column in rad.
func TestRankingGridContext(t *testing.T) {
	for _, c := range []struct {
		metric, column string
	}{
		{mc.MetricMean, "Mean contrast"},
		{mc.MetricBiasSpread, "|bias| p95 (rad)"},
		{mc.MetricP05, "Mean contrast"},
	} {
		rep := RankReport{Ranking: mc.Ranking{Metric: c.metric, Confidence: 0.95,
			Ranking: []mc.Place{{Name: "a", Place: 1}}}, Ramps: []RampReport{{Name: "a"}}}
		g := RankingGrid(rep)
		if n := countOf(g.header, c.column); n != 1 {
			t.Errorf("metric %s: %d columns %q in %v, want 1", c.metric, n, c.column, g.header)
		}
		if len(g.rows[0]) != len(g.header) {
			t.Errorf("metric %s: a row of %d cells under %d columns", c.metric, len(g.rows[0]), len(g.header))
		}
	}
}

func countOf(xs []string, x string) int {
	n := 0
	for _, y := range xs {
		if y == x {
			n++
		}
	}
	return n
}

// TestRankingGridLost checks the lost-shots column: present, with each
// ramp's count and share (17 of 3000 is 0.57 %), when a ramp lost shots,
// with the note that explains it; absent when none did.
func TestRankingGridLost(t *testing.T) {
	rep := RankReport{Ranking: mc.Ranking{Metric: mc.MetricP05, Confidence: 0.95,
		Ranking: []mc.Place{{Name: "a", Place: 1}, {Name: "b", Place: 2}}},
		Ramps: []RampReport{{Name: "a", Summary: mc.Summary{Samples: 3000, Lost: 17}}, {Name: "b", Summary: mc.Summary{Samples: 3000}}}}
	g := RankingGrid(rep)
	col := slices.Index(g.header, "Lost shots")
	if col < 0 {
		t.Fatalf("no lost-shots column in %v", g.header)
	}
	if a, b := g.rows[0][col], g.rows[1][col]; a != "17 (0.57 %)" || b != "0 (0 %)" {
		t.Errorf("lost cells %q, %q; want \"17 (0.57 %%)\" and \"0 (0 %%)\"", a, b)
	}
	if !slices.Contains(RankingNotes(rep), lostNote) {
		t.Errorf("notes %q lack the lost-shots note", RankingNotes(rep))
	}
	rep.Ramps[0].Summary.Lost = 0
	if g := RankingGrid(rep); slices.Contains(g.header, "Lost shots") || slices.Contains(RankingNotes(rep), lostNote) {
		t.Errorf("no shot lost, yet the table has the column or the note: %v", g.header)
	}
}
