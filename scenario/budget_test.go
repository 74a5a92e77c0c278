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
		var sc Scenario
		k := keyByName[s.Scenario]
		if k.kind != number {
			t.Fatalf("%s: scenario key %q is not a number", s.Key, s.Scenario)
		}
		k.set(&sc, 0.5)
		b, err := sc.Budget()
		if err != nil {
			t.Fatal(err)
		}
		if got, want := *s.Sigma(&b), 0.5*s.FileScale; got != want {
			t.Errorf("%s: %s = 0.5 gives sigma %g, want %g", s.Key, s.Scenario, got, want)
		}
		if len(b.Params()) != len(s.Inputs) {
			t.Errorf("%s: %s = 0.5 switches on %d inputs, want %d", s.Key, s.Scenario, len(b.Params()), len(s.Inputs))
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
