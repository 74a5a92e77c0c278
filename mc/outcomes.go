package mc

import "slices"

// Outcomes are the outputs of an ensemble's realisations that its summary
// and histograms need, as columns in index order: the contrast, the bias
// and the complex fringe amplitude z = ZRe + i ZIm. At 8 bytes a value
// they take 32 bytes a realisation, against about 200 for a Record with
// its inputs, so that a summary of 10^7 realisations needs 320 MB of
// columns (and, while it runs, one sorted copy of a column and the |bias|
// column, 16 bytes a realisation more).
type Outcomes struct {
	Contrast []float64
	BiasRad  []float64
	ZRe, ZIm []float64
	// ScaleFactorPPM is the scale-factor error of each realisation when
	// every one added has it (Record.HasScaleFactor), nil otherwise.
	ScaleFactorPPM []float64
	// LossPossible says that a shot may be lost (photon scattering is on,
	// Manifest.LossPossible) even if none of these is: the mean contrast's
	// bound then allows for the losses the sample did not show
	// (stats.ZeroMixture.Possible).
	LossPossible  bool
	noScaleFactor bool
}

// NewOutcomes returns empty columns with room for n realisations.
func NewOutcomes(n int) *Outcomes {
	return &Outcomes{
		Contrast: make([]float64, 0, n), BiasRad: make([]float64, 0, n),
		ZRe: make([]float64, 0, n), ZIm: make([]float64, 0, n),
	}
}

// Add appends the outputs of r. Records must be added in index order (the
// summary's bootstrap draws realisations by their place in the columns).
func (o *Outcomes) Add(r Record) {
	o.Contrast = append(o.Contrast, r.Contrast)
	o.BiasRad = append(o.BiasRad, r.BiasRad)
	o.ZRe = append(o.ZRe, real(r.Z))
	o.ZIm = append(o.ZIm, imag(r.Z))
	switch {
	case !r.HasScaleFactor:
		o.noScaleFactor, o.ScaleFactorPPM = true, nil
	case !o.noScaleFactor:
		o.ScaleFactorPPM = append(o.ScaleFactorPPM, r.ScaleFactorErrorPPM)
	}
}

// Len returns the number of realisations.
func (o *Outcomes) Len() int { return len(o.Contrast) }

// OutcomesOf returns the outputs of records given in any order, in index
// order.
func OutcomesOf(recs []Record) *Outcomes {
	if !slices.IsSortedFunc(recs, byIndex) {
		recs = slices.Clone(recs)
		slices.SortFunc(recs, byIndex)
	}
	o := NewOutcomes(len(recs))
	for _, r := range recs {
		o.Add(r)
	}
	return o
}

func byIndex(a, b Record) int { return a.Index - b.Index }
