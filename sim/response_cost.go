package sim

import (
	"math"
)

// KernelsBytes estimates the memory in bytes that Kernels(maxHz) holds at
// its peak, without computing the kernels. With the cruise in closed form
// (closedSpectra) it is the sum of
//
//   - the ramps' samples: both arms, for each operator (2) and start
//     level, Y and Lambda on both ramps, each sample a vector of the basis
//     size, held in the time-0 picture and once more in the cruise
//     eigenbasis and compressed (counted three times);
//   - the cruise terms: for each arm, operator, level and series, at most
//     Block^2 per class (index, amplitude, gap and two phases, 64 bytes,
//     plus 16 for the cross sums of the ordered integral);
//   - the spectra on the frequency grid: 10 complex values per frequency
//     and operator (R and J per arm and sign, X per sign; the two sampled
//     operators and the closed-form shift), the rotation's transform (one
//     complex value) and the kernels themselves (two real values per
//     channel and the frequency).
//
// Only the last grows with the sequence's duration T (the grid's M+1
// frequencies, M about 4 T times the band); the ramps' part grows with the
// ramps' duration. On the benchmark ring the peak live heap (sampled every
// 20 ms at GOGC=10) was 0.59, 0.52, 0.54, 0.42 and 0.82 of this estimate
// at 0.5, 1, 2, 10 and 100 laps (8.4, 7.7, 8.3, 9.3 and 84.9 MB). It
// costs two diagonalisations of the cruise Hamiltonian (to find the sample
// step) and the start levels.
func (s *Simulator) KernelsBytes(maxHz float64) int64 {
	cfg, b := s.cfg, s.basis
	v0 := 2 * math.Pi * cfg.DepthHz
	rot := cfg.Ring.rotationalRate()
	means := bandMeans(lowestBands(b, rot, cfg.RotationRadS, v0, s.lev))
	lev := int64(min(s.lev, thermalLevels(means, cfg.TemperatureK)))
	drives := s.drives(Shot{})
	tm := drives[0].times()
	T := tm[3]
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
	m := int64(min(int(math.Floor(maxHz*float64(l)*h)), l/2-1))
	const c = 16 // bytes of a complex128
	dim := int64(b.Size())
	nops := int64(len(responseOps))
	var samples int64
	for _, d := range drives {
		t := d.times()
		samples += int64(len(newRampSamples(0, t[1], h).t) + len(newRampSamples(t[2], t[3], h).t))
	}
	ramps := 3 * nops * lev * 2 * samples * dim * c
	terms := 2 * nops * lev * 2 * int64(b.Block) * dim * 80
	grid := (m+1)*(10*(nops+1)*c+c) + (m+1)*8*(2*int64(numChannels)+1)
	return ramps + terms + grid
}
