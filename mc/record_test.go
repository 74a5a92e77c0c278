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
