package main

import (
	"fmt"
	"math"

	"github.com/spf13/cobra"

	"rampart/mc"
	"rampart/scenario"
)

// readoutOptions are --atoms and --cycle-s, the read-out behind the
// gyroscope figures; each overrides its key of the scenario's [readout].
type readoutOptions struct {
	atoms  float64
	cycleS float64
}

func addReadoutFlags(cmd *cobra.Command, o *readoutOptions) {
	f := cmd.Flags()
	f.Float64Var(&o.atoms, "atoms", 0, "atoms `N` detected per shot, for the projection-noise limit and angle random walk (default: the scenario's [readout] atoms)")
	f.Float64Var(&o.cycleS, "cycle-s", 0, "cycle time `T` of one shot in s, for the angle random walk (default: the scenario's [readout] cycle_s)")
}

// of returns the read-out of sc with the flags' overrides.
func (o readoutOptions) of(sc *scenario.Scenario) (mc.Readout, error) {
	switch {
	case !(o.atoms >= 0) || math.IsInf(o.atoms, 0):
		return mc.Readout{}, fmt.Errorf("--atoms %g: want a positive number of atoms per shot", o.atoms)
	case !(o.cycleS >= 0) || math.IsInf(o.cycleS, 0):
		return mc.Readout{}, fmt.Errorf("--cycle-s %g: want a positive cycle time in s", o.cycleS)
	}
	r := mc.Readout{Atoms: sc.Readout.Atoms, CycleS: sc.Readout.CycleS, DetectionAtoms: sc.Readout.DetectionAtoms}
	if o.atoms > 0 {
		r.Atoms = o.atoms
	}
	if o.cycleS > 0 {
		r.CycleS = o.cycleS
	}
	switch {
	case r.Atoms > 0 && r.CycleS == 0:
		return mc.Readout{}, fmt.Errorf("--atoms %g needs a cycle time too: give --cycle-s T or cycle_s in the scenario's [readout]", r.Atoms)
	case r.CycleS > 0 && r.Atoms == 0:
		return mc.Readout{}, fmt.Errorf("--cycle-s %g needs the atoms per shot too: give --atoms N or atoms in the scenario's [readout]", r.CycleS)
	}
	return r, nil
}
