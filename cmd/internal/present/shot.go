package present

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"
	"time"

	"rampart/scenario"
	"rampart/sim"
)

// Describe says in one line what the scenario simulates; ramp names the ramp.
func Describe(sc *scenario.Scenario, cfg sim.Config, ramp string) string {
	atom := fmt.Sprintf("atom of %s u", Sig(sc.Atom.MassU, 6))
	if sc.Atom.MassU == sim.Rb87MassU {
		atom = "Rb-87 atom"
	}
	start := "ground-state start"
	if sc.Thermal() {
		start = fmt.Sprintf("thermal start at %s nK", Sig(sc.Start.TemperatureNK, 6))
	}
	laps := "laps"
	if sc.Motion.Laps == 1 {
		laps = "lap"
	}
	return fmt.Sprintf("%s, %d sites of radius %s um, %s kHz deep (trap %s kHz); %s of %s us to %s rad/s, %s %s; rotation %s rad/s; %s",
		atom, sc.Ring.Sites, Sig(sc.Ring.RadiusUM, 6), Sig(sc.Lattice.DepthKHz, 6), Sig(cfg.Ring.TrapHz(cfg.DepthHz)/1e3, 4),
		ramp, Sig(cfg.Sequence.Up.Duration()*1e6, 6), Sig(sc.Motion.CruiseRadS, 6), Sig(sc.Motion.Laps, 6), laps,
		Sig(sc.Motion.RotationRadS, 6), start)
}

// Duration formats an elapsed time in ms, or in s from one second on.
func Duration(d time.Duration) (value, unit string) {
	if d >= time.Second {
		return Sig(d.Seconds(), 3), "s"
	}
	return Sig(d.Seconds()*1e3, 3), "ms"
}

func WriteJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(v)
}

// WriteTrace writes the observer's diagnostics as CSV, arm s = +1 or -1.
func WriteTrace(w io.Writer, rows []sim.Diagnostics) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintln(bw, "time_s,arm,offset_rad,width_rad,velocity_error_rad_s,ground_band,norm")
	for _, d := range rows {
		arm := 1
		if d.Arm == 1 {
			arm = -1
		}
		fmt.Fprintf(bw, "%s,%d,%s,%s,%s,%s,%s\n", Sig(d.TimeS, -1), arm, Sig(d.OffsetRad, -1), Sig(d.WidthRad, -1),
			Sig(d.VelocityErrRadS, -1), Sig(d.GroundBand, -1), Sig(d.Norm, -1))
	}
	return bw.Flush()
}
