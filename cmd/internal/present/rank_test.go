package present

import (
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
