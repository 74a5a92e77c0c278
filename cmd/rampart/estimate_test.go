package main

import (
	"strings"
	"testing"
	"time"
)

func TestDurationNote(t *testing.T) {
	for _, c := range []struct {
		done    int
		elapsed time.Duration
		left    int
		dir     string
		want    string // "" for no note
	}{
		// 4 shots in 2 s is 2 shots/s: 7200 left take exactly 1 h, not more.
		{4, 2 * time.Second, 7200, "", ""},
		{4, 2 * time.Second, 7202, "", "at the measured 2 shots/s the 7202 realisations left take about 1 h; give --out DIR"},
		// 1e6 left at 2 shots/s: 5e5 s = 138.9 h = 5.8 days.
		{4, 2 * time.Second, 1000000, "run7", "take about 5.8 days; Ctrl-C stops cleanly and --resume run7 continues"},
		{0, time.Second, 1 << 30, "", ""},
		{4, 0, 1 << 30, "", ""},
	} {
		got := durationNote(c.done, c.elapsed, c.left, c.dir)
		if (c.want == "") != (got == "") || !strings.Contains(got, c.want) {
			t.Errorf("durationNote(%d, %v, %d) = %q, want %q", c.done, c.elapsed, c.left, got, c.want)
		}
	}
}
