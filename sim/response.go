package sim

import (
	"fmt"
	"math"
	"sync"
)

// Channel is a noise process during the shot whose effect the transfer
// functions (Kernels) describe.
type Channel int

// The channels. Common is the mean of the two arms' noise, differential
// their difference, as for the static depth errors:
//
//	intensity: eps_+ = eps_c + eps_d/2,          eps_- = eps_c - eps_d/2   (relative depth)
//	phase:     alpha_+ = alpha_c + alpha_d/2,    alpha_- = alpha_c - alpha_d/2  (drive phase, rad;
//	           the lattice moves by alpha/N)
//	shift:     H_+ += h nu_d/2,  H_- -= h nu_d/2 (a differential energy shift in Hz, e.g. a
//	           magnetic field on the two spin states: phase -2 pi nu_d T)
//	rotation:  the platform's rotation rate dOmega (rad/s) during the shot, phase
//	           int w dOmega dt through the arms' enclosed-area rate w (RotationNoisePhaseRad)
//
// Two arms' drive phases of PSD S and correlation rho have a common part of
// PSD S (1+rho)/2 and a differential part of PSD 2 S (1-rho), uncorrelated
// (see PhaseNoise).
const (
	IntensityCommon Channel = iota
	IntensityDifferential
	PhaseCommon
	PhaseDifferential
	PhasePlus     // drive phase noise on arm s = +1 alone
	PhaseMinus    // drive phase noise on arm s = -1 alone
	IntensityPlus // intensity noise on arm s = +1 alone
	ShiftDifferential
	Rotation // the platform's rotation-rate noise, a pure phase (rotationKernel)
	numChannels
)

var channelNames = [...]string{"intensity_common", "intensity_differential", "phase_common",
	"phase_differential", "phase_plus", "phase_minus", "intensity_plus", "shift_differential", "rotation"}

// String returns the channel's name.
func (c Channel) String() string {
	if c < 0 || c >= numChannels {
		return fmt.Sprintf("Channel(%d)", int(c))
	}
	return channelNames[c]
}

// Unit returns the unit of the channel's noise signal (its PSD is in
// unit^2/Hz).
func (c Channel) Unit() string {
	switch c {
	case IntensityCommon, IntensityDifferential, IntensityPlus:
		return "1"
	case ShiftDifferential:
		return "Hz"
	case Rotation:
		return "rad/s"
	}
	return "rad"
}

// ChannelKernel holds one channel's transfer functions on the frequency
// grid of its Kernels: for a one-sided PSD S(f) of the channel's signal,
//
//	Var(bias)           = int S(f) Bias(f) df,      Bias = |G_phi(f)|^2 in rad^2 per unit^2
//	E[C] - C0 (a loss)  = -int S(f) Contrast(f) df, Contrast = K_C(f) in 1 per unit^2
//
// to first order in the bias and to second order in the contrast.
type ChannelKernel struct {
	Channel  Channel
	Bias     []float64
	Contrast []float64
}

// Kernels are the noise transfer functions of one configuration's nominal
// shot, on the uniform grid FrequencyHz[m] = m StepHz.
type Kernels struct {
	FrequencyHz []float64
	StepHz      float64
	SampleStepS float64 // time step of the sampled interaction-picture operators
	DurationS   float64 // T, first to second pulse
	TrapHz      float64
	Contrast    float64 // C0 of the nominal shot
	PhaseRad    float64 // arg z0
	Channels    []ChannelKernel
}

// Channel returns the kernel of channel c.
func (k *Kernels) Channel(c Channel) *ChannelKernel {
	for i := range k.Channels {
		if k.Channels[i].Channel == c {
			return &k.Channels[i]
		}
	}
	panic(fmt.Sprintf("sim: no kernel for channel %v", c))
}

// Kernels returns the noise transfer functions of every Channel for the
// nominal shot, up to maxHz (zero: NoiseBandHz, the band of the noise
// records a Monte Carlo draws).
//
// Each arm a = +, - evolves under its nominal co-moving Hamiltonian H_a
// (propagator U_a) plus x_a(t) W, x_a = c_a xi(t) for the channel's noise
// signal xi of one-sided PSD S and coefficients c_a:
//
//	W = V                    depth modulation (x = eps)
//	W = -V' + x V''/2        lattice displacement (x = delta a = alpha/N), and the
//	                         start state displaced with the lattice, exp(-i l x(0))
//	W = 2 pi                 differential shift (x = nu, Hz)
//
// (The rotation channel is a pure phase, linear in the noise, whose
// kernels follow from the nominal drives alone: rotationKernel.)
//
// In the interaction picture W~(t) = U^+ W U, with psi0 the start level,
// D = exp(-i l (a_+(T) - a_-(T))) the lab-frame map at the end and
// M = U_-(T)^+ D U_+(T), so that z0 = <psi0|M psi0>, and the partner states
// m_+ = M^+ psi0, m_- = M psi0,
//
//	dz1 = int xi(t) rho(t) dt,  rho = -i c_+ <m_+|W~_+ psi0> + i c_- <W~_- psi0|m_->
//	dz2 = <m_+|A2_+ psi0> + <A2_- psi0|m_-> + <A1_- psi0|M A1_+ psi0>,
//	A1 = -i int x W~,  A2 = -int_{t>t'} x(t) x(t') W~(t) W~(t') - i int x^2 W~2.
//
// With E[xi(t) xi(t')] = int S(f) cos(2 pi f (t-t')) df and u = z0/|z0|,
// the bias is Im(u* dz1)/C0 and the contrast |z| = C0 + Re(u* dz) +
// Im(u* dz1)^2/(2 C0), so
//
//	Bias(f)     = |H(f)|^2,  H = int e^{-i w t} Im(u* rho(t))/C0 dt
//	Contrast(f) = -Re(u* dz2(f)) - C0 Bias(f)/2
//
// with dz2(f) the coefficient of S(f) in E[dz2]. Only the ramps are
// sampled: in the cruise W~(t) psi0 and W~(t) m_a are sums of exponentials
// over the cruise Hamiltonian's eigenstates, whose transforms and ordered
// double integrals are closed forms (closedSpectra); pairs of times in
// different regions (ramp up, cruise, ramp down) factorise, and so does the
// cross-arm term. The derivation is in docs/model.md, section "Noise
// transfer functions", Computation.
//
// References:
//
//	P. Cheinet et al., "Measurement of the sensitivity function in a
//	time-domain atomic interferometer", IEEE Trans. Instrum. Meas. 57, 1141
//	(2008).
//	T. J. Green, H. Uys and M. J. Biercuk, "Arbitrary quantum control of
//	qubits in the presence of universal noise", New J. Phys. 15, 095004
//	(2013).
//	T. A. Savard, K. M. O'Hara and J. E. Thomas, "Laser-noise-induced
//	heating in far-off resonance optical traps", Phys. Rev. A 56, R1095
//	(1997).
func (s *Simulator) Kernels(maxHz float64) (*Kernels, error) {
	return s.KernelsProgress(maxHz, nil)
}

// KernelsProgress is Kernels that reports its progress: progress, if not
// nil, is called with the units of work done so far out of total (one
// frequency of one operator and start level each), from any goroutine,
// one call at a time, every few dozen units.
func (s *Simulator) KernelsProgress(maxHz float64, progress func(done, total int)) (*Kernels, error) {
	return s.kernels(maxHz, func(rs *responseSetup) [2]*opSpectra {
		if progress != nil {
			total := len(responseOps) * (rs.m + 1) * len(rs.weights)
			var mu sync.Mutex
			done := 0
			rs.progress = func(k int) {
				mu.Lock()
				defer mu.Unlock()
				done += k
				progress(done, total)
			}
		}
		return s.closedSpectra(rs)
	})
}

// kernels is Kernels with the operators' spectra from spectra: the closed
// form of the cruise (closedSpectra), or the sampled reference
// (spectraSampled) the tests compare it with.
func (s *Simulator) kernels(maxHz float64, spectra func(*responseSetup) [2]*opSpectra) (*Kernels, error) {
	if maxHz < 0 || math.IsNaN(maxHz) || math.IsInf(maxHz, 0) {
		return nil, fmt.Errorf("kernel band %g Hz is not a finite non-negative frequency (0 means the simulator's noise band)", maxHz)
	}
	if s.cfg.Sequence.echo() {
		return nil, fmt.Errorf("the noise transfer functions of an echo sequence (%d segments) are not computed: its packets change lattice at every swap, which the kernels do not follow", s.cfg.Sequence.Segments)
	}
	rs := s.responseSetup(maxHz)
	var z0 complex128
	for n, w := range rs.weights {
		z0 += complex(w, 0) * rs.z0[n]
	}
	k := &Kernels{
		StepHz:      1 / (float64(rs.l) * rs.h),
		SampleStepS: rs.h,
		DurationS:   float64(rs.nt) * rs.h,
		TrapHz:      s.cfg.Ring.TrapHz(s.cfg.DepthHz),
		Contrast:    cmplxAbs(z0),
		PhaseRad:    math.Atan2(imag(z0), real(z0)),
	}
	for m := 0; m <= rs.m; m++ {
		k.FrequencyHz = append(k.FrequencyHz, float64(m)*k.StepHz)
	}
	sp := spectra(rs)
	lattice, slope := sp[0], sp[1]
	shift := rs.shiftSpectra()
	n := float64(s.cfg.Ring.Sites)
	for c := range numChannels {
		var sp *opSpectra
		var cp, cm float64
		switch c {
		case IntensityCommon:
			sp, cp, cm = lattice, 1, 1
		case IntensityDifferential:
			sp, cp, cm = lattice, 0.5, -0.5
		case PhaseCommon:
			sp, cp, cm = slope, 1/n, 1/n
		case PhaseDifferential:
			sp, cp, cm = slope, 0.5/n, -0.5/n
		case PhasePlus:
			sp, cp, cm = slope, 1/n, 0
		case PhaseMinus:
			sp, cp, cm = slope, 0, 1/n
		case IntensityPlus:
			sp, cp, cm = lattice, 1, 0
		case ShiftDifferential:
			sp, cp, cm = shift, 0.5, -0.5
		case Rotation:
			k.Channels = append(k.Channels, rotationKernel(rs.drives, s.cfg.Ring.Inertia(), k.StepHz, rs.m))
			continue
		}
		k.Channels = append(k.Channels, assemble(c, sp, cp, cm, z0))
	}
	return k, nil
}

// assemble forms a channel's kernels from its operator's spectra.
func assemble(ch Channel, sp *opSpectra, cp, cm float64, z0 complex128) ChannelKernel {
	c0 := cmplxAbs(z0)
	u := z0 / complex(c0, 0)
	nf := len(sp.x[0])
	out := ChannelKernel{Channel: ch, Bias: make([]float64, nf), Contrast: make([]float64, nf)}
	icp, icm := complex(0, cp), complex(0, cm)
	conj := complexConj
	for m := range nf {
		rp := -icp*sp.r[0][0][m] + icm*conj(sp.r[1][1][m]) // rho at +w
		rn := -icp*sp.r[0][1][m] + icm*conj(sp.r[1][0][m]) // rho at -w
		hh := (conj(u)*rp - u*conj(rn)) / complex(0, 2*c0)
		g2 := real(hh)*real(hh) + imag(hh)*imag(hh)
		jp := (sp.j[0][0][m] + sp.j[0][1][m]) / 2
		jm := (sp.j[1][0][m] + sp.j[1][1][m]) / 2
		xc := (sp.x[0][m] + sp.x[1][m]) / 2
		dz2 := complex(-cp*cp, 0)*jp - complex(cm*cm, 0)*conj(jm) + complex(cp*cm, 0)*xc -
			complex(0, cp*cp)*sp.q2[0] + complex(0, cm*cm)*conj(sp.q2[1])
		out.Bias[m] = g2
		out.Contrast[m] = -real(conj(u)*dz2) - c0*g2/2
	}
	return out
}

// shiftSpectra returns the spectra of the operator 2 pi (a uniform energy
// shift of nu = 1 Hz), in closed form: W~(t) = 2 pi whatever the motion.
func (rs *responseSetup) shiftSpectra() *opSpectra {
	T := float64(rs.nt) * rs.h
	M := rs.m
	out := &opSpectra{}
	for a := range 2 {
		for sg := range 2 {
			out.r[a][sg] = make([]complex128, M+1)
			out.j[a][sg] = make([]complex128, M+1)
		}
	}
	for sg := range 2 {
		out.x[sg] = make([]complex128, M+1)
	}
	const tau = 2 * math.Pi
	for m := 0; m <= M; m++ {
		w := 2 * math.Pi * float64(m) / (float64(rs.l) * rs.h)
		for sg, ws := range [2]float64{w, -w} {
			i, kappa := phaseIntegrals(ws, T)
			for n, p := range rs.weights {
				pw := complex(p, 0)
				for a := range 2 {
					ov := dot(rs.partner[a][n], rs.starts[n])
					out.r[a][sg][m] += pw * complex(tau, 0) * ov * i
					out.j[a][sg][m] += pw * complex(tau*tau, 0) * ov * kappa
				}
				ii := real(i)*real(i) + imag(i)*imag(i)
				out.x[sg][m] += pw * complex(tau*tau*ii, 0) * rs.z0[n]
			}
		}
	}
	return out
}

// responseSetup fixes the start levels, both arms' U(T) and the grids.
func (s *Simulator) responseSetup(maxHz float64) *responseSetup {
	cfg, b := s.cfg, s.basis
	v0 := 2 * math.Pi * cfg.DepthHz
	rot := cfg.Ring.rotationalRate()
	es0 := lowestBands(b, rot, cfg.RotationRadS, v0, s.lev)
	means := bandMeans(es0)
	lev := min(s.lev, thermalLevels(means, cfg.TemperatureK))
	rs := &responseSetup{b: b, v0: v0, drives: s.drives(Shot{}), weights: thermalWeights(means[:lev], cfg.TemperatureK)}
	trap := 2 * math.Pi * cfg.Ring.TrapHz(cfg.DepthHz)
	for n := range lev {
		rs.starts = append(rs.starts, wannier(b, cfg.Ring, es0, n, trap).Amp)
	}
	T := rs.drives[0].times()[3]
	spread := 0.0
	for a := range 2 {
		rs.props[a] = newPropagator(b, cfg.Ring, v0, b.Block)
		es := diagonaliseFor(rs.props[a], rs.drives[a].cruiseSpeed(), 1)
		for _, v := range es.vals {
			spread = math.Max(spread, v[len(v)-1]-v[0])
		}
	}
	rs.h, rs.nt = s.responseStep(T, spread)
	for a := range 2 {
		rs.ut[a] = s.responseWalk(rs.props[a], rs.drives[a], rs.h, rs.nt, nil, nil)
	}
	rs.da = rs.drives[0].Angle(T) - rs.drives[1].Angle(T)
	dim := b.Size()
	lab := func(v []complex128, sign float64) []complex128 {
		out := make([]complex128, dim)
		for i, x := range v {
			out[i] = x * cis(-sign*float64(b.LMin()+i)*rs.da)
		}
		return out
	}
	for n := range lev {
		var fin [2][]complex128
		for a := range 2 {
			fin[a] = make([]complex128, dim)
			rs.ut[a].mul(b, rs.starts[n], fin[a])
		}
		rs.z0 = append(rs.z0, dot(fin[1], lab(fin[0], 1)))
		mp, mm := make([]complex128, dim), make([]complex128, dim)
		rs.ut[0].mulH(b, lab(fin[1], -1), mp)
		rs.ut[1].mulH(b, lab(fin[0], 1), mm)
		rs.partner[0] = append(rs.partner[0], mp)
		rs.partner[1] = append(rs.partner[1], mm)
	}
	// Twice the length the lags need: the grid samples the kernels at
	// twice their Nyquist rate 2 T, so that linear interpolation between
	// grid points (Predict) follows their sinc^2 lobes.
	rs.l = fftLength(2 * (2*rs.nt + 1))
	if maxHz == 0 {
		maxHz = s.NoiseBandHz()
	}
	rs.m = min(int(math.Floor(maxHz*float64(rs.l)*rs.h)), rs.l/2-1)
	return rs
}
