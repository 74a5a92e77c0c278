package scenario

import (
	"strings"
	"testing"

	"rampart/mc"
)

// TestBudgetReadsEverySource checks that every static row of mc.Sources
// names a number key of the schema, and that Budget converts its file
// value by the row's FileScale (1 in file units -> FileScale in SI).
func TestBudgetReadsEverySource(t *testing.T) {
	for _, s := range mc.Sources {
		if _, ok := keyByName[s.Scenario]; !ok {
			t.Errorf("%s: scenario key %q is not in the schema", s.Key, s.Scenario)
		}
		if s.Kind != mc.Static {
			continue
		}
		sc := Scenario{Start: Start{TemperatureNK: 1}} // a spread below the start temperature
		k := keyByName[s.Scenario]
		if k.kind != number {
			t.Fatalf("%s: scenario key %q is not a number", s.Key, s.Scenario)
		}
		k.set(&sc, 0.05)
		b, err := sc.Budget()
		if err != nil {
			t.Fatal(err)
		}
		if got, want := *s.Sigma(&b), 0.05*s.FileScale; got != want {
			t.Errorf("%s: %s = 0.05 gives sigma %g, want %g", s.Key, s.Scenario, got, want)
		}
		if len(b.Params()) != len(s.Inputs) {
			t.Errorf("%s: %s = 0.05 switches on %d inputs, want %d", s.Key, s.Scenario, len(b.Params()), len(s.Inputs))
		}
	}
}

// TestSourceKeysFromTable checks that a static row of mc.Sources whose
// scenario key the schema lacks gets a key made from the row, stored in
// Scenario.SourceNoise and read back by Number (and so by Budget): a new
// source needs no change to this package (the apparatus's rows, field
// offset, radius, tilt and rotation, have made keys): each made key is a
// static row's, with the row's meaning.
func TestSourceKeysFromTable(t *testing.T) {
	nMade := 0
	for _, k := range keys {
		if !k.source {
			continue
		}
		nMade++
		found := false
		for _, s := range mc.Sources {
			if s.Kind == mc.Static && s.Scenario == k.name && strings.Contains(k.meaning, s.Meaning) {
				found = true
			}
		}
		if !found {
			t.Errorf("made key %s is not a static row's of mc.Sources", k.name)
		}
	}
	if nMade == 0 {
		t.Errorf("no made keys: the apparatus's rows have none written by hand")
	}
	saved := mc.Sources
	defer func() { mc.Sources = saved }()
	mc.Sources = append(append([]mc.Source(nil), saved...), mc.Source{
		Key: "roll_rad", Meaning: "tilt of the ring plane", Scenario: "noise.tilt.sigma_urad", FileScale: 1e-6, Kind: mc.Static,
	})
	made := sourceKeys()
	if len(made) != 1 || made[0].name != "noise.tilt.sigma_urad" || made[0].kind != number || !made[0].source {
		t.Fatalf("made keys %+v, want one number key noise.tilt.sigma_urad", made)
	}
	k := made[0]
	if _, err := k.convert(-1.0); err == nil {
		t.Errorf("a negative sigma is accepted")
	}
	keyByName[k.name] = k
	defer delete(keyByName, k.name)
	var sc Scenario
	k.set(&sc, 3.5)
	if v, ok := sc.Number("noise.tilt.sigma_urad"); !ok || v != 3.5 || sc.SourceNoise["noise.tilt.sigma_urad"] != 3.5 {
		t.Errorf("Number gives %v (%v), SourceNoise %v; want 3.5", v, ok, sc.SourceNoise)
	}
	if !strings.Contains(k.want(), "tilt of the ring plane") {
		t.Errorf("message %q does not name the source", k.want())
	}
}

// TestBudgetRefusesUnphysicalDraws checks that amplitudes whose 5-sigma
// draw is unphysical are refused with what would be accepted: a depth
// error whose draw makes 1 + eps_common - eps_diff/2 negative, a
// temperature spread above the start temperature or with a ground-state
// start; the largest accepted amplitudes pass.
func TestBudgetRefusesUnphysicalDraws(t *testing.T) {
	for _, c := range []struct {
		name                 string
		common, diff, tempNK float64
		spreadNK             float64
		msg                  string // "" accepted
	}{
		{"depth common at 0.5", 0.5, 0, 0, 0, "noise.depth.common_rel = 0.5 with differential_rel = 0: a 5-sigma draw makes a lattice depth negative (1 - 2.5 < 0); want common_rel + differential_rel/2 below 0.2"},
		{"depth common and differential", 0.15, 0.1, 0, 0, "a 5-sigma draw makes a lattice depth negative (1 - 1 < 0)"},
		{"depth just below", 0.199, 0, 0, 0, ""},
		{"spread above the start", 0, 0, 20, 25, "noise.temperature.spread_nk = 25 is above the start temperature start.temperature_nk = 20"},
		{"spread at a ground-state start", 0, 0, 0, 5, "with a ground-state start (start.temperature_nk = 0)"},
		{"spread at the start", 0, 0, 20, 20, ""},
	} {
		sc := Scenario{Name: "s.toml", Start: Start{TemperatureNK: c.tempNK}}
		sc.Noise.Depth.CommonRel, sc.Noise.Depth.DifferentialRel = c.common, c.diff
		sc.Noise.Temperature.SpreadNK = c.spreadNK
		_, err := sc.Budget()
		switch {
		case c.msg == "" && err != nil:
			t.Errorf("%s: got %v, want no error", c.name, err)
		case c.msg != "" && (err == nil || !strings.Contains(err.Error(), c.msg)):
			t.Errorf("%s: got %v, want %q", c.name, err, c.msg)
		}
	}
}
