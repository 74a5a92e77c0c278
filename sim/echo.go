package sim

import (
	"fmt"
	"math"
	"time"
)

// Echo sequences (docs/model.md, Interferometer and signs, Echo sequences).
//
// The arms meet after every segment: both lattices stop there, a swap (pi)
// pulse exchanges the spin states, and each lattice plays the next segment
// in the opposite direction. The packet that started in the arm s = +1 is
// then carried by the other lattice, still in the direction +1, so the
// enclosed angle keeps growing, phi(T) = Segments phi_1, while each packet
// spends alternate segments in each spin state. A static differential
// shift delta between the states then enters the phase as
//
//	Phi_delta = -2 pi delta sum_j (-1)^j T_j,
//
// T_j the time between swaps j-1 and j: zero for an even number of equal
// segments.
//
// The phase is reported in the packet convention, z = <P_-|P_+> with P_s
// the packet that started in the arm s, so that Phi_S = K Omega_bg with
// K = 2 I phi(T) / hbar as for one segment. After an odd number of swaps
// the spin read-out measures the conjugate, -Phi.
//
// References (the echo's principle, from memory):
//
//	E. L. Hahn, "Spin echoes", Phys. Rev. 80, 580 (1950).

// NewEcho returns the echo sequence that plays seg segments times with a
// rest of holdS between segments. seg must be a single segment; segments
// at least 2.
func NewEcho(seg Sequence, segments int, holdS float64) (Sequence, error) {
	if seg.echo() {
		return Sequence{}, fmt.Errorf("the segment is itself an echo sequence of %d segments", seg.Segments)
	}
	if segments < 2 {
		return Sequence{}, fmt.Errorf("an echo needs at least 2 segments, got %d", segments)
	}
	if !(holdS >= 0) || math.IsInf(holdS, 0) {
		return Sequence{}, fmt.Errorf("hold %g s between segments is not a finite non-negative time", holdS)
	}
	seg.Segments, seg.HoldS = segments, holdS
	return seg, nil
}

// echo reports whether q is an echo sequence.
func (q Sequence) echo() bool { return q.Segments >= 2 }

// Segment returns one segment of q: q itself unless q is an echo.
func (q Sequence) Segment() Sequence {
	q.Segments, q.HoldS = 0, 0
	return q
}

// SwapPulses returns the number of swap pulses, Segments - 1 (0 without echo).
func (q Sequence) SwapPulses() int { return max(q.Segments-1, 0) }

// locate returns the segment j holding time t of an echo sequence, the
// time tau into it (clamped to the segment) and whether t lies within the
// segment's motion rather than a hold or outside [0, T].
func (q Sequence) locate(t float64) (j int, tau float64, in bool) {
	if t <= 0 {
		return 0, 0, false
	}
	one := q.segmentS()
	period := one + q.HoldS
	j = int(math.Floor(t / period))
	if j >= q.Segments {
		return q.Segments - 1, one, false
	}
	tau = t - float64(j)*period
	if tau > one {
		return j, one, false
	}
	return j, tau, true
}

// echoPlan is the motion of an echo shot: each lattice's drive for each
// segment and the swap times, in inertial time.
type echoPlan struct {
	drives  [2][]Drive   // [lattice][segment], Seq the single segment
	offsets [2][]float64 // the lattice's angle at the start of each drive
	domains [2][]float64 // drive j of lattice L holds from domains[L][j] to domains[L][j+1]
	windows []float64    // 0, the swap times, end: packets change lattice at the inner ones
}

// echoPlan builds the plan of shot sh.
func (s *Simulator) echoPlan(sh Shot) echoPlan {
	q := s.cfg.Sequence
	seg := q.Segment()
	n := q.Segments
	rate := 1 + sh.ClockRel
	period := seg.Duration() + q.HoldS
	delay := [2]float64{0, sh.SkewS}
	if sh.SkewS < 0 {
		delay = [2]float64{-sh.SkewS, 0}
	}
	var pl echoPlan
	for L := range 2 {
		off := 0.0
		pl.domains[L] = append(pl.domains[L], math.Inf(-1))
		for j := range n {
			sign := float64(1 - 2*L)
			if j%2 == 1 {
				sign = -sign
			}
			d := Drive{
				Seq:          seg,
				Sign:         sign,
				Rate:         rate,
				Scale:        1 + sh.SpeedRel,
				DelayS:       delay[L] + float64(j)*period/rate,
				RotationRadS: s.cfg.RotationRadS + sh.RotationOffsetRadS,
				DepthRel:     sh.DepthRel[L],
				Jitter:       sh.Jitter[L],
				DepthNoise:   sh.DepthNoise[L],
			}
			pl.drives[L] = append(pl.drives[L], d)
			pl.offsets[L] = append(pl.offsets[L], off)
			off += sign * d.scale() * seg.TotalAngle()
			if j > 0 {
				// Mid-hold: the lattice rests there (at the segment boundary
				// itself when there is no hold).
				pl.domains[L] = append(pl.domains[L], delay[L]+(float64(j)*period-q.HoldS/2)/rate)
			}
		}
		pl.domains[L] = append(pl.domains[L], math.Inf(1))
	}
	end := math.Max(delay[0], delay[1]) + q.Duration()/rate
	pl.windows = []float64{0}
	for j := range n - 1 {
		pl.windows = append(pl.windows, (float64(j+1)*period-q.HoldS/2)/rate+(delay[0]+delay[1])/2)
	}
	pl.windows = append(pl.windows, end)
	return pl
}

// end returns the end of the shot.
func (pl echoPlan) end() float64 { return pl.windows[len(pl.windows)-1] }

// lattice returns the lattice that carries packet a (0: the packet that
// started in the arm s = +1) between swaps j-1 and j.
func (pl echoPlan) lattice(a, j int) int { return a ^ (j % 2) }

// angle returns the inertial angle of lattice L at time t.
func (pl echoPlan) angle(L int, t float64) float64 {
	i := pl.drive(L, t)
	return pl.offsets[L][i] + pl.drives[L][i].Angle(t)
}

// drive returns the index of lattice L's drive at time t.
func (pl echoPlan) drive(L int, t float64) int {
	i := 0
	for i+1 < len(pl.drives[L]) && t >= pl.domains[L][i+1] {
		i++
	}
	return i
}

// runEcho is Run for an echo sequence: each packet is propagated through
// the lattices that carry it, window by window, and changes frame at each
// swap (docs/model.md, Echo sequences).
func (s *Simulator) runEcho(sh Shot, obs Observer) Result {
	start := time.Now()
	cfg, b := s.cfg, s.basis
	v0 := 2 * math.Pi * cfg.DepthHz
	wk := s.shotWork()
	defer s.work.Put(wk)
	st := s.startSet(sh, wk)
	pl := s.echoPlan(sh)
	end := pl.end()
	noiseStep := s.noiseStep()

	var res Result
	var fields [2]*field
	for a := range 2 {
		f := newField(b, st.lev)
		for n, x := range st.starts {
			f.set(n, x)
		}
		p := newPropagator(b, cfg.Ring, v0, st.lev)
		cache := map[[2]float64]*eigensystem{}
		eig := func(L int, w float64) *eigensystem {
			k := [2]float64{float64(L), w}
			if cache[k] == nil {
				cache[k] = diagonaliseFor(p, w, 1+pl.drives[L][0].DepthRel)
			}
			return cache[k]
		}
		rest := func(L int, d Drive, t0, t1 float64) {
			switch {
			case t1 <= t0:
			case s.splitOnly:
				p.splitSteps(f, d, t0, t1, int(math.Ceil((t1-t0)/s.splitStep)))
			case t1-t0 < shortStretch*s.step && cache[[2]float64{float64(L), st.omega}] == nil:
				// As in Run: a few split steps cost less than diagonalising.
				p.splitSteps(f, d, t0, t1, s.steps(t1-t0))
			default:
				p.stretch(f, d, st.omega, t0, t1, noiseStep, eig(L, st.omega))
			}
		}
		ramp := func(d Drive, t0, t1 float64) {
			if t1 > t0 {
				p.splitStepsObserved(f, d, t0, t1, s.steps(t1-t0), obs, a)
			}
		}
		for j := range len(pl.windows) - 1 {
			u0, u1 := pl.windows[j], pl.windows[j+1]
			L := pl.lattice(a, j)
			if j > 0 {
				p.kick(f, pl.angle(L, u0)-pl.angle(pl.lattice(a, j-1), u0))
			}
			for i, d := range pl.drives[L] {
				lo, hi := math.Max(u0, pl.domains[L][i]), math.Min(u1, pl.domains[L][i+1])
				if hi <= lo {
					continue
				}
				tm := d.times()
				clip := func(x float64) float64 { return math.Min(math.Max(x, lo), hi) }
				rest(L, d, lo, clip(tm[0]))
				ramp(d, clip(tm[0]), clip(tm[1]))
				w := d.cruiseSpeed()
				if j == 0 && i == 0 && hi >= tm[1] {
					res.GroundAfterRampUp[a] = groundPopulation(f, eig(L, w), 0)
				}
				if c0, c1 := clip(tm[1]), clip(tm[2]); s.splitOnly {
					p.splitSteps(f, d, c0, c1, int(math.Ceil((c1-c0)/s.splitStep)))
				} else if c1 > c0 {
					p.stretchObserved(f, d, w, c0, c1, noiseStep, eig(L, w), obs, a)
				}
				ramp(d, clip(tm[2]), clip(tm[3]))
				rest(L, d, clip(tm[3]), hi)
			}
		}
		fields[a] = f
	}

	last := len(pl.windows) - 2
	da := pl.angle(pl.lattice(0, last), end) - pl.angle(pl.lattice(1, last), end)
	pulse := math.Sin(math.Pi/2*(1+sh.PulseAreaRel[0])) * math.Sin(math.Pi/2*(1+sh.PulseAreaRel[1]))
	swap := math.Sin(math.Pi / 2 * (1 + sh.SwapAreaRel))
	pulse *= math.Pow(swap*swap, float64(cfg.Sequence.SwapPulses()))
	var ring []complex128
	if !sh.Potential.zero() {
		ring = s.ringFactors(sh.Potential, s.packetDrives(sh), end, st.starts)
	}
	for n := range st.lev {
		z := overlap(b, fields[0].get(n), fields[1].get(n), da)
		if ring != nil {
			z *= ring[n]
		}
		res.Levels = append(res.Levels, Level{Band: n, Weight: st.weights[n], EnergyHz: st.means[n] / (2 * math.Pi), Z: z})
		res.Z += complex(st.weights[n]*pulse, 0) * z
	}
	res.Z *= s.echoApparatus(sh, pl)
	return s.finish(res, start)
}

// packetDrives returns, for the first-order ring potential, the motion of
// each packet over the whole echo: the sequence's angle with the packet's
// sign, at the mean depth of the two lattices and without the skew (both
// change the potential's phase at second order only).
func (s *Simulator) packetDrives(sh Shot) [2]Drive {
	m := (sh.DepthRel[0] + sh.DepthRel[1]) / 2
	return s.drives(Shot{ClockRel: sh.ClockRel, SpeedRel: sh.SpeedRel,
		RotationOffsetRadS: sh.RotationOffsetRadS, DepthRel: [2]float64{m, m}})
}

// echoApparatus is apparatus for an echo shot: the differential shift
// changes sign at each swap, and each packet scatters at the rate of the
// lattice that carries it.
func (s *Simulator) echoApparatus(sh Shot, pl echoPlan) complex128 {
	var phase float64
	for j := range len(pl.windows) - 1 {
		x := sh.Field.PhaseRad(pl.windows[j], pl.windows[j+1])
		if j%2 == 1 {
			x = -x
		}
		phase += x
	}
	f := cis(phase)
	if sh.Scattering.RateS != [2]float64{} {
		k, _ := sh.Scattering.Factor(echoScatteringMeans(sh, pl))
		f *= complex(k, 0)
	}
	if sh.RadiusRel != 0 {
		c := s.cfg
		c.RotationRadS += sh.RotationOffsetRadS
		f *= cis(radiusPhase(c, sh.RadiusRel))
	}
	return f
}

// echoScatteringMeans returns each packet's mean number of scattering
// events: lattice L's rate times its relative depth, integrated over the
// windows in which L carries the packet.
func echoScatteringMeans(sh Shot, pl echoPlan) [2]float64 {
	var l [2]float64
	for a := range 2 {
		for j := range len(pl.windows) - 1 {
			L := pl.lattice(a, j)
			u0, u1 := pl.windows[j], pl.windows[j+1]
			lin, _ := seriesIntegrals(sh.DepthNoise[L], u0, u1)
			l[a] += sh.Scattering.RateS[L] * ((1+sh.DepthRel[L])*(u1-u0) + lin)
		}
	}
	return l
}

// WithUp returns q with the ramp-up replaced by up and the cruise set so
// that each segment turns by the same angle as in q; the ramp-down (or
// the mirror, which then mirrors up), the echo segments and the hold are
// kept.
func (q Sequence) WithUp(up Ramp) (Sequence, error) {
	s, err := NewSequenceDown(up, q.Down, q.Segment().TotalAngle()/(2*math.Pi))
	if err != nil || !q.echo() {
		return s, err
	}
	return NewEcho(s, q.Segments, q.HoldS)
}

// Echo reports whether q is an echo sequence (two segments or more).
func (q Sequence) Echo() bool { return q.echo() }
