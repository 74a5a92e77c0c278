package mc

import (
	"fmt"
	"math/rand/v2"

	"rampart/stats"
)

// SaltelliDesign is the set of points at which to evaluate a model of d
// inputs to estimate its Sobol' sensitivity indices: from a base design of n
// points in dimension 2d, the matrices A (the first d coordinates of each base
// point) and B (the last d), and for each input k the matrix A_B^(k), A with
// column k taken from B. The design has n (d+2) points, in blocks of n:
//
//	points [0, n)               rows of A
//	points [n, 2n)              rows of B
//	points [(2+k) n, (3+k) n)   rows of A_B^(k), k = 0..d-1
//
// and outputs y are expected in the same order. A SaltelliDesign is itself a
// [Sampler] of dimension d, so each evaluation can be one realisation of an
// ensemble. Build it on a scrambled [Sobol] base for the smallest error, or on
// [Normal] of one for normal inputs.
//
// References:
//   - A. Saltelli, P. Annoni, I. Azzini, F. Campolongo, M. Ratto and
//     S. Tarantola, "Variance based sensitivity analysis of model output. Design
//     and estimator for the total sensitivity index", Comput. Phys. Commun.
//     181, 259 (2010).
type SaltelliDesign struct {
	base   Sampler
	dim, n int
}

// NewSaltelliDesign returns the design built on base, whose dimension must be
// even (2d for d inputs).
func NewSaltelliDesign(base Sampler) *SaltelliDesign {
	if base.Dim()%2 != 0 {
		panic(fmt.Sprintf("mc: Saltelli base design has odd dimension %d, want 2d", base.Dim()))
	}
	return &SaltelliDesign{base: base, dim: base.Dim() / 2, n: base.Len()}
}

// Dim returns d, the number of model inputs.
func (s *SaltelliDesign) Dim() int { return s.dim }

// Len returns n (d+2), the number of model evaluations.
func (s *SaltelliDesign) Len() int { return s.n * (s.dim + 2) }

// BaseLen returns n, the number of rows of A and B.
func (s *SaltelliDesign) BaseLen() int { return s.n }

// Point writes evaluation point j into dst.
func (s *SaltelliDesign) Point(j int, dst []float64) {
	checkPoint(j, s.Len(), s.dim, dst)
	buf := make([]float64, 2*s.dim)
	block, row := j/s.n, j%s.n
	s.base.Point(row, buf)
	switch block {
	case 0:
		copy(dst, buf[:s.dim])
	case 1:
		copy(dst, buf[s.dim:])
	default:
		k := block - 2
		copy(dst, buf[:s.dim])
		dst[k] = buf[s.dim+k]
	}
}

// Sensitivity holds first-order and total Sobol' indices of a model output,
// one per input, with bootstrap intervals.
type Sensitivity struct {
	First    []stats.Estimate // S_k, the share of variance due to input k alone
	Total    []stats.Estimate // S_Tk, the share due to input k with all its interactions
	Variance float64          // V, the variance of the output
}

// SobolIndices estimates the first-order and total Sobol' indices from the
// outputs y of the model at the points of design, in design order. With
// f_A, f_B and f_ABk the outputs at the rows of A, B and A_B^(k), the
// estimators are Saltelli's for S_k and Jansen's for S_Tk (Saltelli et al.
// 2010, Table 2, (b) and (f)):
//
//	V    = variance of the 2n outputs f_A and f_B, with mean mu,
//	S_k  = (1/n) sum_j (f_B_j - mu) (f_ABk_j - f_A_j) / V,
//	S_Tk = (1/(2n)) sum_j (f_A_j - f_ABk_j)^2 / V.
//
// Centring f_B by mu leaves the estimator's expectation unchanged (f_ABk and
// f_A have the same mean) and reduces its variance when the output mean is
// large. Intervals are bootstrap percentile intervals from resamples resamples
// of the n rows (the same rows in every block), at the given confidence, drawn
// with rng; they assume independent rows and so are conservative on a
// scrambled Sobol' base, whose error is smaller than that of independent
// points. Estimates are not clipped to [0, 1]: small negative first-order
// values are sampling error on an index near zero.
//
// SobolIndices panics if len(y) != design.Len().
//
// References:
//   - A. Saltelli et al., Comput. Phys. Commun. 181, 259 (2010).
//   - M. J. W. Jansen, "Analysis of variance designs for model output",
//     Comput. Phys. Commun. 117, 35 (1999).
//   - I. M. Sobol', "Sensitivity estimates for nonlinear mathematical models",
//     Math. Model. Comput. Exp. 1, 407 (1993).
func SobolIndices(design *SaltelliDesign, y []float64, resamples int, confidence float64, rng *rand.Rand) Sensitivity {
	if len(y) != design.Len() {
		panic(fmt.Sprintf("mc: %d outputs for a Saltelli design of %d points", len(y), design.Len()))
	}
	if resamples < 1 || rng == nil || !(confidence > 0 && confidence < 1) {
		panic(fmt.Sprintf("mc: SobolIndices with %d resamples, confidence %g and random source %v: want at least one resample, a confidence in (0, 1) and a source", resamples, confidence, rng))
	}
	n, d := design.n, design.dim
	all := make([]int, n)
	for j := range all {
		all[j] = j
	}
	v, first, total := saltelli(y, n, d, all)
	s := Sensitivity{First: make([]stats.Estimate, d), Total: make([]stats.Estimate, d), Variance: v}
	reps := make([][]float64, 2*d)
	for k := range reps {
		reps[k] = make([]float64, resamples)
	}
	b := 0
	stats.BootstrapReplicates(n, resamples, rng, func(idx []int) float64 {
		_, f, t := saltelli(y, n, d, idx)
		for k := range d {
			reps[k][b], reps[d+k][b] = f[k], t[k]
		}
		b++
		return 0
	})
	for k := range d {
		lo, hi := stats.PercentileInterval(reps[k], confidence)
		s.First[k] = stats.Estimate{Value: first[k], Lo: lo, Hi: hi, Confidence: confidence}
		lo, hi = stats.PercentileInterval(reps[d+k], confidence)
		s.Total[k] = stats.Estimate{Value: total[k], Lo: lo, Hi: hi, Confidence: confidence}
	}
	return s
}

// SobolIndicesOf evaluates f at every point of design, in order, and returns
// SobolIndices of the outputs. f is called with a scratch slice it may modify.
func SobolIndicesOf(f func(x []float64) float64, design *SaltelliDesign, resamples int, confidence float64, rng *rand.Rand) Sensitivity {
	y := make([]float64, design.Len())
	x := make([]float64, design.Dim())
	for j := range y {
		design.Point(j, x)
		y[j] = f(x)
	}
	return SobolIndices(design, y, resamples, confidence, rng)
}

// saltelli evaluates the estimators of SobolIndices on the rows idx.
func saltelli(y []float64, n, d int, idx []int) (v float64, first, total []float64) {
	fA, fB := y[:n], y[n:2*n]
	var mu float64
	for _, j := range idx {
		mu += fA[j] + fB[j]
	}
	m := float64(len(idx))
	mu /= 2 * m
	for _, j := range idx {
		a, b := fA[j]-mu, fB[j]-mu
		v += a*a + b*b
	}
	v /= 2*m - 1
	first, total = make([]float64, d), make([]float64, d)
	for k := range d {
		fAB := y[(2+k)*n : (3+k)*n]
		var sf, st float64
		for _, j := range idx {
			diff := fAB[j] - fA[j]
			sf += (fB[j] - mu) * diff
			st += diff * diff
		}
		first[k] = sf / m / v
		total[k] = st / (2 * m) / v
	}
	return v, first, total
}
