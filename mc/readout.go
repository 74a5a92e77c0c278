package mc

// Readout is the read-out of an ensemble's shots; zero: none given.
type Readout struct {
	Atoms  float64 // atoms detected per shot N_at
	CycleS float64 // cycle time T_c of one shot, s
	// DetectionAtoms is the detection noise sigma_d, atoms rms on the
	// measured difference N_1 - N_2 (0: projection noise alone;
	// PhaseSigmaRad).
	DetectionAtoms float64
}

// Gyro returns the gyroscope figures of an ensemble summary (Summary.Gyro),
// nil without a read-out or without a fringe to read.
func (r Readout) Gyro(s Summary) *Gyro {
	if r.Atoms == 0 || !(s.Contrast.Mean > 0) || !(s.ScaleFactorS > 0) {
		return nil
	}
	g := s.Gyro(r.Atoms, r.CycleS)
	return &g
}
