package scenario

import (
	"math"
	"strings"
	"testing"
	"testing/fstest"
)

// TestMainsKeys: the mains line's keys reach the budget in SI units, its
// harmonics relative to the fundamental; a line without a spin pair, and
// harmonics without a fundamental, are refused with the key.
func TestMainsKeys(t *testing.T) {
	b, err := withSets(t, "atom.spin_pair=rb87-stretched", "noise.field.mains_ug=2", "noise.field.mains_hz=60",
		"noise.field.mains_h2_ug=0.5", "noise.field.mains_h3_ug=1", "noise.field.mains_phase=fixed", "noise.field.mains_phase_rad=0.3").Budget()
	if err != nil {
		t.Fatal(err)
	}
	m := b.Mains
	if math.Abs(b.MainsG-2e-6) > 1e-20 || m.Hz != 60 || !m.FixedPhase || m.PhaseRad != 0.3 ||
		len(m.HarmonicsRel) != 2 || math.Abs(m.HarmonicsRel[0]-0.25) > 1e-15 || math.Abs(m.HarmonicsRel[1]-0.5) > 1e-15 {
		t.Errorf("mains %g G, %+v", b.MainsG, m)
	}
	for _, tc := range []struct {
		sets []string
		want string
	}{
		{[]string{"noise.field.mains_ug=1"}, "noise.field.mains_ug is given but the spin pair is not"},
		{[]string{"atom.spin_pair=rb87-stretched", "noise.field.mains_h3_ug=1"}, "harmonics need the fundamental"},
		{[]string{"atom.spin_pair=rb87-stretched", "noise.field.mains_phase=sometimes"}, "noise.field.mains_phase"},
		{[]string{"readout.detection_atoms=3"}, "readout.detection_atoms needs readout.atoms"},
	} {
		s, err := parse(fstest.MapFS{}, "s.toml", []byte(minimal), tc.sets)
		if err == nil {
			_, err = s.Budget()
		}
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%v: error %v, want one with %q", tc.sets, err, tc.want)
		}
	}
}
