package scenario

import (
	"errors"
	"math"
	"path/filepath"
	"strings"
	"testing"

	"rampart/sim"
)

func TestParseRampBad(t *testing.T) {
	const sites, cruise = 20, 500.0
	for _, row := range []struct {
		name string
		file string
		line int // 0: the file as a whole
		msg  string
	}{
		{"empty", "", 0, "no header row: the first line that is not blank or a comment must name the columns t_s and one of omega_rad_s, drive_hz"},
		{"comments only", "# nothing\n\n", 0, "no header row"},
		{"numbers before the header", "0,0\n1e-4,500\n", 1, "no header row before the numbers: the first row must name the columns, want the columns t_s and one of omega_rad_s, drive_hz"},
		{"unknown column", "t_s,speed\n0,0\n", 1, `unknown column "speed" in the header`},
		{"three columns in the header", "t_s,omega_rad_s,drive_hz\n", 1, "the header names 3 columns"},
		{"two speed columns", "omega_rad_s,drive_hz\n", 1, "the header names omega_rad_s and drive_hz: want the columns t_s and one of omega_rad_s, drive_hz"},
		{"time twice", "t_s,t_s\n", 1, "the header names t_s twice"},
		{"wrong field count", "t_s,omega_rad_s\n0,0\n1e-4,250,1\n", 3, "3 fields, want 2 (t_s, omega_rad_s)"},
		{"one field", "t_s,omega_rad_s\n0,0\n1e-4\n", 3, "1 field, want 2 (t_s, omega_rad_s)"},
		{"decimal commas", "t_s,omega_rad_s\n0,0\n0,0001,250,5\n", 3, "4 fields, want 2 (t_s, omega_rad_s): the numbers seem to have decimal commas; write them with decimal points (0.5, not 0,5)"},
		{"semicolons with decimal commas", "t_s;omega_rad_s\n0;0\n0,0001;250,5\n", 1, "the columns are separated by semicolons: rampart reads comma-separated values with decimal points"},
		{"empty field", "t_s,omega_rad_s\n0,0\n1e-4,\n", 3, "omega_rad_s is empty: want a number"},
		{"not a number", "t_s,omega_rad_s\n0,0\n1e-4,fast\n", 3, `omega_rad_s = "fast" is not a number`},
		{"NaN", "t_s,omega_rad_s\n0,0\nNaN,500\n", 3, "t_s = NaN: want a finite number"},
		{"Inf", "t_s,omega_rad_s\n0,0\n1e-4,+Inf\n", 3, "omega_rad_s = +Inf: want a finite number"},
		{"beyond float64", "t_s,omega_rad_s\n0,0\n1e-4,1e400\n", 3, "omega_rad_s = 1e400 is beyond the range of a float64"},
		{"does not start at t = 0", "t_s,omega_rad_s\n1e-6,0\n1e-4,500\n", 2, "the first row is at t_s = 1e-6: the ramp must start at t = 0"},
		{"does not start at rest", "t_s,omega_rad_s\n0,3\n1e-4,500\n", 2, "the first row has omega_rad_s = 3: the ramp must start at rest (0)"},
		{"time goes back", "t_s,omega_rad_s\n0,0\n1.3e-4,400\n1.2e-4,500\n", 4, "time 1.2e-4 s is not after the previous row (1.3e-4 s)"},
		{"time repeats", "t_s,omega_rad_s\n0,0\n1e-4,400\n1e-4,500\n", 4, "time 1e-4 s is not after the previous row (1e-4 s)"},
		{"one row", "t_s,omega_rad_s\n0,0\n", 0, "1 data row, want at least 2"},
		{"ends below cruise", "t_s,omega_rad_s\n0,0\n# end\n1e-4,499.9\n\n", 4, "the ramp ends at omega_rad_s = 499.9 but the cruise speed (motion.cruise_rad_s) is 500 rad/s: the last row must match it within a relative 1e-06"},
		{"drive ends below cruise", "t_s,drive_hz\n0,0\n1e-4,1591\n", 3, "the ramp ends at drive_hz = 1591 (499.827391 rad/s on 20 sites) but the cruise speed (motion.cruise_rad_s) is 500 rad/s, drive_hz = 1591.54943"},
	} {
		_, err := ParseRamp(strings.NewReader(row.file), "up.csv", sites, cruise)
		var e *RampError
		if !errors.As(err, &e) {
			t.Errorf("%s: got %v, want a *RampError", row.name, err)
			continue
		}
		if e.Line != row.line || e.File != "up.csv" || !strings.Contains(err.Error(), row.msg) {
			t.Errorf("%s: got %q (line %d), want line %d and %q", row.name, err, e.Line, row.line, row.msg)
		}
	}
}

func TestParseRampFormat(t *testing.T) {
	// The same four rows written in the ways the format allows.
	want := []float64{0, 100, 400, 500} // rad/s at t = 0, 1, 2, 3 us
	for _, row := range []struct {
		name string
		file string
	}{
		{"plain", "t_s,omega_rad_s\n0,0\n1e-6,100\n2e-6,400\n3e-6,500\n"},
		{"comments, blanks, spaces, CRLF", "# from the optimiser\r\n\r\n t_s , omega_rad_s \r\n0, 0 # at rest\r\n1e-6,100\r\n\r\n2e-6 ,400\r\n3e-6,500"},
		{"columns swapped", "omega_rad_s,t_s\n0,0\n100,1e-6\n400,2e-6\n500,3e-6\n"},
		{"drive frequency", "t_s,drive_hz\n0,0\n1e-6,318.30988618379067\n2e-6,1273.2395447351627\n3e-6,1591.5494309189535\n"}, // N Omega / 2 pi, N = 20
	} {
		tab, err := ParseRamp(strings.NewReader(row.file), "up.csv", 20, 500)
		if err != nil {
			t.Errorf("%s: %v", row.name, err)
			continue
		}
		if tab.Rows() != 4 || tab.Duration() != 3e-6 || tab.Name() != "up.csv" {
			t.Errorf("%s: %d rows over %g s named %q, want 4 rows over 3e-6 s named up.csv", row.name, tab.Rows(), tab.Duration(), tab.Name())
		}
		const tol = 1e-12 // relative; the drive_hz rows are rounded to 17 digits
		for i, w := range want {
			if got := tab.Speed(float64(i) * 1e-6); math.Abs(got-w) > tol*500 {
				t.Errorf("%s: speed at row %d: got %v, want %v (tol %g relative)", row.name, i, got, w, tol)
			}
		}
	}
}

// TestRampFileSin2 reads the sampled sin^2 ramp of testdata/ramps and checks
// it against the analytic ramp it was sampled from (testdata/ramps/generate.go).
func TestRampFileSin2(t *testing.T) {
	tab, err := ReadRamp(filepath.Join(root, "testdata", "ramps", "sin2-41.csv"), 20, 500)
	if err != nil {
		t.Fatal(err)
	}
	exact := sim.Sin2{DurationS: 150e-6, CruiseRadS: 500}
	// PCHIP passes through the rows: equal to the 17-digit rounding of the file.
	for i := range 41 {
		tm := 150e-6 * float64(i) / 40
		if got, want := tab.Speed(tm), exact.Speed(tm); math.Abs(got-want) > 1e-12*500 {
			t.Errorf("row %d: speed %v, want %v (tol 1e-12 relative)", i, got, want)
		}
	}
	// Between rows the interpolant follows the smooth ramp to about 1e-4 of
	// the cruise speed (measured 1.15e-4 with 41 rows). The ramp angle is
	// better: sin^2 is antisymmetric about its midpoint and the errors of
	// the two halves cancel (measured: equal to rounding).
	var worst float64
	for i := range 4000 {
		tm := 150e-6 * (float64(i) + 0.5) / 4000
		worst = math.Max(worst, math.Abs(tab.Speed(tm)-exact.Speed(tm)))
	}
	if worst > 2e-4*500 {
		t.Errorf("largest speed difference %g rad/s, want below %g (2e-4 of the cruise speed)", worst, 2e-4*500)
	}
	if got, want := tab.Angle(150e-6), exact.Angle(150e-6); math.Abs(got-want) > 1e-9*want {
		t.Errorf("ramp angle %v rad, want %v (tol 1e-9 relative)", got, want)
	}
}
