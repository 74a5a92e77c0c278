package sim

// Series is a noise record sampled every StepS from t = 0: sample i is the
// value at t = i*StepS. Between samples it is interpolated linearly; before
// the first and after the last sample it holds the end value.
//
// The samples are either stored in Values, or, when Values is empty and
// Stream is set, the first N samples of a stream read in order through a
// window of seriesWindow samples: memory then does not grow with the record.
// A streamed Series keeps read state and is not safe for concurrent use;
// reading before the window rewinds the stream and reads it again from the
// start (the simulator reads each arm's record forward, so that happens once
// per arm that shares a record).
type Series struct {
	StepS  float64
	Values []float64

	Stream SampleStream
	N      int

	win  []float64 // samples base .. base+len(win)-1 of a streamed record
	base int
	skip []float64
}

// SampleStream is a record read in order from its first sample, which Reset
// rewinds to; noise.Stream is one.
type SampleStream interface {
	Read(dst []float64)
	Reset()
	Pos() int
}

// seriesWindow is the number of samples a streamed Series keeps.
const seriesWindow = 4096

// Len returns the number of samples.
func (s *Series) Len() int {
	if s == nil {
		return 0
	}
	if len(s.Values) > 0 || s.Stream == nil {
		return len(s.Values)
	}
	return s.N
}

// At returns the value at time t.
func (s *Series) At(t float64) float64 {
	n := s.Len()
	if n == 0 {
		return 0
	}
	x := t / s.StepS
	if x <= 0 {
		return s.sample(0)
	}
	i := int(x)
	if i >= n-1 {
		return s.sample(n - 1)
	}
	u := x - float64(i)
	if len(s.Values) > 0 {
		return s.Values[i]*(1-u) + s.Values[i+1]*u
	}
	s.fetch(i, i+1)
	return s.win[i-s.base]*(1-u) + s.win[i+1-s.base]*u
}

func (s *Series) sample(i int) float64 {
	if len(s.Values) > 0 {
		return s.Values[i]
	}
	s.fetch(i, i)
	return s.win[i-s.base]
}

// fetch makes samples lo..hi of a streamed record available in the window.
// The window moves forward so that a quarter of it stays behind lo (the
// split steps go back in time by a fraction of a step).
func (s *Series) fetch(lo, hi int) {
	if s.win != nil && lo >= s.base && hi < s.base+len(s.win) {
		return
	}
	if s.win == nil {
		s.win = make([]float64, 0, seriesWindow)
	}
	base := max(0, lo-seriesWindow/4)
	end := min(s.N, base+seriesWindow)
	if base < s.base || s.Stream.Pos() != s.base+len(s.win) {
		// Behind the window (or the stream was read elsewhere): start again.
		s.Stream.Reset()
		s.base, s.win = 0, s.win[:0]
	}
	// Keep the part of the old window that the new one covers.
	keep := 0
	if base < s.base+len(s.win) {
		keep = copy(s.win[:cap(s.win)], s.win[base-s.base:])
	}
	// Skip the samples between the old window's end and the new base.
	for gap := base - s.Stream.Pos(); gap > 0; {
		if s.skip == nil {
			s.skip = make([]float64, seriesWindow)
		}
		k := min(gap, len(s.skip))
		s.Stream.Read(s.skip[:k])
		gap -= k
	}
	s.win = s.win[:end-base]
	s.Stream.Read(s.win[keep:])
	s.base = base
}
