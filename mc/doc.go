// Package mc runs Monte Carlo ensembles of the interferometer simulation and
// turns them into statistics and decisions.
//
// # Sampling
//
// An ensemble is a set of realisations i = 0, 1, ..., n-1. Everything random in
// realisation i derives from the pair (seed, i) alone, through [Stream] and
// [Substream], so that realisation i is the same whatever the number of workers,
// the order in which realisations complete, or a resume after an interruption.
// Static parameters (a depth error, a clock-rate error, a temperature) are drawn
// as points of the unit hypercube [0,1)^d by a [Sampler]: independent
// pseudo-random points ([NewRandom]), a Latin hypercube ([NewLatinHypercube]) or
// a Sobol' low-discrepancy sequence ([NewSobol]), each of which gives point i
// without computing the others. [Normal] maps a sampler's points to standard
// normal variates by the inverse normal distribution function.
//
// # Perturbation sources
//
// [Sources] is the one table of perturbation sources: for each its key, its
// meaning, the scenario key that sets it, its lab unit and scale, its kind
// (a [Static] draw per shot, or a noise [Process] during the shot), its
// field of [Budget], how a shot applies it, its reference amplitude and
// search range. Sampling (one coordinate per drawn input: [StaticDim]),
// [Budget.Scaled], the tolerance search's axes and [SourceAmplitude], the
// sensitivity design's inputs and the tables and budget lines of the
// commands all iterate over it (docs/model.md, Perturbations).
//
// # Ensembles
//
// Realisation i of an ensemble takes its static parameters from point i of the
// sampler and each noise series from its own named substream of (seed, i), so
// adding a noise source, or switching one off, leaves the draws of the others
// unchanged. Two ramps run with the same seed see the same static errors and
// the same noise (common random numbers), so their paired differences have
// much smaller errors than their separate estimates.
//
// # Statistics
//
// Per realisation the ensemble yields a contrast C_i, a bias b_i and an overlap
// z_i. The generic statistics live in package stats, which never imports
// sim: moments and quantiles, exact order-statistic bounds on quantiles,
// the bootstrap-t of a mean, Clopper-Pearson bounds on a yield, Holm's
// correction, alpha spending over looks and circular statistics. Here
// [Histogram] counts fixed bins and [SobolIndices] apportions the variance
// of an output among the static parameters (first-order and total Sobol'
// indices).
//
// # Running
//
// [NewRealiser] prepares an [Ensemble] (a configuration, a [Budget], a sample
// count, a seed and a sampler); [Realiser.Run] realises a range of indices on
// a pool of workers and emits the [Record]s in index order, cancellably. A
// [Store] streams them to a directory as they complete; [Resume] continues an
// interrupted run and [Merge] combines the shards of one ([Shard]) into the
// records of a single run, byte for byte. A [Job] does all of it for one
// run directory: it writes the [Manifest] (with the scale factor of the
// nominal sequence), creates or resumes the store and runs its shard.
// [SharedGrid] sizes one noise grid for ensembles compared on common random
// numbers; [Manifest.Summarise] summarises a run (see below).
//
// # Decisions
//
// [Summarise] gives each output's distribution with intervals that hold
// their confidence: exact distribution-free order-statistic intervals for
// the quantiles (Hahn, Meeker and Escobar 2017, ch. 5; absent, with the size
// that would give them, when the ensemble is too small), the bootstrap-t
// for the mean (Hall 1988; with lost shots, whose contrast is 0, the
// mixture bound stats.ZeroMixture, also in [Qualify] and a ranking by
// mean), the percentile bootstrap for the standard
// deviation, and the bias as an angle (mean direction, circular standard
// deviation; Fisher 1993) with the count of inverted shots.
//
// [Qualify] checks an ensemble against [Requirements]. Each criterion gets
// two exact or second-order one-sided tests, "met" and "missed": order
// statistics and binomial tails for quantiles, the bootstrap-t for the mean
// contrast,
// Clopper-Pearson for a yield. The spec passes when every criterion passes
// (an intersection-union test, Berger 1982), fails when Holm's correction
// (Holm 1979) rejects a criterion on the fail side, and is undecided
// otherwise, never a pass on an ensemble too small to bound its quantiles.
// Each look at a growing ensemble (Requirements.Look) spends its share
// alpha 6/(pi^2 k^2) of the level (Lan and DeMets 1983), so topping up and
// qualifying again keeps the stated confidence; the advice "N more
// realisations" is for the next look's share. Seeded coverage simulations
// in the tests hold every rate at its level.
//
// [Rank] orders ramps run on common random numbers. Every settled place
// holds simultaneously at the confidence: quantiles and yields by exact
// intervals at the Bonferroni level 1 - alpha/k that must not overlap,
// means by a max-type paired bootstrap over all pairs (Romano and Wolf
// 2005; Hsu 1996, ch. 4); a place is settled only when it is separated
// from every other ramp. [ToleranceSearch] (the largest amplitude of each
// noise source, or of the whole budget, at which the requirements still
// hold), [SensitivityDesign] (Sobol' indices of each source on contrast and
// bias) and [GyroFigures] (projection noise and angle random walk) build on
// these.
//
// Confidence levels are fractions in (0, 1), such as 0.95. Programmer misuse
// (a negative realisation index, a confidence outside (0, 1), mismatched slice
// lengths) panics with an "mc: " prefix.
package mc
