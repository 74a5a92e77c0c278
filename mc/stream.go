package mc

import (
	"math"
	"math/rand/v2"

	"rampart/noise"
)

// StreamSamples is the record length, in samples, above which an
// ensemble's intensity and drive phase noise records are streamed
// (noise.StreamSynthesizer) rather than stored: from there on a worker's
// memory no longer grows with the shot. A streamed record's band starts at
// 1/(StreamSamples dt), the lower edge the stored record of StreamSamples
// samples has: noise below it, slower than a 2^16-sample record (0.32 s at
// the benchmark ring's 4.8 us step), enters a longer shot as an offset and a
// drift and is left out (noise.Band; docs/model.md, Numerics).
const StreamSamples = 1 << 16

// streamAbove is StreamSamples; tests lower it to stream short records.
var streamAbove = StreamSamples

// streamBand returns the band of a streamed record: b with its lower edge
// raised to at least 1/(StreamSamples dt).
func streamBand(b noise.Band, dt float64) noise.Band {
	b.LowHz = math.Max(b.LowHz, 1/(float64(streamAbove)*dt))
	return b
}

// mixStream is the record ca a + cb b of two streams read in step (b may be
// nil): the drive phase of an arm, scaled to a lattice angle, and correlated
// with the other arm's.
type mixStream struct {
	a, b   *noise.Stream
	ca, cb float64
	buf    []float64
}

func (m *mixStream) Read(dst []float64) {
	m.a.Read(dst)
	for i := range dst {
		dst[i] *= m.ca
	}
	if m.b == nil {
		return
	}
	if cap(m.buf) < len(dst) {
		m.buf = make([]float64, len(dst))
	}
	y := m.buf[:len(dst)]
	m.b.Read(y)
	for i, v := range y {
		dst[i] += m.cb * v
	}
}

func (m *mixStream) Reset() {
	m.a.Reset()
	if m.b != nil {
		m.b.Reset()
	}
}

func (m *mixStream) Pos() int { return m.a.Pos() }

// streamRMS returns the rms of the first n samples of s and rewinds it.
func streamRMS(s interface {
	Read([]float64)
	Reset()
}, n int, scratch []float64) float64 {
	var sum float64
	for k := 0; k < n; k += len(scratch) {
		x := scratch[:min(len(scratch), n-k)]
		s.Read(x)
		for _, v := range x {
			sum += v * v
		}
	}
	s.Reset()
	return math.Sqrt(sum / float64(n))
}

// substream returns a source that makes Substream(seed, i, purpose) afresh.
func substream(seed uint64, i int, purpose string) func() *rand.Rand {
	return func() *rand.Rand { return Substream(seed, i, purpose) }
}
