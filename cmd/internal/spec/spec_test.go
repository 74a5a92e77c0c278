package spec

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"rampart/mc"
)

func TestParseFull(t *testing.T) {
	src := `# every key
confidence = 0.9

[contrast]
mean_min = 0.9
p05_min = 0.8

[bias]
abs_p95_max_rad = 1e-3
abs_p95_max_deg_per_h = 5   # an integer is a number too

[scale_factor]
abs_p95_max_ppm = 12.5

[yield]
min = 0.99
contrast_min = 0.8
bias_max_rad = 2e-3
`
	got, err := Parse("full.toml", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	want := mc.Requirements{Confidence: 0.9, ContrastMeanMin: 0.9, ContrastP05Min: 0.8, AbsBiasP95MaxRad: 1e-3, AbsBiasP95MaxDegPerH: 5,
		AbsScaleFactorP95MaxPPM: 12.5, YieldMin: 0.99, Yield: mc.Spec{MinContrast: 0.8, MaxAbsBiasRad: 2e-3}}
	if got != want {
		t.Errorf("got %+v, want %+v", got, want)
	}
}

func TestParseDefaultsAndDottedKeys(t *testing.T) {
	got, err := Parse("short.toml", []byte("contrast.p05_min = 0.95\n"))
	if err != nil {
		t.Fatal(err)
	}
	if want := (mc.Requirements{Confidence: 0.95, ContrastP05Min: 0.95}); got != want {
		t.Errorf("got %+v, want %+v (confidence defaults to 0.95)", got, want)
	}
}

// TestParseErrors checks that each kind of mistake is refused with the
// file, the line, the key and what would be accepted.
func TestParseErrors(t *testing.T) {
	for _, tt := range []struct {
		name, src string
		line      int
		key       string
		want      []string // fragments of the message
	}{
		{"unknown key", "[contrast]\np05_min = 0.9\np50_min = 0.9\n", 3, "contrast.p50_min",
			[]string{"unknown key contrast.p50_min", "[contrast] takes mean_min, p05_min"}},
		{"unknown top key", "contrast.p05_min = 0.9\nconfidense = 0.9\n", 2, "confidense",
			[]string{"unknown key confidense", "confidence, [contrast], [bias], [scale_factor], [yield]"}},
		{"unknown table", "[phase]\nmax = 1\n", 1, "phase", []string{"unknown table [phase]"}},
		{"unknown subtable", "[contrast.tail]\np01_min = 0.5\n", 1, "contrast.tail", []string{"unknown table [contrast.tail]: [contrast] takes mean_min, p05_min"}},
		{"wrong type", "[contrast]\n\np05_min = \"high\"\n", 3, "contrast.p05_min",
			[]string{`contrast.p05_min = "high"`, "got a string", "a number in (0, 1]"}},
		{"boolean", "[bias]\nabs_p95_max_rad = true\n", 2, "bias.abs_p95_max_rad", []string{"got a boolean", "(0, pi]"}},
		{"out of range", "[contrast]\np05_min = 1.5\n", 2, "contrast.p05_min",
			[]string{"contrast.p05_min = 1.5 is out of range", "want a number in (0, 1] for the least 5th-percentile contrast"}},
		{"zero limit", "[bias]\nabs_p95_max_deg_per_h = 0\n", 2, "bias.abs_p95_max_deg_per_h", []string{"out of range", "> 0"}},
		{"nan", "[contrast]\nmean_min = nan\n", 2, "contrast.mean_min", []string{"mean_min = nan is out of range"}},
		{"confidence", "confidence = 1\ncontrast.p05_min = 0.9\n", 1, "confidence", []string{"confidence = 1 is out of range", "(0.5, 1)"}},
		{"yield of one", "[yield]\nmin = 1\ncontrast_min = 0.9\n", 2, "yield.min", []string{"(0, 1)"}},
		{"table as value", "contrast = 0.9\n", 1, "contrast", []string{"contrast must be a table [contrast]", "got a float"}},
		{"yield without limits", "[yield]\nmin = 0.99\n", 2, "yield.min", []string{"needs yield.contrast_min or yield.bias_max_rad"}},
		{"limits without yield", "[contrast]\np05_min = 0.9\n[yield]\nbias_max_rad = 1e-3\n", 4, "yield.bias_max_rad",
			[]string{"yield.bias_max_rad is given without yield.min"}},
		{"scale factor zero", "[scale_factor]\nabs_p95_max_ppm = 0\n", 2, "scale_factor.abs_p95_max_ppm", []string{"out of range", "> 0", "|K_shot / K - 1| in ppm"}},
		{"scale factor key", "[scale_factor]\nabs_p95_max = 3\n", 2, "scale_factor.abs_p95_max", []string{"unknown key", "[scale_factor] takes abs_p95_max_ppm"}},
		{"no criterion", "confidence = 0.9\n", 0, "", []string{"no criterion", "scale_factor.abs_p95_max_ppm"}},
		{"empty", "", 0, "", []string{"no criterion"}},
		{"syntax", "[contrast]\np05_min = = 0.9\n", 2, "", []string{"not valid TOML"}},
		{"unclosed table on line 1", "[contrast\np05_min = 0.9\n", 1, "", []string{"not valid TOML: expected '.' or ']' to end table name"}},
		{"UTF-16 byte-order mark", "\xff\xfe[contrast]\np05_min = 0.9\n", 1, "", []string{"UTF-16 byte-order mark"}},
		{"duplicate", "[contrast]\np05_min = 0.9\np05_min = 0.8\n", 3, "", []string{"not valid TOML"}},
	} {
		t.Run(tt.name, func(t *testing.T) {
			_, err := Parse("q.toml", []byte(tt.src))
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("got %v, want an *Error", err)
			}
			if e.File != "q.toml" || e.Line != tt.line || e.Key != tt.key {
				t.Errorf("got file %q line %d key %q, want q.toml line %d key %q (%v)", e.File, e.Line, e.Key, tt.line, tt.key, err)
			}
			msg := err.Error()
			where := `spec "q.toml"`
			if tt.line > 0 {
				where += fmt.Sprintf(" line %d", tt.line)
			}
			if !strings.HasPrefix(msg, where+": ") {
				t.Errorf("message %q: want it to start %q", msg, where)
			}
			for _, w := range tt.want {
				if !strings.Contains(msg, w) {
					t.Errorf("message %q: want it to contain %q", msg, w)
				}
			}
		})
	}
}

func TestRead(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "gate.toml")
	if err := os.WriteFile(path, []byte("[yield]\nmin = 0.9\ncontrast_min = 0.5\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	got, err := Read(path)
	if err != nil || got.YieldMin != 0.9 || got.Yield.MinContrast != 0.5 {
		t.Errorf("got %+v, %v", got, err)
	}
	if _, err := Read(filepath.Join(dir, "missing.toml")); err == nil || !strings.Contains(err.Error(), "missing.toml") {
		t.Errorf("missing file: got %v, want an error naming it", err)
	}
	if _, err := Read(path); err != nil {
		t.Fatal(err)
	}
	bad := filepath.Join(dir, "bad.toml")
	if err := os.WriteFile(bad, []byte("[contrast]\np05_min = 2\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := Read(bad); err == nil || !strings.HasPrefix(err.Error(), fmt.Sprintf("spec %q line 2: ", bad)) {
		t.Errorf("bad file: got %v, want an error naming the path and line", err)
	}
}

func ExampleParse() {
	req, err := Parse("gate.toml", []byte(`
[contrast]
p05_min = 0.9
[yield]
min = 0.99
bias_max_rad = 1e-3
`))
	fmt.Printf("%+v %v\n", req, err)
	_, err = Parse("gate.toml", []byte("[contrast]\np05_min = 90\n"))
	fmt.Println(err)
	// Output:
	// {Confidence:0.95 LossPossible:false ContrastMeanMin:0 ContrastP05Min:0.9 AbsBiasP95MaxRad:0 AbsBiasP95MaxDegPerH:0 AbsScaleFactorP95MaxPPM:0 YieldMin:0.99 Yield:{MinContrast:0 MaxAbsBiasRad:0.001} Look:0} <nil>
	// spec "gate.toml" line 2: contrast.p05_min = 90 is out of range: want a number in (0, 1] for the least 5th-percentile contrast
}
