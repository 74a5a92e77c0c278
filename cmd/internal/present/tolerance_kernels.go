package present

import (
	"fmt"
	"strings"

	"rampart/mc"
)

// kernelToleranceNotes say, for each tolerance found from the noise
// transfer functions, that it was, what it rests on, and what the
// confirming ensemble gave.
func kernelToleranceNotes(rep ToleranceReport) []string {
	var out []string
	for _, res := range rep.Results {
		kt := res.Kernel
		if res.Method != mc.MethodKernels || kt == nil {
			continue
		}
		if res.At == nil || kt.Confirm == nil {
			out = append(out, fmt.Sprintf("%s (kernels): with the source off, the ensemble's estimate of %s is already on the bad side of its limit: no level is left to the process.", res.Source, kt.Binding))
			continue
		}
		c, _ := res.Binding(*res.At)
		f := criterionFormat(c)
		s := fmt.Sprintf("%s (kernels): found from the noise transfer functions (docs/model.md, Noise transfer functions), not searched: %s %s is the level at which the predicted %s meets its limit %s (predicted %s), the process itself costing a mean contrast loss of %s and a bias std %s rad, the rest of the budget taken from the ensemble with it off. The ensemble at that level, the whole budget on, gives the row's values: %s %s, verdict %s",
			res.Source, Sig(kt.Amplitude, 4), res.Unit, kt.Binding, f(c.Limit), f(kt.Predicted), Sci(kt.ContrastLoss, 3), Sci(kt.BiasStdRad, 3), kt.Binding, f(c.Value), *kt.Confirm)
		if *kt.Confirm != mc.Pass {
			s += " (the estimate sits on the limit at a predicted tolerance, so undecided, or a fail within the estimate's standard error, is what agreement looks like; --kernels=false searches the demonstrated tolerance)"
		}
		s += "."
		if len(kt.Unpredicted) > 0 {
			s += " The kernels do not predict " + strings.Join(kt.Unpredicted, " or ") + ": the confirmation alone decides them."
		}
		for _, w := range kt.Warnings {
			s += " Warning: " + w + "; the confirmation is the answer to trust."
		}
		out = append(out, s)
	}
	if rep.KernelsSkipped != "" {
		out = append(out, "Kernels: "+rep.KernelsSkipped+".")
	}
	return out
}
