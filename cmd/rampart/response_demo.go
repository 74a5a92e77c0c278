package main

import (
	"fmt"

	"rampart/cmd/internal/present"
)

// responseStage is the demo's look at the winner's noise transfer
// functions: which frequencies of intensity and drive phase noise matter,
// and the masks the hardware must meet for the demo's spec (the demo's
// budget has no noise during the shot, so the masks are the whole room).
func (d *demo) responseStage() error {
	budget, req, _, err := d.inputs()
	if err != nil {
		return err
	}
	c := d.cs[d.winner]
	o := responseOptions{memoryMiB: defaultKernelMemoryMiB, bands: "decade", spec: demoSpec}
	rep, _, _, err := computeResponse(nil, c.Scenario, c.Config, budget, &req, o)
	if err != nil {
		return err
	}
	d.response = &rep
	fmt.Fprintf(d.out, "5. Which noise frequencies matter for %s: its noise transfer functions, and the largest intensity and drive phase noise the spec allows\n\n", c.Name)
	if err := present.ResponseKernelGrid(rep).RenderNoted(d.out, present.ResponseKernelNotes(rep)); err != nil {
		return err
	}
	fmt.Fprintln(d.out)
	return present.PrintResponseMasks(d.out, rep)
}
