// Package stats holds the generic statistics behind rampart's summaries and
// decisions. It knows nothing of the simulation and never imports it; the
// model document (docs/model.md, section Statistics) says where each method
// is used.
//
// # Samples
//
// [Mean], [Variance], [StdDev] and [Quantile] (Hyndman and Fan type 7,
// NumPy's default) summarise a sample; [CircularStats] summarises angles by
// their mean direction, mean resultant length R and circular standard
// deviation sqrt(-2 ln R) (Fisher 1993; Mardia and Jupp 2000), which a phase
// near +-pi needs.
//
// # Quantile bounds
//
// The bound on a quantile xi_p is an order statistic X(r) with r from the
// binomial distribution: X(r) <= xi_p exactly when at least r observations
// lie at or below xi_p, so P(X(r) <= xi_p) = P(Bin(n, p) >= r) for every
// continuous distribution, and at least that for any other ([LowerRank],
// [UpperRank], [QuantileLower], [QuantileUpper], [QuantileInterval]; Hahn,
// Meeker and Escobar, Statistical Intervals, 2nd ed. (2017), ch. 5; David and
// Nagaraja, Order Statistics (2003), sec. 7.1). They are the duals of
// Clopper-Pearson's binomial bounds, and exact: no bootstrap, no model of
// the distribution. A bound exists only from a certain sample size on
// ([MinSamplesLower]: 59 for a 5th or 95th percentile at 95 %, 93 with the
// second order statistic, 299 for the 1st; Wilks, Ann. Math. Stat. 12, 91
// (1941)); below it the functions say so rather than return a bound that
// does not hold. [QuantileAtLeast] and [QuantileAtMost] are the matching
// exact tests against a limit.
//
// # Means and bootstrap intervals
//
// [MeanBootstrapT] is the studentized bootstrap (bootstrap-t) of a mean
// (Hall, Ann. Stat. 16, 927 (1988)), whose one-sided coverage error is
// O(1/n) where the percentile bootstrap's ([Bootstrap], [PairedBootstrap])
// is O(1/sqrt(n)); it is what a one-sided verdict on a skewed output needs.
// It was chosen over BCa (Efron 1987) by measured coverage on skewed data
// at n = 30-60 (see its documentation). [Bootstrap] and [BootstrapReplicates] remain for
// statistics without a better interval (a standard deviation, Sobol'
// indices).
//
// [ZeroMixture] ([MeanZeroMixture], [NewZeroMixture]) bounds the mean of a
// non-negative output with a point mass at exactly 0 (a contrast with lost
// shots): Clopper-Pearson on the fraction of zeros times the bootstrap-t
// (or [SkewT]) of the rest, each at alpha/2. The bootstrap-t of all values
// collapses there, a resample without a zero having a tiny standard error.
//
// # Proportions
//
// A yield has the exact binomial interval of Clopper and Pearson
// ([ClopperPearson], [ClopperPearsonLower], [ClopperPearsonUpper]); with no
// failures [ZeroFailureUpper] and [RuleOfThree] bound the failure rate.
// [BinomialCDF] and [BinomialSurvival] give the tails behind the exact tests.
//
// # Many tests, many looks
//
// [Holm] corrects a family of tests by Holm's step-down procedure (Scand. J.
// Stat. 6, 65 (1979)), so that "some criterion fails" holds at the stated
// level whatever the dependence. [LookAlpha] spends a level over an
// unbounded sequence of looks at a growing sample, alpha_k = alpha
// 6/(pi^2 k^2), whose sum is alpha (an alpha-spending plan in the sense of Lan
// and DeMets, Biometrika 70, 659 (1983), bounded by the union bound): topping
// up an ensemble and deciding again does not inflate the error rate.
//
// # Planning
//
// [AdditionalSamples] and [AdditionalTrials] estimate how many more
// observations would take an interval clear of a threshold.
//
// Confidence levels are fractions in (0, 1), such as 0.95. Programmer misuse
// (an empty sample, a confidence outside (0, 1)) panics with a "stats: "
// prefix.
package stats
