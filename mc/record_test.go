package mc

import "testing"

// TestRecordColumns checks that each static input's column in the records
// names the unit its draws are stored in (the source's SIUnit), and that
// the columns of inputs stored in their lab unit keep the key.
func TestRecordColumns(t *testing.T) {
	want := map[string]string{
		ParamDepthCommon: "depth.common_rel",
		ParamClock:       "timing.clock_rel",
		ParamSpeed:       "timing.speed_rel",
		ParamSkew:        "timing.skew_s",
		ParamTemperature: "temperature.spread_k",
		ParamPulse1:      "pulses.area_rel.1",
		ParamFieldOffset: "field.offset_g",
		ParamRadius:      "ring.radius_rel",
		ParamTilt:        "ring.tilt_rad",
		ParamRotation:    "platform.rotation_rad_s",
		ParamMains:       "field.mains_g",
		ParamGradient:    "field.gradient_ug_um", // 1 uG/um is 1 G/m: the same number
		ParamSwap:        "pulses.swap_area_rel",
	}
	for in, col := range want {
		if got := RecordColumn(in); got != col {
			t.Errorf("RecordColumn(%q) = %q, want %q", in, got, col)
		}
	}
	// Every static input has a distinct column.
	seen := map[string]string{}
	for _, s := range Sources {
		for _, in := range s.Inputs {
			c := RecordColumn(in)
			if o, dup := seen[c]; dup {
				t.Errorf("inputs %q and %q share the column %q", o, in, c)
			}
			seen[c] = in
		}
	}
}

// TestScenarioDiff checks the fields a refused resume names: nested
// fields by their paths in order, a cap on how many, and nothing for texts
// that are not JSON or do not differ.
func TestScenarioDiff(t *testing.T) {
	a := `{"Ring":{"Sites":20,"TiltMrad":0.5},"Noise":{"Timing":{"SkewNS":5}},"Name":"x"}`
	b := `{"Ring":{"Sites":20,"TiltMrad":0.6},"Noise":{"Timing":{"SkewNS":7}},"Name":"x"}`
	if got, want := scenarioDiff(a, b, 4), "Noise.Timing.SkewNS 5, not 7; Ring.TiltMrad 0.5, not 0.6"; got != want {
		t.Errorf("scenarioDiff = %q, want %q", got, want)
	}
	if got, want := scenarioDiff(a, b, 1), "Noise.Timing.SkewNS 5, not 7; and 1 more"; got != want {
		t.Errorf("scenarioDiff capped = %q, want %q", got, want)
	}
	if got := scenarioDiff(a, a, 4); got != "" {
		t.Errorf("scenarioDiff of equal texts = %q, want empty", got)
	}
	if got := scenarioDiff("not json", b, 4); got != "" {
		t.Errorf("scenarioDiff of a non-JSON text = %q, want empty", got)
	}
}
