package main

import (
	"fmt"
	"rampart/cmd/internal/present"
	"rampart/internal/plural"
	"time"
)

// longRun is the estimated duration above which an ensemble says at its
// start how long it will take.
const longRun = time.Hour

// durationNote returns the note an ensemble prints once its first done
// realisations took elapsed, with left more to run: empty unless the
// estimate, left / (done / elapsed), exceeds longRun.
func durationNote(done int, elapsed time.Duration, left int, dir string) string {
	if done < 1 || elapsed <= 0 || left < 1 {
		return ""
	}
	rate := float64(done) / elapsed.Seconds()
	est := time.Duration(float64(left) / rate * float64(time.Second))
	if est <= longRun {
		return ""
	}
	keep := "give --out DIR to keep what is done across an interruption"
	if dir != "" {
		keep = "Ctrl-C stops cleanly and --resume " + dir + " continues"
	}
	return fmt.Sprintf("note: at the measured %s shots/s the %s left take about %s; %s\n",
		present.Sig(rate, 3), plural.Count(left, "realisation"), roughDuration(est), keep)
}

// roughDuration formats a long duration in hours or days to two figures.
func roughDuration(d time.Duration) string {
	if h := d.Hours(); h < 48 {
		return present.Sig(h, 2) + " h"
	}
	return present.Sig(d.Hours()/24, 2) + " days"
}
