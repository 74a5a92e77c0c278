package scenario

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"
	"testing/fstest"
)

// FuzzParseRamp feeds arbitrary files to the ramp parser: it must return a
// ramp or an error, never panic, and a ramp it returns must satisfy the
// format's promises. Run with
//
//	go test -fuzz=FuzzParseRamp ./scenario
func FuzzParseRamp(f *testing.F) {
	for _, name := range []string{"sin2-41.csv", "sin2-41-drive.csv"} {
		data, err := os.ReadFile(filepath.Join(root, "testdata", "ramps", name))
		if err != nil {
			f.Fatal(err)
		}
		f.Add(data)
	}
	for _, seed := range []string{
		"",
		"t_s,omega_rad_s\n0,0\n1e-4,500\n",
		"drive_hz,t_s\n0,0\n1591.5494309189535,1e-4\n",
		"# c\n t_s , omega_rad_s \r\n0,0 # rest\n5e-5,600\n1e-4,500\n",
		"t_s,omega_rad_s\n0,0\n1e-4,NaN\n",
		"t_s,omega_rad_s\n0,0\n2e-4,300\n1e-4,500\n",
		"t_s,omega_rad_s,x\n",
		"0,0\n",
	} {
		f.Add([]byte(seed))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		tab, err := ParseRamp(bytes.NewReader(data), "fuzz.csv", 20, 500)
		if err != nil {
			return
		}
		if d := tab.Duration(); !(d > 0) {
			t.Fatalf("ramp of duration %v s accepted", d)
		}
		if tab.Speed(0) != 0 || tab.Speed(tab.Duration()) != 500 {
			t.Fatalf("ramp from %v to %v rad/s accepted, want 0 to 500", tab.Speed(0), tab.Speed(tab.Duration()))
		}
	})
}

// FuzzParseScenario feeds arbitrary scenario files and overrides to the
// scenario parser: it must return a scenario or an error, never panic, and a
// scenario it returns must give a valid simulation configuration. Run with
//
//	go test -fuzz=FuzzParseScenario ./scenario
func FuzzParseScenario(f *testing.F) {
	files, err := filepath.Glob(filepath.Join(root, "testdata", "scenarios", "*.toml"))
	if err != nil {
		f.Fatal(err)
	}
	for _, name := range append(files, filepath.Join(root, "testdata", "demo", "demo.toml")) {
		data, err := os.ReadFile(name)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(data, "")
	}
	f.Add([]byte(minimal), "ramp.shape=inverse")
	f.Add([]byte(minimal), "noise.depth.rin_band_hz=[1,2]")
	f.Add([]byte(minimal), "ring.sites=0")
	f.Add([]byte(minimal+"[ramp.x]\n"), "")
	f.Add([]byte(minimal+"file = \"up.csv\"\n"), "ramp.shape=file")
	f.Add([]byte("a.b.c = 1\n[[x]]\ny = 2\n"), "a=")
	fsys := fstest.MapFS{
		"up.csv":          {Data: []byte("t_s,omega_rad_s\n0,0\n1e-4,500\n")},
		"drive-phase.csv": {Data: []byte("f_hz,l_dbc_hz\n10,-80\n")},
	}
	f.Fuzz(func(t *testing.T, data []byte, override string) {
		var overrides []string
		if override != "" {
			overrides = []string{override}
		}
		s, err := parse(fsys, "s.toml", data, overrides)
		if err != nil {
			return
		}
		if _, err := s.Config(); err != nil {
			t.Fatalf("accepted scenario does not configure: %v", err)
		}
	})
}
