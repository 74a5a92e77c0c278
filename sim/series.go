package sim

// Series is a noise record sampled every StepS from t = 0: Values[i] is the
// value at t = i*StepS. Between samples it is interpolated linearly; before
// the first and after the last sample it holds the end value.
type Series struct {
	StepS  float64
	Values []float64
}

// At returns the value at time t.
func (s *Series) At(t float64) float64 {
	if s == nil || len(s.Values) == 0 {
		return 0
	}
	x := t / s.StepS
	if x <= 0 {
		return s.Values[0]
	}
	i := int(x)
	if i >= len(s.Values)-1 {
		return s.Values[len(s.Values)-1]
	}
	u := x - float64(i)
	return s.Values[i]*(1-u) + s.Values[i+1]*u
}
