package noise

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestReadPhaseNoise(t *testing.T) {
	tab, err := ReadPhaseNoise("testdata/phase_noise.csv")
	if err != nil {
		t.Fatal(err)
	}
	// The file's rows, converted by S_φ = 2·10^(L/10) (IEEE Std 1139), and the
	// log-log interpolation between them: -100 dBc/Hz at sqrt(10 × 100) Hz.
	tests := []struct {
		fHz, want float64
	}{
		{10, 2e-9},
		{100, 2e-11},
		{math.Sqrt(1000), 2e-10},
		{1e4, 2e-13},
		{1e6, 2e-13},
	}
	for _, tt := range tests {
		if got := tab.Density(tt.fHz); relErr(got, tt.want) > 1e-12 {
			t.Errorf("S_phi(%g Hz): got %v, want %v (rel tol 1e-12)", tt.fHz, got, tt.want)
		}
	}
	if _, err := ReadPhaseNoise("testdata/missing.csv"); err == nil || !strings.Contains(err.Error(), "testdata/missing.csv") {
		t.Errorf("missing file: got error %v, want one naming the file", err)
	}
}

func TestParsePhaseNoiseAccepts(t *testing.T) {
	// Comments, blank lines, spaces, CRLF line ends and a byte-order mark are
	// all allowed; each input has the rows (10 Hz, -80) and (1 kHz, -120).
	inputs := map[string]string{
		"plain":           "f_hz,l_dbc_hz\n10,-80\n1000,-120\n",
		"comments":        "# from the beat note\n\nf_hz,l_dbc_hz\n# low offsets\n10,-80\n\n1e3,-120",
		"spaces":          "  f_hz , l_dbc_hz \n 10 , -80\n1000,  -120  \n",
		"CRLF":            "f_hz,l_dbc_hz\r\n10,-80\r\n1000,-120\r\n",
		"byte-order mark": "\ufefff_hz,l_dbc_hz\n10,-80\n1000,-120\n",
	}
	for name, in := range inputs {
		tab, err := ParsePhaseNoise(strings.NewReader(in), name)
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		// -100 dBc/Hz at the geometric mean, 100 Hz: S_φ = 2e-10.
		if got, want := tab.Density(100), 2e-10; relErr(got, want) > 1e-12 {
			t.Errorf("%s: S_phi(100 Hz) = %v, want %v (rel tol 1e-12)", name, got, want)
		}
	}
}

func TestParsePhaseNoiseErrors(t *testing.T) {
	const h = "f_hz,l_dbc_hz\n"
	tests := []struct {
		name, in, want string
	}{
		{"empty file", "", `phase-noise table "t.csv": empty, want the header "f_hz,l_dbc_hz"`},
		{"only comments", "# nothing\n\n", `phase-noise table "t.csv": empty`},
		{"wrong header", "freq,dbc\n10,-80\n", `phase-noise table "t.csv" line 1: the first line that is not blank or a comment is not the header: want "f_hz,l_dbc_hz"`},
		{"missing header", "10,-80\n", `line 1: the first line that is not blank or a comment is not the header`},
		{"header only", h, `phase-noise table "t.csv": no rows after the header`},
		{"one field", h + "10\n", `line 2: 1 field, want 2 (f_hz,l_dbc_hz)`},
		{"three fields", h + "10,-80,3\n", `line 2: 3 fields, want 2`},
		{"bad frequency", h + "ten,-80\n", `line 2: frequency "ten" is not a number`},
		{"empty frequency", h + ",-80\n", `line 2: frequency "" is not a number`},
		{"bad level", h + "10,-80dB\n", `line 2: level "-80dB" is not a number`},
		{"NaN frequency", h + "NaN,-80\n", `line 2: frequency NaN is not finite`},
		{"infinite frequency", h + "inf,-80\n", `line 2: frequency +Inf is not finite`},
		{"NaN level", h + "10,nan\n", `line 2: level NaN dBc/Hz is not finite`},
		{"infinite level", h + "10,-Inf\n", `line 2: level -Inf dBc/Hz is not finite`},
		{"zero frequency", h + "0,-80\n", `line 2: frequency 0 Hz is not positive`},
		{"negative frequency", h + "-10,-80\n", `line 2: frequency -10 Hz is not positive`},
		{"repeated frequency", h + "10,-80\n# c\n10,-90\n", `line 4: frequency 10 Hz is not above the previous row's (10 Hz, line 2)`},
		{"decreasing frequency", h + "100,-80\n10,-90\n", `line 3: frequency 10 Hz is not above the previous row's (100 Hz, line 2)`},
		{"level underflows", h + "10,-4000\n", `line 2: level -4000 dBc/Hz is out of range (S_phi = 0 rad^2/Hz)`},
		{"level overflows", h + "10,4000\n", `line 2: level 4000 dBc/Hz is out of range (S_phi = +Inf rad^2/Hz)`},
		{"level at 0 dBc/Hz", h + "10,-80\n100,0\n", `line 3: level 0 dBc/Hz: want a level below 0 dBc/Hz`},
		{"positive level", h + "100,+50\n", `line 2: level 50 dBc/Hz: want a level below 0 dBc/Hz`},
		{"semicolons", "f_hz;l_dbc_hz\n10;-80\n", `line 1: the columns are separated by semicolons`},
		{"line too long", h + strings.Repeat("1", 70000) + ",-80\n", `phase-noise table "t.csv": bufio.Scanner: token too long`},
	}
	for _, tt := range tests {
		_, err := ParsePhaseNoise(strings.NewReader(tt.in), "t.csv")
		if err == nil || !strings.Contains(err.Error(), tt.want) {
			t.Errorf("%s: got error %v, want one containing %q", tt.name, err, tt.want)
		}
	}
}

func FuzzParsePhaseNoise(f *testing.F) {
	seeds := []string{
		"f_hz,l_dbc_hz\n10,-80\n1000,-120\n",
		"# c\nf_hz,l_dbc_hz\n1e-3,20\n",
		"f_hz,l_dbc_hz\n10,-80\n10,-80\n",
		"f_hz,l_dbc_hz\n0x1p3,-1e2\n",
		"f_hz,l_dbc_hz\n1,-3000\n2,3000\n",
		"f_hz,l_dbc_hz\n5e-324,-80\n1.7976931348623157e308,-80\n",
		"\ufefff_hz,l_dbc_hz\r\n1,1\r\n",
		"freq,dbc\n",
		"",
	}
	for _, s := range seeds {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, in string) {
		tab, err := ParsePhaseNoise(strings.NewReader(in), "fuzz.csv")
		if err != nil {
			if !strings.HasPrefix(err.Error(), `phase-noise table "fuzz.csv"`) {
				t.Fatalf("error does not name the input: %v", err)
			}
			return
		}
		// A table that parsed must be usable: positive finite densities and
		// finite non-negative band integrals everywhere.
		for _, fHz := range []float64{0, 1e-300, 1e-3, 1, 1e3, 1e9, 1e300} {
			d := tab.Density(fHz)
			if !(d > 0) || math.IsInf(d, 1) {
				t.Fatalf("Density(%g) = %v for input %q", fHz, d, in)
			}
		}
		for i := range tab.freq {
			if i > 0 && !(tab.freq[i] > tab.freq[i-1]) {
				t.Fatalf("frequencies not increasing: %v", tab.freq)
			}
		}
		if v := tab.Integral(0, 1); !(v >= 0) {
			t.Fatalf("Integral(0, 1) = %v for input %q", v, in)
		}
	})
}

// TestPhaseNoiseFileNotEchoed checks that a file pointed at by mistake is
// not echoed into the message (the header error used to quote its first
// line), and that special files and oversized files are refused.
func TestPhaseNoiseFileNotEchoed(t *testing.T) {
	dir := t.TempDir()
	secret := filepath.Join(dir, "credentials")
	os.WriteFile(secret, []byte("password=hunter2\n"), 0o600)
	_, err := ReadPhaseNoise(secret)
	if err == nil || strings.Contains(err.Error(), "hunter2") {
		t.Errorf("got %v, want a refusal that does not quote the file", err)
	}
	for _, c := range []struct{ path, want string }{
		{"/dev/zero", "a device, not a regular file"},
		{dir, "a directory, not a regular file"},
		{filepath.Join(dir, "none.csv"), "cannot read the file: no such file or directory"},
	} {
		if _, err := ReadPhaseNoise(c.path); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want %q", c.path, err, c.want)
		}
	}
}
