package scenario

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"testing/fstest"

	"rampart/sim"
)

// minimal holds the required keys only.
const minimal = `[ring]
radius_um = 5.0
sites = 20

[lattice]
depth_khz = 20.0

[motion]
cruise_rad_s = 500.0
laps = 1

[ramp]
shape = "sin2"
duration_us = 150.0
`

const root = ".."

func TestLoadExamples(t *testing.T) {
	files, err := filepath.Glob(filepath.Join(root, "testdata", "scenarios", "*.toml"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no example scenarios: %v", err)
	}
	for _, f := range files {
		s, err := Load(f, nil)
		if err != nil {
			t.Errorf("Load(%q): %v", f, err)
			continue
		}
		if _, err := s.Config(); err != nil {
			t.Errorf("%s: Config: %v", f, err)
		}
	}
	s, err := LoadFS(os.DirFS(root), "testdata/demo/demo.toml", nil)
	if err != nil {
		t.Fatalf("LoadFS(demo): %v", err)
	}
	if _, err := s.Config(); err != nil {
		t.Errorf("demo: Config: %v", err)
	}
}

func TestConfigUnits(t *testing.T) {
	s, err := Load(filepath.Join(root, "testdata", "scenarios", "benchmark.toml"), []string{
		"atom.mass_u=6.0151228874", "start.temperature_nk=50", "numerics.grid=800", "numerics.step_us=2.5",
	})
	if err != nil {
		t.Fatal(err)
	}
	c, err := s.Config()
	if err != nil {
		t.Fatal(err)
	}
	// Exact unit conversions: the tolerance (relative) allows the rounding
	// of one multiplication.
	const tol = 1e-15
	for _, row := range []struct {
		name      string
		got, want float64
	}{
		{"RadiusM", c.Ring.RadiusM, 5e-6},
		{"MassKg", c.Ring.MassKg, 6.0151228874 * 1.66053906660e-27}, // m_u, CODATA 2018
		{"DepthHz", c.DepthHz, 20e3},
		{"RotationRadS", c.RotationRadS, 1e-3},
		{"TemperatureK", c.TemperatureK, 50e-9},
		{"StepS", c.StepS, 2.5e-6},
		{"ramp DurationS", c.Sequence.Up.Duration(), 150e-6},
		{"cruise RadS", c.Sequence.CruiseSpeed(), 500},
		{"total angle rad", c.Sequence.TotalAngle(), 2 * math.Pi},
	} {
		if d := math.Abs(row.got-row.want) / math.Abs(row.want); d > tol {
			t.Errorf("%s: got %v, want %v (tol %g relative)", row.name, row.got, row.want, tol)
		}
	}
	if c.Ring.Sites != 20 || c.Grid != 800 {
		t.Errorf("sites, grid: got %d, %d, want 20, 800", c.Ring.Sites, c.Grid)
	}
	if c.Sequence.Up.Name() != "sin2" {
		t.Errorf("ramp: got %q, want sin2", c.Sequence.Up.Name())
	}
}

func TestDefaults(t *testing.T) {
	s, err := parse(fstest.MapFS{}, "minimal.toml", []byte(minimal), nil)
	if err != nil {
		t.Fatal(err)
	}
	if s.Atom.MassU != sim.Rb87MassU {
		t.Errorf("mass: got %v u, want rubidium-87 %v u", s.Atom.MassU, sim.Rb87MassU)
	}
	if s.Start != (Start{}) || s.Numerics != (Numerics{}) || s.Noise != (Noise{}) || s.Readout != (Readout{}) ||
		s.Motion.RotationRadS != 0 || s.Ramp.DesignDepthKHz != 0 {
		t.Errorf("optional keys are not zero by default: %+v", s)
	}
}

func TestInverseDesignDepth(t *testing.T) {
	for _, row := range []struct {
		set    []string
		design float64 // Hz
	}{
		{nil, 18e3},
		{[]string{"ramp.design_depth_khz=0"}, 20e3}, // 0: the lattice depth
	} {
		s, err := Load(filepath.Join(root, "testdata", "scenarios", "inverse.toml"), row.set)
		if err != nil {
			t.Fatal(err)
		}
		c, err := s.Config()
		if err != nil {
			t.Fatal(err)
		}
		inv, ok := c.Sequence.Up.(sim.Inverse)
		if !ok {
			t.Fatalf("ramp: got %T, want sim.Inverse", c.Sequence.Up)
		}
		want := 2 * math.Pi * c.Ring.TrapHz(row.design)
		if inv.TrapRadS != want || inv.DesignDepth != row.design {
			t.Errorf("%v: trap %v rad/s at %v Hz, want %v rad/s at %v Hz (exact)", row.set, inv.TrapRadS, inv.DesignDepth, want, row.design)
		}
	}
}

func TestFileRamps(t *testing.T) {
	var ramps []sim.Ramp
	for _, f := range []string{"file.toml", "file-drive.toml"} {
		s, err := Load(filepath.Join(root, "testdata", "scenarios", f), nil)
		if err != nil {
			t.Fatal(err)
		}
		c, err := s.Config()
		if err != nil {
			t.Fatal(err)
		}
		tab, ok := c.Sequence.Up.(*sim.Tabulated)
		if !ok || tab.Rows() != 41 || tab.Duration() != 150e-6 {
			t.Fatalf("%s: got %T with %d rows over %g s, want 41 rows over 150e-6 s", f, c.Sequence.Up, tab.Rows(), tab.Duration())
		}
		ramps = append(ramps, tab)
	}
	// The two files hold the same ramp, one as Omega and one as
	// N Omega / 2 pi: equal to the rounding of the conversion.
	const tol = 1e-12 // relative to the cruise speed
	for i := 0; i <= 300; i++ {
		tm := 150e-6 * float64(i) / 300
		a, b := ramps[0].Speed(tm), ramps[1].Speed(tm)
		if math.Abs(a-b) > tol*500 {
			t.Fatalf("t = %g s: omega file %v rad/s, drive file %v rad/s (tol %g relative)", tm, a, b, tol)
		}
	}
}

func TestOverrides(t *testing.T) {
	dir := t.TempDir()
	ramp := filepath.Join(dir, "up.csv")
	if err := os.WriteFile(ramp, []byte("t_s,omega_rad_s\n0,0\n1e-4,500\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, row := range []struct {
		set   []string
		check func(s *Scenario) bool
	}{
		{[]string{"ring.sites=24"}, func(s *Scenario) bool { return s.Ring.Sites == 24 }},
		{[]string{"ring.sites = 24 "}, func(s *Scenario) bool { return s.Ring.Sites == 24 }},
		{[]string{"lattice.depth_khz=25"}, func(s *Scenario) bool { return s.Lattice.DepthKHz == 25 }},
		{[]string{"ramp.shape=inverse"}, func(s *Scenario) bool { return s.Ramp.Shape == "inverse" }},
		{[]string{`ramp.shape="minjerk"`}, func(s *Scenario) bool { return s.Ramp.Shape == "minjerk" }},
		{[]string{"ramp.shape='minjerk'"}, func(s *Scenario) bool { return s.Ramp.Shape == "minjerk" }},
		{[]string{"noise.depth.rin_band_hz=[1, 1e4]", "noise.depth.rin_db_hz=-120"}, func(s *Scenario) bool {
			return s.Noise.Depth.RINBandHz == [2]float64{1, 1e4} && s.Noise.Depth.RINDBPerHz == -120
		}},
		{[]string{"ramp.shape=file", "ramp.file=" + ramp, "ramp.duration_us=100"}, func(s *Scenario) bool { return s.Ramp.File == ramp }},
		{[]string{"motion.laps=2", "motion.laps=1.5"}, func(s *Scenario) bool { return s.Motion.Laps == 1.5 }}, // the last wins
		{[]string{"motion.echo_segments=2", "motion.echo_hold_us=30", "ramp.down_shape=minjerk", "ramp.down_duration_us=80"}, func(s *Scenario) bool {
			cfg, err := s.Config()
			q := cfg.Sequence
			return err == nil && q.Segments == 2 && math.Abs(q.HoldS-30e-6) < 1e-18 && q.Down != nil && math.Abs(q.Down.Duration()-80e-6) < 1e-18 &&
				math.Abs(q.TotalAngle()-2*2*math.Pi*s.Motion.Laps) < 1e-12*q.TotalAngle()
		}},
	} {
		s, err := parse(nil, filepath.Join(dir, "s.toml"), []byte(minimal), row.set)
		if err != nil {
			t.Errorf("%q: %v", row.set, err)
			continue
		}
		if !row.check(s) {
			t.Errorf("%q: not applied: %+v", row.set, s)
		}
	}
}

func TestBadScenario(t *testing.T) {
	fsys := fstest.MapFS{
		"ramps/up.csv": {Data: []byte("t_s,omega_rad_s\n0,0\n1e-4,500\n")},
	}
	for _, row := range []struct {
		name string
		doc  string
		set  []string
		line int    // want this line; -1: the error names a --set flag
		key  string // want this key
		msg  string // the message contains this
	}{
		// The decoder reports an unexpected newline on the next line; the
		// line is counted from its byte offset (tomlpos.ErrorLine).
		{"syntax", minimal + "[ring\n", nil, 15, "", "not valid TOML: expected '.' or ']' to end table name"},
		{"syntax on line 1", "[ring\n" + minimal, nil, 1, "", "not valid TOML: expected '.' or ']' to end table name, but got '\\n'"},
		{"syntax after a UTF-8 byte-order mark", "\xef\xbb\xbf" + minimal + "[ring\n", nil, 15, "", "not valid TOML"},
		{"UTF-16 byte-order mark", "\xff\xfe" + minimal, nil, 1, "", "the file starts with a UTF-16 byte-order mark (bytes 0xff 0xfe or 0xfe 0xff): save it as UTF-8"},
		{"invalid UTF-8 in a comment", minimal + "# caf\xe9\n", nil, 15, "", "byte 0xe9 at column 6 is not UTF-8: save the file as UTF-8"},
		{"unknown top-level key", "foo = 1\n" + minimal, nil, 1, "foo", "unknown key foo: a scenario holds only the tables atom, ring, lattice, motion, ramp, start, numerics, noise, readout"},
		{"unknown table", minimal + "[rings]\nsites = 3\n", nil, 15, "rings", "unknown table [rings]: a scenario has the tables atom, ring,"},
		{"unknown sub-table", minimal + "[noise.depht]\ncommon_rel = 0.1\n", nil, 15, "noise.depht", "unknown table [noise.depht]: [noise] takes depth, drive, timing, temperature, pulses"},
		{"unknown key", minimal + "[atom]\nmass = 87\n", nil, 16, "atom.mass", "unknown key atom.mass: [atom] takes mass_u"},
		{"key in the wrong table", minimal + "radius_um = 5\n", nil, 15, "ramp.radius_um", "unknown key ramp.radius_um: [ramp] takes shape, duration_us, design_depth_khz, file, down_shape, down_duration_us, down_design_depth_khz, down_file (radius_um belongs in [ring])"},
		{"key in the wrong case", minimal + "[atom]\nMass_U = 87\n", nil, 16, "atom.Mass_U", "unknown key atom.Mass_U: [atom] takes mass_u"},
		{"table given a value", "atom = 87\n" + minimal, nil, 1, "atom", "atom must be a table [atom], got an integer"},
		{"value given a table", minimal + "[start.temperature_nk]\nvalue = 20\n", nil, 16, "start.temperature_nk.value", "start.temperature_nk is a value, not a table: want a finite number >= 0 (0: the ground state) for the start temperature in nK"},
		{"string for a number", minimal + "[atom]\nmass_u = \"87\"\n", nil, 16, "atom.mass_u", `atom.mass_u = "87": want a finite number > 0 for the atom mass in u, got a string`},
		{"float for an integer", strings.Replace(minimal, "sites = 20", "sites = 20.0", 1), nil, 3, "ring.sites", "ring.sites = 20.0: want an integer from 1 to 4096 for the number of lattice sites, got a float"},
		{"number for a string", strings.Replace(minimal, `shape = "sin2"`, "shape = 2", 1), nil, 13, "ramp.shape", `ramp.shape = 2: want one of "sin2", "minjerk", "inverse", "inverse-gap", "file" for the ramp shape, got an integer`},
		{"unknown shape", strings.Replace(minimal, `"sin2"`, `"cos2"`, 1), nil, 13, "ramp.shape", `ramp.shape = "cos2" is unknown: want one of "sin2", "minjerk", "inverse", "inverse-gap", "file"`},
		{"negative radius", strings.Replace(minimal, "radius_um = 5.0", "radius_um = -5.0", 1), nil, 2, "ring.radius_um", "ring.radius_um = -5.0 is out of range: want a finite number > 0 for the ring radius in um"},
		{"zero sites", strings.Replace(minimal, "sites = 20", "sites = 0", 1), nil, 3, "ring.sites", "ring.sites = 0 is out of range: want an integer from 1 to 4096"},
		{"NaN depth", strings.Replace(minimal, "depth_khz = 20.0", "depth_khz = nan", 1), nil, 6, "lattice.depth_khz", "lattice.depth_khz = nan is out of range: want a finite number > 0"},
		{"infinite rotation", strings.Replace(minimal, "laps = 1", "laps = 1\nrotation_rad_s = -inf", 1), nil, 11, "motion.rotation_rad_s", "motion.rotation_rad_s = -inf is out of range: want a finite number for the background rotation in rad/s"},
		{"duplicate key", minimal + "[ring]\n", nil, 15, "", "not valid TOML"},
		{"negative temperature", minimal + "[start]\ntemperature_nk = -1\n", nil, 16, "start.temperature_nk", "start.temperature_nk = -1 is out of range: want a finite number >= 0 (0: the ground state)"},
		{"grid not a multiple", minimal + "[numerics]\ngrid = 100\n", nil, 16, "numerics.grid", "numerics.grid = 100 is not a multiple of 2*sites = 40: want 0 (automatic) or a multiple such as 80 or 120"},
		{"correlation above 1", minimal + "[noise.drive]\ncorrelation = 1.5\n", nil, 16, "noise.drive.correlation", "noise.drive.correlation = 1.5 is out of range: want a finite number from -1 to 1"},
		{"positive RIN", minimal + "[noise.depth]\nrin_db_hz = 10\n", nil, 16, "noise.depth.rin_db_hz", "noise.depth.rin_db_hz = 10 is out of range: want a finite number < 0 dB/Hz (0: off)"},
		{"relative sigma of 1", minimal + "[noise.pulses]\narea_rel = 1\n", nil, 16, "noise.pulses.area_rel", "noise.pulses.area_rel = 1 is out of range: want a finite number from 0 up to but not including 1 (0: off)"},
		{"band reversed", minimal + "[noise.depth]\nrin_band_hz = [1e4, 10]\n", nil, 16, "noise.depth.rin_band_hz", "noise.depth.rin_band_hz = [10000.0, 10] is out of range: want an array [low, high] of two finite numbers with 0 <= low < high"},
		{"band of one", minimal + "[noise.depth]\nrin_band_hz = [10]\n", nil, 16, "noise.depth.rin_band_hz", "noise.depth.rin_band_hz = [10]: want an array [low, high] of two finite numbers"},
		{"phase floor and table", minimal + "[noise.drive]\nphase_dbc_hz = -100\nphase_table = \"../ramps/up.csv\"\n", nil, 17, "noise.drive.phase_table", "noise.drive.phase_table and noise.drive.phase_dbc_hz are both given"},
		{"phase table missing", minimal + "[noise.drive]\nphase_table = \"phase.csv\"\n", nil, 16, "noise.drive.phase_table", `phase-noise table "s/phase.csv": cannot read the file: file does not exist`},
		{"read-out half given", minimal + "[readout]\ncycle_s = 1\n", nil, 16, "readout.cycle_s", "readout.cycle_s needs readout.atoms too: give both for gyroscope figures, or neither"},
		{"missing required key", strings.Replace(minimal, "radius_um = 5.0\n", "", 1), nil, 0, "ring.radius_um", "missing ring.radius_um: want a finite number > 0 for the ring radius in um"},
		{"missing duration", strings.Replace(minimal, "duration_us = 150.0\n", "", 1), nil, 0, "ramp.duration_us", `missing ramp.duration_us, which shape "sin2" needs`},
		{"file shape without file", strings.Replace(minimal, `"sin2"`, `"file"`, 1), nil, 13, "ramp.shape", `ramp.shape = "file" needs ramp.file, the ramp table: give file = "PATH" in [ramp], a CSV file (a path in the scenario file is relative to the scenario file's directory)`},
		// On the command line a path is relative to the working directory
		// (Scenario.resolve), and the message says so.
		{"file shape without file, set", minimal, []string{"ramp.shape=file"}, -1, "ramp.shape", `ramp.shape = "file" needs ramp.file, the ramp table: give --set ramp.file=PATH too, a CSV file (a path on the command line is relative to the working directory)`},
		{"file with another shape", minimal + "file = \"../ramps/up.csv\"\n", nil, 15, "ramp.file", `ramp.file is given but ramp.shape = "sin2"`},
		{"design depth with another shape", minimal + "design_depth_khz = 18\n", nil, 15, "ramp.design_depth_khz", `ramp.design_depth_khz applies to shapes designed for a depth (inverse, inverse-gap) only, not "sin2"`},
		{"ramp file missing", strings.Replace(minimal, `shape = "sin2"`, "shape = \"file\"\nfile = \"../ramps/down.csv\"", 1), nil, 14, "ramp.file", `ramp file "ramps/down.csv": cannot read the file: file does not exist`},
		{"ramp file ends below cruise", strings.Replace(strings.Replace(minimal, `shape = "sin2"`, "shape = \"file\"\nfile = \"../ramps/up.csv\"", 1), "duration_us = 150.0\n", "", 1) + "", []string{"motion.cruise_rad_s=400"}, 14, "ramp.file", `ramp file "ramps/up.csv" line 3: the ramp ends at omega_rad_s = 500 but the cruise speed (motion.cruise_rad_s) is 400 rad/s`},
		{"duration disagrees with file", strings.Replace(minimal, `shape = "sin2"`, "shape = \"file\"\nfile = \"../ramps/up.csv\"", 1), nil, 15, "ramp.duration_us", `ramp.duration_us = 150 but the ramp file "ramps/up.csv" ends at t = 0.0001 s (100 us): give that time or leave duration_us out`},
		{"arms do not close", strings.Replace(minimal, "laps = 1", "laps = 0.7", 1), nil, 10, "motion.laps", "the arms do not recombine: with laps = 0.7 they end 8 sites apart on the 20-site ring"},
		{"ramps longer than the laps", strings.Replace(minimal, "laps = 1", "laps = 0.5", 1), []string{"ramp.duration_us=1e5"}, -1, "ramp.duration_us", "the two ramps alone turn each arm by"},
		// The ramps' angle: 2 x 50000 rad/s x 150 us / 2 = 7.5 rad = 1.19366 turns.
		{"ramps too fast for the laps", minimal, []string{"motion.cruise_rad_s=50000"}, -1, "motion.cruise_rad_s", "the two ramps alone turn each arm by 1.19366 turns, more than laps = 1: raise laps, lower the cruise speed or shorten the ramp"},
		{"ramps longer than the laps in the file", strings.Replace(minimal, "cruise_rad_s = 500.0", "cruise_rad_s = 50000.0", 1), nil, 10, "motion.laps", "the two ramps alone turn each arm by"},
		// The momentum grid (sim.AutoNumerics, sim.MaxGrid): the packet at
		// 1e9 kHz needs 31366 states, the speed 34; at 1e6 rad/s the speed
		// needs 2 I Omega / hbar = 68000 (34 x 2000).
		{"grid too large for the depth", minimal, []string{"lattice.depth_khz=1e9"}, -1, "lattice.depth_khz", "the momentum grid would need 31400 states, more than the 16384 rampart handles (memory and time grow as grid^2 / sites): about 34 of them hold the arms' momentum at the peak speed 500 rad/s, 31366 the site's wave packet, which widens with the depth as V0^(1/4): lower the lattice depth (lattice.depth_khz), or set numerics.grid"},
		{"grid too large for the depth in the file", strings.Replace(minimal, "depth_khz = 20.0", "depth_khz = 1e9", 1), nil, 6, "lattice.depth_khz", "lower the lattice depth (lattice.depth_khz)"},
		{"grid too large for the speed", minimal, []string{"motion.cruise_rad_s=1e6", "motion.laps=30"}, -1, "motion.cruise_rad_s", "lower the cruise speed (motion.cruise_rad_s)"},
		// Overrides.
		{"override without =", minimal, []string{"ring.sites"}, -1, "", "want table.key=value, for example ring.sites=24"},
		{"override of an unknown key", minimal, []string{"ring.radius=3"}, -1, "ring.radius", "unknown key ring.radius: [ring] takes radius_um, sites"},
		{"override of an unknown table", minimal, []string{"rings.radius_um=3"}, -1, "rings.radius_um", "unknown table [rings]"},
		{"override of a table", minimal, []string{"ring=3"}, -1, "ring", "ring is a table, not a key: [ring] takes radius_um, sites"},
		{"override not TOML", minimal, []string{"ring.sites=twenty"}, -1, "ring.sites", `"twenty" is not a TOML value: want an integer from 1 to 4096 for the number of lattice sites`},
		{"override of the wrong type", minimal, []string{"ring.sites=20.5"}, -1, "ring.sites", "ring.sites = 20.5: want an integer from 1 to 4096 for the number of lattice sites, got a float"},
		{"override out of range", minimal, []string{"lattice.depth_khz=-3"}, -1, "lattice.depth_khz", "lattice.depth_khz = -3 is out of range"},
		{"override that does not close", minimal, []string{"motion.laps=0.25"}, -1, "motion.laps", "the arms do not recombine: with laps = 0.25"},
		{"override spanning lines", minimal, []string{"ring.sites=20\nfoo=1"}, -1, "ring.sites", "the value of ring.sites spans several lines"},
		// The ramp-down and the echo (sim.NewSequenceDown, sim.NewEcho).
		{"ramp-down time without a shape", minimal, []string{"ramp.down_duration_us=100"}, -1, "ramp.down_duration_us", "ramp.down_duration_us is given but ramp.down_shape is not"},
		{"ramp-down shape without a time", minimal, []string{"ramp.down_shape=minjerk"}, -1, "ramp.down_shape", `ramp.down_shape = "minjerk" needs ramp.down_duration_us`},
		{"ramp-down file without a table", minimal, []string{"ramp.down_shape=file"}, -1, "ramp.down_shape", `ramp.down_shape = "file" needs ramp.down_file, the ramp-down table: give --set ramp.down_file=PATH too, a CSV file (a path on the command line is relative to the working directory)`},
		{"ramp-down design depth for sin2", minimal, []string{"ramp.down_shape=sin2", "ramp.down_duration_us=100", "ramp.down_design_depth_khz=10"}, -1, "ramp.down_design_depth_khz", "applies to shapes designed for a depth"},
		{"ramp-down table at another speed", minimal, []string{"motion.cruise_rad_s=400", "ramp.down_shape=file", "ramp.down_file=ramps/up.csv"}, -1, "ramp.down_file", "ramps/up.csv"},
		{"echo hold without segments", minimal, []string{"motion.echo_hold_us=20"}, -1, "motion.echo_hold_us", "applies to echo sequences only"},
		{"too many echo segments", minimal, []string{"motion.echo_segments=1001"}, -1, "motion.echo_segments", "want an integer 0 (no echo) or from 2 to 1000"},
		{"one echo segment", minimal, []string{"motion.echo_segments=1"}, -1, "motion.echo_segments", "motion.echo_segments = 1 is out of range: want an integer 0 (no echo) or from 2 to 1000 (an echo swaps the states between segments, so it needs at least 2; 1 would be no echo)"},
		{"one echo segment in the file", strings.Replace(minimal, "laps = 1\n", "laps = 1\necho_segments = 1\n", 1), nil, 11, "motion.echo_segments", "motion.echo_segments = 1 is out of range"},
		{"echo segments that do not close", minimal, []string{"motion.laps=1", "motion.echo_segments=2", "motion.laps=0.25"}, -1, "motion.laps", "the arms do not recombine: with laps = 0.25"},
	} {
		_, err := parse(fsys, "s/s.toml", []byte(row.doc), row.set)
		var e *Error
		if !errors.As(err, &e) {
			t.Errorf("%s: got %v, want a *scenario.Error", row.name, err)
			continue
		}
		if !strings.Contains(err.Error(), row.msg) {
			t.Errorf("%s: got %q, want it to contain %q", row.name, err, row.msg)
		}
		if e.Key != row.key {
			t.Errorf("%s: key %q, want %q", row.name, e.Key, row.key)
		}
		switch {
		case row.line < 0 && (e.Flag == "" || !strings.HasPrefix(err.Error(), "--set "+e.Flag+": ")):
			t.Errorf("%s: %q does not name the --set flag", row.name, err)
		case row.line >= 0 && (e.Line != row.line || !strings.HasPrefix(err.Error(), `scenario "s/s.toml"`)):
			t.Errorf("%s: %q: line %d, want %d in scenario %q", row.name, err, e.Line, row.line, "s/s.toml")
		}
	}
}

// TestRelativeTableMessage: a table given on the command line with a
// relative path is read from the working directory; when it is missing the
// message names the absolute path that was tried.
func TestRelativeTableMessage(t *testing.T) {
	dir := t.TempDir()
	name := filepath.Join(dir, "s.toml")
	if err := os.WriteFile(name, []byte(minimal), 0o644); err != nil {
		t.Fatal(err)
	}
	t.Chdir(dir)
	_, err := Load(name, []string{"noise.drive.phase_table=missing.csv"})
	want := "(looked for " + filepath.Join(dir, "missing.csv") + ")"
	if err == nil || !strings.Contains(err.Error(), want) {
		t.Fatalf("error %v, want it to contain %q", err, want)
	}
}
