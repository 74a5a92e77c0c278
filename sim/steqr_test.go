package sim

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/lapack"
	"gonum.org/v1/gonum/lapack/gonum"
)

// TestSteqrMatchesGonum checks the transposed transcription against the
// routine it transcribes, gonum's Dsteqr (compz = EVTridiag), bit for bit:
// random tridiagonal matrices of sizes 1 to 40 (with repeated and zero
// off-diagonals, which split the matrix), and the class blocks of the
// benchmark ring moving at 0 and 500 rad/s.
func TestSteqrMatchesGonum(t *testing.T) {
	type tri struct{ d, e []float64 }
	var cases []tri
	rng := rand.New(rand.NewPCG(5, 6))
	for n := 1; n <= 40; n++ {
		d, e := make([]float64, n), make([]float64, n)
		for i := range d {
			d[i] = rng.NormFloat64() * 1e4
			switch rng.IntN(6) {
			case 0:
				e[i] = 0
			case 1:
				e[i] = -0.25
			default:
				e[i] = rng.NormFloat64()
			}
		}
		cases = append(cases, tri{d, e})
	}
	c := issueConfig(t, 1)
	b, err := NewBasis(20, 360)
	if err != nil {
		t.Fatal(err)
	}
	for _, w := range []float64{0, 500, -500} {
		for cl := range b.Sites {
			d, e := make([]float64, b.Block), make([]float64, b.Block)
			blockHamiltonian(b, cl, c.Ring.rotationalRate(), w, 2*math.Pi*c.DepthHz, d, e)
			cases = append(cases, tri{d, e})
		}
	}
	var impl gonum.Implementation
	for i, tc := range cases {
		n := len(tc.d)
		d1, e1 := append([]float64(nil), tc.d...), append([]float64(nil), tc.e...)
		d2, e2 := append([]float64(nil), tc.d...), append([]float64(nil), tc.e...)
		z := make([]float64, n*n)
		zt := make([]float64, n*n)
		work := make([]float64, max(1, 2*n-2))
		ok1 := impl.Dsteqr(lapack.EVTridiag, n, d1, e1, z, n, work)
		ok2 := steqr(n, d2, e2, zt, make([]float64, max(1, 2*n-2)))
		if ok1 != ok2 {
			t.Fatalf("case %d: converged %v, gonum %v", i, ok2, ok1)
		}
		for k := range n {
			if math.Float64bits(d1[k]) != math.Float64bits(d2[k]) {
				t.Fatalf("case %d (n=%d): eigenvalue %d is %v, gonum's %v (bit for bit)", i, n, k, d2[k], d1[k])
			}
			for j := range n {
				if math.Float64bits(z[j*n+k]) != math.Float64bits(zt[k*n+j]) {
					t.Fatalf("case %d (n=%d): vector %d component %d is %v, gonum's %v (bit for bit)", i, n, k, j, zt[k*n+j], z[j*n+k])
				}
			}
		}
	}
}

// TestDlartgMatchesGonum checks the inlined rotation against gonum's
// Dlartg bit for bit, on ordinary, zero, tiny and huge arguments (the
// scaled branch).
func TestDlartgMatchesGonum(t *testing.T) {
	var impl gonum.Implementation
	rng := rand.New(rand.NewPCG(7, 8))
	vals := []float64{0, 1, -1, 0x1p-1022, -0x1p-1000, 0x1p-600, 1e300, -1e308, 0x1p511, 3.5, -2.25e-5}
	for range 200 {
		vals = append(vals, rng.NormFloat64()*math.Pow(10, float64(rng.IntN(600)-300)))
	}
	for _, f := range vals {
		for _, g := range vals {
			c1, s1, r1 := impl.Dlartg(f, g)
			c2, s2, r2 := dlartg(f, g)
			if math.Float64bits(c1) != math.Float64bits(c2) || math.Float64bits(s1) != math.Float64bits(s2) || math.Float64bits(r1) != math.Float64bits(r2) {
				t.Fatalf("dlartg(%v, %v) = %v, %v, %v, gonum %v, %v, %v (bit for bit)", f, g, c2, s2, r2, c1, s1, r1)
			}
		}
	}
}
