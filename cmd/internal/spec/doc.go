// Package spec reads rampart qualification specs: the TOML file of criteria
// that an ensemble must meet for "rampart qualify" and "rampart tolerance",
//
//	confidence = 0.95            # one-sided, of every verdict (default 0.95)
//
//	[contrast]
//	mean_min = 0.9               # mean contrast at least this
//	p05_min = 0.8                # 5th-percentile contrast at least this
//
//	[bias]
//	abs_p95_max_rad = 1e-3       # 95th percentile of |bias| at most this
//	abs_p95_max_deg_per_h = 0.05 # the same as a rotation-rate error
//
//	[scale_factor]
//	abs_p95_max_ppm = 10         # 95th percentile of |K_shot / K - 1| at most this
//
//	[yield]
//	min = 0.99                   # fraction of realisations inside both limits
//	contrast_min = 0.8           # a realisation's contrast at least this
//	bias_max_rad = 1e-3          # and its |bias| at most this
//
// Every key is optional, but the file must give at least one criterion, and
// yield.min comes with at least one of the yield limits (and they with it).
// A scale-factor criterion makes the ensemble measure each realisation's
// scale-factor error (mc.Ensemble.ScaleFactor: three shots a realisation).
// The file is strict: an unknown table or key, a value of the wrong type and
// an out-of-range value are errors of type *Error, which name the file, the
// line (where the TOML decoder tells it), the key and what would be
// accepted. Parse returns the criteria as mc.Requirements.
package spec
