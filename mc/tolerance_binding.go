package mc

import "math"

// Binding returns the criterion of a tolerance result's metric at a point
// of its curve, and whether the point evaluated it.
func (res ToleranceResult) Binding(p TolerancePoint) (Criterion, bool) {
	for _, c := range p.Criteria {
		if c.Name == res.Metric {
			return c, true
		}
	}
	return Criterion{}, false
}

// MinYieldSamples returns the fewest realisations with which a yield
// requirement can pass: n of n inside has the one-sided lower bound
// (1-c)^(1/n) (the Clopper-Pearson bound at k = n), which must reach the
// minimum yield; 0 without a yield requirement.
func MinYieldSamples(req Requirements) int {
	if !(req.YieldMin > 0 && req.YieldMin < 1) {
		return 0
	}
	return int(math.Ceil(math.Log(1-req.Confidence) / math.Log(req.YieldMin)))
}
