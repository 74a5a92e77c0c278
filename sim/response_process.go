package sim

import (
	"math"

	"rampart/noise"
)

// Process is one noise process of a budget as the kernels see it: its
// one-sided PSD, the band it is drawn in and how it reaches the channels.
type Process struct {
	Name string
	// Unit is the unit of the process's signal (its PSD is in unit^2/Hz).
	Unit string
	Load Load
	PSD  noise.PSD
	// Band is where the process has power; a zero edge is the kernels'
	// grid's (0 or its last frequency).
	Band noise.Band
}

// PredictProcesses returns the prediction for processes acting together:
// each channel's PSD is the sum over processes of w_c S restricted to the
// process's band (independent processes add), predicted by PredictAll over
// the whole grid, warnings included.
func (k *Kernels) PredictProcesses(ps []Process) Prediction {
	psds := map[Channel]noise.PSD{}
	for c := range numChannels {
		var sum bandSum
		for _, p := range ps {
			if w, ok := p.Load[c]; ok && w != 0 && p.PSD != nil {
				sum = append(sum, bandLimited{scaledPSD{p.PSD, w}, p.Band})
			}
		}
		if len(sum) > 0 {
			psds[c] = sum
		}
	}
	return k.PredictAll(psds, noise.Band{})
}

// Without returns the processes with the channels of load taken out of
// their loads: the rest of a budget when the load's channels are given a
// mask.
func Without(ps []Process, load Load) []Process {
	var out []Process
	for _, p := range ps {
		q := p
		q.Load = Load{}
		for c, w := range p.Load {
			if _, drop := load[c]; !drop {
				q.Load[c] = w
			}
		}
		out = append(out, q)
	}
	return out
}

// bandLimited is a PSD with no power outside its band (zero upper edge:
// none).
type bandLimited struct {
	s    scaledPSD
	band noise.Band
}

func (p bandLimited) clip(a, b float64) (float64, float64) {
	a = math.Max(a, p.band.LowHz)
	if p.band.HighHz > 0 {
		b = math.Min(b, p.band.HighHz)
	}
	return a, b
}

func (p bandLimited) Density(f float64) float64 {
	if a, b := p.clip(f, f); a != f || b != f {
		return 0
	}
	return p.s.Density(f)
}

func (p bandLimited) Integral(a, b float64) float64 {
	a, b = p.clip(a, b)
	if a >= b {
		return 0
	}
	return p.s.Integral(a, b)
}

// bandSum is a sum of band-limited PSDs.
type bandSum []bandLimited

func (s bandSum) Density(f float64) float64 {
	var d float64
	for _, p := range s {
		d += p.Density(f)
	}
	return d
}

func (s bandSum) Integral(a, b float64) float64 {
	var v float64
	for _, p := range s {
		v += p.Integral(a, b)
	}
	return v
}

// Lines is a spectrum of spectral lines: a sinusoid A sin(2 pi f_i t + p)
// of uniformly random phase p has the one-sided PSD (A^2/2) delta(f - f_i),
// its variance A^2/2 (PowerUnit2[i]) concentrated at f_i (a mains line and
// its harmonics, docs/model.md, Noise transfer functions). A prediction
// weights each line by the kernel interpolated within a quarter of a grid
// interval of it.
type Lines struct {
	FrequencyHz []float64
	PowerUnit2  []float64
}

// Density is zero away from the lines (their density is a delta).
func (l Lines) Density(float64) float64 { return 0 }

// Integral returns the power of the lines in [a, b).
func (l Lines) Integral(a, b float64) float64 {
	var s float64
	for i, f := range l.FrequencyHz {
		if f >= a && f < b {
			s += l.PowerUnit2[i]
		}
	}
	return s
}

// splitLines parts a PSD built by PredictProcesses (sums, scalings and
// band limits of PSDs) into its continuous part (nil: none) and its lines,
// which Predict weights by the kernels at their frequencies (At) rather
// than by quadrature.
func splitLines(p noise.PSD) (noise.PSD, Lines) {
	switch q := p.(type) {
	case Lines:
		return nil, q
	case scaledPSD:
		c, l := splitLines(q.s)
		out := Lines{FrequencyHz: l.FrequencyHz}
		for _, w := range l.PowerUnit2 {
			out.PowerUnit2 = append(out.PowerUnit2, q.k*w)
		}
		if c != nil {
			c = scaledPSD{c, q.k}
		}
		return c, out
	case bandLimited:
		c, l := splitLines(q.s)
		var out Lines
		for i, f := range l.FrequencyHz {
			if a, b := q.clip(f, f); a == f && b == f {
				out.FrequencyHz = append(out.FrequencyHz, f)
				out.PowerUnit2 = append(out.PowerUnit2, l.PowerUnit2[i])
			}
		}
		if c != nil {
			c = bandLimited{scaledPSD{c, 1}, q.band}
		}
		return c, out
	case bandSum:
		var cont bandSum
		var out Lines
		for _, x := range q {
			c, l := splitLines(x)
			out.FrequencyHz = append(out.FrequencyHz, l.FrequencyHz...)
			out.PowerUnit2 = append(out.PowerUnit2, l.PowerUnit2...)
			if c != nil {
				cont = append(cont, c.(bandLimited))
			}
		}
		if len(cont) == 0 {
			return nil, out
		}
		return cont, out
	}
	return p, Lines{}
}
