package mc

import (
	"math"

	"rampart/noise"
	"rampart/sim"
)

// Process names of a budget's noise processes on the kernels (sim.Process
// Name), one per Process row of Sources.
const (
	ProcessRIN   = "rin"
	ProcessPhase = "phase"
	ProcessField = "field"
	ProcessMains = "mains"
	// ProcessRotation is the platform's rotation-rate noise (its channel
	// bears the same name, sim.Rotation).
	ProcessRotation = "rotation"
)

// processNames maps the Process rows of Sources to their process names.
var processNames = map[string]string{SourceRIN: ProcessRIN, SourcePhase: ProcessPhase, SourceFieldNoise: ProcessField, ParamMains: ProcessMains, SourceRotationPSD: ProcessRotation}

// Processes returns the budget's noise processes on the noise transfer
// functions' channels (sim.Kernels), in the bands the Monte Carlo draws
// them: from 1/T, the lowest frequency a record of a shot of duration T
// holds, up to the kernels' band unless the budget gives a band.
func (b Budget) Processes(durationS float64) []sim.Process {
	var ps []sim.Process
	for _, key := range []string{SourceRIN, SourcePhase, SourceFieldNoise, ParamMains, SourceRotationPSD} {
		if p, ok := b.Process(key, durationS); ok {
			ps = append(ps, p)
		}
	}
	return ps
}

// Process returns the noise process of the Process row key of Sources (or
// of the mains line, ParamMains) on the kernels' channels, and whether the
// budget switches it on:
//
//	rin:   intensity_common, PSD S_eps (one laser for both spin states)
//	phase: sim.PhaseLoad(PhaseCorrelation), PSD S_alpha of each arm
//	field: shift_differential with weight k^2, PSD S_B in G^2/Hz, where
//	       k = LinearHzPerG + 2 QuadraticHzPerG2 OffsetG (Hz/G) is the slope of
//	       the spin pair's differential Zeeman shift at the apparatus's static
//	       field offset (sim.FieldShift): delta_nu(t) = k b(t) to first order.
//	mains: the same load, a line spectrum (sim.Lines) of power a_h^2/2 at
//	       each harmonic h f of the line (Mains), from 0 Hz: a sinusoid of
//	       uniformly random phase. A line triggered at a fixed phase
//	       (Mains.FixedPhase) moves every shot alike, a bias and no spread:
//	       it is no process.
//	rotation: sim.Rotation, PSD S_Omega of the platform's rotation rate in
//	       (rad/s)^2/Hz (Budget.RotationNoise), a pure phase through the
//	       arms' enclosed-area rate.
//
// The quadratic Zeeman term's own response to the noise, -2 pi Q int b^2
// dt, is a mean phase shift of -2 pi Q sigma_b^2 T (second order), not a
// spread; the kernels leave it out (docs/model.md, Noise transfer
// functions).
func (b Budget) Process(key string, durationS float64) (sim.Process, bool) {
	lo := 1 / durationS
	switch key {
	case SourceRIN:
		if b.RIN == nil {
			return sim.Process{}, false
		}
		band := b.RINBand
		band.LowHz = math.Max(band.LowHz, lo)
		return sim.Process{Name: ProcessRIN, Unit: "1", Load: sim.Load{sim.IntensityCommon: 1}, PSD: b.RIN, Band: band}, true
	case SourcePhase:
		if b.Phase == nil {
			return sim.Process{}, false
		}
		return sim.Process{Name: ProcessPhase, Unit: "rad", Load: sim.PhaseLoad(b.PhaseCorrelation), PSD: b.Phase, Band: noise.Band{LowHz: lo}}, true
	case SourceFieldNoise:
		if b.FieldNoise == nil {
			return sim.Process{}, false
		}
		return sim.Process{Name: ProcessField, Unit: "G", Load: b.FieldLoad(), PSD: b.FieldNoise, Band: noise.Band{LowHz: lo}}, true
	case ParamMains:
		if !(b.MainsG > 0) || b.Mains.FixedPhase {
			return sim.Process{}, false
		}
		f := b.Mains.Frequency()
		lines := sim.Lines{}
		for h, r := range append([]float64{1}, b.Mains.HarmonicsRel...) {
			a := b.MainsG * r
			lines.FrequencyHz = append(lines.FrequencyHz, float64(h+1)*f)
			lines.PowerUnit2 = append(lines.PowerUnit2, a*a/2)
		}
		return sim.Process{Name: ProcessMains, Unit: "G", Load: b.FieldLoad(), PSD: lines}, true
	case SourceRotationPSD:
		if b.RotationNoise == nil {
			return sim.Process{}, false
		}
		return sim.Process{Name: ProcessRotation, Unit: "rad/s", Load: sim.Load{sim.Rotation: 1}, PSD: b.RotationNoise, Band: noise.Band{LowHz: lo}}, true
	}
	return sim.Process{}, false
}

// FieldLoad is how field noise of PSD S_B (G^2/Hz) reaches the kernels:
// the differential shift channel with weight k^2, k the slope of the spin
// pair's differential Zeeman shift at the static field offset (Process).
func (b Budget) FieldLoad() sim.Load {
	f := b.Apparatus.Field
	k := f.Zeeman.LinearHzPerG + 2*f.Zeeman.QuadraticHzPerG2*f.OffsetG
	return sim.Load{sim.ShiftDifferential: k * k}
}

// ProcessName returns the process name (sim.Process Name) of a Process row
// of Sources, and whether key is one.
func ProcessName(key string) (string, bool) {
	n, ok := processNames[key]
	return n, ok
}
