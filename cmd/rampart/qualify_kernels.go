package main

import (
	"fmt"

	"rampart/cmd/internal/present"
	"rampart/mc"
	"rampart/sim"
)

// kernelPrediction returns the noise transfer functions' prediction for
// the noise processes of budget b on configuration cfg (the ensemble's,
// numerics resolved), to state beside a verdict (mc.Budget.Processes: the
// noise during the shot and a mains line of random phase): nil when b has
// none, a prediction with Skipped set when their kernels would need more
// than capMiB (twice sim.KernelsBytes, as rampart response).
func kernelPrediction(cfg sim.Config, b mc.Budget, capMiB int) (*present.KernelPrediction, error) {
	if len(b.Processes(cfg.Sequence.Duration())) == 0 {
		return nil, nil
	}
	s, err := sim.NewSimulator(cfg)
	if err != nil {
		return nil, err
	}
	if need := 2 * s.KernelsBytes(0); need > int64(capMiB)<<20 {
		return &present.KernelPrediction{Skipped: fmt.Sprintf("no prediction: the kernels of this sequence would need about %d MiB, more than %d MiB (rampart response --memory-mib computes them)", need>>20, capMiB)}, nil
	}
	k, err := s.Kernels(0)
	if err != nil {
		return nil, err
	}
	procs := b.Processes(k.DurationS)
	if len(procs) == 0 {
		return nil, nil
	}
	all := k.PredictProcesses(procs)
	p := &present.KernelPrediction{Contrast: k.Contrast, ContrastLoss: all.ContrastLoss, BiasStdRad: all.BiasStdRad, Warnings: all.Warnings}
	if p.Warnings == nil {
		p.Warnings = []string{}
	}
	for _, pr := range procs {
		one := k.PredictProcesses([]sim.Process{pr})
		p.ByProcess = append(p.ByProcess, present.KernelProcessEffect{Process: pr.Name, ContrastLoss: one.ContrastLoss, BiasStdRad: one.BiasStdRad})
	}
	return p, nil
}
