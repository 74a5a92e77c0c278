package sim

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestRotationNoiseWhite checks the Sagnac phase of a rotation-rate
// record against the closed form for white noise (docs/model.md,
// Perturbations, platform rotation): Phi = integral w(t) delta Omega(t) dt
// with w = I (a_+' - a_-') / hbar = 2 I Omega_arm(t) / hbar, so that for
// white noise of one-sided level S_0, Var Phi = (S_0 / 2) integral w^2 dt.
// For the sin2 ramp Omega_arm = Omega_0 sin^2(pi t / 2 t_r), whose
// integral of sin^4 over a ramp is 3 t_r / 8, so
//
//	integral w^2 dt = (2 I Omega_0 / hbar)^2 (T_cruise + 3 t_r / 4).
//
// The records are iid normal samples of variance sigma^2 on a step dt,
// interpolated linearly: white noise of one-sided level S_0 = 2 sigma^2 dt
// (the sampled white noise of IEEE Std 1139; common practice) well below
// 1/dt. 3000 records: the variance's standard error is sqrt(2/3000) =
// 2.6 %; tolerance 4 standard errors. A constant rate must give K Omega.
func TestRotationNoiseWhite(t *testing.T) {
	cfg := potentialConfig(t, 1, 150e-6)
	s, err := NewSimulator(cfg)
	if err != nil {
		t.Fatal(err)
	}
	drives := s.drives(Shot{})
	end := math.Max(drives[0].times()[3], drives[1].times()[3])
	const dt, sigma, n = 5e-6, 1e-3, 3000
	m := int(math.Ceil(end/dt)) + 2
	// A constant rate: the Sagnac phase K Omega.
	const omega = 1e-3
	flat := &Series{StepS: dt, Values: make([]float64, m)}
	for i := range flat.Values {
		flat.Values[i] = omega
	}
	k := cfg.Ring.ScaleFactor(cfg.Sequence.TotalAngle())
	if got := RotationNoisePhaseRad(cfg.Ring, 0, drives, end, flat); math.Abs(got-k*omega) > 1e-9*k*omega {
		t.Errorf("constant rate: phase %.10g rad, want K Omega = %.10g", got, k*omega)
	}
	if got := RotationNoisePhaseRad(cfg.Ring, 1e-3, drives, end, flat); math.Abs(got-k*omega*1.001*1.001) > 1e-9*k*omega {
		t.Errorf("constant rate, radius error 1e-3: phase %.10g rad, want K (1+r)^2 Omega = %.10g", got, k*omega*1.001*1.001)
	}

	// With a skew of 30 us and a clock error the arms move at different
	// times, but the enclosed area is still 2 phi(T) R^2 / 2 per arm.
	skewed := s.drives(Shot{SkewS: 30e-6, ClockRel: 1e-3})
	skewEnd := math.Max(skewed[0].times()[3], skewed[1].times()[3])
	if got := RotationNoisePhaseRad(cfg.Ring, 0, skewed, skewEnd, flat); math.Abs(got-k*omega) > 1e-9*k*omega {
		t.Errorf("constant rate, skew and clock error: phase %.10g rad, want K Omega = %.10g", got, k*omega)
	}
	// Through a shot: the same factor on z.
	nominal := s.Run(Shot{}, nil)
	if d := Wrap(s.Run(Shot{RotationNoise: flat}, nil).PhaseRad - nominal.PhaseRad); math.Abs(d-k*omega) > 1e-9 {
		t.Errorf("shot with a constant rate record: phase moves by %.10g rad, want K Omega = %.10g", d, k*omega)
	}

	rng := rand.New(rand.NewPCG(1, 2))
	var sum, sum2 float64
	rec := &Series{StepS: dt, Values: make([]float64, m)}
	for range n {
		for i := range rec.Values {
			rec.Values[i] = sigma * rng.NormFloat64()
		}
		p := RotationNoisePhaseRad(cfg.Ring, 0, drives, end, rec)
		sum += p
		sum2 += p * p
	}
	mean := sum / n
	v := sum2/n - mean*mean
	w0 := 2 * cfg.Ring.Inertia() * cfg.Sequence.CruiseSpeed() / Hbar
	tr := cfg.Sequence.Up.Duration()
	want := sigma * sigma * dt * w0 * w0 * (cfg.Sequence.CruiseS + 3*tr/4) // (S_0/2) integral w^2, S_0 = 2 sigma^2 dt
	se := want * math.Sqrt(2.0/n)
	t.Logf("Var Phi %.5g rad^2, closed form %.5g (se %.2g)", v, want, se)
	if math.Abs(v-want) > 4*se {
		t.Errorf("Var Phi %.5g rad^2, want (S_0/2) integral w^2 = %.5g (4 se %.2g)", v, want, 4*se)
	}
	if math.Abs(mean) > 4*math.Sqrt(want/n) {
		t.Errorf("mean phase %.3g rad, want 0 (4 se %.2g)", mean, 4*math.Sqrt(want/n))
	}
}
