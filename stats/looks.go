package stats

import (
	"fmt"
	"math"
)

// LookAlpha returns the level alpha_k spent at look k = 1, 2, ... of a
// sequence of verdicts on a growing ensemble (qualify, top up, qualify
// again), when the whole sequence may claim level alpha:
//
//	alpha_k = alpha 6 / (pi^2 k^2),   sum_{k>=1} alpha_k = alpha,
//
// the sum being Euler's sum_{k>=1} 1/k^2 = pi^2/6. By the union bound the
// probability that any look wrongly passes (or wrongly fails) is at most
// sum_k alpha_k <= alpha, however many looks are taken, however the next
// ensemble size is chosen, and whatever the dependence between the looks;
// no maximum number of looks need be fixed in advance. The first look
// spends 0.608 alpha (at 95 %, a 96.96 % one-sided bound), the second
// 0.152 alpha, the fourth 0.038 alpha. This is an alpha-spending plan in the
// sense of Lan and DeMets with spending function
// alpha(k) = alpha (6/pi^2) sum_{j<=k} 1/j^2 of the look number, made
// conservative by the union bound in place of the joint distribution of the
// looks. LookAlpha panics if alpha is outside (0, 1) or look < 1.
//
// References:
//   - K. K. G. Lan and D. L. DeMets, "Discrete sequential boundaries for
//     clinical trials", Biometrika 70, 659 (1983).
func LookAlpha(alpha float64, look int) float64 {
	if !(alpha > 0 && alpha < 1) || look < 1 {
		panic(fmt.Sprintf("stats: look %d at level %g: want look >= 1 and a level in (0, 1)", look, alpha))
	}
	k := float64(look)
	return alpha * 6 / (math.Pi * math.Pi * k * k)
}
