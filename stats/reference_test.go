package stats

import (
	"testing"

	"rampart/internal/reftest"
)

// statsReference is testdata/reference/stats_reference.json, written by
// testdata/reference/stats_reference.py (Python 3.11.2, NumPy 1.24.2, SciPy
// 1.10.1 from Debian 12; the file records the versions it ran on).
type statsReference struct {
	Versions       map[string]string
	ClopperPearson []struct {
		K, N                     int
		Confidence, Lower, Upper float64
	} `json:"clopper_pearson"`
	ZeroFailureUpper []struct {
		N                 int
		Confidence, Upper float64
		BetaPPF           float64 `json:"beta_ppf"`
	} `json:"zero_failure_upper"`
	Quantiles []struct {
		Data, P, Linear []float64
		Mean            float64
		StdDDOF1        *float64 `json:"std_ddof1"`
	}
	PercentileCoverage []struct {
		N                    int
		Confidence, Coverage float64
	} `json:"percentile_coverage_normal_mean"`
}

// reference returns the SciPy reference numbers
// (testdata/reference/stats_reference.py).
func reference(t testing.TB) *statsReference {
	t.Helper()
	var r statsReference
	reftest.JSON(t, "stats_reference.json", &r)
	return &r
}
