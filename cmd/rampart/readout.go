package main

import (
	"fmt"
	"math"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/present"
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

// absBiasP95DegPerH is the 95th percentile of |bias| of a summary as a
// rotation-rate error.
func absBiasP95DegPerH(s mc.Summary) float64 { return mc.BiasDegPerH(s.AbsBiasRad.P95, s.ScaleFactorS) }

// gyroGrid returns the gyroscope figures of an ensemble: its biases as
// rotation rates and, with a read-out, the projection-noise limit and the
// angle random walk (PHYSICS.md section 8).
func gyroGrid(s mc.Summary, g *mc.Gyro) *present.Grid {
	b3 := func(x float64) string { return present.Sci(x, 3) }
	t := present.NewGrid("Gyroscope figures", "Gyroscope figure", "Value", "Unit")
	t.Append("Scale factor K = 2 I phi(T) / hbar", present.Sig(s.ScaleFactorS, 6), "s (rad per rad/s)")
	t.Append("Mean bias as a rotation rate", b3(s.BiasDegPerH.Mean), "deg/h")
	t.Append("|bias| p95 as a rotation rate", b3(absBiasP95DegPerH(s)), "deg/h")
	if g != nil {
		t.Append(fmt.Sprintf("Projection-noise limit per shot, %s atoms at contrast %s", present.Sig(g.Atoms, 6), present.Fixed(g.Contrast, 4)), b3(g.ShotNoiseDegPerH), "deg/h")
		t.Append(fmt.Sprintf("Angle random walk, one shot per %s s", present.Sig(g.CycleS, 6)), b3(g.AngleRandomWalkDegPerSqrtH), "deg/sqrt(h)")
	}
	return t
}

// noReadout says what the gyroscope figures lack without a read-out.
const noReadout = "(For the projection-noise limit and the angle random walk, give the scenario a [readout] table or --atoms and --cycle-s.)"
