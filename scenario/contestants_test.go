package scenario

import (
	"reflect"
	"strings"
	"testing"
)

// TestKeysCoverScenario checks that every value of a Scenario has a key
// (SourceNoise holds the source keys), so that differingKeys names every
// difference sameButRamp can find.
func TestKeysCoverScenario(t *testing.T) {
	var s Scenario
	have := map[uintptr]bool{}
	for _, k := range keys {
		if !k.source {
			have[reflect.ValueOf(k.field(&s)).Pointer()] = true
		}
	}
	var walk func(v reflect.Value, path string)
	walk = func(v reflect.Value, path string) {
		for i := range v.NumField() {
			f, ft := v.Field(i), v.Type().Field(i)
			name := path + "." + ft.Name
			switch {
			case !ft.IsExported() || name == ".Name" || name == ".SourceNoise":
			case f.Kind() == reflect.Struct:
				walk(f, name)
			case !have[f.Addr().Pointer()]:
				t.Errorf("Scenario%s has no key", name)
			}
		}
	}
	walk(reflect.ValueOf(&s).Elem(), "")
}

// TestDemoVariantsDifferOnlyInRamp: testdata/demo/slow600.toml and
// slow1500.toml are the demo with only [ramp] changed (README, rampart
// robust, ranks them against the demo), and a file that differs is named
// by its keys, the [noise] sub-tables and the source keys included.
func TestDemoVariantsDifferOnlyInRamp(t *testing.T) {
	demo, err := Load("../testdata/demo/demo.toml", nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{"slow600.toml", "slow1500.toml"} {
		sc, err := Load("../testdata/demo/"+f, nil)
		if err != nil {
			t.Fatal(err)
		}
		if err := sameButRamp(demo, sc); err != nil {
			t.Errorf("%s: %v", f, err)
		}
		if reflect.DeepEqual(sc.Ramp, demo.Ramp) {
			t.Errorf("%s: the same [ramp] as the demo, want another", f)
		}
	}
	for _, tc := range []struct {
		sets []string
		want string // the keys named, in schema order
	}{
		{[]string{"noise.field.offset_ug=200"}, "in noise.field.offset_ug:"},
		{[]string{"noise.platform.rotation_noise_urad2_s2_hz=2"}, "in noise.platform.rotation_noise_urad2_s2_hz:"},
		{[]string{"atom.field_gradient_ug_um=0.03", "lattice.depth_khz=21"}, "in atom.field_gradient_ug_um, lattice.depth_khz:"},
		{[]string{"ramp.duration_us=600"}, ""},
	} {
		sc, err := Load("../testdata/demo/demo.toml", tc.sets)
		if err != nil {
			t.Fatal(err)
		}
		err = sameButRamp(demo, sc)
		switch {
		case tc.want == "" && err != nil:
			t.Errorf("%v: %v, want no difference", tc.sets, err)
		case tc.want != "" && (err == nil || !strings.Contains(err.Error(), tc.want)):
			t.Errorf("%v: %v, want %q", tc.sets, err, tc.want)
		}
	}
}
