package present

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"

	"rampart/internal/plural"
	"rampart/scenario"
	"rampart/sim"
)

func PrintDrive(w io.Writer, sc *scenario.Scenario, cfg sim.Config) error {
	seq := cfg.Sequence
	up := seq.Up
	cruise := seq.CruiseSpeed()
	peak, reverses := sim.PeakSpeed(up)
	trap := cfg.Ring.TrapHz(cfg.DepthHz)
	laps := seq.TotalAngle() / (2 * math.Pi)

	fmt.Fprintf(w, "Scenario %s\n%s\n\n", sc.Name, Describe(sc, cfg, cfg.Sequence.Up.Name()+" ramp"))
	t := NewTable(w, "Quantity", "Value", "Unit")
	t.Append("Ramp shape", shapeName(up), "")
	if seq.Down == nil {
		t.Append("Ramp-up time t_r (the ramp-down mirrors it)", Sig(up.Duration()*1e6, 6), "us")
	} else {
		t.Append("Ramp-up time t_r", Sig(up.Duration()*1e6, 6), "us")
		t.Append("Ramp-down shape (played backwards)", shapeName(seq.Down), "")
		t.Append("Ramp-down time t_d", Sig(seq.Down.Duration()*1e6, 6), "us")
	}
	t.Append("Cruise speed Omega_0", Sig(cruise, 6), "rad/s")
	t.Append("Drive offset at cruise N Omega_0 / 2 pi", Sig(float64(cfg.Ring.Sites)*cruise/(2*math.Pi), 6), "Hz")
	t.Append("Peak speed max |Omega|", Sig(peak, 6), "rad/s")
	t.Append("Peak speed / cruise speed", Fixed(peak/cruise, 4), "")
	t.Append("Speed reverses (throw and catch)", YesNo(reverses), "")
	if seq.Down == nil {
		t.Append("Angle of each ramp", Sig(up.Angle(up.Duration()), 6), "rad")
	} else {
		t.Append("Angle of the ramp-up and of the ramp-down", Sig(up.Angle(up.Duration()), 6)+", "+Sig(seq.Down.Angle(seq.Down.Duration()), 6), "rad")
	}
	if seq.Segments >= 2 {
		t.Append("Echo segments (swap pulses between)", fmt.Sprint(seq.Segments), "")
		t.Append("Hold between segments", Sig(seq.HoldS*1e6, 6), "us")
	}
	if seq.Segments >= 2 {
		t.Append("Cruise time of each segment", Sig(seq.CruiseS*1e3, 6), "ms")
	} else {
		t.Append("Cruise time", Sig(seq.CruiseS*1e3, 6), "ms")
	}
	t.Append("Total time T", Sig(seq.Duration()*1e3, 6), "ms")
	t.Append("Laps phi(T) / 2 pi", Sig(laps, 6), "turns")
	segLaps := seq.Segment().TotalAngle() / (2 * math.Pi)
	if seq.Segments >= 2 {
		t.Append("Closure", fmt.Sprintf("arms meet at every swap (2*laps = %s per segment)", Sig(2*segLaps, 6)), "")
	} else {
		t.Append("Closure", fmt.Sprintf("arms meet (2*laps = %s)", Sig(2*laps, 6)), "")
	}
	t.Append("Trap frequency at the lattice depth", Sig(trap/1e3, 4), "kHz")
	t.Append("Trap periods in the ramp-up t_r nu", Sig(up.Duration()*trap, 3), "")
	return t.Render()
}

// shapeName describes a ramp-up for the summary.
func shapeName(r sim.Ramp) string {
	switch r := r.(type) {
	case sim.InverseGap:
		return fmt.Sprintf("inverse-engineered for the band gap %s kHz at %s kHz", Sig(r.GapHz/1e3, 4), Sig(r.DesignDepth/1e3, 6))
	case sim.Inverse:
		return fmt.Sprintf("inverse-engineered for %s kHz (trap %s kHz)", Sig(r.DesignDepth/1e3, 6), Sig(r.TrapRadS/(2*math.Pi)/1e3, 4))
	case *sim.Tabulated:
		return fmt.Sprintf("table %s, %s, PCHIP between rows", r.Name(), plural.Count(r.Rows(), "row"))
	}
	return r.Name()
}

// WriteProfile writes the whole sequence's Omega(t) and phi(t) and returns
// the number of samples.
func WriteProfile(w io.Writer, seq sim.Sequence) (int, error) {
	one := seq.Segment()
	tr, tc, td := one.Up.Duration(), one.CruiseS, one.RampDown().Duration()
	var times []float64
	for j := range max(seq.Segments, 1) {
		// Each segment: its ramp-up, cruise and ramp-down; an echo's hold
		// is the straight line between the segments' end and start.
		t0 := float64(j) * (one.Duration() + seq.HoldS)
		for i := 0; i <= ProfileRampPoints; i++ {
			times = append(times, t0+tr*float64(i)/ProfileRampPoints)
		}
		if tc > 0 {
			for i := 1; i <= ProfileCruisePoints; i++ {
				times = append(times, t0+tr+tc*float64(i)/ProfileCruisePoints)
			}
		}
		for i := 1; i < ProfileRampPoints; i++ {
			times = append(times, t0+tr+tc+td*float64(i)/ProfileRampPoints)
		}
		times = append(times, t0+one.Duration())
	}

	bw := bufio.NewWriter(w)
	fmt.Fprintln(bw, "t_s,omega_rad_s,phi_rad")
	for _, t := range times {
		fmt.Fprintf(bw, "%s,%s,%s\n", strconv.FormatFloat(t, 'g', -1, 64),
			strconv.FormatFloat(seq.Speed(t), 'g', -1, 64), strconv.FormatFloat(seq.Angle(t), 'g', -1, 64))
	}
	return len(times), bw.Flush()
}

// Sampling of the drive profile written by `rampart ramp --out`: the ramps
// change fast and get many points, the cruise is a straight line in phi.
const (
	ProfileRampPoints   = 2000 // intervals per ramp
	ProfileCruisePoints = 10   // intervals over the cruise
)
