package mc

import (
	"math"

	"rampart/sim"
	"rampart/stats"
)

// Measured is the signal a read-out measures (docs/model.md, Gyroscope
// figures): each realisation's bias with the projection noise of its
// Atoms atoms and the read-out's detection noise added
// (Readout.MeasuredBias), its distributions and the yield on it. The
// contrast of a yield spec is the simulated one: a single shot reads a
// phase, not a contrast.
type Measured struct {
	Atoms          float64      `json:"atoms"`
	DetectionAtoms float64      `json:"detection_noise_atoms"`
	BiasRad        Distribution `json:"bias_rad"`
	AbsBiasRad     Distribution `json:"abs_bias_rad"`
	Yield          *YieldResult `json:"yield,omitempty"`
}

// PhaseSigmaRad returns the standard deviation of the phase a read-out
// reads from the population imbalance z = (N_1 - N_2)/N of N = Atoms
// atoms at mid-fringe, for a shot of contrast C:
//
//	sigma_phi^2 = 1/(C^2 N) + sigma_d^2/(C^2 N^2),
//
// the standard quantum limit (atom projection noise of N independent
// atoms, common practice; W. M. Itano et al., Phys. Rev. A 47, 3554
// (1993)) plus a detection noise of sigma_d = DetectionAtoms atoms rms on
// the measured difference N_1 - N_2 (docs/model.md, Gyroscope figures).
// It is +Inf for C = 0 and 0 without a read-out.
func (r Readout) PhaseSigmaRad(contrast float64) float64 {
	if r.Atoms == 0 {
		return 0
	}
	v := (1 + r.DetectionAtoms*r.DetectionAtoms/r.Atoms) / (contrast * contrast * r.Atoms)
	return math.Sqrt(v)
}

// MeasuredBias returns the measured bias of realisation i of an ensemble
// with the given seed, whose simulated contrast and bias are given: the
// bias plus a normal draw of standard deviation PhaseSigmaRad(contrast)
// from the realisation's own stream Substream(seed, i, "detection"), so
// that no other draw changes, wrapped into (-pi, pi] as the angle it is.
func (r Readout) MeasuredBias(seed uint64, i int, contrast, biasRad float64) float64 {
	e := Substream(seed, i, "detection").NormFloat64()
	return sim.Wrap(biasRad + e*r.PhaseSigmaRad(contrast))
}

// Measure returns the statistics of the measured signal of the outputs o
// of an ensemble with the given seed (o in realisation-index order, as
// Outcomes.Add wants them), nil without a read-out. The lost shots have
// no phase and are outside the yield, as in SummariseOutcomes; its
// bootstraps draw from Substream(seed, 0, "summary/measured").
func (r Readout) Measure(o *Outcomes, seed uint64, confidence float64, spec Spec) *Measured {
	if r.Atoms == 0 {
		return nil
	}
	n := o.Len()
	m := &Measured{Atoms: r.Atoms, DetectionAtoms: r.DetectionAtoms}
	bias, abs := make([]float64, 0, n), make([]float64, 0, n)
	measured := make([]float64, n)
	for i := range n {
		if o.lost(i) {
			continue
		}
		measured[i] = r.MeasuredBias(seed, i, o.Contrast[i], o.BiasRad[i])
		bias, abs = append(bias, measured[i]), append(abs, math.Abs(measured[i]))
	}
	rng := Substream(seed, 0, "summary/measured")
	buf := make([]float64, n)
	if len(bias) > 0 {
		m.BiasRad = distribution(bias, buf, rng, confidence, [2]float64{-math.Pi, math.Pi})
		m.AbsBiasRad = distribution(abs, buf, rng, confidence, [2]float64{0, math.Pi})
	}
	if spec.Active() {
		k := 0
		for i := range n {
			if spec.inside(o.Contrast[i], measured[i], o.lost(i)) {
				k++
			}
		}
		e := stats.ClopperPearson(k, n, confidence)
		m.Yield = &YieldResult{Interval: Interval{e.Value, e.Lo, e.Hi}, Inside: k, Spec: spec}
	}
	return m
}

// MeasuredRecords returns copies of the records of an ensemble with the
// given seed with each realisation's bias and phase replaced by the
// measured ones (MeasuredBias, the same draws Measure makes), so that
// Qualify and Rank decide on the measured signal as on the true one. A lost
// shot stays lost (no phase to read); the contrast, the fringe amplitude
// and the inputs stay as simulated. Without a read-out it returns nil.
func (r Readout) MeasuredRecords(recs []Record, seed uint64) []Record {
	if r.Atoms == 0 {
		return nil
	}
	out := make([]Record, len(recs))
	for i, rec := range recs {
		out[i] = rec
		if rec.Lost() {
			continue
		}
		m := r.MeasuredBias(seed, rec.Index, rec.Contrast, rec.BiasRad)
		out[i].BiasRad = m
		out[i].PhaseRad = sim.Wrap(rec.PhaseRad + m - rec.BiasRad)
	}
	return out
}
