package present

import (
	"encoding/json"
	"fmt"
	"strings"
)

// KernelPrediction is what the noise transfer functions predict for the
// noise processes of a budget (sim.Kernels.PredictProcesses): their mean
// contrast loss and bias standard deviation about the nominal shot, alone
// and together.
type KernelPrediction struct {
	Contrast     float64               `json:"nominal_contrast"` // C0 of the nominal shot
	ContrastLoss float64               `json:"contrast_loss"`
	BiasStdRad   float64               `json:"bias_std_rad"`
	ByProcess    []KernelProcessEffect `json:"by_process"`
	Warnings     []string              `json:"warnings"`
	// Skipped says why there is no prediction (the kernels would not fit
	// in memory); the other fields are then zero and left out of the JSON.
	Skipped string `json:"skipped,omitempty"`
}

// MarshalJSON writes a skipped prediction as its reason alone: the
// figures it does not have are absent, not 0.
func (p KernelPrediction) MarshalJSON() ([]byte, error) {
	if p.Skipped != "" {
		return json.Marshal(struct {
			Skipped string `json:"skipped"`
		}{p.Skipped})
	}
	type plain KernelPrediction
	return json.Marshal(plain(p))
}

// KernelProcessEffect is one process's predicted effect.
type KernelProcessEffect struct {
	Process      string  `json:"process"`
	ContrastLoss float64 `json:"contrast_loss"`
	BiasStdRad   float64 `json:"bias_std_rad"`
}

// kernelPredictionNote states the prediction beside a verdict.
func kernelPredictionNote(p *KernelPrediction) string {
	if p == nil {
		return ""
	}
	if p.Skipped != "" {
		return "Noise transfer functions: " + p.Skipped + "."
	}
	var each []string
	for _, e := range p.ByProcess {
		each = append(each, fmt.Sprintf("%s: loss %s, bias std %s rad", e.Process, Sci(e.ContrastLoss, 3), Sci(e.BiasStdRad, 3)))
	}
	s := fmt.Sprintf("Noise transfer functions (docs/model.md, Noise transfer functions): the budget's noise processes during the shot are predicted to cost a mean contrast loss of %s and a bias std of %s rad about the nominal shot (contrast %s), to linear order (%s); the ensemble simulates them with the rest of the budget, and the verdict is the ensemble's.",
		Sci(p.ContrastLoss, 3), Sci(p.BiasStdRad, 3), Fixed(p.Contrast, 5), strings.Join(each, "; "))
	for _, w := range p.Warnings {
		s += " Warning: " + w + "."
	}
	return s
}
