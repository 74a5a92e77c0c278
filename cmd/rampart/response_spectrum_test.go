package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// TestResponseSpectrum checks --spectrum on the fast ensemble's small
// ring: a power law of exponent 0 is the white level of its coefficient,
// and a sum of terms predicts the sum of their predictions (both effects
// are linear in the PSD; docs/model.md, Noise transfer functions), each to
// 1e-9 relative (rounding and the sums' order); and bad values are refused
// with exit 2 and a message naming what would be accepted.
func TestResponseSpectrum(t *testing.T) {
	predict := func(spec string) float64 {
		t.Helper()
		stdout, stderr, code := execute(t, "response", "--scenario", ensembleScenario, "--set", "ring.sites=10", "--set", "ring.radius_um=2.5",
			"--spectrum", spec, "--json")
		if code != 0 {
			t.Fatalf("--spectrum %s: exit %d: %s", spec, code, stderr)
		}
		var rep struct {
			Predicted struct {
				ContrastLoss float64 `json:"contrast_loss"`
			}
		}
		if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
			t.Fatal(err)
		}
		return rep.Predicted.ContrastLoss
	}
	white := predict("rin=white:1e-11")
	flat := predict("rin=powerlaw:1e-11:0")
	pink := predict("rin=powerlaw:1e-8:-1")
	sum := predict("rin=white:1e-11+powerlaw:1e-8:-1")
	if !(white > 0) || math.Abs(flat/white-1) > 1e-9 {
		t.Errorf("powerlaw of exponent 0: loss %.12g, white %.12g (tol 1e-9 relative)", flat, white)
	}
	if math.Abs(sum/(white+pink)-1) > 1e-9 {
		t.Errorf("sum of terms: loss %.12g, sum of the terms' %.12g (tol 1e-9 relative)", sum, white+pink)
	}
	for _, tc := range []struct{ spec, want string }{
		{"laser=white:1", "unknown process"},
		{"rin=white:-1", "must be positive"},
		{"rin=brown:1", "want white:S, powerlaw:H:ALPHA or table:FILE"},
		{"field=table:x.csv", "x.csv"},
		{"phase", "PROCESS=TERM"},
	} {
		_, stderr, code := execute(t, "response", "--scenario", ensembleScenario, "--spectrum", tc.spec)
		if code != 2 || !strings.Contains(stderr, tc.want) {
			t.Errorf("--spectrum %s: exit %d, stderr %q; want 2 and %q", tc.spec, code, stderr, tc.want)
		}
	}
}
