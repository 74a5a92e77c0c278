package mc

import (
	"fmt"
	"math"
	"testing"

	"rampart/stats"
)

// fixedPoints is a one-dimensional sampler returning given values.
type fixedPoints []float64

func (f fixedPoints) Dim() int                   { return 1 }
func (f fixedPoints) Len() int                   { return len(f) }
func (f fixedPoints) Point(i int, dst []float64) { dst[0] = f[i] }

func TestNormalQuantiles(t *testing.T) {
	// scipy.stats.norm.ppf (SciPy 1.10.1, testdata/reference/stats_reference.json);
	// relative tolerance 1e-13, about 500 ulp, for the Cephes ndtri algorithm
	// gonum uses against SciPy's.
	const tol = 1e-13
	ref := reference(t).NormalQuantile
	u := make(fixedPoints, len(ref))
	for k, r := range ref {
		u[k] = r.P
	}
	s := Normal(u)
	x := make([]float64, 1)
	for k, r := range ref {
		s.Point(k, x)
		if math.Abs(x[0]-r.X) > tol*math.Abs(r.X) {
			t.Errorf("Phi^-1(%v): got %v, want %v (rel tol %g)", r.P, x[0], r.X, tol)
		}
	}
}

func TestNormalClampsZero(t *testing.T) {
	// Phi^-1(2^-53) = -8.2095 (scipy.stats.norm.ppf(2**-53), SciPy 1.10.1;
	// absolute tolerance 1e-4).
	x := make([]float64, 1)
	Normal(fixedPoints{0}).Point(0, x)
	if math.Abs(x[0]-(-8.2095)) > 1e-4 {
		t.Errorf("Normal of u = 0: got %v, want -8.2095 (tol 1e-4)", x[0])
	}
}

func TestSamplersMoments(t *testing.T) {
	// N = 4096 points in 3 dimensions. Uniform coordinates: mean 1/2 with
	// standard error sqrt(1/12/N) = 0.0045 and variance 1/12 with standard
	// error sqrt(1/180/N) = 0.0012 for independent points (stratified and
	// low-discrepancy points do better). Normal coordinates: mean 0, standard
	// error 1/sqrt(N) = 0.016; variance 1, standard error sqrt(2/N) = 0.022.
	// Tolerance 4 standard errors.
	const n, d = 4096, 3
	for _, c := range []struct {
		name string
		s    Sampler
	}{
		{"random", NewRandom(d, n, 11)},
		{"lhs", NewLatinHypercube(d, n, 11)},
		{"sobol", NewSobol(d, n, 11, Unscrambled)},
		{"sobol-owen", NewSobol(d, n, 11, Owen)},
		{"sobol-shift", NewSobol(d, n, 11, DigitalShift)},
	} {
		for _, normal := range []bool{false, true} {
			s := c.s
			mean, variance := 0.5, 1.0/12
			seMean, seVar := math.Sqrt(1.0/12/n), math.Sqrt(1.0/180/n)
			if normal {
				if c.name == "sobol" {
					continue // the origin maps to the clamp; see Normal
				}
				s = Normal(s)
				mean, variance = 0, 1
				seMean, seVar = 1/math.Sqrt(n), math.Sqrt(2.0/n)
			}
			cols := columns(s)
			for k, col := range cols {
				if !normal {
					for i, u := range col {
						if !(u >= 0 && u < 1) {
							t.Fatalf("%s point %d coordinate %d: %v outside [0, 1)", c.name, i, k, u)
						}
					}
				}
				if m := stats.Mean(col); math.Abs(m-mean) > 4*seMean {
					t.Errorf("%s normal=%v dim %d mean: got %v, want %v (tol %g)", c.name, normal, k, m, mean, 4*seMean)
				}
				if v := stats.Variance(col); math.Abs(v-variance) > 4*seVar {
					t.Errorf("%s normal=%v dim %d variance: got %v, want %v (tol %g)", c.name, normal, k, v, variance, 4*seVar)
				}
			}
		}
	}
}

func TestSamplersReproducibleInAnyOrder(t *testing.T) {
	// Exact equality: points computed backwards by a fresh sampler built from
	// the same (dim, n, seed) equal points computed forwards.
	const n, d = 300, 5
	makers := map[string]func() Sampler{
		"random":      func() Sampler { return NewRandom(d, n, 99) },
		"lhs":         func() Sampler { return NewLatinHypercube(d, n, 99) },
		"sobol-owen":  func() Sampler { return NewSobol(d, n, 99, Owen) },
		"sobol-shift": func() Sampler { return NewSobol(d, n, 99, DigitalShift) },
	}
	for name, build := range makers {
		fwd := columns(build())
		s := build()
		x := []float64{0, 0, 0, 0, 0}
		for i := n - 1; i >= 0; i-- {
			s.Point(i, x)
			for k := range x {
				if x[k] != fwd[k][i] {
					t.Fatalf("%s point %d coordinate %d: got %v backwards, %v forwards", name, i, k, x[k], fwd[k][i])
				}
			}
		}
		other := columns(NewRandom(d, n, 100))
		if name == "random" && other[0][0] == fwd[0][0] {
			t.Errorf("random: seeds 99 and 100 give the same first coordinate %v", fwd[0][0])
		}
	}
}

func TestSamplerPanics(t *testing.T) {
	for _, c := range []struct {
		name string
		f    func()
	}{
		{"index past end", func() { NewRandom(2, 3, 0).Point(3, make([]float64, 2)) }},
		{"negative index", func() { NewLatinHypercube(2, 3, 0).Point(-1, make([]float64, 2)) }},
		{"short buffer", func() { NewSobol(2, 3, 0, Owen).Point(0, make([]float64, 1)) }},
		{"zero dimension", func() { NewRandom(0, 3, 0) }},
		{"zero length", func() { NewLatinHypercube(2, 0, 0) }},
		{"too many Sobol' dimensions", func() { NewSobol(SobolMaxDim+1, 4, 0, Owen) }},
		{"unknown scrambling", func() { NewSobol(2, 4, 0, Scrambling(7)) }},
	} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("%s: did not panic", c.name)
				}
			}()
			c.f()
		}()
	}
}

// columns returns the points of s as one slice per dimension.
func columns(s Sampler) [][]float64 {
	cols := make([][]float64, s.Dim())
	for k := range cols {
		cols[k] = make([]float64, s.Len())
	}
	x := make([]float64, s.Dim())
	for i := range s.Len() {
		s.Point(i, x)
		for k := range x {
			cols[k][i] = x[k]
		}
	}
	return cols
}

func BenchmarkSamplerPoint(b *testing.B) {
	const n = 1 << 16
	for _, d := range []int{4, 32} {
		for _, c := range []struct {
			name string
			s    Sampler
		}{
			{"random", NewRandom(d, n, 1)},
			{"lhs", NewLatinHypercube(d, n, 1)},
			{"sobol", NewSobol(d, n, 1, Unscrambled)},
			{"sobol-shift", NewSobol(d, n, 1, DigitalShift)},
			{"sobol-owen", NewSobol(d, n, 1, Owen)},
			{"sobol-owen-normal", Normal(NewSobol(d, n, 1, Owen))},
		} {
			b.Run(fmt.Sprintf("%s/d=%d", c.name, d), func(b *testing.B) {
				x := make([]float64, d)
				i := 0
				for b.Loop() {
					c.s.Point(i, x)
					i = (i + 1) % n
				}
			})
		}
	}
}
