package mc

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
