package noise

import (
	"strings"
	"testing"
)

// TestParseRIN: a RIN table's rows are S_eps = 10^(RIN/10) in 1/Hz (the
// definition of RIN as a one-sided PSD in dB/Hz, docs/model.md,
// Perturbations, intensity noise), interpolated as power laws between
// rows: -120 dB/Hz halfway (in log f) between -100 dB/Hz at 10 Hz and
// -140 dB/Hz at 1 kHz, and held outside. The band integral over a row
// pair is that of the power law S(f) = 1e-10 (f/10)^-2, 1e-9 (1 - 10/1000)
// = 9.9e-10 (closed form).
func TestParseRIN(t *testing.T) {
	tab, err := ParseRIN(strings.NewReader("# servo on\nf_hz,rin_db_hz\n10,-100\n1e3,-140\n"), "rin.csv")
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ f, want float64 }{{10, 1e-10}, {100, 1e-12}, {1e3, 1e-14}, {1, 1e-10}, {1e6, 1e-14}} {
		if got := tab.Density(c.f); relErr(got, c.want) > 1e-12 {
			t.Errorf("S_eps(%g Hz) = %g, want %g (rel tol 1e-12)", c.f, got, c.want)
		}
	}
	if got := tab.Integral(10, 1e3); relErr(got, 9.9e-10) > 1e-9 {
		t.Errorf("band integral %g, want 9.9e-10", got)
	}
}

// TestParseRINErrors: the messages name the table kind, the file, the
// line and what would be accepted (the phase-noise table's reader, shared).
func TestParseRINErrors(t *testing.T) {
	for _, c := range []struct{ in, msg string }{
		{"f_hz,l_dbc_hz\n10,-100\n", `intensity-noise table "r.csv" line 1: the first line that is not blank or a comment is not the header: want "f_hz,rin_db_hz"`},
		{"f_hz,rin_db_hz\n10,x\n", `intensity-noise table "r.csv" line 2: level "x" is not a number`},
		{"f_hz,rin_db_hz\n10,-100\n5,-110\n", `line 3: frequency 5 Hz is not above the previous row's (10 Hz, line 2)`},
		{"f_hz,rin_db_hz\n10,-4000\n", `level -4000 dB/Hz is out of range (S_eps = 0 1/Hz)`},
		{"f_hz,rin_db_hz\n10,3\n", `level 3 dB/Hz: want a level below 0 dB/Hz`},
		{"f_hz,rin_db_hz\n", `intensity-noise table "r.csv": no rows after the header`},
	} {
		_, err := ParseRIN(strings.NewReader(c.in), "r.csv")
		if err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("%q: error %v, want %q", c.in, err, c.msg)
		}
	}
}
