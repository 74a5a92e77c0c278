package scenario

import (
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
		f, ok := keyByName[s.Scenario].field(&sc).(*float64)
		if !ok {
			t.Fatalf("%s: scenario key %q is not a number", s.Key, s.Scenario)
		}
		*f = 0.5
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
