package sim

import (
	"math"
	"testing"
)

// TestLowestBands checks the eigenvalue-only QL plus inverse iteration path
// against the full implicit QL eigensolver (LAPACK dsteqr, gonum): the
// eigenvalues of every band and the vectors of the lowest bands agree to
// round-off, up to sign, on deep, shallow and moving lattices.
func TestLowestBands(t *testing.T) {
	for _, tc := range []struct {
		depthHz, w float64
		grid       int
	}{
		{20e3, 0, 400},
		{20e3, 500, 440},
		{2e3, 0.3, 240},
		{80e3, -3000, 800},
	} {
		c := benchConfig(t, 1)
		b := mustBasis(t, c.Ring.Sites, tc.grid)
		rot, v0 := c.Ring.rotationalRate(), 2*math.Pi*tc.depthHz
		full := diagonalise(b, rot, tc.w, v0)
		const count = 5
		low := lowestBands(b, rot, tc.w, v0, count)
		k := b.Block
		for cl := range b.Sites {
			for n := range k {
				if d := math.Abs(low.vals[cl][n] - full.vals[cl][n]); d > 1e-9*math.Abs(full.vals[cl][k-1]) {
					t.Errorf("V0 %g Hz, w %g: class %d band %d: eigenvalue %.12g, dsteqr %.12g", tc.depthHz, tc.w, cl, n, low.vals[cl][n], full.vals[cl][n])
				}
			}
			for n := range count {
				var dot float64
				for j := range k {
					dot += low.vecs[cl][j*k+n] * full.vecs[cl][j*k+n]
				}
				if d := 1 - math.Abs(dot); d > 1e-12 {
					t.Errorf("V0 %g Hz, w %g: class %d band %d: |<low|full>| = 1 - %.2g, want 1 (tol 1e-12)", tc.depthHz, tc.w, cl, n, d)
				}
			}
		}
	}
}
