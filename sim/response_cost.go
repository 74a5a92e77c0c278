package sim

import (
	"math"
)

// KernelsBytes estimates the memory in bytes that Kernels(maxHz) holds at
// its peak, without computing the kernels: the sampled interaction-picture
// series of both arms (two vectors of the basis size per start level, L
// complex samples each, L about four times the samples nt = T/h; the first
// arm's are garbage when the second's are made, but need not have been
// collected yet), the kept transforms of both arms (the same vectors at
// M+1 frequencies per sign) and the FFT work array. On the benchmark
// scenario at 0.5, 1 and 2 laps the peak live heap measured (sampled every
// 20 ms) was 0.79, 0.99 and 1.03 of this estimate (148, 297 and 580 MB);
// the process may hold up to twice the live heap (the Go collector's target
// at GOGC=100). It costs two diagonalisations of the
// cruise Hamiltonian (to find the sample step) and the start levels.
//
// The estimate grows linearly with the sequence duration T: a caller that
// must not run out of memory compares it with its cap before calling
// Kernels.
func (s *Simulator) KernelsBytes(maxHz float64) int64 {
	cfg, b := s.cfg, s.basis
	v0 := 2 * math.Pi * cfg.DepthHz
	rot := cfg.Ring.rotationalRate()
	means := bandMeans(lowestBands(b, rot, cfg.RotationRadS, v0, s.lev))
	lev := min(s.lev, thermalLevels(means, cfg.TemperatureK))
	drives := s.drives(Shot{})
	T := drives[0].times()[3]
	spread := 0.0
	for a := range 2 {
		p := newPropagator(b, cfg.Ring, v0, b.Block)
		es := diagonaliseFor(p, drives[a].cruiseSpeed(), 1)
		for _, v := range es.vals {
			spread = math.Max(spread, v[len(v)-1]-v[0])
		}
	}
	h, nt := s.responseStep(T, spread)
	l := fftLength(2 * (2*nt + 1))
	if maxHz == 0 {
		maxHz = s.NoiseBandHz()
	}
	m := min(int(math.Floor(maxHz*float64(l)*h)), l/2-1)
	const c = 16 // bytes of a complex128
	dim := int64(b.Size())
	series := 2 * 2 * int64(lev) * dim * int64(l) * c
	kept := 2 * 2 * int64(lev) * int64(m+1) * dim * c
	return series + kept + 2*int64(l)*c
}
