package present

import (
	"strings"
	"testing"

	"rampart/scenario"
)

// TestDescribeCounts: the scenario line writes its site count in the
// number it asks for (internal/plural): "1 site", "20 sites".
func TestDescribeCounts(t *testing.T) {
	for _, tc := range []struct {
		sites string
		want  string
	}{{"1", "1 site of radius 5 um"}, {"20", "20 sites of radius 5 um"}} {
		sc, cfg, err := scenario.LoadConfig("../../../testdata/scenarios/benchmark.toml", []string{"ring.sites=" + tc.sites})
		if err != nil {
			t.Fatal(err)
		}
		if got := Describe(sc, cfg, "sin2 ramp"); !strings.Contains(got, tc.want) {
			t.Errorf("%s sites: %q, want it to contain %q", tc.sites, got, tc.want)
		}
	}
}
