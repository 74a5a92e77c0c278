package mc

import (
	"encoding/json"
	"os"
	"path/filepath"
	"sync"
	"testing"
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

var loadReference = sync.OnceValues(func() (*statsReference, error) {
	b, err := os.ReadFile(filepath.Join("..", "testdata", "reference", "stats_reference.json"))
	if err != nil {
		return nil, err
	}
	var r statsReference
	if err := json.Unmarshal(b, &r); err != nil {
		return nil, err
	}
	return &r, nil
})

func reference(t testing.TB) *statsReference {
	t.Helper()
	r, err := loadReference()
	if err != nil {
		t.Fatalf("read SciPy reference numbers: %v", err)
	}
	return r
}
