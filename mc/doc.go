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
// z_i. [Mean], [StdDev] and [Quantile] (Hyndman and Fan type 7, NumPy's default)
// summarise a sample; [Bootstrap] gives percentile confidence intervals for any
// statistic and [PairedBootstrap] for the difference of a statistic between two
// ramps run on common random numbers. A yield, the fraction of realisations
// inside a specification, has the exact binomial interval of Clopper and
// Pearson ([ClopperPearson]); with no failures [RuleOfThree] and
// [ZeroFailureUpper] bound the failure rate. [Histogram] counts fixed bins.
// [SobolIndices] apportions the variance of an output among the static
// parameters (first-order and total Sobol' indices).
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
// numbers. [Summarise] ([Manifest.Summarise]) gives the distributions
// of contrast and bias with bootstrap intervals, the averaged-fringe contrast
// and a yield.
//
// # Decisions
//
// A verdict compares an interval with a threshold: clear above, clear below, or
// undecided while the interval straddles it. For an undecided verdict,
// [AdditionalSamples] and [AdditionalTrials] estimate how many more
// realisations would settle it. On these rest [Rank] (ramps ordered by a
// metric on common random numbers, with paired differences and whether each
// place is resolved), [Qualify] (an ensemble against [Requirements]: pass,
// fail or undecided), [ToleranceSearch] (the largest amplitude of each noise
// source, or of the whole budget, at which the requirements still hold),
// [SensitivityDesign] (Sobol' indices of each source on contrast and bias)
// and [GyroFigures] (projection noise and angle random walk).
//
// Confidence levels are fractions in (0, 1), such as 0.95. Programmer misuse
// (a negative realisation index, a confidence outside (0, 1), mismatched slice
// lengths) panics with an "mc: " prefix.
package mc
