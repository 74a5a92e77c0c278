package mc

import (
	"context"
	"fmt"
	"math"
)

// SourceDetection is the tolerance axis of the read-out's detection noise
// sigma_d in atoms rms (Readout.DetectionAtoms): the largest detection
// noise at which the measured signal (each bias with the projection noise
// of the read-out's atoms and the detection noise, Readout.MeasuredRecords)
// still meets the requirements. It is not a row of Sources: it draws
// nothing in a shot, and its search runs the ensemble once and reads it
// out at each amplitude.
const SourceDetection = "readout.detection_atoms"

// detectionSource returns the axis of the detection noise of read-out r.
// The search starts from the read-out's detection noise or, without one,
// from sqrt(N) atoms, where the detection noise equals the projection
// noise (PhaseSigmaRad); it goes no further than N atoms rms, a detection
// noise as large as the signal.
func detectionSource(b Budget, r Readout) (source, error) {
	if !(r.Atoms > 0) {
		return source{}, fmt.Errorf("tolerance of %s: no read-out (give the scenario a [readout] table with atoms and cycle_s, or --atoms and --cycle-s)", SourceDetection)
	}
	s := source{name: SourceDetection, unit: "atoms rms", nominal: r.DetectionAtoms, ref: math.Sqrt(r.Atoms), max: r.Atoms,
		set:     func(float64) Budget { return b },
		display: func(a float64) float64 { return a },
	}
	if s.nominal > 0 {
		s.ref = s.nominal
	}
	s.measure = func(a float64, recs []Record, seed uint64) []Record {
		ro := r
		ro.DetectionAtoms = a
		return ro.MeasuredRecords(recs, seed)
	}
	return s, nil
}

// once returns an evaluator that runs eval on its first call and returns
// those records on every call: the detection axis reads one ensemble.
func once(eval Evaluator) Evaluator {
	var recs []Record
	return func(ctx context.Context, b Budget) ([]Record, error) {
		if recs != nil {
			return recs, nil
		}
		r, err := eval(ctx, b)
		if err == nil {
			recs = r
		}
		return r, err
	}
}
