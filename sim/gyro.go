package sim

// Gyro holds a shot's zero-rate bias and scale factor apart, in the terms
// of the gyroscope standards (IEEE Std 952-1997, IEEE Std 528): the phase
// is modelled as Phi(Omega) = b_0 + K_shot Omega, with
//
//	K_shot = dPhi/dOmega   the shot's own scale factor (rad per rad/s),
//	b_0    = Phi - K_shot Omega   the bias at zero rotation,
//	e_K    = K_shot / K - 1       the scale-factor error against the
//	                              nominal K = 2 I phi(T) / hbar.
//
// What K_shot is (docs/model.md, Gyroscope figures). In the adiabatic limit
// arm s picks up the phase (I / 2 hbar) int w_s^2 dt of its co-moving frame,
// w_s = u_s + Omega, whose part linear in Omega is (I / hbar) Omega A_s with
// A_s = int u_s dt the angle its lattice turns. The arms' difference is
// (I / hbar) Omega (A_+ - A_-): with a drive-frequency scale error k this is
// K (1 + k) Omega, the enclosed angle grown by k. But then the arms end
// Delta = 2 k phi(T) apart, and their overlap carries the separation phase
// -l_0 Delta of packets with the momentum l_0 = I Omega / hbar of the
// rotating frame (the separation phase of an open interferometer: P. Storey
// and C. Cohen-Tannoudji, J. Phys. II France 4, 1999 (1994), from memory),
// which is -k K Omega. The sum is K Omega: the open arms read the angle
// that closes, 2 phi(T), not the angle the lattices turned. So neither a
// speed error nor a clock error (which keeps every angle) nor a skew
// (which shifts one arm's motion in time and keeps its angle) changes
// K_shot at first order; what remains are the non-adiabatic lags of the
// packets, of order ppm on fast ramps (TestGyroScaleFactor). K_shot is
// therefore measured, not assumed: by a central difference of the full
// shot in Omega.
type Gyro struct {
	ScaleFactorS        float64 // K_shot, the central difference of the phase in Omega
	NominalScaleFactorS float64 // K = 2 I phi(T) / hbar
	ScaleFactorErrorPPM float64 // (K_shot / K - 1) 1e6
	ZeroRateBiasRad     float64 // wrap(Phi - K_shot Omega)
	StepRadS            float64 // the difference step h in Omega
}

// GyroPhaseStep is the phase K h that the central difference of Gyro spans
// on either side, in rad: large against the shots' phase error (1e-6 rad,
// and the same numerics on both sides, so their errors largely cancel),
// small enough to stay far from the wrap at pi and from the curvature of
// Phi in Omega (the cubic term of a central difference; Phi is linear in
// Omega up to the centrifugal change of the lattice states, of relative order
// (I h / hbar)^2 / l_osc^2).
const GyroPhaseStep = 0.05

// Gyro runs the shot sh at the configured rotation and at Omega +- h, with
// h = GyroPhaseStep / K, on the numerics of s, and returns the shot's
// result and its scale factor and zero-rate bias. It costs three shots.
func (s *Simulator) Gyro(sh Shot) (Result, Gyro, error) {
	res := s.Run(sh, nil)
	k := res.ScaleFactorS
	h := GyroPhaseStep / k
	var phase [2]float64
	for i, sign := range [2]float64{1, -1} {
		c := s.Config()
		c.RotationRadS += sign * h
		o, err := NewSimulator(c)
		if err != nil {
			return Result{}, Gyro{}, err
		}
		phase[i] = o.Run(sh, nil).PhaseRad
	}
	ks := Wrap(phase[0]-phase[1]) / (2 * h)
	g := Gyro{
		ScaleFactorS:        ks,
		NominalScaleFactorS: k,
		ScaleFactorErrorPPM: (ks/k - 1) * 1e6,
		ZeroRateBiasRad:     Wrap(res.PhaseRad - ks*s.cfg.RotationRadS),
		StepRadS:            h,
	}
	return res, g, nil
}
