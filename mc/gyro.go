package mc

import (
	"fmt"
	"math"

	"rampart/sim"
)

// Gyro holds the gyroscope figures of an interferometer read out with
// Atoms atoms per shot every CycleS seconds (docs/model.md, Gyroscope figures). With
// scale factor K (rad per rad/s) and contrast C, the phase of one shot is
// known to the atom projection-noise limit 1 / (C sqrt(N_at)) rad, so
//
//	dOmega = 1 / (K C sqrt(N_at))   rad/s per shot,
//	ARW    = dOmega sqrt(T_c)       rad/sqrt(s),
//
// the angle random walk: the white rotation-rate noise that averages down as
// dOmega sqrt(T_c / tau) over a time tau, which is how IEEE Std 952 reads
// it off an Allan deviation (at tau = 1 on the -1/2 slope). Gyroscope users
// quote it in deg/sqrt(h): since sqrt(s) = sqrt(h) / 60,
//
//	1 rad/sqrt(s) = (180 / pi) 60 deg/sqrt(h) = 3437.75 deg/sqrt(h).
//
// References:
//   - IEEE Std 952-1997, IEEE Standard Specification Format Guide and Test
//     Procedure for Single-Axis Interferometric Fiber Optic Gyros (its
//     Allan variance noise model).
type Gyro struct {
	ScaleFactorS float64 `json:"scale_factor_s"`
	Contrast     float64 `json:"contrast"`
	Atoms        float64 `json:"atoms"`
	CycleS       float64 `json:"cycle_s"`
	// ShotNoiseRadS is dOmega, the projection-noise limit of one shot,
	// ShotNoiseDegPerH the same in deg/h.
	ShotNoiseRadS    float64 `json:"projection_noise_rad_s"`
	ShotNoiseDegPerH float64 `json:"projection_noise_deg_per_h"`
	// AngleRandomWalkDegPerSqrtH is dOmega sqrt(T_c) in deg/sqrt(h).
	AngleRandomWalkDegPerSqrtH float64 `json:"angle_random_walk_deg_per_sqrt_h"`
}

// GyroFigures returns the gyroscope figures of a sequence of scale factor
// scaleFactorS and contrast, read out with atoms atoms per shot every
// cycleS seconds. It panics unless all four are positive and finite.
func GyroFigures(scaleFactorS, contrast, atoms, cycleS float64) Gyro {
	for _, v := range []float64{scaleFactorS, contrast, atoms, cycleS} {
		if !(v > 0 && !math.IsInf(v, 1)) {
			panic(fmt.Sprintf("mc: gyroscope figures need positive finite scale factor, contrast, atoms and cycle time, got %g, %g, %g, %g",
				scaleFactorS, contrast, atoms, cycleS))
		}
	}
	shot := 1 / (scaleFactorS * contrast * math.Sqrt(atoms))
	return Gyro{
		ScaleFactorS: scaleFactorS, Contrast: contrast, Atoms: atoms, CycleS: cycleS,
		ShotNoiseRadS:              shot,
		ShotNoiseDegPerH:           sim.RadPerSToDegPerH(shot),
		AngleRandomWalkDegPerSqrtH: RadPerSqrtSToDegPerSqrtH(shot * math.Sqrt(cycleS)),
	}
}

// Gyro returns the gyroscope figures of the summarised ensemble with its
// mean shot contrast: each shot's phase is read from its own fringe, so the
// projection noise is set by the contrast of a shot, not by that of a fringe
// averaged over shots (whose loss comes from the shot-to-shot bias scatter,
// a separate noise).
func (s Summary) Gyro(atoms, cycleS float64) Gyro {
	return GyroFigures(s.ScaleFactorS, s.Contrast.Mean, atoms, cycleS)
}

// BiasDegPerH converts a bias phase in rad to the rotation-rate error
// b / K in deg/h.
func BiasDegPerH(biasRad, scaleFactorS float64) float64 {
	return sim.RadPerSToDegPerH(biasRad / scaleFactorS)
}

// RadPerSqrtSToDegPerSqrtH converts an angle random walk from rad/sqrt(s) to
// deg/sqrt(h), multiplying by (180 / pi) 60.
func RadPerSqrtSToDegPerSqrtH(x float64) float64 { return x * 180 / math.Pi * 60 }
