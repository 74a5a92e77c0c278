package main

import (
	"context"
	"fmt"

	"rampart/mc"
	"rampart/sim"
)

// toleranceKernels computes the noise transfer functions of a tolerance
// search's nominal shot once, when the first noise process is searched,
// unless their memory estimate is above the cap (then the processes are
// searched by Monte Carlo and Skipped says why).
type toleranceKernels struct {
	cfg     sim.Config
	capMiB  int
	done    bool
	k       *sim.Kernels
	Skipped string
}

// get returns the kernels, or nil when they are not used.
func (tk *toleranceKernels) get() (*sim.Kernels, error) {
	if tk.done {
		return tk.k, nil
	}
	tk.done = true
	s, err := sim.NewSimulator(tk.cfg)
	if err != nil {
		return nil, err
	}
	if need := 2 * s.KernelsBytes(0); need > int64(tk.capMiB)<<20 {
		tk.Skipped = fmt.Sprintf("the noise processes were searched by Monte Carlo: their kernels would need about %d MiB, more than the %d MiB the tolerance search allows them (rampart response --memory-mib)", need>>20, tk.capMiB)
		return nil, nil
	}
	if tk.k, err = s.Kernels(0); err != nil {
		return nil, err
	}
	return tk.k, nil
}

// searchSource searches the tolerance of one source: a noise process from
// the kernels (mc.ToleranceSearch.Kernel) when tk is given and they fit,
// anything else by the Monte Carlo search.
func searchSource(ctx context.Context, search mc.ToleranceSearch, eval mc.Evaluator, name string, tk *toleranceKernels) (mc.ToleranceResult, error) {
	if row, ok := mc.LookupSource(name); ok && row.Kind == mc.Process && tk != nil {
		k, err := tk.get()
		if err != nil {
			return mc.ToleranceResult{}, err
		}
		if k != nil {
			return search.Kernel(ctx, eval, k, name)
		}
	}
	return search.Source(ctx, eval, name)
}
