package present

import (
	"fmt"
	"io"
	"math"
	"strings"

	"rampart/scenario"
	"rampart/sim"
)

// PrintRampComparison prints the first stage of rampart demo: the
// scenario sc (whose leading comment tells the demo's story), then one
// noise-free shot of each ramp (names[i] ran runs[i]; cfg is the last
// ramp's configuration) side by side, and what each ramp-up leaves outside
// the moving ground band.
func PrintRampComparison(w io.Writer, sc *scenario.Scenario, cfg sim.Config, names []string, runs []ShotRun) error {
	fmt.Fprintf(w, "rampart demo: the built-in scenario %s\n%s\n\n", sc.Name, Describe(sc, cfg, strings.Join(names, ", ")+" ramps"))
	if text := story(sc); text != "" {
		fmt.Fprintf(w, "%s\n\n", text)
	}

	fmt.Fprintln(w, "1. One noise-free shot of each ramp")
	header := append([]string{"Quantity"}, names...)
	t := NewTable(w, append(header, "Unit")...)
	row := func(label, unit string, value func(r ShotRun) string) {
		cells := []string{label}
		for _, r := range runs {
			cells = append(cells, value(r))
		}
		t.Append(append(cells, unit))
	}
	row("Contrast C = |z|", "", func(r ShotRun) string { return Fixed(r.Result.Contrast, 5) })
	row("Ground band after ramp-up, arm s = +1", "", func(r ShotRun) string { return Fixed(r.Result.GroundAfterRampUp[0], 5) })
	row("Ground band after ramp-up, arm s = -1", "", func(r ShotRun) string { return Fixed(r.Result.GroundAfterRampUp[1], 5) })
	row("Interferometer phase arg z", "rad", func(r ShotRun) string { return Sci(r.Result.PhaseRad, 7) })
	row("Sagnac phase", "rad", func(r ShotRun) string { return Sci(r.Result.SagnacRad, 7) })
	// The bias as rampart shot reports it: at zero rotation, with the
	// shot's own scale factor (ShotReport.SetGyro).
	bias := func(r ShotRun) float64 {
		if r.Gyro != nil {
			return r.Gyro.ZeroRateBiasRad
		}
		return math.NaN()
	}
	row("Bias at zero rotation b = phase - K_shot Omega", "rad", func(r ShotRun) string { return Sci(bias(r), 3) })
	row("Bias as a rotation rate b / K", "deg/h", func(r ShotRun) string {
		return Sci(sim.RadPerSToDegPerH(bias(r)/r.Result.ScaleFactorS), 3)
	})
	row("Peak speed max |Omega|", "rad/s", func(r ShotRun) string {
		peak, _ := sim.PeakSpeed(r.Config.Sequence.Up)
		return Sig(peak, 5)
	})
	row("Speed reverses (throw and catch)", "", func(r ShotRun) string {
		_, rev := sim.PeakSpeed(r.Config.Sequence.Up)
		return YesNo(rev)
	})
	row("Elapsed (one shot)", "ms", func(r ShotRun) string { return Sig(r.Elapsed.Seconds()*1e3, 3) })
	if err := t.Render(); err != nil {
		return err
	}

	up := runs[0].Config.Sequence.Up
	var outside []string
	for _, r := range runs {
		outside = append(outside, fmt.Sprintf("%s %s %%", names[len(outside)], Sig(100*(1-r.Result.GroundAfterRampUp[0]), 2)))
	}
	fmt.Fprintf(w, "\nA ramp-up of %s us is %s trap periods. Left outside the moving ground band after it: %s.\n",
		Sig(up.Duration()*1e6, 6), Sig(up.Duration()*cfg.Ring.TrapHz(cfg.DepthHz), 2), strings.Join(outside, ", "))
	return nil
}

// story returns the leading comment of the scenario file, which tells the
// demo's invented lab story.
func story(sc *scenario.Scenario) string {
	data, err := sc.ReadFile(sc.Name)
	if err != nil {
		return ""
	}
	var lines []string
	for _, line := range strings.Split(string(data), "\n") {
		text, ok := strings.CutPrefix(line, "#")
		if !ok {
			break
		}
		lines = append(lines, strings.TrimPrefix(text, " "))
	}
	return strings.TrimSpace(strings.Join(lines, "\n"))
}
