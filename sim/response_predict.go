package sim

import (
	"fmt"
	"math"

	"rampart/noise"
)

// Validity limits of the linear (first-order phase, second-order contrast)
// answer: beyond them the next order is no longer small (common practice
// for a perturbative expansion; TestResponseNonlinear shows the departure).
const (
	MaxLinearContrastLoss = 0.03 // predicted mean contrast loss
	MaxLinearPhaseStdRad  = 0.3  // predicted bias standard deviation
)

// ChannelPrediction is the predicted effect of one channel's noise.
type ChannelPrediction struct {
	Channel      Channel
	ContrastLoss float64 // C0 - E[C]
	BiasVarRad2  float64
	BiasStdRad   float64
	// Unresolved is set when, where most of the effect comes from, the
	// kernel is more than four times both its neighbours: a resonance
	// narrower than the grid. (The grid's spacing 1/(L h) <= 1/(4 T) samples
	// the response of a shot of duration T at twice its Nyquist rate,
	// where the neighbours of a sinc^2 peak are 0.8 of it, so this flags
	// numerical trouble rather than physics.)
	Unresolved bool
}

// Prediction is the predicted effect of noise on every channel given.
type Prediction struct {
	Channels     []ChannelPrediction
	ContrastLoss float64 // sum over channels (independent noises add at second order)
	BiasStdRad   float64 // root of the summed variances
	// Warnings say where the linear answer cannot be trusted.
	Warnings []string
}

// Predict returns the effect of noise of one-sided PSD psd on channel ch,
// restricted to band (zero edges: the kernel grid's, from 0 to its last
// frequency). It is one pass over the grid: the PSD is integrated over
// quarters of each grid interval (noise.Variance, exact for the closed
// forms) and weighted by the kernels interpolated linearly.
//
// Spectral lines (Lines, alone or in the sums, scalings and band limits
// PredictProcesses builds) are weighted by the kernels at their own
// frequencies (At), inside the band.
func (k *Kernels) Predict(ch Channel, psd noise.PSD, band noise.Band) ChannelPrediction {
	psd, lines := splitLines(psd)
	out := k.predictContinuous(ch, psd, band)
	for i, f := range lines.FrequencyHz {
		if f < band.LowHz || (band.HighHz > 0 && f > band.HighHz) {
			continue
		}
		kb, kc := k.At(ch, f)
		out.ContrastLoss += lines.PowerUnit2[i] * kc
		out.BiasVarRad2 += lines.PowerUnit2[i] * kb
	}
	out.BiasStdRad = math.Sqrt(math.Max(out.BiasVarRad2, 0))
	return out
}

// predictContinuous is Predict of a PSD without lines (nil: none).
func (k *Kernels) predictContinuous(ch Channel, psd noise.PSD, band noise.Band) ChannelPrediction {
	kc := k.Channel(ch)
	if psd == nil {
		return ChannelPrediction{Channel: ch}
	}
	lo, hi := band.LowHz, band.HighHz
	top := k.FrequencyHz[len(k.FrequencyHz)-1]
	if hi == 0 || hi > top {
		hi = top
	}
	out := ChannelPrediction{Channel: ch}
	var best, bestVal float64 = -1, 0
	nf := len(k.FrequencyHz)
	// Each grid interval [f_m, f_m+1] is cut into quarters; on each the
	// PSD's integral (noise.Variance) is weighted by the kernels linearly
	// interpolated to the quarter's centre.
	const parts = 4
	for m := 0; m+1 < nf; m++ {
		for q := range parts {
			a := k.FrequencyHz[m] + float64(q)*k.StepHz/parts
			b := a + k.StepHz/parts
			a, b = math.Max(a, lo), math.Min(b, hi)
			if a >= b {
				continue
			}
			if a == 0 {
				if _, ok := psd.(noise.Integrable); !ok {
					a = math.Min(b/2, 1e-3*k.StepHz)
				}
			}
			w := noise.Variance(psd, a, b)
			u := ((a+b)/2 - k.FrequencyHz[m]) / k.StepHz
			kc0 := kc.Contrast[m]*(1-u) + kc.Contrast[m+1]*u
			kb := kc.Bias[m]*(1-u) + kc.Bias[m+1]*u
			out.ContrastLoss += w * kc0
			v := w * kb
			out.BiasVarRad2 += v
			if e := math.Max(v, math.Abs(w*kc0)); e > bestVal {
				best, bestVal = float64(m), e
			}
		}
	}
	out.BiasStdRad = math.Sqrt(math.Max(out.BiasVarRad2, 0))
	if m := int(best); m > 0 && m < len(k.FrequencyHz)-1 {
		for _, ker := range [][]float64{kc.Bias, kc.Contrast} {
			c, l, r := math.Abs(ker[m]), math.Abs(ker[m-1]), math.Abs(ker[m+1])
			if c > 0 && l < c/4 && r < c/4 {
				out.Unresolved = true
			}
		}
	}
	return out
}

// PredictAll returns the effect of the noises given per channel, their
// totals and the validity warnings.
func (k *Kernels) PredictAll(psds map[Channel]noise.PSD, band noise.Band) Prediction {
	var p Prediction
	var v float64
	for c := range numChannels {
		s, ok := psds[c]
		if !ok || s == nil {
			continue
		}
		cp := k.Predict(c, s, band)
		p.Channels = append(p.Channels, cp)
		p.ContrastLoss += cp.ContrastLoss
		v += cp.BiasVarRad2
		if cp.Unresolved {
			p.Warnings = append(p.Warnings, fmt.Sprintf("%v: the kernel has a resonance narrower than the %.3g Hz grid where the effect comes from", c, k.StepHz))
		}
	}
	p.BiasStdRad = math.Sqrt(math.Max(v, 0))
	var absLoss float64
	for _, c := range p.Channels {
		absLoss += math.Abs(c.ContrastLoss)
	}
	if p.ContrastLoss > MaxLinearContrastLoss {
		p.Warnings = append(p.Warnings, fmt.Sprintf("predicted contrast loss %.3g is above %g: second order is not enough, confirm with a Monte Carlo", p.ContrastLoss, MaxLinearContrastLoss))
	}
	if p.BiasStdRad > MaxLinearPhaseStdRad {
		p.Warnings = append(p.Warnings, fmt.Sprintf("predicted bias standard deviation %.3g rad is above %g rad: the linear phase response is not enough, confirm with a Monte Carlo", p.BiasStdRad, MaxLinearPhaseStdRad))
	}
	// The phase's second order is of the size of the contrast loss (both
	// are second-order amplitudes); its spread adds to the linear std.
	if absLoss > SecondOrderPhaseShare*p.BiasStdRad && absLoss > 1e-3 {
		p.Warnings = append(p.Warnings, fmt.Sprintf("second-order phase fluctuations, of the order of the contrast loss %.3g, are not small against the linear bias std %.3g rad: the bias std is underestimated, confirm with a Monte Carlo", absLoss, p.BiasStdRad))
	}
	return p
}

// SecondOrderPhaseShare is the ratio of the summed |contrast loss| to the
// linear bias std above which the bias std is flagged (a heuristic: on the
// inverse ramp the Monte Carlo bias std was 7 % above the linear one at a
// ratio of 0.19 and 42 % above at 1.06, TestResponseNonlinear).
const SecondOrderPhaseShare = 0.3

// PhaseNoise splits drive phase noise of one-sided PSD s on each arm, with
// correlation coefficient rho between the arms, into the uncorrelated
// common and differential channels: S (1+rho)/2 and 2 S (1-rho).
func PhaseNoise(s noise.PSD, rho float64) map[Channel]noise.PSD {
	return map[Channel]noise.PSD{
		PhaseCommon:       scaledPSD{s, (1 + rho) / 2},
		PhaseDifferential: scaledPSD{s, 2 * (1 - rho)},
	}
}

// scaledPSD is k times a PSD.
type scaledPSD struct {
	s noise.PSD
	k float64
}

func (p scaledPSD) Density(f float64) float64 { return p.k * p.s.Density(f) }

func (p scaledPSD) Integral(a, b float64) float64 {
	if p.k == 0 {
		return 0
	}
	if _, ok := p.s.(noise.Integrable); !ok && a == 0 {
		a = math.Min(b/2, 1e-6*b)
	}
	return p.k * noise.Variance(p.s, a, b)
}
