package plots

import (
	"slices"
	"strings"
	"testing"
)

func labels(t *testing.T, tk ticker, min, max float64) []string {
	t.Helper()
	var out []string
	seen := map[float64]bool{}
	for _, tick := range tk.Ticks(min, max) {
		if seen[tick.Value] {
			t.Errorf("[%v, %v]: tick %v repeats", min, max, tick.Value)
		}
		seen[tick.Value] = true
		if tick.Label != "" {
			if tick.Value < min || tick.Value > max {
				t.Errorf("[%v, %v]: labelled tick %v lies outside the range", min, max, tick.Value)
			}
			out = append(out, tick.Label)
		}
	}
	return out
}

// TestTickLabels checks labels on typical axes of rampart's figures. The
// expected labels follow from the rules in linearTicks and relabel: a step
// of 1, 2, 2.5 or 5 x 10^k, at most six intervals, shared decimals.
func TestTickLabels(t *testing.T) {
	for _, tc := range []struct {
		name     string
		tk       ticker
		min, max float64
		want     []string
	}{
		{"contrast", ticker{}, 0.9, 1, []string{"0.90", "0.92", "0.94", "0.96", "0.98", "1.00"}},
		{"counts", ticker{}, 0, 212, []string{"0", "50", "100", "150", "200"}},
		{"signed", ticker{}, -1.2, 1.2, []string{"−1.0", "−0.5", "0.0", "0.5", "1.0"}},
		{"bias rad", ticker{}, -1.4e-6, 1.2e-6, []string{"−1e−6", "−5e−7", "0", "5e−7", "1e−6"}},
		{"near one", ticker{}, 0.9999991, 1.0000004, []string{"0.99999925", "0.99999950", "0.99999975", "1.00000000", "1.00000025"}},
		{"large", ticker{}, 0, 3e5, []string{"0", "5.0e4", "1.0e5", "1.5e5", "2.0e5", "2.5e5", "3.0e5"}},
		{"log decades", ticker{log: true}, 1e-3, 10, []string{"0.001", "0.01", "0.1", "1", "10"}},
		{"log small", ticker{log: true}, 1e-9, 1e-7, []string{"1e−9", "1e−8", "1e−7"}},
		{"log within a decade", ticker{log: true}, 2, 8, []string{"2", "3", "4", "5", "6", "7", "8"}},
		// The tolerance curves of the demo (a differential depth of 2e-8 to
		// 3.2e-8, a temperature spread of 5 to 80 nK): gonum/plot's LogTicks
		// gave the first no tick inside and repeated 10 in the second.
		{"log inside one mantissa step", ticker{log: true}, 2e-8, 3.2e-8, []string{"2e−8", "3e−8"}},
		{"log between two mantissas", ticker{log: true}, 2.05e-8, 2.9e-8, []string{"2.2e−8", "2.4e−8", "2.6e−8", "2.8e−8"}},
		{"log across one power of ten", ticker{log: true}, 5, 80, []string{"5", "10", "20", "50"}},
		{"log from one", ticker{log: true}, 1, 80, []string{"1", "10"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if got := labels(t, tc.tk, tc.min, tc.max); !slices.Equal(got, tc.want) {
				t.Errorf("got %q, want %q", got, tc.want)
			}
		})
	}
}

func TestFormatTick(t *testing.T) {
	for _, tc := range []struct {
		v        float64
		notation byte
		prec     int
		want     string
	}{
		{2.5e-7, 'e', 1, "2.5e−7"},
		{-3e12, 'e', 0, "−3e12"},
		{0, 'e', 2, "0"},
		{-1.5, 'f', 1, "−1.5"},
		{-0.001, 'f', 2, "0.00"}, // rounds to zero: no sign
	} {
		if got := formatTick(tc.v, tc.notation, tc.prec); got != tc.want {
			t.Errorf("formatTick(%v, %c, %d): got %q, want %q", tc.v, tc.notation, tc.prec, got, tc.want)
		}
	}
}

// TestLogTicksManyDecades: a log axis from 1e-25 to 100 labels its ticks
// in exponent notation, not as 0.0000000000000000000000001.
func TestLogTicksManyDecades(t *testing.T) {
	for _, tk := range (ticker{log: true}).Ticks(1e-25, 100) {
		if strings.HasPrefix(tk.Label, "0.000") {
			t.Fatalf("tick %g labelled %q", tk.Value, tk.Label)
		}
	}
}
