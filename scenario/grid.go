package scenario

import (
	"fmt"
	"math"

	"rampart/sim"
)

// gridKeys are the keys that set the automatic momentum grid
// (sim.AutoNumerics), beside the ramps' (sequenceKeys).
var gridKeys = append([]string{"lattice.depth_khz", "motion.cruise_rad_s", "motion.rotation_rad_s", "start.temperature_nk",
	"ring.radius_um", "ring.sites", "atom.mass_u", "motion.laps"}, sequenceKeys...)

// checkGrid refuses a configuration whose automatic momentum grid
// (sim.AutoNumerics) is larger than sim.MaxGrid, as sim.NewSimulator would,
// but at the key that sets it and with the remedy that fits. The window
// holds, on either side of l = 0, the rigid-rotation momentum at the peak
// speed, l_peak = I (max|Omega| + |Omega_bg|) / hbar, and the site's wave
// packet, a few oscillator momenta l_osc = sqrt(I omega / hbar), with
// omega growing as sqrt(V0), so l_osc as V0^(1/4); more for a thermal
// start's higher levels and, slowly, for a longer shot (docs/model.md,
// Numerics). The larger share names the key: the cruise speed or the
// depth.
func checkGrid(cfg sim.Config, thermal bool) *keyError {
	if cfg.Grid != 0 {
		return nil
	}
	grid := sim.AutoNumerics(cfg).Grid
	if grid <= sim.MaxGrid {
		return nil
	}
	q := cfg.Sequence
	peak, _ := sim.PeakSpeed(q.Up)
	if q.Down != nil {
		d, _ := sim.PeakSpeed(q.Down)
		peak = math.Max(peak, d)
	}
	speed := 2 * cfg.Ring.Inertia() * (peak + math.Abs(cfg.RotationRadS)) / sim.Hbar
	packet := float64(grid) - speed
	key, remedy, levels := "lattice.depth_khz", "lower the lattice depth (lattice.depth_khz)", ""
	if thermal {
		remedy += " or the temperature (start.temperature_nk)"
		levels = " and with a thermal start's levels"
	}
	if speed > packet {
		key, remedy = "motion.cruise_rad_s", "lower the cruise speed (motion.cruise_rad_s)"
	}
	return &keyError{key: key, also: gridKeys, err: fmt.Errorf(
		"the momentum grid would need %d states, more than the %d rampart handles (memory and time grow as grid^2 / sites): "+
			"about %.0f of them hold the arms' momentum at the peak speed %.4g rad/s, %.0f the site's wave packet, which widens with the depth as V0^(1/4)%s: "+
			"%s, or set numerics.grid (at most %d, a multiple of 2*sites) and check its error with rampart shot --check",
		grid, sim.MaxGrid, speed, peak+math.Abs(cfg.RotationRadS), packet, levels, remedy, sim.MaxGrid)}
}
