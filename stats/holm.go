package stats

import (
	"fmt"
	"slices"
)

// Holm returns which of m hypotheses with p-values p Holm's step-down
// procedure rejects at family-wise level alpha: with the p-values in
// ascending order p_(1) <= ... <= p_(m), it rejects H_(1), ..., H_(j) for the
// largest j such that
//
//	p_(i) <= alpha / (m - i + 1)   for every i <= j,
//
// and none if p_(1) > alpha/m. The probability of rejecting any true
// hypothesis is at most alpha whatever the dependence between the tests.
// A NaN p-value is never rejected and stops the procedure at its place.
// Holm panics if alpha is outside (0, 1).
//
// References:
//   - S. Holm, "A simple sequentially rejective multiple test procedure",
//     Scand. J. Stat. 6, 65 (1979).
func Holm(p []float64, alpha float64) []bool {
	if !(alpha > 0 && alpha < 1) {
		panic(fmt.Sprintf("stats: Holm at level %g outside (0, 1)", alpha))
	}
	m := len(p)
	order := make([]int, m)
	for i := range order {
		order[i] = i
	}
	// NaN sorts last, so it ends the step-down.
	slices.SortStableFunc(order, func(a, b int) int {
		pa, pb := p[a], p[b]
		switch {
		case pa != pa:
			if pb != pb {
				return 0
			}
			return 1
		case pb != pb, pa < pb:
			return -1
		case pa > pb:
			return 1
		}
		return 0
	})
	reject := make([]bool, m)
	for i, k := range order {
		if !(p[k] <= alpha/float64(m-i)) {
			break
		}
		reject[k] = true
	}
	return reject
}
