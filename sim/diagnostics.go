package sim

import "math"

// Diagnostics describes one arm's lowest level in the frame co-moving with
// its lattice.
type Diagnostics struct {
	Arm             int     // 0: s = +1, 1: s = -1
	TimeS           float64 // inertial time
	OffsetRad       float64 // mean angular offset from the nearest lattice minimum, arg<e^{iN theta}>/N
	WidthRad        float64 // rms angular width, sqrt(-2 ln|<e^{iN theta}>|)/N (exact for a Gaussian packet)
	VelocityErrRadS float64 // <L>/I - w, the packet's angular velocity relative to the lattice
	GroundBand      float64 // population in the lowest band of the co-moving lattice
	Norm            float64
}

// Observer receives diagnostics along a shot.
type Observer func(Diagnostics)

// TraceSamples is the number of samples an observer receives over each
// ramp and over the cruise. An observed shot takes at least TraceSamples
// split steps on each ramp (finer than the automatic step of short ramps,
// so its results can differ from an unobserved shot's within the numerical
// tolerance).
const TraceSamples = 100

func (p *propagator) observe(obs Observer, arm int, t float64, f *field, d Drive, es *eigensystem) {
	if obs == nil {
		return
	}
	if es == nil {
		es = diagonaliseFor(p, d.Speed(t), d.Depth(t))
	}
	obs(p.diagnose(f, d, arm, t, es))
}

// splitStepsObserved is splitSteps with an observation every few steps.
func (p *propagator) splitStepsObserved(f *field, d Drive, t0, t1 float64, n int, obs Observer, arm int) {
	if obs == nil || n < 1 {
		p.splitSteps(f, d, t0, t1, n)
		return
	}
	n = max(n, TraceSamples)
	chunk := max(1, n/TraceSamples)
	dt := (t1 - t0) / float64(n)
	for i := 0; i < n; i += chunk {
		m := min(chunk, n-i)
		ta := t0 + float64(i)*dt
		tb := t0 + float64(i+m)*dt
		if i+m == n {
			tb = t1
		}
		p.splitSteps(f, d, ta, tb, m)
		p.observe(obs, arm, tb, f, d, nil)
	}
}

// stretchObserved is stretch with observations: every sixteenth of a
// trap period over the first and last EdgePeriods trap periods of the
// stretch, where the motion left by a ramp shows, and TraceSamples evenly
// in between (too few to resolve the oscillation there: plot the edges).
func (p *propagator) stretchObserved(f *field, d Drive, w, t0, t1, noiseStep float64, es *eigensystem, obs Observer, arm int) {
	if obs == nil || t1 <= t0 {
		p.stretch(f, d, w, t0, t1, noiseStep, es)
		return
	}
	period := 2 * math.Pi / (float64(p.b.Sites) * math.Sqrt(p.v0*p.rot))
	edge := math.Min(EdgePeriods*period, (t1-t0)/2)
	var times []float64
	add := func(a, b float64, n int) {
		for i := 1; i <= n; i++ {
			times = append(times, a+(b-a)*float64(i)/float64(n))
		}
	}
	m := int(math.Ceil(16 * edge / period))
	add(t0, t0+edge, m)
	if t1-edge > t0+edge {
		add(t0+edge, t1-edge, TraceSamples)
	}
	add(t1-edge, t1, m)
	ta := t0
	for _, tb := range times {
		es = p.stretch(f, d, w, ta, tb, noiseStep, es)
		p.observe(obs, arm, tb, f, d, es)
		ta = tb
	}
}

// EdgePeriods is the number of trap periods at each end of a constant
// stretch that an observer sees resolved.
const EdgePeriods = 3

func (p *propagator) diagnose(f *field, d Drive, arm int, t float64, es *eigensystem) Diagnostics {
	b := f.b
	k, n, wd := b.Block, b.Sites, f.width()
	cols := 2 * wd
	var norm, lsum, er, ei float64
	for j := range k {
		for c := range n {
			xr, xi := f.x[j*cols+c], f.x[j*cols+wd+c]
			p := xr*xr + xi*xi
			norm += p
			lsum += p * float64(b.L(c, j))
			if j+1 < k {
				// <e^{iN theta}> = sum_l conj(psi_{l+N}) psi_l
				yr, yi := f.x[(j+1)*cols+c], f.x[(j+1)*cols+wd+c]
				er += yr*xr + yi*xi
				ei += yr*xi - yi*xr
			}
		}
	}
	fn := float64(n)
	mag := math.Hypot(er, ei) / norm
	inertia := Hbar / (2 * p.rot)
	return Diagnostics{
		Arm:             arm,
		TimeS:           t,
		OffsetRad:       math.Atan2(ei, er) / fn,
		WidthRad:        math.Sqrt(math.Max(0, -2*math.Log(mag))) / fn,
		VelocityErrRadS: Hbar*lsum/norm/inertia - d.Speed(t),
		GroundBand:      groundPopulation(f, es, 0),
		Norm:            norm,
	}
}
