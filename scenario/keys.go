package scenario

import (
	"fmt"
	"math"
	"reflect"
	"strings"

	"rampart/internal/tomlpos"
	"rampart/mc"
	"rampart/sim"
)

// kind is the TOML type a key takes.
type kind int

const (
	number  kind = iota // a float; an integer literal is accepted
	integer             // an integer literal only
	text                // a string
	file                // a string naming a file, relative to the scenario file
	band                // an array [low, high] of two numbers, 0 <= low < high
)

// bound is the accepted range of a number.
type bound struct {
	ok   func(x float64) bool
	text string // for messages, after "a number" or "an integer"
}

var (
	anyFinite    = bound{func(float64) bool { return true }, ""}
	positive     = bound{func(x float64) bool { return x > 0 }, "> 0"}
	atLeastOne   = bound{func(x float64) bool { return x >= 1 }, ">= 1"}
	nonNegative  = bound{func(x float64) bool { return x >= 0 }, ">= 0"}
	relSigma     = bound{func(x float64) bool { return x >= 0 && x < 1 }, "from 0 up to but not including 1 (0: off)"}
	ppmSigma     = bound{func(x float64) bool { return x >= 0 && x < 1e6 }, "from 0 up to but not including 1e6 (0: off)"}
	unitInterval = bound{func(x float64) bool { return x >= -1 && x <= 1 }, "from -1 to 1"}
)

// Size bounds of the integer and count keys, so that no product of them
// overflows (2*sites, grid*grid) and a typo cannot ask for an endless run.
const (
	// maxSites: the grid holds at least 4 states per site (sim.AutoNumerics)
	// and at most sim.MaxGrid, so no ring beyond MaxGrid/4 sites can run.
	maxSites = sim.MaxGrid / 4
	// maxLaps: 10^6 turns, a hundred times the longest cruise docs/model.md
	// (Numerics) checks; a longer cruise is a typo, not an experiment.
	maxLaps = 1e6
	// maxSegments: every segment costs two ramps of split steps; a
	// thousand swap pulses is far beyond any echo train in use.
	maxSegments = 1000
)

var (
	sitesBound = bound{func(x float64) bool { return x >= 1 && x <= maxSites }, fmt.Sprintf("from 1 to %d", maxSites)}
	lapsBound  = bound{func(x float64) bool { return x > 0 && x <= maxLaps }, "> 0 and at most 1e6"}
	// One segment would be no echo at all (no swap pulse): refused rather
	// than run silently as the plain sequence.
	segmentsBound = bound{func(x float64) bool { return x == 0 || x >= 2 && x <= maxSegments },
		fmt.Sprintf("0 (no echo) or from 2 to %d (an echo swaps the states between segments, so it needs at least 2; 1 would be no echo)", maxSegments)}
	gridBound = bound{func(x float64) bool { return x >= 0 && x <= sim.MaxGrid }, fmt.Sprintf("from 0 (automatic) to %d", sim.MaxGrid)}
	// The ring potential is applied at first order, tested to a tilt of
	// 10 mrad and harmonics of 1e-2 (sim.RingPotential.Validate).
	tiltBound     = bound{func(x float64) bool { return math.Abs(x) <= 10 }, "from -10 to 10"}
	harmonicBound = bound{func(x float64) bool { return math.Abs(x) <= 0.01 }, "from -0.01 to 0.01"}
	radiusError   = bound{func(x float64) bool { return x > -1e6 }, "> -1e6"}
)

// zeroOrAbove accepts x >= 0, zero meaning what zero says.
func zeroOrAbove(zero string) bound { return bound{nonNegative.ok, ">= 0 (0: " + zero + ")"} }

// levelOrOff accepts a level in dB below the carrier, zero switching it off.
func levelOrOff(unit string) bound {
	return bound{func(x float64) bool { return x <= 0 }, "< 0 " + unit + " (0: off)"}
}

// key is one key of the scenario file.
type key struct {
	name     string // dotted, "ring.radius_um"
	kind     kind
	bound    bound    // number and integer keys
	choices  []string // text keys with a fixed set of values
	required bool
	meaning  string              // what the value is, with its unit
	field    func(*Scenario) any // pointer to the Scenario field; nil: a source key
	// source marks a key made from a row of mc.Sources, stored in
	// Scenario.SourceNoise.
	source bool
}

// shapes are the values of ramp.shape: the registered shapes, and a file.
var shapes = append(sim.ShapeNames(), "file")

// keys is the scenario schema, in the order of the reference in README.md.
var keys = []*key{
	{name: "atom.mass_u", kind: number, bound: positive, meaning: "the atom mass in u",
		field: func(s *Scenario) any { return &s.Atom.MassU }},
	{name: "atom.spin_pair", kind: text, choices: presetKeys(), meaning: "the spin pair of the arms, a rubidium-87 preset with its F = 2 state in the arm s = +1",
		field: func(s *Scenario) any { return &s.Atom.SpinPair }},
	{name: "atom.bias_field_g", kind: number, bound: nonNegative, meaning: "the bias field in G at which the spin pair's Zeeman coefficients are taken",
		field: func(s *Scenario) any { return &s.Atom.BiasFieldG }},
	{name: "atom.zeeman_linear_hz_g", kind: number, bound: anyFinite, meaning: "the linear differential Zeeman coefficient of the arm s = +1 against the arm s = -1 in Hz/G",
		field: func(s *Scenario) any { return &s.Atom.ZeemanLinearHzPerG }},
	{name: "atom.zeeman_quadratic_hz_g2", kind: number, bound: anyFinite, meaning: "the quadratic differential Zeeman coefficient in Hz/G^2",
		field: func(s *Scenario) any { return &s.Atom.ZeemanQuadraticHzPerG2 }},
	{name: "atom.field_offset_ug", kind: number, bound: anyFinite, meaning: "a static offset of the field from the bias during the shot in uG",
		field: func(s *Scenario) any { return &s.Atom.FieldOffsetUG }},
	{name: "atom.field_gradient_ug_um", kind: number, bound: anyFinite, meaning: "a static field gradient in the ring's plane in uG/um (G/m), a differential Zeeman shift varying as cos(theta - theta_g) around the ring",
		field: func(s *Scenario) any { return &s.Atom.FieldGradientUGPerUM }},
	{name: "atom.field_gradient_deg", kind: number, bound: anyFinite, meaning: "the azimuth theta_g of the field gradient from the start site in degrees",
		field: func(s *Scenario) any { return &s.Atom.FieldGradientDeg }},
	{name: "ring.radius_um", kind: number, bound: positive, required: true, meaning: "the ring radius in um",
		field: func(s *Scenario) any { return &s.Ring.RadiusUM }},
	{name: "ring.sites", kind: integer, bound: sitesBound, required: true, meaning: "the number of lattice sites",
		field: func(s *Scenario) any { return &s.Ring.Sites }},
	{name: "ring.radius_error_ppm", kind: number, bound: radiusError, meaning: "the error of the true radius against the calibrated radius_um in ppm",
		field: func(s *Scenario) any { return &s.Ring.RadiusErrorPPM }},
	{name: "ring.tilt_mrad", kind: number, bound: tiltBound, meaning: "the ring's tilt from horizontal in mrad",
		field: func(s *Scenario) any { return &s.Ring.TiltMrad }},
	{name: "ring.low_deg", kind: number, bound: anyFinite, meaning: "the azimuth of the ring's lowest point from the start site in degrees",
		field: func(s *Scenario) any { return &s.Ring.LowDeg }},
	{name: "ring.harmonic_order", kind: integer, bound: zeroOrAbove("none"), meaning: "the order k of an angular harmonic of the lattice depth around the ring",
		field: func(s *Scenario) any { return &s.Ring.HarmonicOrder }},
	{name: "ring.harmonic_rel", kind: number, bound: harmonicBound, meaning: "the relative amplitude of that depth harmonic",
		field: func(s *Scenario) any { return &s.Ring.HarmonicRel }},
	{name: "ring.harmonic_phase_deg", kind: number, bound: anyFinite, meaning: "the phase of that depth harmonic in degrees",
		field: func(s *Scenario) any { return &s.Ring.HarmonicPhaseDeg }},
	{name: "lattice.depth_khz", kind: number, bound: positive, required: true, meaning: "the lattice depth V0/h in kHz",
		field: func(s *Scenario) any { return &s.Lattice.DepthKHz }},
	{name: "lattice.wavelength_nm", kind: number, bound: zeroOrAbove("no scattering"), meaning: "the vacuum wavelength of the lattice light in nm, for photon scattering of rubidium-87",
		field: func(s *Scenario) any { return &s.Lattice.WavelengthNM }},
	{name: "lattice.scattering_plus_per_s", kind: number, bound: nonNegative, meaning: "the photon scattering rate of the arm s = +1 at the lattice depth in 1/s",
		field: func(s *Scenario) any { return &s.Lattice.ScatteringPlusPerS }},
	{name: "lattice.scattering_minus_per_s", kind: number, bound: nonNegative, meaning: "the photon scattering rate of the arm s = -1 at the lattice depth in 1/s",
		field: func(s *Scenario) any { return &s.Lattice.ScatteringMinusPerS }},
	{name: "lattice.polarisation_plus", kind: number, bound: unitInterval, meaning: "the degree of circular polarisation of the light carrying the arm s = +1 (0 linear, +1 sigma+, -1 sigma-), for its scattering with lattice.wavelength_nm and atom.spin_pair",
		field: func(s *Scenario) any { return &s.Lattice.PolarisationPlus }},
	{name: "lattice.polarisation_minus", kind: number, bound: unitInterval, meaning: "the degree of circular polarisation of the light carrying the arm s = -1, as lattice.polarisation_plus",
		field: func(s *Scenario) any { return &s.Lattice.PolarisationMinus }},
	{name: "motion.cruise_rad_s", kind: number, bound: positive, required: true, meaning: "each arm's cruise speed in rad/s",
		field: func(s *Scenario) any { return &s.Motion.CruiseRadS }},
	{name: "motion.laps", kind: number, bound: lapsBound, required: true, meaning: "each arm's one-way angle in turns, with 2*laps a whole number",
		field: func(s *Scenario) any { return &s.Motion.Laps }},
	{name: "motion.rotation_rad_s", kind: number, bound: anyFinite, meaning: "the background rotation in rad/s",
		field: func(s *Scenario) any { return &s.Motion.RotationRadS }},
	{name: "motion.echo_segments", kind: integer, bound: segmentsBound, meaning: "the number of echo segments, each ending where the arms meet with a swap pulse and the drives reversed (0: no echo; an echo needs 2 or more)",
		field: func(s *Scenario) any { return &s.Motion.EchoSegments }},
	{name: "motion.echo_hold_us", kind: number, bound: zeroOrAbove("none"), meaning: "the rest between echo segments in us, the swap pulse at its middle",
		field: func(s *Scenario) any { return &s.Motion.EchoHoldUS }},
	{name: "ramp.shape", kind: text, choices: shapes, required: true, meaning: "the ramp shape",
		field: func(s *Scenario) any { return &s.Ramp.Shape }},
	{name: "ramp.duration_us", kind: number, bound: positive, meaning: "the ramp-up time in us",
		field: func(s *Scenario) any { return &s.Ramp.DurationUS }},
	{name: "ramp.design_depth_khz", kind: number, bound: zeroOrAbove("the lattice depth"), meaning: "the depth V0/h in kHz the inverse ramp is designed for",
		field: func(s *Scenario) any { return &s.Ramp.DesignDepthKHz }},
	{name: "ramp.file", kind: file, meaning: "the ramp table, a CSV file relative to the scenario file",
		field: func(s *Scenario) any { return &s.Ramp.File }},
	{name: "ramp.down_shape", kind: text, choices: shapes, meaning: "the ramp-down's shape, a ramp-up played backwards (none: the mirror of the ramp-up)",
		field: func(s *Scenario) any { return &s.Ramp.DownShape }},
	{name: "ramp.down_duration_us", kind: number, bound: positive, meaning: "the ramp-down time in us",
		field: func(s *Scenario) any { return &s.Ramp.DownDurationUS }},
	{name: "ramp.down_design_depth_khz", kind: number, bound: zeroOrAbove("the lattice depth"), meaning: "the depth V0/h in kHz the inverse ramp-down is designed for",
		field: func(s *Scenario) any { return &s.Ramp.DownDesignDepthKHz }},
	{name: "ramp.down_file", kind: file, meaning: "the ramp-down table (a ramp-up played backwards), a CSV file relative to the scenario file",
		field: func(s *Scenario) any { return &s.Ramp.DownFile }},
	{name: "start.temperature_nk", kind: number, bound: zeroOrAbove("the ground state"), meaning: "the start temperature in nK",
		field: func(s *Scenario) any { return &s.Start.TemperatureNK }},
	{name: "numerics.grid", kind: integer, bound: gridBound, meaning: "the number of momentum states, a multiple of 2*sites",
		field: func(s *Scenario) any { return &s.Numerics.Grid }},
	{name: "numerics.step_us", kind: number, bound: zeroOrAbove("automatic"), meaning: "the split-step time step in us",
		field: func(s *Scenario) any { return &s.Numerics.StepUS }},
	{name: "noise.depth.common_rel", kind: number, bound: relSigma, meaning: "the sigma of the relative depth error of both spin states",
		field: func(s *Scenario) any { return &s.Noise.Depth.CommonRel }},
	{name: "noise.depth.differential_rel", kind: number, bound: relSigma, meaning: "the sigma of the relative depth difference between the spin states",
		field: func(s *Scenario) any { return &s.Noise.Depth.DifferentialRel }},
	{name: "noise.depth.rin_db_hz", kind: number, bound: levelOrOff("dB/Hz"), meaning: "the white relative intensity noise in dB/Hz",
		field: func(s *Scenario) any { return &s.Noise.Depth.RINDBPerHz }},
	{name: "noise.depth.rin_table", kind: file, meaning: "the intensity-noise table, a CSV file of f_hz,rin_db_hz relative to the scenario file",
		field: func(s *Scenario) any { return &s.Noise.Depth.RINTable }},
	{name: "noise.depth.rin_band_hz", kind: band, meaning: "the band of the intensity noise in Hz",
		field: func(s *Scenario) any { return &s.Noise.Depth.RINBandHz }},
	{name: "noise.drive.phase_dbc_hz", kind: number, bound: levelOrOff("dBc/Hz"), meaning: "the white single-sideband phase noise of each arm's drive in dBc/Hz",
		field: func(s *Scenario) any { return &s.Noise.Drive.PhaseDBcPerHz }},
	{name: "noise.drive.phase_table", kind: file, meaning: "the phase-noise table, a CSV file of f_hz,l_dbc_hz relative to the scenario file",
		field: func(s *Scenario) any { return &s.Noise.Drive.PhaseTable }},
	{name: "noise.drive.correlation", kind: number, bound: unitInterval, meaning: "the correlation of the two arms' drive phase noise",
		field: func(s *Scenario) any { return &s.Noise.Drive.Correlation }},
	{name: "noise.timing.clock_ppm", kind: number, bound: ppmSigma, meaning: "the sigma of the waveform time-base error in ppm",
		field: func(s *Scenario) any { return &s.Noise.Timing.ClockPPM }},
	{name: "noise.timing.speed_ppm", kind: number, bound: ppmSigma, meaning: "the sigma of the drive-frequency scale error in ppm",
		field: func(s *Scenario) any { return &s.Noise.Timing.SpeedPPM }},
	{name: "noise.timing.skew_ns", kind: number, bound: zeroOrAbove("off"), meaning: "the sigma of the delay between the arms' drives in ns",
		field: func(s *Scenario) any { return &s.Noise.Timing.SkewNS }},
	{name: "noise.temperature.spread_nk", kind: number, bound: zeroOrAbove("off"), meaning: "the sigma of the shot-to-shot temperature in nK",
		field: func(s *Scenario) any { return &s.Noise.Temperature.SpreadNK }},
	{name: "noise.pulses.area_rel", kind: number, bound: relSigma, meaning: "the sigma of the relative area error of each pi/2 pulse",
		field: func(s *Scenario) any { return &s.Noise.Pulses.AreaRel }},
	{name: "noise.field.noise_ug2_hz", kind: number, bound: zeroOrAbove("off"), meaning: "the white one-sided PSD of the magnetic field during the shot in uG^2/Hz",
		field: func(s *Scenario) any { return &s.Noise.FieldUG2PerHz }},
	{name: "noise.field.flicker_ug2", kind: number, bound: zeroOrAbove("none"), meaning: "the flicker term h_-1 of the field's PSD during the shot, S(f) = h_-1 / f, in uG^2",
		field: func(s *Scenario) any { return &s.Noise.FieldFlickerUG2 }},
	{name: "noise.field.random_walk_ug2_hz", kind: number, bound: zeroOrAbove("none"), meaning: "the random-walk term h_-2 of the field's PSD during the shot, S(f) = h_-2 / f^2, in uG^2 Hz",
		field: func(s *Scenario) any { return &s.Noise.FieldRandomWalkUG2Hz }},
	{name: "noise.field.mains_ug", kind: number, bound: zeroOrAbove("off"), meaning: "in uG, the " + sourceMeaning(mc.ParamMains), source: true},
	{name: "noise.field.mains_hz", kind: number, bound: zeroOrAbove("50 Hz"), meaning: "the mains frequency in Hz",
		field: func(s *Scenario) any { return &s.Noise.Mains.Hz }},
	{name: "noise.field.mains_h2_ug", kind: number, bound: zeroOrAbove("none"), meaning: "the amplitude of the mains line's second harmonic in uG",
		field: func(s *Scenario) any { return &s.Noise.Mains.H2UG }},
	{name: "noise.field.mains_h3_ug", kind: number, bound: zeroOrAbove("none"), meaning: "the amplitude of the mains line's third harmonic in uG",
		field: func(s *Scenario) any { return &s.Noise.Mains.H3UG }},
	{name: "noise.field.mains_phase", kind: text, choices: []string{"random", "fixed"}, meaning: "the mains line's phase at the shot's start: random (uniform) or fixed (mains_phase_rad)",
		field: func(s *Scenario) any { return &s.Noise.Mains.Phase }},
	{name: "noise.field.mains_phase_rad", kind: number, bound: anyFinite, meaning: "the fixed phase of the mains line at the shot's start in rad",
		field: func(s *Scenario) any { return &s.Noise.Mains.PhaseRad }},
	{name: "noise.platform.rotation_noise_urad2_s2_hz", kind: number, bound: zeroOrAbove("off"), meaning: "the white one-sided PSD of the platform's rotation rate during the shot (from 1/T up; slower wander is rotation_urad_s) in (urad/s)^2/Hz",
		field: func(s *Scenario) any { return &s.Noise.RotationURad2S2PerHz }},
	{name: "readout.atoms", kind: number, bound: zeroOrAbove("no read-out"), meaning: "the atoms detected per shot",
		field: func(s *Scenario) any { return &s.Readout.Atoms }},
	{name: "readout.cycle_s", kind: number, bound: zeroOrAbove("no read-out"), meaning: "the cycle time of one shot in s",
		field: func(s *Scenario) any { return &s.Readout.CycleS }},
	{name: "readout.detection_atoms", kind: number, bound: zeroOrAbove("projection noise alone"), meaning: "the detection noise, atoms rms on the measured difference of the two ports",
		field: func(s *Scenario) any { return &s.Readout.DetectionAtoms }},
}

var (
	keyByName = map[string]*key{}
	tables    = map[string][]string{} // table -> its keys and sub-tables, in schema order; "" is the top level
)

func init() {
	keys = append(keys, sourceKeys()...)
	for _, k := range keys {
		keyByName[k.name] = k
		parts := strings.Split(k.name, ".")
		for i := range parts {
			parent := strings.Join(parts[:i], ".")
			if !contains(tables[parent], parts[i]) {
				tables[parent] = append(tables[parent], parts[i])
			}
		}
	}
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// table returns the table a key belongs to.
func (k *key) table() string { return k.name[:strings.LastIndexByte(k.name, '.')] }

// want says what the key accepts: "a finite number > 0 for the ring radius in um".
func (k *key) want() string {
	var w string
	switch k.kind {
	case number:
		w = strings.TrimSpace("a finite number " + k.bound.text)
	case integer:
		w = strings.TrimSpace("an integer " + k.bound.text)
	case text:
		q := make([]string, len(k.choices))
		for i, c := range k.choices {
			q[i] = fmt.Sprintf("%q", c)
		}
		w = "one of " + strings.Join(q, ", ")
	case file:
		w = "a file path (a string)"
	case band:
		w = "an array [low, high] of two finite numbers with 0 <= low < high"
	}
	return w + " for " + k.meaning
}

// convert checks a decoded TOML value against the key and returns it as
// float64, int, string or [2]float64.
func (k *key) convert(v any) (any, error) {
	wrongType := func() error {
		if _, isArray := v.([]any); isArray && k.kind == band {
			return fmt.Errorf("%s = %s: want %s", k.name, tomlpos.Show(v), k.want())
		}
		return fmt.Errorf("%s = %s: want %s, got %s", k.name, tomlpos.Show(v), k.want(), tomlpos.TypeName(v))
	}
	outOfRange := func() error {
		if k.kind == text {
			return fmt.Errorf("%s = %s is unknown: want %s", k.name, tomlpos.Show(v), k.want())
		}
		return fmt.Errorf("%s = %s is out of range: want %s", k.name, tomlpos.Show(v), k.want())
	}
	switch k.kind {
	case number, integer:
		var x float64
		switch n := v.(type) {
		case int64:
			x = float64(n)
			if k.kind == integer && int64(int(n)) != n {
				return nil, outOfRange()
			}
		case float64:
			if k.kind == integer {
				return nil, wrongType()
			}
			x = n
		default:
			return nil, wrongType()
		}
		if math.IsNaN(x) || math.IsInf(x, 0) || !k.bound.ok(x) {
			return nil, outOfRange()
		}
		if k.kind == integer {
			return int(v.(int64)), nil
		}
		return x, nil
	case text, file:
		s, ok := v.(string)
		if !ok {
			return nil, wrongType()
		}
		if k.choices != nil && !contains(k.choices, s) {
			return nil, outOfRange()
		}
		return s, nil
	case band:
		a, ok := v.([]any)
		if !ok || len(a) != 2 {
			return nil, wrongType()
		}
		var p [2]float64
		for i, e := range a {
			switch n := e.(type) {
			case int64:
				p[i] = float64(n)
			case float64:
				p[i] = n
			default:
				return nil, wrongType()
			}
			if math.IsNaN(p[i]) || math.IsInf(p[i], 0) {
				return nil, outOfRange()
			}
		}
		if !(p[0] >= 0 && p[0] < p[1]) {
			return nil, outOfRange()
		}
		return p, nil
	}
	panic("scenario: unknown key kind")
}

// sourceKeys returns a key for every static row of mc.Sources whose
// scenario key the schema above lacks: a sigma in the file unit the key's
// name carries, zero switching the source off.
func sourceKeys() []*key {
	have := map[string]bool{}
	for _, k := range keys {
		have[k.name] = true
	}
	var out []*key
	for _, s := range mc.Sources {
		if s.Kind != mc.Static || have[s.Scenario] {
			continue
		}
		out = append(out, &key{name: s.Scenario, kind: number, bound: zeroOrAbove("off"),
			meaning: "the sigma of the " + s.Meaning, source: true})
	}
	return out
}

// set stores a converted value in the Scenario field of the key.
func (k *key) set(s *Scenario, v any) {
	if k.source {
		if s.SourceNoise == nil {
			s.SourceNoise = map[string]float64{}
		}
		s.SourceNoise[k.name] = v.(float64)
		return
	}
	switch p := k.field(s).(type) {
	case *float64:
		*p = v.(float64)
	case *int:
		*p = v.(int)
	case *string:
		*p = v.(string)
	case *[2]float64:
		*p = v.([2]float64)
	default:
		panic("scenario: unsupported field type")
	}
}

// value returns the key's value in s (a source key that s does not set
// is 0, as Number has it).
func (k *key) value(s *Scenario) any {
	if k.source {
		return s.SourceNoise[k.name]
	}
	return reflect.ValueOf(k.field(s)).Elem().Interface()
}

// Number returns the value of the number key name ("noise.timing.skew_ns")
// in s, and whether the schema has such a key.
func (s *Scenario) Number(name string) (float64, bool) {
	k, ok := keyByName[name]
	if !ok || k.kind != number {
		return 0, false
	}
	if k.source {
		return s.SourceNoise[name], true
	}
	return *k.field(s).(*float64), true
}

// sourceMeaning returns the meaning of the row of mc.Sources with the key.
func sourceMeaning(key string) string {
	s, ok := mc.LookupSource(key)
	if !ok {
		panic("scenario: no source " + key)
	}
	return s.Meaning
}
