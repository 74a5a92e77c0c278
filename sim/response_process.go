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
