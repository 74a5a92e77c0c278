package sim

import (
	"math"
	"strings"
	"testing"
)

// TestWarnings checks each of Config.Warnings on either side of its limit.
func TestWarnings(t *testing.T) {
	base := benchConfig(t, 1) // 20 sites on 5 um: spacing 1.57 um; 20 kHz; 1e-3 rad/s against 500 rad/s
	if w := base.Warnings(); len(w) != 0 {
		t.Fatalf("benchmark scenario: warnings %q, want none", w)
	}
	// N such that 2 pi R / N straddles 0.4 um at R = 5 um: 2 pi 5 / 0.4 = 78.5.
	spacing := func(n int) Config { c := base; c.Ring.Sites = n; return c }
	rotation := func(w float64) Config { c := base; c.RotationRadS = w; return c }
	depth := func(hz float64) Config { c := base; c.DepthHz = hz; return c }
	for _, tc := range []struct {
		name string
		c    Config
		want string // a fragment of the warning; "" for none
	}{
		{"78 sites: 0.403 um", spacing(78), ""},
		{"79 sites: 0.398 um", spacing(79), "site spacing 2 pi R / N = 0.398 um"},
		{"rotation 499 rad/s", rotation(499), ""},
		{"rotation -501 rad/s", rotation(-501), "rotation -501 rad/s is faster than the cruise 500 rad/s"},
		{"depth 20 MHz", depth(20e6), ""},
		{"depth 21 MHz", depth(21e6), "lattice depth 21 MHz is above 20.8 MHz"}, // k_B 1 mK / h = 20.837 MHz (CODATA 2018 exact constants)
	} {
		w := tc.c.Warnings()
		switch {
		case tc.want == "" && len(w) != 0:
			t.Errorf("%s: warnings %q, want none", tc.name, w)
		case tc.want != "" && (len(w) != 1 || !strings.Contains(w[0], tc.want)):
			t.Errorf("%s: warnings %q, want one containing %q", tc.name, w, tc.want)
		}
	}
	if d := math.Abs(MaxDepthHz - 20.837e6); d > 1e3 {
		t.Errorf("MaxDepthHz = %v, want 1.380649e-23 x 1e-3 / 6.62607015e-34 = 20.837 MHz", MaxDepthHz)
	}
}
