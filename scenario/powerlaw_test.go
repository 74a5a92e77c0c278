package scenario

import (
	"math"
	"strings"
	"testing"
	"testing/fstest"

	"rampart/mc"
)

// TestFieldPowerLawKeys: the field noise's keys give the IEEE Std 1139
// power-law PSD S_B(f) = h_0 + h_-1/f + h_-2/f^2 in G^2/Hz (uG^2 = 1e-12
// G^2), checked at three frequencies against the formula; the rotation
// noise is a white PSD in (rad/s)^2/Hz ((urad/s)^2 = 1e-12 (rad/s)^2); the
// gradient reaches the shot in G/m (uG/um = G/m) with its azimuth; and
// each needs a spin pair (the rotation noise does not).
func TestFieldPowerLawKeys(t *testing.T) {
	b, err := withSets(t, "atom.spin_pair=rb87-stretched", "noise.field.noise_ug2_hz=0.01", "noise.field.flicker_ug2=2",
		"noise.field.random_walk_ug2_hz=300", "noise.platform.rotation_noise_urad2_s2_hz=0.04",
		"atom.field_gradient_ug_um=0.5", "atom.field_gradient_deg=90", "noise.field.gradient_ug_um=0.1").Budget()
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []float64{1, 100, 1e4} {
		want := (0.01 + 2/f + 300/(f*f)) * 1e-12
		if got := b.FieldNoise.Density(f); math.Abs(got-want) > 1e-12*want {
			t.Errorf("S_B(%g Hz) = %g G^2/Hz, want %g", f, got, want)
		}
	}
	if got := b.RotationNoise.Density(7); math.Abs(got-0.04e-12) > 1e-27 {
		t.Errorf("S_Omega = %g (rad/s)^2/Hz, want 4e-14", got)
	}
	if f := b.Apparatus.Field; f.GradientGPerM != 0.5 || math.Abs(f.GradientRad-math.Pi/2) > 1e-15 || b.GradientGPerM != 0.1 {
		t.Errorf("gradient %g G/m towards %g rad, sigma %g G/m; want 0.5 towards pi/2, sigma 0.1", f.GradientGPerM, f.GradientRad, b.GradientGPerM)
	}
	if _, ok := mc.LookupSource(mc.SourceRotationPSD); !ok || !mustOn(b) {
		t.Error("rotation noise is not an active source of the budget")
	}
	for _, key := range []string{"noise.field.flicker_ug2=1", "noise.field.random_walk_ug2_hz=1", "atom.field_gradient_ug_um=1", "noise.field.gradient_ug_um=1"} {
		s, err := parse(fstest.MapFS{}, "s.toml", []byte(minimal), []string{key})
		if err == nil {
			_, err = s.Budget()
		}
		if err == nil || !strings.Contains(err.Error(), "spin pair is not") {
			t.Errorf("%s without a spin pair: error %v, want a refusal", key, err)
		}
	}
	if _, err := withSets(t, "noise.platform.rotation_noise_urad2_s2_hz=1").Budget(); err != nil {
		t.Errorf("rotation noise without a spin pair: %v", err)
	}
}

func mustOn(b mc.Budget) bool {
	for _, k := range mc.ActiveSources(b) {
		if k == mc.SourceRotationPSD {
			return true
		}
	}
	return false
}
