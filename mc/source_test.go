package mc

import (
	"math"
	"os"
	"reflect"
	"strings"
	"testing"

	"rampart/noise"
	"rampart/sim"
)

// TestSourcesComplete fails when a row of the table of perturbation
// sources lacks a field its kind needs, or when keys or inputs repeat.
func TestSourcesComplete(t *testing.T) {
	seen := map[string]bool{}
	dim := 0
	for i, s := range Sources {
		missing := func(what string) { t.Errorf("row %d (%q) lacks %s", i, s.Key, what) }
		if s.Key == "" {
			missing("a key")
		}
		if seen[s.Key] {
			t.Errorf("row %d: key %q repeats", i, s.Key)
		}
		seen[s.Key] = true
		if s.Meaning == "" {
			missing("a meaning")
		}
		if !strings.HasPrefix(s.Scenario, "noise.") {
			missing("a scenario key under [noise.*]")
		}
		if s.Unit == "" {
			missing("a lab unit")
		}
		if s.Line == "" {
			missing("a budget-line phrase")
		}
		if !strings.HasPrefix(s.Reference, "docs/model.md") {
			missing("a reference into docs/model.md")
		}
		if !(s.Max > 0) {
			missing("a largest search amplitude")
		}
		switch s.Kind {
		case Static:
			if s.Scale == 0 || s.FileScale == 0 || s.SIUnit == "" {
				missing("a display scale, a file scale and an SI unit")
			}
			if len(s.Inputs) == 0 {
				missing("its drawn inputs")
			}
			for _, in := range s.Inputs {
				if seen["input "+in] {
					t.Errorf("row %d: input %q repeats", i, in)
				}
				seen["input "+in] = true
			}
			dim += len(s.Inputs)
			if s.Sigma == nil || (s.Apply == nil) == (s.Waveform == nil) {
				missing("its budget field and how a shot applies it")
			}
			if !(s.Ref > 0 && s.Ref < s.Max) {
				t.Errorf("row %d (%q): reference amplitude %g not in (0, max %g)", i, s.Key, s.Ref, s.Max)
			}
			if !strings.Contains(s.Line, "{}") {
				t.Errorf("row %d (%q): budget-line phrase %q has no {} for its amplitude", i, s.Key, s.Line)
			}
		case Process:
			if s.PSD == nil || s.ApplyNoise == nil || s.Level == nil || s.FromLevel == nil {
				missing("its PSD field, level conversions and how a shot applies its records")
			}
			if s.FromLevel != nil && !(s.FromLevel(s.Ref) > 0) || math.IsInf(s.Ref, 0) || math.IsNaN(s.Ref) {
				t.Errorf("row %d (%q): reference level %g %s is not a finite level of a positive PSD", i, s.Key, s.Ref, s.Unit)
			}
		default:
			missing("a kind")
		}
	}
	if dim != StaticDim {
		t.Errorf("StaticDim = %d, the static rows draw %d inputs", StaticDim, dim)
	}
}

// TestSourcesApply checks that each static row writes its draw into the
// shot (a non-zero shot from v = 1e-3), that a budget with only that row on
// gives exactly that row's inputs, and that its field is what Sigma points
// at (Scaled by 2 doubles it). Each process row writes its records.
func TestSourcesApply(t *testing.T) {
	for _, s := range Sources {
		if s.Kind == Process {
			var sh sim.Shot
			rec := &sim.Series{StepS: 1, Values: []float64{1}}
			s.ApplyNoise(&sh, [2]*sim.Series{rec, rec})
			if reflect.DeepEqual(sh, sim.Shot{}) {
				t.Errorf("%s: ApplyNoise left the shot unchanged", s.Key)
			}
			var b Budget
			*s.PSD(&b) = noise.White{Level: 1}
			if !s.On(b) || !b.Dynamic() {
				t.Errorf("%s: a budget with its PSD set is not on / not dynamic", s.Key)
			}
			continue
		}
		for i := range s.Inputs {
			var sh sim.Shot
			if s.Waveform != nil {
				var b Budget
				*s.Sigma(&b) = 1e-3
				s.Waveform(&sh, &b, 0.3, 1e-3, 10)
			} else {
				s.Apply(&sh, i, 1e-3)
			}
			if reflect.DeepEqual(sh, sim.Shot{}) {
				t.Errorf("%s input %d: Apply left the shot unchanged", s.Key, i)
			}
		}
		var b Budget
		*s.Sigma(&b) = 1e-9
		params := b.Params()
		if len(params) != len(s.Inputs) {
			t.Fatalf("%s: budget with it alone has %d params, want %d", s.Key, len(params), len(s.Inputs))
		}
		for i, p := range params {
			if p.Name != s.Inputs[i] || p.Sigma != 1e-9 {
				t.Errorf("%s: param %d = %+v, want %s with sigma 1e-9", s.Key, i, p, s.Inputs[i])
			}
		}
		if got := *s.Sigma(ptr(b.Scaled(2))); got != 2e-9 {
			t.Errorf("%s: Scaled(2) gives %g, want 2e-9", s.Key, got)
		}
		if got := ActiveSources(b); len(got) != 1 || got[0] != s.Key {
			t.Errorf("%s: active sources %q, want only it", s.Key, got)
		}
		a, on := SourceAmplitude(s.Key, b, b)
		if want := 1e-9 * s.Scale; !on || math.Abs(a-want) > 1e-15*want {
			t.Errorf("%s: amplitude %g %s (on %v), want %g", s.Key, a, s.Unit, on, want)
		}
	}
}

func ptr(b Budget) *Budget { return &b }

// TestSourcesInReadme checks that README.md documents every row: its
// scenario key in the table of its [noise.*] section, and its key in the
// list of tolerance --sources.
func TestSourcesInReadme(t *testing.T) {
	data, err := os.ReadFile("../README.md")
	if err != nil {
		t.Fatal(err)
	}
	readme := string(data)
	var sources string
	for _, line := range strings.Split(readme, "\n") {
		if strings.HasPrefix(line, "| `--sources LIST`") {
			sources = line
		}
	}
	if sources == "" {
		t.Fatal("README.md has no row for tolerance --sources")
	}
	for _, s := range Sources {
		dot := strings.LastIndexByte(s.Scenario, '.')
		heading := "#### [" + s.Scenario[:dot] + "]"
		at := strings.Index(readme, heading)
		if at < 0 {
			t.Errorf("%s: README.md has no section %s", s.Key, heading)
			continue
		}
		section := readme[at+len(heading):]
		if end := strings.Index(section, "\n#"); end >= 0 {
			section = section[:end]
		}
		if !strings.Contains(section, "| `"+s.Scenario[dot+1:]+"` |") {
			t.Errorf("%s: README.md section %s has no row for `%s`", s.Key, heading, s.Scenario[dot+1:])
		}
		if !strings.Contains(sources, "`"+s.Key+"`") {
			t.Errorf("%s: README.md's --sources row does not list `%s`", s.Key, s.Key)
		}
	}
}

// TestSourceOneNameOneUnit checks that each source has one name and one
// lab unit everywhere: its key is its scenario key without "noise." (so
// the unit suffix of the file is the unit of every table), a static
// source's lab scale is the inverse of its file scale (the file's number
// is the table's number), and the suffix names the lab unit.
func TestSourceOneNameOneUnit(t *testing.T) {
	suffix := map[string]string{"_rel": Relative, "_ppm": "ppm", "_ns": "ns", "_nk": "nK", "_db_hz": "dB/Hz", "_dbc_hz": "dBc/Hz",
		"_ug": "uG", "_mrad": "mrad", "_urad_s": "urad/s", "_ug2_hz": "uG^2/Hz", "_ug_um": "uG/um", "_urad2_s2_hz": "(urad/s)^2/Hz"}
	for _, s := range Sources {
		if s.Key != strings.TrimPrefix(s.Scenario, "noise.") {
			t.Errorf("%s: key differs from its scenario key %s", s.Key, s.Scenario)
		}
		if s.Kind == Static && math.Abs(s.Scale*s.FileScale-1) > 1e-12 {
			t.Errorf("%s: lab scale %g x file scale %g = %g, want 1 (tol 1e-12)", s.Key, s.Scale, s.FileScale, s.Scale*s.FileScale)
		}
		found := false
		for suf, unit := range suffix {
			if strings.HasSuffix(s.Key, suf) {
				found = true
				if s.Unit != unit {
					t.Errorf("%s: lab unit %q, want %q from its suffix", s.Key, s.Unit, unit)
				}
			}
		}
		if !found {
			t.Errorf("%s: no unit suffix", s.Key)
		}
		for _, in := range s.Inputs {
			if !strings.HasPrefix(in, s.Key) {
				t.Errorf("%s: drawn input %s is not named after its source", s.Key, in)
			}
		}
	}
}

// TestLabValueRoundTrip: a budget's amplitude read from the scenario file
// (times FileScale to SI) and shown in the lab unit (times Scale) comes
// back as the file's number, not as 99.99999999999999 for 100 uG.
func TestLabValueRoundTrip(t *testing.T) {
	for _, s := range Sources {
		if s.Kind != Static {
			continue
		}
		for _, file := range []float64{100, 0.3, 5, 2e-8, 0.05} {
			if got := s.labValue(file * s.FileScale); got != file {
				t.Errorf("%s: %g in the file shows as %v", s.Key, file, got)
			}
		}
	}
}
