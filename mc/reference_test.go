package mc

import (
	"testing"

	"rampart/internal/reftest"
)

// statsReference is testdata/reference/stats_reference.json, written by
// testdata/reference/stats_reference.py (Python 3.11.2, NumPy 1.24.2, SciPy
// 1.10.1 from Debian 12; the file records the versions it ran on).
type statsReference struct {
	Versions       map[string]string
	NormalQuantile []struct {
		P, X float64
	} `json:"normal_quantile"`
	SobolUnscrambled []struct {
		Dim, Start int
		Points     [][]float64
	} `json:"sobol_unscrambled"`
	Ishigami struct {
		A, B, Variance float64
		First, Total   []float64
	}
}

// reference returns the SciPy reference numbers
// (testdata/reference/stats_reference.py).
func reference(t testing.TB) *statsReference {
	t.Helper()
	var r statsReference
	reftest.JSON(t, "stats_reference.json", &r)
	return &r
}
