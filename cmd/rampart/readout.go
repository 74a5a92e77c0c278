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

// readout is the read-out of an ensemble's shots; zero: none given.
type readout struct {
	atoms  float64
	cycleS float64
}

// of returns the read-out of sc with the flags' overrides.
func (o readoutOptions) of(sc *scenario.Scenario) (readout, error) {
	switch {
	case !(o.atoms >= 0) || math.IsInf(o.atoms, 0):
		return readout{}, fmt.Errorf("--atoms %g: want a positive number of atoms per shot", o.atoms)
	case !(o.cycleS >= 0) || math.IsInf(o.cycleS, 0):
		return readout{}, fmt.Errorf("--cycle-s %g: want a positive cycle time in s", o.cycleS)
	}
	r := readout{atoms: sc.Readout.Atoms, cycleS: sc.Readout.CycleS}
	if o.atoms > 0 {
		r.atoms = o.atoms
	}
	if o.cycleS > 0 {
		r.cycleS = o.cycleS
	}
	switch {
	case r.atoms > 0 && r.cycleS == 0:
		return readout{}, fmt.Errorf("--atoms %g needs a cycle time too: give --cycle-s T or cycle_s in the scenario's [readout]", r.atoms)
	case r.cycleS > 0 && r.atoms == 0:
		return readout{}, fmt.Errorf("--cycle-s %g needs the atoms per shot too: give --atoms N or atoms in the scenario's [readout]", r.cycleS)
	}
	return r, nil
}

// gyro returns the gyroscope figures of an ensemble summary (mc.Summary.Gyro),
// nil without a read-out or without a fringe to read.
func (r readout) gyro(s mc.Summary) *mc.Gyro {
	if r.atoms == 0 || !(s.Contrast.Mean > 0) || !(s.ScaleFactorS > 0) {
		return nil
	}
	g := s.Gyro(r.atoms, r.cycleS)
	return &g
}
