package scenario

import (
	"strings"
	"testing"
)

// TestCountsInMessages: the counts a user can bring down to 0 or 1 are
// written with the noun in the number they ask for (internal/plural).
func TestCountsInMessages(t *testing.T) {
	base, cfg, err := LoadConfig("../testdata/scenarios/benchmark.toml", nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		ramps []string
		want  string
	}{
		{nil, "0 ramps to rank:"},
		{[]string{"a=sin2"}, "1 ramp to rank:"},
	} {
		_, err := Contestants(base, cfg, tc.ramps, nil, nil)
		if err == nil || !strings.HasPrefix(err.Error(), tc.want) {
			t.Errorf("ramps %v: %v, want %q", tc.ramps, err, tc.want)
		}
	}
	_, err = ParseRamp(strings.NewReader("t_s\n0\n"), "one.csv", 20, 500)
	if err == nil || !strings.Contains(err.Error(), "the header names 1 column:") {
		t.Errorf("a one-column header: %v, want \"the header names 1 column:\"", err)
	}
}
