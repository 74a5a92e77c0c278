// Package stats holds the generic statistics behind rampart's summaries and
// decisions: sample moments and quantiles, bootstrap intervals, exact
// binomial and order-statistic bounds, multiple-testing corrections and
// circular statistics. It knows nothing of the simulation and never imports
// it.
//
// Confidence levels are fractions in (0, 1), such as 0.95. Programmer misuse
// (an empty sample, a confidence outside (0, 1)) panics with a "stats: "
// prefix.
package stats
