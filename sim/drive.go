package sim

// Drive is the motion and depth of one arm's lattice in the inertial frame,
// the sequence as the hardware plays it:
//
//	a(t) = Sign Scale phi(Rate (t - DelayS)) + RotationRadS t + Jitter(t)
//	g(t) = 1 + DepthRel + DepthNoise(t)        (relative depth)
//
// Rate is the waveform clock factor 1 + kappa (the profile plays faster, the
// angle is kept); Scale the drive-frequency scale 1 + k (speed and angle
// scale). Zero Rate or Scale mean 1. Jitter and DepthNoise may be nil.
type Drive struct {
	Seq          Sequence
	Sign         float64
	Rate         float64
	Scale        float64
	DelayS       float64
	RotationRadS float64
	DepthRel     float64
	Jitter       *Series
	DepthNoise   *Series
}

func (d Drive) rate() float64 {
	if d.Rate == 0 {
		return 1
	}
	return d.Rate
}

func (d Drive) scale() float64 {
	if d.Scale == 0 {
		return 1
	}
	return d.Scale
}

// Angle returns a(t) in rad, jitter included.
func (d Drive) Angle(t float64) float64 {
	return d.Sign*d.scale()*d.Seq.Angle(d.rate()*(t-d.DelayS)) + d.RotationRadS*t + d.Jitter.At(t)
}

// Speed returns the commanded angular velocity in rad/s (jitter excluded).
func (d Drive) Speed(t float64) float64 {
	return d.Sign*d.scale()*d.rate()*d.Seq.Speed(d.rate()*(t-d.DelayS)) + d.RotationRadS
}

// Depth returns g(t).
func (d Drive) Depth(t float64) float64 { return 1 + d.DepthRel + d.DepthNoise.At(t) }

// times returns the start of the ramp-up, the start of the cruise, the start
// of the ramp-down and the end of the drive, in inertial time.
func (d Drive) times() [4]float64 {
	r, tr := d.rate(), d.Seq.Up.Duration()
	return [4]float64{
		d.DelayS,
		d.DelayS + tr/r,
		d.DelayS + (tr+d.Seq.CruiseS)/r,
		d.DelayS + d.Seq.Duration()/r,
	}
}

// cruiseSpeed returns the angular velocity during the cruise.
func (d Drive) cruiseSpeed() float64 {
	return d.Sign*d.scale()*d.rate()*d.Seq.CruiseSpeed() + d.RotationRadS
}

// noisy reports whether the lattice moves or breathes off the commanded
// profile during stretches that are otherwise constant.
func (d Drive) noisy() bool { return d.Jitter != nil || d.DepthNoise != nil }

func (d Drive) angle(t float64) float64 { return d.Angle(t) }
func (d Drive) depth(t float64) float64 { return d.Depth(t) }
