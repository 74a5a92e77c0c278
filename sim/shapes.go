package sim

import (
	"fmt"
	"strings"
)

// Shape is an entry of the registry of analytic ramp shapes: the scenario
// reader, the ramp variants of a ranking and the help texts all read
// Shapes, so a shape added here is accepted everywhere.
type Shape struct {
	Name    string // the value of ramp.shape, "sin2"
	Meaning string // one line, for help
	// Designed reports whether the shape is designed for a lattice depth
	// (the design depth of New; others ignore it and the ring).
	Designed bool
	// New returns the ramp-up of the shape over durationS to cruiseRadS,
	// designed (if Designed) for the trap of ring r at V0/h = designDepthHz.
	New func(r Ring, durationS, cruiseRadS, designDepthHz float64) (Ramp, error)
}

// Shapes is the registry of analytic ramp shapes (docs/model.md, Ramp
// shapes). A tabulated ramp (Tabulated) is not a shape: it is read from a
// file.
var Shapes = []Shape{
	{Name: "sin2", Meaning: "Omega(t) = Omega_0 sin^2(pi t / 2 t_r)",
		New: func(_ Ring, d, w, _ float64) (Ramp, error) {
			if err := checkRamp(d, w); err != nil {
				return nil, err
			}
			return Sin2{d, w}, nil
		}},
	{Name: "minjerk", Meaning: "the minimum-jerk quintic in t / t_r",
		New: func(_ Ring, d, w, _ float64) (Ramp, error) {
			if err := checkRamp(d, w); err != nil {
				return nil, err
			}
			return MinJerk{d, w}, nil
		}},
	{Name: "inverse", Meaning: "inverse-engineered for the harmonic trap at the design depth", Designed: true,
		New: func(r Ring, d, w, depthHz float64) (Ramp, error) { return NewInverse(r, d, w, depthHz) }},
	{Name: "inverse-gap", Meaning: "inverse-engineered for the lattice's band gap at quasi-momentum 0 at the design depth", Designed: true,
		New: func(r Ring, d, w, depthHz float64) (Ramp, error) { return NewInverseGap(r, d, w, depthHz) }},
}

// ShapeNames returns the names of Shapes, in registry order.
func ShapeNames() []string {
	names := make([]string, len(Shapes))
	for i, s := range Shapes {
		names[i] = s.Name
	}
	return names
}

// LookupShape returns the registered shape of the given name.
func LookupShape(name string) (Shape, error) {
	for _, s := range Shapes {
		if s.Name == name {
			return s, nil
		}
	}
	return Shape{}, fmt.Errorf("unknown ramp shape %q (want %s or file)", name, strings.Join(ShapeNames(), ", "))
}
